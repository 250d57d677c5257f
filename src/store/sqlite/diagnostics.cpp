// SPDX-License-Identifier: Apache-2.0
// Query plans of the backend's statements.
#include "store/sqlite/diagnostics.h"

#include <stdexcept>

#include "store/sqlite/sqlite_store.h"

namespace cw::store::sqlite {

std::string query_plan(Store& store, const char* sql) {
  auto* sqlite = dynamic_cast<SqliteStore*>(&store);
  if (sqlite == nullptr) throw std::invalid_argument("not a SQLite store");
  Database& d = sqlite->database();
  return guarded(d, [&] {
    SQLite::Statement s(*d.db, std::string("EXPLAIN QUERY PLAN ") + sql);
    std::string plan;
    while (s.executeStep()) plan += s.getColumn(3).getString() + "\n";
    return plan;
  });
}

}  // namespace cw::store::sqlite
