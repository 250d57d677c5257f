// SPDX-License-Identifier: Apache-2.0
// The PostgreSQL backend of the store seam: one database (its current schema) on a server shared
// by many workstations. Writes are READ COMMITTED transactions serialised by one advisory lock,
// reads REPEATABLE READ READ ONLY snapshots (database.cpp says why).
#pragma once

#include <memory>
#include <string>
#include <vector>

#include "store/postgresql/database.h"
#include "store/store.h"

namespace cw::store::postgresql {

class PgStore final : public Store {
 public:
  explicit PgStore(std::unique_ptr<Database> db) : db_(std::move(db)) {}

  std::unique_ptr<ReadUnit> read() override;
  std::unique_ptr<WriteUnit> write(const Actor& actor) override;
  /// The URI with its password masked.
  const std::string& location() const override { return db_->path; }
  int schema_version() override;
  int latest_schema_version() const override;
  bool was_created() const override { return db_->created; }
  std::vector<std::string> missing_guards() override;
  std::string privilege_statements() override;
  /// Takes the store's advisory write lock, as write() does.
  std::unique_ptr<StoreLoader> load() override;

  Database& database() { return *db_; }

 private:
  /// Refuses a write when the append-only guards are missing (StoreError, exit 4).
  void require_guards();

  std::unique_ptr<Database> db_;
};

}  // namespace cw::store::postgresql
