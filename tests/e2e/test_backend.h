// SPDX-License-Identifier: Apache-2.0
// Which backend the end-to-end and scenario tests run against, and the PostgreSQL side of the
// harness's store helpers (libpq directly: an independent path from the tool's own store layer).
//
//   CURVEWARDEN_TEST_BACKEND   unset or "sqlite": each sandbox's store is a file in its folder;
//                              "postgresql": each sandbox gets a fresh database on the server
//   CURVEWARDEN_TEST_PG        the server's URI (a superuser role), e.g.
//                              postgresql://cw@127.0.0.1:54321/postgres (tests/pg/cluster.sh)
#pragma once

#include <optional>
#include <string>
#include <vector>

namespace cw::test {

enum class Backend { Sqlite, Postgresql };

/// The backend of CURVEWARDEN_TEST_BACKEND; throws std::runtime_error for an unknown name.
Backend test_backend();

namespace pg {

/// CURVEWARDEN_TEST_PG; throws std::runtime_error when it is not set (the tests then fail, they
/// are never skipped).
std::string server_uri();

/// `uri` (a postgresql:// or postgres:// URI, or a key=value connection string) naming the
/// database `database` instead of its own.
std::string with_database(const std::string& uri, const std::string& database);

/// Creates a database with a new random name (cw_t_<hex>) on the server at `server`; returns
/// its name.
std::string create_database(const std::string& server);

/// Drops `database` on the server at `server`, closing its connections (WITH (FORCE)); a
/// database that does not exist is no error.
void drop_database(const std::string& server, const std::string& database);

/// Every row of `sql` as text (NULL → nullopt); throws std::runtime_error with the server's
/// message when the connection or the query fails.
std::vector<std::vector<std::optional<std::string>>> query(const std::string& uri,
                                                           const std::string& sql);

/// Runs `sql` (one or more statements); 0 on success, 1 otherwise with the server's message in
/// `error` ("" on success).
int exec(const std::string& uri, const std::string& sql, std::string* error = nullptr);

}  // namespace pg
}  // namespace cw::test
