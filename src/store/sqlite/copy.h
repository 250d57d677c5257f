// SPDX-License-Identifier: Apache-2.0
// Internal to the SQLite backend: the two sides of `store copy` (store/copy.h). The statements
// are built from the fixed identifiers of copy_tables(), never from input.
#pragma once

#include <map>
#include <memory>
#include <string_view>

#include "store/copy.h"
#include "store/sqlite/database.h"

namespace cw::store::sqlite {

class SqliteTableRows final : public TableRowReader {
 public:
  explicit SqliteTableRows(Database& db) : db_(db) {}
  void each_row(const CopyTable& table, const std::function<void(const CopyRow&)>& row) override;

 private:
  Database& db_;
};

/// BEGIN IMMEDIATE with foreign keys checked at commit; ROLLBACK unless committed.
class SqliteLoader final : public StoreLoader {
 public:
  explicit SqliteLoader(Database& db);
  ~SqliteLoader() override;
  bool empty() override;
  void append_row(const CopyTable& table, const CopyRow& row) override;
  void commit() override;

 private:
  Database& db_;
  std::map<std::string_view, std::unique_ptr<SQLite::Statement>> inserts_;
  bool open_ = false;
};

}  // namespace cw::store::sqlite
