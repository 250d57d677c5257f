// SPDX-License-Identifier: Apache-2.0
// A store written before runs existed (schema 4, tests/data/stores/schema4-demo.sql: the demo
// lab's first day, 26 audit entries) opens with this build: migrations 0006 and later are
// applied, every fact row and entry still verifies, and the head hash is the one the old store
// had, so a head hash recorded outside the store before the upgrade still matches.
#include <catch2/catch.hpp>

#include <string>

#include "store/sqlite/open.h"
#include "store/store.h"
#include "store_test_support.h"

#ifndef CW_TEST_DATA_DIR
#error "CW_TEST_DATA_DIR must name tests/data (see tests/unit/store/CMakeLists.txt)"
#endif

namespace {

using cw::store_test::RawDb;

const std::string kFixture = std::string(CW_TEST_DATA_DIR) + "/stores/schema4-demo.sql";

/// Row counts of the tables a schema-4 store has.
std::vector<std::vector<std::string>> old_counts(RawDb& raw) {
  std::vector<std::vector<std::string>> out;
  for (const char* table :
       {"audit_log", "lab_settings", "instruments", "instrument_service_events", "methods",
        "method_versions", "lots", "lot_values", "lot_withdrawals", "calibrations",
        "calibration_lots", "curves", "curve_points", "curve_reviews", "curve_retirements",
        "refusals", "checks", "results"}) {
    out.push_back({table, raw.text(std::string("SELECT count(*) FROM ") + table)});
  }
  return out;
}

}  // namespace

TEST_CASE("store: a schema-4 store migrates and still verifies with the same head hash",
          "[store][upgrade]") {
  cw::store_test::TempDir tmp;
  const auto path = tmp / "demo.db";
  std::string head_before;
  std::vector<std::vector<std::string>> counts_before;
  {
    RawDb raw(path, /*create=*/true);
    std::string error;
    REQUIRE(raw.exec(cw::store_test::read_bytes(kFixture), &error) == 0);
    INFO(error);
    REQUIRE(raw.integer("PRAGMA user_version") == 4);
    REQUIRE(raw.integer("SELECT count(*) FROM audit_log") == 26);
    head_before = raw.text("SELECT hash FROM audit_log ORDER BY seq DESC LIMIT 1");
    counts_before = old_counts(raw);
  }

  cw::store::OpenOptions o;
  o.location = path.string();
  auto store = cw::store::Store::open(o);
  CHECK(store->schema_version() == cw::store::sqlite::embedded_migrations().back().version);
  CHECK(store->missing_guards().empty());
  const auto report = store->read()->audit().verify();
  INFO(report.problem);
  CHECK(report.ok);
  CHECK(report.entries == 26);
  CHECK(report.head_hash == head_before);

  RawDb raw(path);
  CHECK(old_counts(raw) == counts_before);  // the migration added tables, not rows
  CHECK(raw.integer("SELECT count(*) FROM runs") == 0);
  CHECK(raw.integer("SELECT count(*) FROM result_status_events") == 0);
  CHECK(raw.integer("SELECT max(version) FROM schema_migrations") ==
        cw::store::sqlite::embedded_migrations().back().version);
}
