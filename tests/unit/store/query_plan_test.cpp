// SPDX-License-Identifier: Apache-2.0
// The statements the SQLite backend runs for lookups by curve, group, instrument, expiry and lot
// use their indexes: EXPLAIN QUERY PLAN on the very constants of store/sqlite/sql.h that the
// repositories execute, so that a change to a statement cannot slip past this test.
#include <catch2/catch.hpp>
#include <string>
#include <vector>

#include "store/sqlite/diagnostics.h"
#include "store/sqlite/sql.h"
#include "store/store.h"
#include "store_test_support.h"

namespace sql = cw::store::sqlite::sql;

TEST_CASE("store: every per-curve and per-group lookup searches an index", "[store]") {
  cw::store_test::TempDir tmp;
  cw::store::OpenOptions options;
  options.location = (tmp / "plans.db").string();
  options.create = true;
  auto store = cw::store::Store::open(options);

  struct Expectation {
    const char* name;
    const char* sql;
    const char* index;  ///< must appear in the plan
    const char* table;  ///< must not be scanned in full
  };
  const std::vector<Expectation> expected = {
      {"groups expiring", sql::kGroupsExpiringBetween, "curves_by_expiry", "curves"},
      {"live in group", sql::kLiveInGroup, "curves_by_group_expiry", "curves"},
      {"latest in group", sql::kLatestInGroup, "curves_by_group", "curves"},
      {"live of instrument", sql::kLiveOfInstrument, "curves_by_instrument", "curves"},
      {"curves of a calibration", sql::kCurvesOfCalibration, "curves_by_calibration", "curves"},
      {"curves of a lot", sql::kCurvesOfLot, "calibration_lots_by_lot", "calibration_lots"},
      {"checks of curves", sql::kChecksOf, "checks_by_curve", "checks"},
      {"results of curves", sql::kResultsOf, "results_by_curve", "results"},
      {"reported results of a curve", sql::kReportedBetween, "results_by_curve", "results"},
      {"reviews of curves", sql::kReviewsOf, "curve_reviews_by_curve", "curve_reviews"},
      {"retirements of curves", sql::kRetirementsOf, "curve_retirements_by_curve",
       "curve_retirements"},
      {"points of curves", sql::kPointsOf, "sqlite_autoindex_curve_points", "curve_points"},
      {"service events of instruments", sql::kServiceEventsOf,
       "instrument_service_events_by_instrument", "instrument_service_events"},
      {"settled curves of an instrument: the steps ahead of the moment", sql::kSettledCounts,
       "COVERING INDEX settled_tallies_by_instrument (instrument_id=? AND effective_at>?)",
       "settled_tallies"},
      {"settled curves of an instrument: the latest total of each state", sql::kSettledCounts,
       "SEARCH t USING PRIMARY KEY (instrument_id=? AND state=?)", "settled_totals"},
      {"an instrument's latest total in a state, before the next is appended",
       sql::kLatestSettledTotal, "USING PRIMARY KEY (instrument_id=? AND state=?)",
       "settled_totals"},
      {"reviews of a curve, before its tally steps", sql::kSettledReviewsOf,
       "curve_reviews_by_curve", "curve_reviews"},
      {"retirements of a curve, before its tally steps", sql::kSettledRetirementsOf,
       "curve_retirements_by_curve", "curve_retirements"},
      {"method and analyte pairs of an instrument: the method's next analyte",
       sql::kNextMethodAnalyte,
       "COVERING INDEX curves_by_instrument_group (instrument_id=? AND method_id=? AND analyte>?)",
       "curves"},
      {"method and analyte pairs of an instrument: the next method", sql::kNextMethodAnalyte,
       "COVERING INDEX curves_by_instrument_group (instrument_id=? AND method_id>?)", "curves"},
      {"recent failed checks of the lab, back from a moment", sql::kFailedChecksBack,
       "checks_failed_by_time", "checks"},
      {"status events of users", sql::kUserEventsOf, "user_events_by_user", "user_events"},
      {"a user's passphrase", sql::kPassphraseOf, "user_passphrases_by_user", "user_passphrases"},
      {"a user's wrong passphrases", sql::kFailedSignaturesInARow, "signature_failures_by_user",
       "signature_failures"},
      {"signatures of records", sql::kSignaturesOf, "signatures_by_entity", "signatures"},
  };
  for (const auto& e : expected) {
    INFO(e.name);
    const std::string plan = cw::store::sqlite::query_plan(*store, e.sql);
    INFO("plan:\n" << plan);
    CHECK_THAT(plan, Catch::Contains(e.index));
    CHECK_THAT(plan, !Catch::Contains("SCAN " + std::string(e.table) + "\n"));
  }
}
