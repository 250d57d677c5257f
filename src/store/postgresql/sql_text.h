// SPDX-License-Identifier: Apache-2.0
// The SQL embedded from schema/postgresql/ and migrations/postgresql/ at build time (generated
// pg_sql_text.cpp). Only the PostgreSQL backend includes this header.
#pragma once

#include <vector>

namespace cw::store::postgresql::sql {

struct EmbeddedMigration {
  int version;       ///< the NNNN of the file name
  const char* name;  ///< the file name without extension
  const char* text;  ///< the file's SQL
};

/// schema/postgresql/bootstrap.sql: the store's mark and the schema_migrations table, created
/// with the first migration.
extern const char* const kBootstrap;
/// Every migrations/postgresql/NNNN_*.sql in version order.
const std::vector<EmbeddedMigration>& migrations();

}  // namespace cw::store::postgresql::sql
