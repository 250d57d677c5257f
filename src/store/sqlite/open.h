// SPDX-License-Identifier: Apache-2.0
// Opening a SQLite store with an explicit list of migrations (for the migrator's tests); the
// embedded list is what Store::open uses. No SQLite types here.
#pragma once

#include <memory>
#include <string>
#include <vector>

#include "store/store.h"

namespace cw::store::sqlite {

struct Database;

struct MigrationSpec {
  int version;
  std::string name;
  std::string sql;
  /// Run after `sql` in the same transaction, for a step SQL cannot do alone (one that writes
  /// audit entries, which need the hash chain).
  void (*after)(Database& db, const Clock& clock) = nullptr;
};

/// Every migration compiled into this binary, in order.
std::vector<MigrationSpec> embedded_migrations();

/// Opens the SQLite store at `options.location` applying `migrations`.
std::unique_ptr<Store> open_sqlite(const OpenOptions& options,
                                   const std::vector<MigrationSpec>& migrations);

}  // namespace cw::store::sqlite
