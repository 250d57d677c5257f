// SPDX-License-Identifier: Apache-2.0
// A read-only query stepped through SQLite's C interface.
#include "store/sqlite/scan.h"

namespace cw::store::sqlite {

Scan::Scan(SQLite::Database& db, const std::string& sql) : db_(db.getHandle()) {
  const int rc =
      sqlite3_prepare_v2(db_, sql.c_str(), static_cast<int>(sql.size()) + 1, &statement_, nullptr);
  if (rc != SQLITE_OK) {
    sqlite3_finalize(statement_);
    throw SQLite::Exception(db_, rc);
  }
}

Scan::~Scan() {
  sqlite3_finalize(statement_);
}

bool Scan::step() {
  const int rc = sqlite3_step(statement_);
  if (rc == SQLITE_ROW) return true;
  if (rc == SQLITE_DONE) return false;
  throw SQLite::Exception(db_, rc);
}

void Scan::reset() {
  sqlite3_reset(statement_);
}

void Scan::bind(int index, std::int64_t value) {
  const int rc = sqlite3_bind_int64(statement_, index, value);
  if (rc != SQLITE_OK) throw SQLite::Exception(db_, rc);
}

}  // namespace cw::store::sqlite
