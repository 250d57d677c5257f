// SPDX-License-Identifier: Apache-2.0
// Tests of opening the store (src/store/connection.cpp): migrations on a fresh file, re-opening,
// a migration that fails halfway, and refusal of newer, foreign and non-SQLite files.
//
// The store is inspected through the SQLite C API and, for the header fields, by reading the
// file's bytes: offsets 18/19 (read/write format version, 2 = WAL), 60 (user_version) and 68
// (application_id) are from the SQLite file-format description (sqlite.org/fileformat.html,
// "The Database Header"), 4-byte fields big-endian.
#include <catch2/catch.hpp>
#include <string>
#include <vector>

#include "core/error.h"
#include "store/sqlite/open.h"
#include "store/store.h"
#include "store_test_support.h"

namespace {

using cw::StoreError;
using cw::store::OpenOptions;
using cw::store::sqlite::MigrationSpec;
using cw::store_test::RawDb;
using cw::store_test::read_bytes;
using cw::store_test::TempDir;
using cw::store_test::write_bytes;

/// The number of the newest migration this build knows (user_version of a fresh store).
const int kLatest = cw::store::sqlite::embedded_migrations().back().version;

OpenOptions options(const std::filesystem::path& p, bool create) {
  OpenOptions o;
  o.location = p.string();
  o.create = create;
  return o;
}

/// The StoreError message that opening throws ("" when it opens).
std::string open_error(const OpenOptions& o) {
  try {
    cw::store::Store::open(o);
  } catch (const StoreError& e) {
    CHECK(e.exit_code() == cw::ExitCode::Store);
    return e.what();
  }
  return "";
}

std::string open_error(const OpenOptions& o, const std::vector<MigrationSpec>& migrations) {
  try {
    cw::store::sqlite::open_sqlite(o, migrations);
  } catch (const StoreError& e) {
    return e.what();
  }
  return "";
}

std::vector<std::string> table_names(RawDb& raw) {
  std::vector<std::string> names;
  for (const auto& r : raw.rows("SELECT name FROM sqlite_master WHERE type = 'table' "
                                "AND name NOT LIKE 'sqlite%' ORDER BY name")) {
    names.push_back(r.at(0));
  }
  return names;
}

}  // namespace

TEST_CASE("store: the migrations compiled in are the files of migrations/, in order", "[store]") {
  const auto m = cw::store::sqlite::embedded_migrations();
  REQUIRE(m.size() == 10);
  CHECK(m[0].version == 1);
  CHECK(m[0].name == "0001_create_audit_and_registries");
  CHECK(m[1].version == 2);
  CHECK(m[1].name == "0002_create_calibrations_and_curves");
  CHECK(m[2].version == 3);
  CHECK(m[2].name == "0003_create_checks_and_results");
  CHECK(m[3].version == 4);
  CHECK(m[3].name == "0004_forbid_updates_and_deletes");
  CHECK(m[4].version == 5);
  CHECK(m[4].name == "0005_add_censoring_and_uncertainty");
  CHECK(m[5].version == 6);
  CHECK(m[5].name == "0006_record_runs_and_status_events");
  CHECK(m[6].version == 7);
  CHECK(m[6].name == "0007_register_users_and_signatures");
  CHECK(m[6].after != nullptr);  // registers the names of an older trail as users
  CHECK(m[7].version == 8);
  CHECK(m[7].name == "0008_index_curves_for_status");
  CHECK(m[8].version == 9);
  CHECK(m[8].name == "0009_derive_settled_tallies");
  CHECK(m[8].after != nullptr);  // builds the tally steps of the curves already stored
  CHECK(m[9].version == 10);
  CHECK(m[9].name == "0010_total_settled_tallies");
  CHECK(m[9].after == nullptr);  // its totals are built from the steps by its own SQL
  CHECK_THAT(m[0].sql, Catch::Contains("CREATE TABLE audit_log"));
}

TEST_CASE("store: a fresh store records every migration, user_version and application_id",
          "[store]") {
  TempDir tmp;
  const auto path = tmp / "fresh.db";
  const auto migrations = cw::store::sqlite::embedded_migrations();
  {
    auto c = cw::store::Store::open(options(path, true));
    CHECK(c->was_created());
    CHECK(c->schema_version() == kLatest);
  }
  RawDb raw(path);
  const auto rows =
      raw.rows("SELECT version, name, sha256, applied_at FROM schema_migrations ORDER BY version");
  REQUIRE(rows.size() == migrations.size());
  for (size_t i = 0; i < rows.size(); ++i) {
    INFO("migration " << i + 1);
    CHECK(rows[i][0] == std::to_string(migrations[i].version));
    CHECK(rows[i][1] == migrations[i].name);
    // The recorded checksum is SHA-256 of the applied SQL, recomputed here with OpenSSL.
    CHECK(rows[i][2] == cw::store_test::evp_sha256_hex(migrations[i].sql));
    CHECK(rows[i][3].size() == 20);  // YYYY-MM-DDTHH:MM:SSZ
    CHECK(rows[i][3].back() == 'Z');
  }
  CHECK(raw.integer("PRAGMA user_version") == kLatest);
  CHECK(raw.integer("PRAGMA application_id") == 0x43575244);
  CHECK(raw.text("PRAGMA journal_mode") == "wal");
  CHECK(table_names(raw) == std::vector<std::string>{"audit_log",
                                                     "calibration_lots",
                                                     "calibrations",
                                                     "checks",
                                                     "curve_points",
                                                     "curve_retirements",
                                                     "curve_reviews",
                                                     "curves",
                                                     "instrument_column_maps",
                                                     "instrument_service_events",
                                                     "instruments",
                                                     "lab_settings",
                                                     "lot_values",
                                                     "lot_withdrawals",
                                                     "lots",
                                                     "method_versions",
                                                     "methods",
                                                     "refusals",
                                                     "result_status_events",
                                                     "results",
                                                     "run_checks",
                                                     "run_results",
                                                     "runs",
                                                     "schema_migrations",
                                                     "settled_tallies",
                                                     "settled_totals",
                                                     "signature_failures",
                                                     "signatures",
                                                     "user_events",
                                                     "user_passphrases",
                                                     "users"});
  // Two append-only triggers (no update, no delete) for each of the 30 tables.
  CHECK(raw.integer("SELECT count(*) FROM sqlite_master WHERE type = 'trigger'") == 62);

  // The same facts in the file header, read as bytes.
  const std::string header = read_bytes(path).substr(0, 100);
  CHECK(header.substr(0, 16) == std::string("SQLite format 3\0", 16));
  CHECK(header.substr(68, 4) == "CWRD");  // application_id 0x43575244
  CHECK(header.substr(60, 4) == std::string("\0\0\0", 3) + static_cast<char>(kLatest));
  CHECK(header[18] == 2);  // WAL
  CHECK(header[19] == 2);
}

TEST_CASE("store: re-opening applies nothing", "[store]") {
  TempDir tmp;
  const auto path = tmp / "store.db";
  { cw::store::Store::open(options(path, true)); }
  std::vector<std::vector<std::string>> before;
  std::int64_t objects_before = 0;
  {
    RawDb raw(path);
    before = raw.rows("SELECT * FROM schema_migrations ORDER BY version");
    objects_before = raw.integer("SELECT count(*) FROM sqlite_master");
  }
  const std::string bytes_before = read_bytes(path);

  for (bool create : {false, true}) {
    INFO("create = " << create);
    auto c = cw::store::Store::open(options(path, create));
    CHECK_FALSE(c->was_created());
    CHECK(c->schema_version() == kLatest);
  }
  RawDb raw(path);
  CHECK(raw.rows("SELECT * FROM schema_migrations ORDER BY version") == before);
  CHECK(raw.integer("SELECT count(*) FROM sqlite_master") == objects_before);
  CHECK(raw.integer("PRAGMA user_version") == kLatest);
  CHECK(read_bytes(path) == bytes_before);
}

TEST_CASE("store: a migration that fails halfway leaves nothing of itself", "[store]") {
  TempDir tmp;
  const auto path = tmp / "half.db";
  const std::vector<MigrationSpec> good = {
      {1, "0001_create_one", "CREATE TABLE one (x INTEGER) STRICT;"},
  };
  // The second migration's first statement is valid, its second refers to a missing table.
  std::vector<MigrationSpec> broken = good;
  broken.push_back({2, "0002_half",
                    "CREATE TABLE two (y INTEGER) STRICT;\n"
                    "INSERT INTO no_such_table VALUES (1);"});

  const std::string message = open_error(options(path, true), broken);
  CHECK_THAT(message, Catch::Contains("no_such_table"));

  RawDb raw(path);
  // Migration 1 was committed on its own; nothing of migration 2 remains.
  CHECK(table_names(raw) == std::vector<std::string>{"one", "schema_migrations"});
  CHECK(raw.integer("PRAGMA user_version") == 1);
  const auto recorded = raw.rows("SELECT version, name FROM schema_migrations ORDER BY version");
  CHECK(recorded == std::vector<std::vector<std::string>>{{"1", "0001_create_one"}});

  // Fixed, the second migration applies on the next open.
  std::vector<MigrationSpec> fixed = good;
  fixed.push_back({2, "0002_half", "CREATE TABLE two (y INTEGER) STRICT;"});
  auto c = cw::store::sqlite::open_sqlite(options(path, false), fixed);
  CHECK(c->schema_version() == 2);
  CHECK(table_names(raw) == std::vector<std::string>{"one", "schema_migrations", "two"});
}

TEST_CASE("store: a first migration that fails leaves a bare, unclaimed file", "[store]") {
  TempDir tmp;
  const auto path = tmp / "first.db";
  const std::vector<MigrationSpec> broken = {
      {1, "0001_bad", "CREATE TABLE one (x INTEGER);\nCREATE TABLE one (x INTEGER);"},
  };
  CHECK_THAT(open_error(options(path, true), broken), Catch::Contains("already exists"));
  {
    RawDb raw(path);
    CHECK(raw.integer("SELECT count(*) FROM sqlite_master") == 0);
    CHECK(raw.integer("PRAGMA user_version") == 0);
    // Not even the application id: the bootstrap rolled back with the migration.
    CHECK(raw.integer("PRAGMA application_id") == 0);
  }
  // So init can try again.
  auto c = cw::store::Store::open(options(path, true));
  CHECK(c->schema_version() == kLatest);
}

TEST_CASE("store: a store written by a newer version is refused and left byte-identical",
          "[store]") {
  TempDir tmp;
  const auto path = tmp / "newer.db";
  { cw::store::Store::open(options(path, true)); }
  {
    RawDb raw(path);
    REQUIRE(raw.exec("PRAGMA user_version = 99") == SQLITE_OK);
  }
  const std::string before = read_bytes(path);
  for (bool create : {false, true}) {
    INFO("create = " << create);
    const std::string message = open_error(options(path, create));
    CHECK_THAT(message, Catch::Contains("newer version of curvewarden"));
    CHECK_THAT(message, Catch::Contains("schema 99"));
    CHECK_THAT(message, Catch::Contains("knows up to " + std::to_string(kLatest)));
    CHECK(read_bytes(path) == before);
  }
  RawDb raw(path);
  CHECK(raw.integer("SELECT count(*) FROM schema_migrations") ==
        static_cast<std::int64_t>(cw::store::sqlite::embedded_migrations().size()));
}

TEST_CASE("store: a file that is not SQLite is refused and left unchanged", "[store]") {
  TempDir tmp;
  const auto path = tmp / "notes.db";
  SECTION("short text") {
    write_bytes(path, "calibration notes, not a database\n");
  }
  SECTION("a page of binary") {
    std::string bytes(8192, '\0');
    for (size_t i = 0; i < bytes.size(); ++i) bytes[i] = static_cast<char>((i * 37 + 11) % 256);
    write_bytes(path, bytes);
  }
  const std::string before = read_bytes(path);
  for (bool create : {false, true}) {
    INFO("create = " << create);
    CHECK_THAT(open_error(options(path, create)), Catch::Contains("is not a Curvewarden store"));
    CHECK(read_bytes(path) == before);
  }
  CHECK_FALSE(std::filesystem::exists(tmp / "notes.db-wal"));
}

TEST_CASE("store: a SQLite file of another application is refused and left unchanged", "[store]") {
  TempDir tmp;
  const auto path = tmp / "other.db";
  {
    RawDb raw(path, /*create=*/true);
    SECTION("tables, no application id") {
      REQUIRE(raw.exec("CREATE TABLE samples (id INTEGER PRIMARY KEY, name TEXT);"
                       "INSERT INTO samples (name) VALUES ('tap water');") == SQLITE_OK);
    }
    SECTION("another application id, no tables") {
      REQUIRE(raw.exec("PRAGMA application_id = 1234; PRAGMA user_version = 1;") == SQLITE_OK);
    }
  }
  const std::string before = read_bytes(path);
  for (bool create : {false, true}) {
    INFO("create = " << create);
    CHECK_THAT(open_error(options(path, create)), Catch::Contains("is not a Curvewarden store"));
    CHECK(read_bytes(path) == before);
  }
}

TEST_CASE("store: a missing or empty file is not a store unless init creates it", "[store]") {
  TempDir tmp;
  const auto missing = tmp / "missing.db";
  CHECK_THAT(open_error(options(missing, false)), Catch::Contains("no store at"));
  CHECK_FALSE(std::filesystem::exists(missing));

  const auto empty = tmp / "empty.db";
  write_bytes(empty, "");
  CHECK_THAT(open_error(options(empty, false)), Catch::Contains("is an empty file"));
  CHECK(read_bytes(empty).empty());
  auto c = cw::store::Store::open(options(empty, true));
  CHECK(c->was_created());
  CHECK(c->schema_version() == kLatest);
}

TEST_CASE("store: every table whose rows name an audit entry has an index on audit_seq",
          "[store]") {
  // Inserting an entry settles the deferred keys naming it: without an index on the naming
  // column that is a scan of the whole table per entry, and writes slow down as the store grows.
  cw::store_test::TempDir dir;
  const auto path = dir / "s.db";
  {
    cw::store::OpenOptions o;
    o.location = path.string();
    o.create = true;
    cw::store::Store::open(o);
  }
  RawDb raw(path);
  int tables = 0;
  for (const auto& t : raw.rows("SELECT m.name FROM sqlite_master m, pragma_table_info(m.name) c "
                                "WHERE m.type = 'table' AND c.name = 'audit_seq' ORDER BY 1")) {
    INFO("table " << t.at(0));
    ++tables;
    CHECK(raw.integer("SELECT count(*) FROM pragma_index_list('" + t.at(0) +
                      "') l, pragma_index_info(l.name) i WHERE i.seqno = 0 AND "
                      "i.name = 'audit_seq'") >= 1);
  }
  CHECK(tables == 29);  // the 27 fact tables, settled_tallies and settled_totals
}
