// SPDX-License-Identifier: Apache-2.0
// Scenarios of `curve log`: the fit report of a realistic two-analyte calibration against
// independent reference values, and acceptance criteria that store a curve as rejected.
#include <catch2/catch.hpp>

#include "scenario_support.h"

using namespace cw::scenario;

namespace {

constexpr const char* kAcquired = "2026-03-02T09:00:00Z";

/// A lab with instrument IC-01, lot CRM-A (valid all year) and the method `spec`.
void set_up(const Lab& lab, const MethodSpec& spec) {
  lab.add_instrument("IC-01");
  lab.add_lot("CRM-A", "2026-12-31");
  lab.add_method(spec);
}

const Json& curve_of(const Json& log, const std::string& analyte) {
  for (const auto& c : log.at("curves")) {
    if (c.at("analyte") == analyte) return c;
  }
  FAIL("no curve for analyte " << analyte << " in " << log.dump(2));
  throw;  // not reached
}

}  // namespace

TEST_CASE("curve log: fits a two-analyte calibration with duplicates and an excluded point",
          "[scenario]") {
  Lab lab;
  MethodSpec spec;  // unweighted linear, min 5 levels, r² ≥ 0.995, %RE 15 (20 at the lowest)
  spec.review_required = true;
  set_up(lab, spec);
  const auto before = lab.counts();
  const auto seq_before = lab.sql("SELECT max(seq) FROM audit_log");

  // Nitrate: the M1 data (calibration-practice.md §9 M1, Miller & Miller ch. 5) plus a second
  // injection of level L3 excluded with a reason; sulfate: six levels in duplicate.
  const std::string csv = std::string(kPointsHeader) + m1_rows("nitrate") +
                          "nitrate,L3,6,19.9,2,injection error: air bubble in the loop\n" +
                          duplicate_sulfate_rows();
  const Json log = lab.log_curve("ANION-IC", "IC-01", "CRM-A", csv, kAcquired, 0);

  REQUIRE(log.at("calibration_id").is_number_integer());
  REQUIRE(log.at("curves").size() == 2);
  const std::int64_t calibration = log.at("calibration_id").get<std::int64_t>();

  SECTION("nitrate matches the M1 textbook values; the excluded point is not fitted") {
    const Json& c = curve_of(log, "nitrate");
    CHECK(c.at("calibration_id") == calibration);
    CHECK(c.at("method") == "ANION-IC");
    CHECK(c.at("method_version") == 1);
    CHECK(c.at("instrument") == "IC-01");
    CHECK(strings(c.at("lots")) == std::vector<std::string>{"CRM-A"});
    CHECK(c.at("acquired_at") == kAcquired);
    CHECK(c.at("analyst") == "alice");
    CHECK(c.at("model") == "linear");
    CHECK(c.at("weighting") == "none");
    // calibration-practice.md §9 M1 [C]: b = 1081/560, a = 85/56, s_y/x, s_b, s_a, r², and
    // the ICH limits 3.3·s_y/x/b and 10·s_y/x/b.
    CHECK(c.at("parameters").at("slope").get<double>() == Approx(m1::kSlope).epsilon(1e-9));
    CHECK(c.at("parameters").at("intercept").get<double>() == Approx(m1::kIntercept).epsilon(1e-9));
    CHECK(c.at("parameters").at("quadratic").get<double>() == 0.0);
    CHECK(c.at("standard_errors").at("slope").get<double>() == Approx(m1::kSeSlope).epsilon(1e-9));
    CHECK(c.at("standard_errors").at("intercept").get<double>() ==
          Approx(m1::kSeIntercept).epsilon(1e-9));
    CHECK(c.at("r2").get<double>() == Approx(m1::kR2).epsilon(1e-9));
    CHECK(c.at("residual_sd").get<double>() == Approx(m1::kResidualSd).epsilon(1e-9));
    CHECK(c.at("n_points") == 7);  // the excluded injection does not count
    CHECK(c.at("range").at("low").get<double>() == 0.0);
    CHECK(c.at("range").at("high").get<double>() == 12.0);
    CHECK(c.at("lod").get<double>() == Approx(m1::kLod).epsilon(1e-9));
    CHECK(c.at("loq").get<double>() == Approx(m1::kLoq).epsilon(1e-9));
    CHECK(c.at("verdict") == "accepted");
    CHECK(c.at("failed_criteria") == Json::array());
    CHECK(c.at("state") == "awaiting-review");  // the method requires review
    CHECK(c.at("reasons") == Json::array());
    CHECK(c.at("expires_at") == "2026-03-09T09:00:00Z");  // acquired + 7 days

    const Json& points = c.at("points");
    REQUIRE(points.size() == 8);
    // Back-calculation and %RE of every point from the M1 line: x = (y - a)/b.
    // In file order: the seven M1 points, then the excluded second injection of L3.
    const double x[] = {0, 2, 4, 6, 8, 10, 12, 6};
    const double y[] = {2.1, 5.0, 9.0, 12.6, 17.3, 21.0, 24.7, 19.9};
    const int replicate[] = {1, 1, 1, 1, 1, 1, 1, 2};
    const char* level[] = {"L0", "L1", "L2", "L3", "L4", "L5", "L6", "L3"};
    for (std::size_t i = 0; i < points.size(); ++i) {
      const Json& p = points[i];
      INFO("point " << i << ": " << p.dump());
      CHECK(p.at("level") == level[i]);
      CHECK(p.at("replicate") == replicate[i]);
      CHECK(p.at("nominal").get<double>() == x[i]);
      CHECK(p.at("response").get<double>() == y[i]);
      // Exact M1 coefficients (§9 M1 [C]: b = 1081/560, a = 85/56), so that a small %RE is
      // not swamped by the rounding of the 10-digit constants.
      const double back = (y[i] - 85.0 / 56.0) / (1081.0 / 560.0);
      CHECK(p.at("back_calculated").get<double>() == Approx(back).epsilon(1e-8));
      if (x[i] == 0) {
        CHECK(p.at("error_pct").is_null());  // %RE is undefined at a zero nominal
      } else {
        CHECK(p.at("error_pct").get<double>() == Approx(100 * (back - x[i]) / x[i]).epsilon(1e-7));
      }
      const bool excluded = i == 7;
      CHECK(p.at("excluded") == excluded);
      if (excluded) {
        CHECK(p.at("exclude_reason") == "injection error: air bubble in the loop");
      } else {
        CHECK(p.at("exclude_reason").is_null());
        CHECK(p.at("within_limits") == true);
      }
    }
    // §9 M1 [C]: %RE at the 2 pg/mL level is -9.805735430 %, inside the 15 % limit.
    CHECK(points[1].at("error_pct").get<double>() == Approx(-9.805735430).epsilon(1e-8));
  }

  SECTION("sulfate with duplicates matches an exact-fraction calculation") {
    const Json& c = curve_of(log, "sulfate");
    CHECK(c.at("parameters").at("slope").get<double>() == Approx(sulfate::kSlope).epsilon(1e-9));
    CHECK(c.at("parameters").at("intercept").get<double>() ==
          Approx(sulfate::kIntercept).epsilon(1e-9));
    CHECK(c.at("standard_errors").at("slope").get<double>() ==
          Approx(sulfate::kSeSlope).epsilon(1e-9));
    CHECK(c.at("standard_errors").at("intercept").get<double>() ==
          Approx(sulfate::kSeIntercept).epsilon(1e-9));
    CHECK(c.at("r2").get<double>() == Approx(sulfate::kR2).epsilon(1e-9));
    CHECK(c.at("residual_sd").get<double>() == Approx(sulfate::kResidualSd).epsilon(1e-9));
    CHECK(c.at("lod").get<double>() == Approx(sulfate::kLod).epsilon(1e-9));
    CHECK(c.at("loq").get<double>() == Approx(sulfate::kLoq).epsilon(1e-9));
    CHECK(c.at("n_points") == 12);  // replicates count as points
    CHECK(c.at("range").at("low").get<double>() == 2.0);
    CHECK(c.at("range").at("high").get<double>() == 12.0);
    CHECK(c.at("verdict") == "accepted");
    REQUIRE(c.at("points").size() == 12);
    CHECK(c.at("points")[1].at("replicate") == 2);
    // Replicate 2 of S1: x = (6.9 - a)/b = 1.940668824 mg/L, %RE -2.966558792 (same source).
    CHECK(c.at("points")[1].at("error_pct").get<double>() == Approx(-2.966558792).epsilon(1e-8));
  }

  SECTION("the calibration, its two curves and 20 points are stored and audited") {
    const auto after = lab.counts();
    for (const auto& [table, n] : before) {
      std::int64_t added = 0;
      if (table == "calibrations" || table == "calibration_lots") added = 1;
      if (table == "curves") added = 2;
      if (table == "curve_points") added = 20;
      if (table == "audit_log") added = 3;
      if (table == "settled_tallies") added = 2;  // each curve's state from its expiry on
      if (table == "settled_totals") added = 2;   // each moves the instrument's total
      if (table == "sqlite_sequence") continue;   // AUTOINCREMENT bookkeeping
      INFO("table " << table);
      CHECK(after.at(table) == n + added);
    }
    CHECK(lab.sql("SELECT " + cw::test::text_join(lab.box) +
                  "(action, ',') FROM (SELECT action FROM audit_log WHERE seq > " + seq_before +
                  " ORDER BY seq) AS t") == "calibration.log,curve.log,curve.log");
    CHECK(lab.sql("SELECT exclude_reason FROM curve_points WHERE excluded = 1") ==
          "injection error: air bubble in the loop");
    CHECK(lab.sql("SELECT count(*) FROM curves WHERE verdict = 'accepted'") == "2");
    const Json verify = lab.json_at(kAcquired, {"audit", "verify"});
    CHECK(verify.at("ok") == true);
  }
}

TEST_CASE("curve log: rejects a curve with too few levels but keeps it on the record",
          "[scenario]") {
  Lab lab;
  MethodSpec spec;  // min_levels = 5
  spec.analytes = {"nitrate"};
  set_up(lab, spec);
  // Four levels: enough to fit a line with a residual degree of freedom, fewer than the
  // method's five. Exact fit (Python fractions): b = 9.96, a = 0.25, r² = 0.9997490590.
  const std::string csv = std::string(kPointsHeader) +
                          "nitrate,C1,2,19.8,1,\nnitrate,C2,4,40.5,1,\n"
                          "nitrate,C3,6,60.3,1,\nnitrate,C4,8,79.6,1,\n";
  const auto r = lab.run_at(
      kAcquired, {"curve", "log", "--method", "ANION-IC", "--instrument", "IC-01", "--lot", "CRM-A",
                  "--points", lab.box.write_file("four.csv", csv).string()});
  INFO(r.describe());
  REQUIRE(r.exit_code == 3);
  CHECK_THAT(r.err, Catch::Contains("rejected"));
  const Json log = r.json();
  REQUIRE(log.at("curves").size() == 1);
  const Json& c = log.at("curves")[0];
  CHECK(c.at("verdict") == "rejected");
  CHECK(strings(c.at("failed_criteria")) == std::vector<std::string>{"too-few-levels"});
  CHECK(c.at("state") == "rejected");
  CHECK(c.at("parameters").at("slope").get<double>() == Approx(9.96).epsilon(1e-9));
  const std::int64_t id = c.at("id").get<std::int64_t>();

  const Json list = lab.json_at(kAcquired, {"curve", "list"});
  REQUIRE(list.at("curves").size() == 1);
  CHECK(list.at("curves")[0].at("id") == id);
  CHECK(list.at("curves")[0].at("state") == "rejected");
  const Json only_rejected = lab.json_at(kAcquired, {"curve", "list", "--state", "rejected"});
  CHECK(ids(only_rejected.at("curves")) == std::vector<std::int64_t>{id});
  CHECK(lab.sql("SELECT verdict FROM curves WHERE id = " + std::to_string(id)) == "rejected");
  CHECK(lab.sql("SELECT failed_criteria FROM curves WHERE id = " + std::to_string(id)) ==
        "[\"too-few-levels\"]");
}

TEST_CASE("curve log: rejects a curve whose r² is below the method's minimum", "[scenario]") {
  Lab lab;
  MethodSpec spec;
  spec.analytes = {"nitrate"};
  spec.min_r2 = "0.999";  // M1 has r² = 0.9977603861 (calibration-practice.md §9 M1)
  set_up(lab, spec);
  const Json log = lab.log_curve("ANION-IC", "IC-01", "CRM-A",
                                 std::string(kPointsHeader) + m1_rows(), kAcquired, 3);
  const Json& c = log.at("curves")[0];
  CHECK(c.at("verdict") == "rejected");
  CHECK(strings(c.at("failed_criteria")) == std::vector<std::string>{"r2-below-min"});
  CHECK(c.at("state") == "rejected");
  CHECK(c.at("r2").get<double>() == Approx(m1::kR2).epsilon(1e-9));
}

TEST_CASE("curve log: rejects a curve with a level outside its %RE limit", "[scenario]") {
  Lab lab;
  MethodSpec spec;
  spec.analytes = {"nitrate"};
  spec.min_levels_within.reset();  // every level must meet its limit
  set_up(lab, spec);

  SECTION("the lowest level at +22 % fails its 20 % limit") {
    // Exact fit of x = 1, 2, 4, 6, 8, 10; y = 14.0, 19.8, 40.5, 60.3, 79.6, 100.3 (Python
    // fractions): %RE at C1 = +22.08965304, the others within ±9.2 %; r² = 0.9984381784.
    const std::string csv = std::string(kPointsHeader) +
                            "nitrate,C1,1,14.0,1,\nnitrate,C2,2,19.8,1,\nnitrate,C3,4,40.5,1,\n"
                            "nitrate,C4,6,60.3,1,\nnitrate,C5,8,79.6,1,\nnitrate,C6,10,100.3,1,\n";
    const Json log = lab.log_curve("ANION-IC", "IC-01", "CRM-A", csv, kAcquired, 3);
    const Json& c = log.at("curves")[0];
    CHECK(c.at("verdict") == "rejected");
    CHECK(strings(c.at("failed_criteria")) == std::vector<std::string>{"level-error"});
    CHECK(c.at("state") == "rejected");
    REQUIRE(c.at("points").size() == 6);
    CHECK(c.at("points")[0].at("error_pct").get<double>() == Approx(22.08965304).epsilon(1e-8));
    CHECK(c.at("points")[0].at("within_limits") == false);
    for (std::size_t i = 1; i < 6; ++i) CHECK(c.at("points")[i].at("within_limits") == true);
  }

  SECTION("the lowest level at +17.5 % passes: its limit is 20 %, not 15 %") {
    // Same data with y(C1) = 13.2: %RE at C1 = +17.48887707 (Python fractions).
    const std::string csv = std::string(kPointsHeader) +
                            "nitrate,C1,1,13.2,1,\nnitrate,C2,2,19.8,1,\nnitrate,C3,4,40.5,1,\n"
                            "nitrate,C4,6,60.3,1,\nnitrate,C5,8,79.6,1,\nnitrate,C6,10,100.3,1,\n";
    const Json log = lab.log_curve("ANION-IC", "IC-01", "CRM-A", csv, kAcquired, 0);
    const Json& c = log.at("curves")[0];
    CHECK(c.at("verdict") == "accepted");
    CHECK(c.at("points")[0].at("error_pct").get<double>() == Approx(17.48887707).epsilon(1e-8));
    CHECK(c.at("points")[0].at("within_limits") == true);
    CHECK(c.at("state") == "active");
  }
}

TEST_CASE("curve log: one rejected analyte makes the command exit 3 and stores both curves",
          "[scenario]") {
  Lab lab;
  MethodSpec spec;
  spec.min_levels = 6;  // sulfate has six levels, nitrate (below) only four
  set_up(lab, spec);
  const std::string csv = std::string(kPointsHeader) + duplicate_sulfate_rows() +
                          "nitrate,C1,2,19.8,1,\nnitrate,C2,4,40.5,1,\n"
                          "nitrate,C3,6,60.3,1,\nnitrate,C4,8,79.6,1,\n";
  const Json log = lab.log_curve("ANION-IC", "IC-01", "CRM-A", csv, kAcquired, 3);
  REQUIRE(log.at("curves").size() == 2);
  CHECK(curve_of(log, "sulfate").at("verdict") == "accepted");
  CHECK(curve_of(log, "sulfate").at("state") == "active");
  CHECK(curve_of(log, "nitrate").at("verdict") == "rejected");
  CHECK(strings(curve_of(log, "nitrate").at("failed_criteria")) ==
        std::vector<std::string>{"too-few-levels"});
  CHECK(lab.sql("SELECT count(*) FROM curves") == "2");
}

TEST_CASE("curve log: an excluded top level narrows the working range", "[scenario]") {
  Lab lab;
  MethodSpec spec;
  spec.analytes = {"nitrate"};
  set_up(lab, spec);
  // M1 with the 12 pg/mL standard excluded: the line through the six others is
  // b = 27/14 = 1.928571429, a = 32/21 = 1.523809524 (Python fractions).
  std::string csv = std::string(kPointsHeader) + m1_rows();
  const std::string top = "nitrate,L6,12,24.7,1,\n";
  csv.replace(csv.find(top), top.size(), "nitrate,L6,12,24.7,1,standard prepared twice\n");
  const Json log = lab.log_curve("ANION-IC", "IC-01", "CRM-A", csv, kAcquired, 0);
  const Json& c = log.at("curves")[0];
  CHECK(c.at("n_points") == 6);
  CHECK(c.at("range").at("low").get<double>() == 0.0);
  CHECK(c.at("range").at("high").get<double>() == 10.0);
  CHECK(c.at("parameters").at("slope").get<double>() == Approx(27.0 / 14.0).epsilon(1e-12));
  CHECK(c.at("parameters").at("intercept").get<double>() == Approx(32.0 / 21.0).epsilon(1e-12));
  CHECK(c.at("points")[6].at("excluded") == true);
  // The exclusion and its reason are part of the audited record.
  CHECK(lab.sql("SELECT count(*) FROM audit_log WHERE action = 'curve.log' AND payload LIKE "
                "'%standard prepared twice%'") == "1");
  // 23.0 reads 11.14 pg/mL: within the calibrated 0–12 but above the narrowed range.
  const auto q = lab.run_at("2026-03-02T10:00:00Z",
                            {"quantify", "--curve", std::to_string(c.at("id").get<std::int64_t>()),
                             "--response", "23.0", "--sample", "W-9"});
  INFO(q.describe());
  CHECK(q.exit_code == 3);
  CHECK(strings(q.json().at("reasons")) == std::vector<std::string>{"above-range"});
}
