// SPDX-License-Identifier: Apache-2.0
// open_postgresql for the programs that link the backend itself (the tests) and for the module:
// an object of its own (cw_store_pg_linked), so it is on the link line before the archives that
// call it, as the binary's loader.cpp is.
#include "store/postgresql/database.h"
#include "store/postgresql/open.h"
#include "store/postgresql/pg_store.h"

namespace cw::store::postgresql {

std::unique_ptr<Store> open_postgresql(const OpenOptions& options) {
  return std::make_unique<PgStore>(Database::open(options.location, options.create,
                                                  options.busy_timeout_ms, options.os_login,
                                                  options.migrate));
}

void require_postgresql() {}

}  // namespace cw::store::postgresql
