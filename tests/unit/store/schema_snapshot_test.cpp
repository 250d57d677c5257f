// SPDX-License-Identifier: Apache-2.0
// Compares schema/current.sql with the schema that the migrations build, so that every
// schema change shows up in review as a diff of one readable file.
//
// To regenerate schema/current.sql after adding a migration, run the test with
// CURVEWARDEN_UPDATE_SCHEMA_SNAPSHOT=1, e.g.
//   CURVEWARDEN_UPDATE_SCHEMA_SNAPSHOT=1 build-tests/tests/unit/store/store_tests '[schema]'
// and commit the new file together with the migration.
#include <catch2/catch.hpp>
#include <cstdlib>
#include <sstream>
#include <string>

#include "store/store.h"
#include "store_test_support.h"

#ifndef CW_SCHEMA_SNAPSHOT
#error "CW_SCHEMA_SNAPSHOT must name schema/current.sql (see tests/unit/store/CMakeLists.txt)"
#endif

namespace {

using cw::store_test::RawDb;

const char* const kSnapshotHeader =
    "-- SPDX-License-Identifier: Apache-2.0\n"
    "-- The store's schema after every migration in migrations/, for readers and reviewers.\n"
    "-- GENERATED: the normalised dump of sqlite_master (type, name, sql; ordered by type, then\n"
    "-- name; SQLite's internal objects left out; trailing spaces removed), followed by the\n"
    "-- schema version. Do not edit: tests/unit/store/schema_snapshot_test.cpp compares this\n"
    "-- file with what the migrations build and fails when they differ. To regenerate after\n"
    "-- adding a migration, run from the repository root\n"
    "--   CURVEWARDEN_UPDATE_SCHEMA_SNAPSHOT=1 build-tests/tests/unit/store/store_tests "
    "'[schema]'\n"
    "-- (with your build directory) and review the diff together with the migration.\n";

std::string without_trailing_spaces(const std::string& sql) {
  std::istringstream in(sql);
  std::string line, out;
  bool first = true;
  while (std::getline(in, line)) {
    while (!line.empty() && (line.back() == ' ' || line.back() == '\t' || line.back() == '\r')) {
      line.pop_back();
    }
    out += (first ? "" : "\n") + line;
    first = false;
  }
  return out;
}

/// The normalised schema of the store at `path`.
std::string schema_dump(const std::filesystem::path& path) {
  RawDb raw(path);
  std::string out = kSnapshotHeader;
  for (const auto& row :
       raw.rows("SELECT type, name, sql FROM sqlite_master "
                "WHERE sql IS NOT NULL AND substr(name, 1, 7) <> 'sqlite_' ORDER BY type, name")) {
    out += "\n-- " + row[0] + " " + row[1] + "\n" + without_trailing_spaces(row[2]) + ";\n";
  }
  out += "\nPRAGMA user_version = " + raw.text("PRAGMA user_version") + ";\n";
  return out;
}

}  // namespace

TEST_CASE("store: schema/current.sql matches the schema the migrations build", "[store][schema]") {
  cw::store_test::TempDir tmp;
  const auto path = tmp / "schema.db";
  {
    cw::store::OpenOptions o;
    o.location = path.string();
    o.create = true;
    cw::store::Store::open(o);
  }
  const std::string generated = schema_dump(path);
  CHECK_THAT(generated, Catch::Contains("-- table audit_log\nCREATE TABLE audit_log ("));
  CHECK_THAT(generated, Catch::Contains("PRAGMA user_version = 10;"));

  const char* update = std::getenv("CURVEWARDEN_UPDATE_SCHEMA_SNAPSHOT");
  if (update != nullptr && std::string(update) == "1") {
    cw::store_test::write_bytes(CW_SCHEMA_SNAPSHOT, generated);
    WARN("rewrote " << CW_SCHEMA_SNAPSHOT);
    return;
  }

  const std::string snapshot = cw::store_test::read_bytes(CW_SCHEMA_SNAPSHOT);
  INFO("snapshot: " << CW_SCHEMA_SNAPSHOT);
  REQUIRE_FALSE(snapshot.empty());
  if (snapshot != generated) {
    // Point at the first line that differs rather than printing both files whole.
    std::istringstream a(snapshot), b(generated);
    std::string la, lb;
    int line = 0;
    while (true) {
      ++line;
      const bool more_a = static_cast<bool>(std::getline(a, la));
      const bool more_b = static_cast<bool>(std::getline(b, lb));
      if (!more_a && !more_b) break;
      if (!more_a || !more_b || la != lb) {
        FAIL("schema/current.sql is out of date at line "
             << line << "\n  snapshot:  " << (more_a ? la : "<end of file>")
             << "\n  generated: " << (more_b ? lb : "<end of file>")
             << "\nregenerate it with CURVEWARDEN_UPDATE_SCHEMA_SNAPSHOT=1 (see the file's "
                "header)");
      }
    }
  }
  CHECK(snapshot == generated);
}
