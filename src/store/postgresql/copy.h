// SPDX-License-Identifier: Apache-2.0
// Internal to the PostgreSQL backend: the two sides of `store copy` (store/copy.h). The statements
// are built from the fixed identifiers of copy_tables(), never from input; values travel as
// parameters.
#pragma once

#include <map>
#include <memory>
#include <string_view>

#include "store/copy.h"
#include "store/postgresql/database.h"

namespace cw::store::postgresql {

/// Reads every row of a table through a cursor of the unit's snapshot, each value as its
/// column's logical type says (row_form.h).
class PgTableRows final : public TableRowReader {
 public:
  explicit PgTableRows(Database& db) : db_(db) {}
  void each_row(const CopyTable& table, const std::function<void(const CopyRow&)>& row) override;

 private:
  Database& db_;
};

/// A write transaction as a write unit's (READ COMMITTED holding the store's advisory write
/// lock); the rows' references to the audit trail are checked at commit. ROLLBACK unless
/// committed.
class PgLoader final : public StoreLoader {
 public:
  explicit PgLoader(Database& db);
  ~PgLoader() override;
  bool empty() override;
  void append_row(const CopyTable& table, const CopyRow& row) override;
  void commit() override;

 private:
  Database& db_;
  std::map<std::string_view, std::unique_ptr<Statement>> inserts_;
  bool open_ = false;
};

}  // namespace cw::store::postgresql
