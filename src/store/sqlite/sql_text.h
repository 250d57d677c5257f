// SPDX-License-Identifier: Apache-2.0
// The SQL embedded from schema/ and migrations/ at build time (generated sql_text.cpp).
// Only the SQLite backend includes this header.
#pragma once

#include <vector>

namespace cw::store::sqlite::sql {

struct EmbeddedMigration {
  int version;       ///< the NNNN of the file name
  const char* name;  ///< the file name without extension
  const char* text;  ///< the file's SQL
};

/// schema/bootstrap.sql: the schema_migrations table, created with the first migration.
extern const char* const kBootstrap;
/// Every migrations/NNNN_*.sql in version order.
const std::vector<EmbeddedMigration>& migrations();

}  // namespace cw::store::sqlite::sql
