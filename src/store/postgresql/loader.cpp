// SPDX-License-Identifier: Apache-2.0
// open_postgresql for the binary: opens the backend from its module (module.h) the first time a
// PostgreSQL store is opened.
#include "core/module_loader.h"
#include "store/postgresql/module.h"
#include "store/postgresql/open.h"

namespace cw::store::postgresql {

namespace {

OpenFunction module_open() {
  static const auto open = reinterpret_cast<OpenFunction>(
      Module::load(kModuleFile, "the PostgreSQL backend").symbol(kOpenSymbol));
  return open;
}

}  // namespace

std::unique_ptr<Store> open_postgresql(const OpenOptions& options) {
  return std::unique_ptr<Store>(module_open()(options));
}

void require_postgresql() {
  module_open();
}

}  // namespace cw::store::postgresql
