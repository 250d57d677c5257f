// SPDX-License-Identifier: Apache-2.0
// Backend selection of the tests and the libpq helpers (see test_backend.h).
#include "test_backend.h"

#include <libpq-fe.h>

#include <algorithm>
#include <cstdint>
#include <cstdlib>
#include <memory>
#include <random>
#include <stdexcept>

namespace cw::test {

Backend test_backend() {
  const char* name = std::getenv("CURVEWARDEN_TEST_BACKEND");
  if (name == nullptr || *name == '\0' || std::string(name) == "sqlite") return Backend::Sqlite;
  if (std::string(name) == "postgresql") return Backend::Postgresql;
  throw std::runtime_error(std::string("CURVEWARDEN_TEST_BACKEND=") + name +
                           ": expected sqlite or postgresql");
}

namespace pg {
namespace {

struct Connection {
  PGconn* handle = nullptr;
  explicit Connection(const std::string& uri) : handle(PQconnectdb(uri.c_str())) {
    if (handle == nullptr || PQstatus(handle) != CONNECTION_OK) {
      const std::string message = handle ? PQerrorMessage(handle) : "out of memory";
      PQfinish(handle);
      throw std::runtime_error("cannot connect to " + uri + ": " + message);
    }
    // NOTICEs (e.g. "database does not exist, skipping") are not test output.
    PQsetNoticeProcessor(
        handle, [](void*, const char*) {}, nullptr);
  }
  ~Connection() { PQfinish(handle); }
  Connection(const Connection&) = delete;
  Connection& operator=(const Connection&) = delete;
};

using Result = std::unique_ptr<PGresult, decltype(&PQclear)>;

bool is_uri(const std::string& s) {
  return s.rfind("postgresql://", 0) == 0 || s.rfind("postgres://", 0) == 0;
}

}  // namespace

std::string server_uri() {
  const char* uri = std::getenv("CURVEWARDEN_TEST_PG");
  if (uri == nullptr || *uri == '\0') {
    throw std::runtime_error(
        "CURVEWARDEN_TEST_BACKEND=postgresql needs CURVEWARDEN_TEST_PG, the URI of a PostgreSQL "
        "server with a superuser role (tests/pg/cluster.sh start DIR prints one)");
  }
  return uri;
}

std::string with_database(const std::string& uri, const std::string& database) {
  if (!is_uri(uri)) return uri + " dbname=" + database;  // a later keyword wins
  const auto authority = uri.find("://") + 3;
  const auto query = uri.find('?', authority);
  const auto slash = uri.find('/', authority);
  const auto host_end = std::min(slash, query);
  std::string out = uri.substr(0, host_end) + "/" + database;
  if (query != std::string::npos) out += uri.substr(query);
  return out;
}

std::string create_database(const std::string& server) {
  std::random_device device;
  std::mt19937_64 random((static_cast<std::uint64_t>(device()) << 32) ^ device());
  static constexpr char kHex[] = "0123456789abcdef";
  std::string name = "cw_t_";
  for (int i = 0; i < 16; ++i) name.push_back(kHex[random() % 16]);
  std::string error;
  if (exec(server, "CREATE DATABASE " + name, &error) != 0) {
    throw std::runtime_error("cannot create database " + name + ": " + error);
  }
  return name;
}

void drop_database(const std::string& server, const std::string& database) {
  std::string error;
  if (exec(server, "DROP DATABASE IF EXISTS " + database + " WITH (FORCE)", &error) != 0) {
    throw std::runtime_error("cannot drop database " + database + ": " + error);
  }
}

std::vector<std::vector<std::optional<std::string>>> query(const std::string& uri,
                                                           const std::string& sql) {
  Connection c(uri);
  Result r(PQexec(c.handle, sql.c_str()), &PQclear);
  const auto status = PQresultStatus(r.get());
  if (status != PGRES_TUPLES_OK && status != PGRES_COMMAND_OK) {
    throw std::runtime_error("query '" + sql + "' failed: " + PQerrorMessage(c.handle));
  }
  std::vector<std::vector<std::optional<std::string>>> rows;
  for (int i = 0; i < PQntuples(r.get()); ++i) {
    auto& row = rows.emplace_back();
    for (int j = 0; j < PQnfields(r.get()); ++j) {
      if (PQgetisnull(r.get(), i, j)) {
        row.emplace_back(std::nullopt);
      } else {
        row.emplace_back(std::string(PQgetvalue(r.get(), i, j),
                                     static_cast<std::size_t>(PQgetlength(r.get(), i, j))));
      }
    }
  }
  return rows;
}

int exec(const std::string& uri, const std::string& sql, std::string* error) {
  Connection c(uri);
  Result r(PQexec(c.handle, sql.c_str()), &PQclear);
  const auto status = PQresultStatus(r.get());
  const bool ok = status == PGRES_TUPLES_OK || status == PGRES_COMMAND_OK;
  if (error) *error = ok ? "" : PQerrorMessage(c.handle);
  return ok ? 0 : 1;
}

}  // namespace pg
}  // namespace cw::test
