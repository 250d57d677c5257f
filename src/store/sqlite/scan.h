// SPDX-License-Identifier: Apache-2.0
// Internal to the SQLite backend: a read-only query stepped through SQLite's C interface, for
// full scans that read every column of every row (`audit verify`) and the rows an audit entry
// records, read back by id as each entry is written (`PayloadBuilder`), where SQLiteCpp's
// per-column objects cost more than the reads themselves. Errors are SQLite::Exception, as
// SQLiteCpp's.
#pragma once

#include <SQLiteCpp/SQLiteCpp.h>
#include <sqlite3.h>

#include <cstdint>
#include <string>

namespace cw::store::sqlite {

class Scan {
 public:
  Scan(SQLite::Database& db, const std::string& sql);
  ~Scan();
  Scan(const Scan&) = delete;
  Scan& operator=(const Scan&) = delete;

  /// Moves to the next row; false after the last.
  bool step();
  /// Back to before the first row, parameters kept.
  void reset();
  /// Binds the integer `value` to the `index`th parameter (from 1).
  void bind(int index, std::int64_t value);
  /// The statement, on its current row, for sqlite3_column_*.
  sqlite3_stmt* row() const { return statement_; }

 private:
  sqlite3* db_;
  sqlite3_stmt* statement_ = nullptr;
};

}  // namespace cw::store::sqlite
