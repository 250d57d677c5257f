// SPDX-License-Identifier: Apache-2.0
// The harness's PostgreSQL side (test_backend.h) against the server of CURVEWARDEN_TEST_PG:
// every sandbox has a database of its own, dropped with it, and the backend-neutral helpers read
// and write it through libpq. Hidden from the SQLite run (it needs the server); the pg: run
// (CURVEWARDEN_PG_TESTS) includes it.
#include <catch2/catch.hpp>

#include "harness.h"

namespace {

using cw::test::Backend;
namespace pg = cw::test::pg;

bool database_exists(const std::string& name) {
  return pg::query(pg::server_uri(),
                   "SELECT count(*) FROM pg_database WHERE datname = '" + name + "'")
             .at(0)
             .at(0)
             .value() == "1";
}

std::string database_of(const cw::test::Sandbox& box) {
  return cw::test::query_text(box, "SELECT current_database()");
}

}  // namespace

TEST_CASE("harness: with_database names another database in a URI or a connection string",
          "[harness]") {
  CHECK(pg::with_database("postgresql://cw@127.0.0.1:5432/postgres", "x") ==
        "postgresql://cw@127.0.0.1:5432/x");
  CHECK(pg::with_database("postgres://cw@h:1", "x") == "postgres://cw@h:1/x");
  CHECK(pg::with_database("postgresql://cw@h/postgres?sslmode=disable", "x") ==
        "postgresql://cw@h/x?sslmode=disable");
  CHECK(pg::with_database("postgresql://h?dbname=y", "x") == "postgresql://h/x?dbname=y");
  CHECK(pg::with_database("host=h dbname=postgres", "x") == "host=h dbname=postgres dbname=x");
}

TEST_CASE("harness: a PostgreSQL sandbox has a fresh database of its own, dropped with it",
          "[harness][.postgresql]") {
  REQUIRE(cw::test::test_backend() == Backend::Postgresql);
  std::string first;
  {
    cw::test::Sandbox a;
    cw::test::Sandbox b;
    REQUIRE(a.backend() == Backend::Postgresql);
    first = database_of(a);
    CHECK(first.rfind("cw_t_", 0) == 0);
    CHECK(database_of(b) != first);
    CHECK(a.location().rfind("postgresql://", 0) == 0);
    const auto env = a.environment();
    CHECK(env.at("CURVEWARDEN_DB") == a.location());
    CHECK(env.at("CURVEWARDEN_KEY") == a.key().string());
    CHECK(env.count("CURVEWARDEN_TEST_PG") == 0);
    CHECK(cw::test::table_row_counts(a).empty());

    std::string error;
    REQUIRE(cw::test::exec_sql(a,
                               "CREATE TABLE t (id integer PRIMARY KEY, note text);"
                               "INSERT INTO t VALUES (1, 'one'), (2, NULL)",
                               &error) == 0);
    CHECK(error.empty());
    CHECK(cw::test::table_row_counts(a) == std::map<std::string, std::int64_t>{{"t", 2}});
    CHECK(cw::test::query_text(a, "SELECT note FROM t WHERE id = 2").empty());
    CHECK(cw::test::query_text(a, "SELECT note FROM t WHERE id = 1") == "one");
    CHECK(cw::test::table_row_counts(b).empty());  // b's database is another one
    CHECK(cw::test::exec_sql(a, "INSERT INTO t VALUES (1, 'again')", &error) == 1);
    CHECK_THAT(error, Catch::Contains("duplicate key"));
    CHECK_THROWS(cw::test::query_text(a, "SELECT id FROM t"));  // two rows
    REQUIRE(database_exists(first));

    // copy_from: the files of the directory and the database, under b's own name.
    a.write_file("input.csv", "x\n");
    const std::string b_name = database_of(b);
    b.copy_from(a);
    CHECK(database_of(b) == b_name);
    CHECK(cw::test::table_row_counts(b) == std::map<std::string, std::int64_t>{{"t", 2}});
    CHECK(cw::test::read_file(b.path("input.csv")) == "x\n");
    REQUIRE(cw::test::exec_sql(b, "INSERT INTO t VALUES (3, 'b only')") == 0);
    CHECK(cw::test::table_row_counts(a).at("t") == 2);
  }
  CHECK_FALSE(database_exists(first));
}
