// SPDX-License-Identifier: Apache-2.0
// The SQLite backend of the store seam: one file in WAL mode, BEGIN IMMEDIATE for writes,
// BEGIN DEFERRED snapshots for reads.
#pragma once

#include <memory>
#include <string>
#include <vector>

#include "store/sqlite/database.h"
#include "store/store.h"

namespace cw::store::sqlite {

class SqliteStore final : public Store {
 public:
  explicit SqliteStore(std::unique_ptr<Database> db) : db_(std::move(db)) {}

  std::unique_ptr<ReadUnit> read() override;
  std::unique_ptr<WriteUnit> write(const Actor& actor) override;
  const std::string& location() const override { return db_->path; }
  int schema_version() override;
  int latest_schema_version() const override;
  bool was_created() const override { return db_->created; }
  std::vector<std::string> missing_guards() override;
  std::unique_ptr<StoreLoader> load() override;

  Database& database() { return *db_; }

 private:
  /// Throws StoreError when the append-only guards are missing (nothing may be written).
  void require_guards();
  std::unique_ptr<Database> db_;
};

}  // namespace cw::store::sqlite
