// SPDX-License-Identifier: Apache-2.0
// A store written by an earlier version (schema 4, before the store seam and the column list of
// the hashed row form) still opens, reads back and verifies with the head hash it had: the row
// form of row_form.cpp hashes the same bytes as the SELECT * form it replaced. The fixture
// tests/data/stores/schema4-demo.sql is the dump of a store made by that version (a week of the
// demo lab: calibrations, a rejected curve, reviews, a refused self-review, checks, results, a
// refused check on a rejected curve, a method revision, a service event, a retirement and a lot
// withdrawal).
#include <catch2/catch.hpp>
#include <fstream>
#include <sstream>

#include "store/sqlite/open.h"
#include "store/store.h"
#include "store_test_support.h"

namespace {

/// The head hash `audit verify` printed for the fixture when it was made.
const char* const kHeadHash = "29eb4a116b6c7b5ceef60323ae5bf85228b9db4ed21c0e69532c767898c4e73f";

std::filesystem::path load_fixture(const cw::store_test::TempDir& tmp) {
  std::ifstream in(CW_STORE_FIXTURES "/schema4-demo.sql");
  std::stringstream sql;
  sql << in.rdbuf();
  const auto path = tmp / "legacy.db";
  cw::store_test::RawDb raw(path, /*create=*/true);
  std::string error;
  REQUIRE(raw.exec(sql.str(), &error) == SQLITE_OK);
  INFO(error);
  return path;
}

}  // namespace

TEST_CASE("store: a store of the previous version opens and verifies with its head hash",
          "[store]") {
  cw::store_test::TempDir tmp;
  const auto path = load_fixture(tmp);
  cw::store::OpenOptions options;
  options.location = path.string();
  auto store = cw::store::Store::open(options);
  CHECK(store->missing_guards().empty());
  auto unit = store->read();
  const auto report = unit->audit().verify();
  INFO(report.problem);
  CHECK(report.ok);
  // Its two names became users (migration 0007), each with an entry after the old head.
  CHECK(report.entries == 26 + 2);
  CHECK(unit->audit().list({}).at(25).hash == kHeadHash);

  // Its facts read back into typed values (states, reasons, flags, criteria).
  CHECK(unit->registry().settings()->time_zone == "Europe/Berlin");
  CHECK(unit->registry().methods().front().versions.size() == 2);
  CHECK(unit->registry().lot("CRM-AN-0419")->withdrawal.has_value());
  const auto curves =
      unit->curves().curves({cw::CurveId{1}, cw::CurveId{3}}, cw::store::CurveDetail::Points);
  REQUIRE(curves.size() == 2);
  CHECK(curves[0].verdict == cw::Verdict::Accepted);
  CHECK(curves[0].reviews.size() == 1);
  CHECK(curves[1].verdict == cw::Verdict::Rejected);
  CHECK_FALSE(curves[1].failed_criteria.empty());
  const auto results = unit->curves().results_of({cw::CurveId{1}});
  REQUIRE_FALSE(results.empty());
  bool below_range = false;
  for (const auto& r : results) below_range = below_range || r.has_flag(cw::ResultFlag::BelowRange);
  CHECK(below_range);
}

TEST_CASE("store: a stored token that names no value is damage, not another value", "[store]") {
  cw::store_test::TempDir tmp;
  const auto path = load_fixture(tmp);
  {
    cw::store_test::RawDb raw(path);
    REQUIRE(raw.exec("DROP TRIGGER results_no_update") == SQLITE_OK);
    REQUIRE(raw.exec("UPDATE results SET flags = '[\"below-range\",\"approved-anyway\"]' "
                     "WHERE id = (SELECT min(id) FROM results)") == SQLITE_OK);
  }
  cw::store::OpenOptions options;
  options.location = path.string();
  auto store = cw::store::Store::open(options);
  auto unit = store->read();
  try {
    unit->curves().results_of({cw::CurveId{1}});
    FAIL("a result with an unknown flag was read");
  } catch (const cw::StoreError& e) {
    CHECK(e.exit_code() == cw::ExitCode::Store);
    CHECK_THAT(e.what(),
               Catch::Contains("results.flags holds the unknown value 'approved-anyway'"));
  }
}
