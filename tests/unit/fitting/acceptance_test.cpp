// SPDX-License-Identifier: Apache-2.0
// Checks evaluate_acceptance(): each criterion just inside, exactly at and just outside its
// limit, the bioanalytical 75 % rule and the lowest-level limit.
#include <catch2/catch.hpp>
#include <cmath>
#include <cstddef>
#include <optional>
#include <string>
#include <vector>

#include "fitting/acceptance.h"
#include "fitting/fit.h"

namespace {

using Catch::Matchers::Contains;
using Catch::Matchers::WithinRel;
using cw::fitting::Acceptance;
using cw::fitting::AcceptanceCriteria;
using cw::fitting::Criterion;
using cw::fitting::evaluate_acceptance;
using cw::fitting::FitResult;
using cw::fitting::Model;
using cw::fitting::PointFit;
using cw::fitting::Weighting;

// A back-calculated calibration point as a results table shows it: nominal x and its %RE.
struct TablePoint {
  std::string level;
  double x;
  double error_pct;
  bool excluded = false;
};

// A fit summary built by hand from a %RE table, so that a %RE can sit exactly at its limit.
FitResult from_table(const std::vector<TablePoint>& table, std::vector<std::string>& levels) {
  FitResult f;
  f.model = Model::Linear;
  f.weighting = Weighting::None;
  f.slope = 1;
  f.r2 = 0.9999;
  std::vector<double> distinct;
  levels.clear();
  for (const TablePoint& t : table) {
    PointFit p;
    p.x = t.x;
    p.y = t.x;
    p.excluded = t.excluded;
    p.back_calculated = t.x * (1 + t.error_pct / 100);
    p.error_pct = t.error_pct;
    p.weight = t.excluded ? 0 : 1;
    f.points.push_back(p);
    levels.push_back(t.level);
    if (!t.excluded) {
      bool seen = false;
      for (double d : distinct) seen = seen || d == t.x;
      if (!seen) distinct.push_back(t.x);
      ++f.n_points;
    }
  }
  f.n_levels = static_cast<int>(distinct.size());
  return f;
}

// Bioanalytical calibration rule: >= 75 % of the non-zero levels within ±15 % of nominal,
// ±20 % at the lowest level (LLOQ). Source: ICH M10 (2022) §3 / FDA BMV 2018, as summarised in
// calibration-practice.md §5.1 [P2].
AcceptanceCriteria bioanalytical() {
  AcceptanceCriteria c;
  c.min_levels = 6;
  c.max_error_pct = 15;
  c.max_error_pct_lowest = 20;
  c.min_levels_within = 0.75;
  return c;
}

// Eight levels, nominal 1-100; %RE values chosen around the ±15 % / ±20 % limits.
std::vector<TablePoint> eight_levels(double level3, double level6, double level8) {
  return {{"1", 1, -18.0}, {"2", 2, 4.0},     {"3", 5, level3}, {"4", 10, -2.5},
          {"5", 20, 14.9}, {"6", 50, level6}, {"7", 80, -6.0},  {"8", 100, level8}};
}

int count(const std::vector<cw::fitting::CriterionFinding>& findings, Criterion c) {
  int n = 0;
  for (const auto& f : findings) n += f.criterion == c ? 1 : 0;
  return n;
}

}  // namespace

TEST_CASE("acceptance: criterion names", "[fitting]") {
  // Tokens documented in fitting/acceptance.h (stored and shown in reports).
  CHECK(cw::fitting::to_string(Criterion::TooFewLevels) == "too-few-levels");
  CHECK(cw::fitting::to_string(Criterion::R2BelowMin) == "r2-below-min");
  CHECK(cw::fitting::to_string(Criterion::LevelError) == "level-error");
  CHECK(cw::fitting::to_string(Criterion::TooFewLevelsWithin) == "too-few-levels-within");
  CHECK(cw::fitting::to_string(Criterion::RfRsdAboveMax) == "rf-rsd-above-max");
  CHECK(cw::fitting::to_string(Criterion::NotMonotonic) == "not-monotonic");
  CHECK(cw::fitting::parse_criterion("level-error") == Criterion::LevelError);
  CHECK_FALSE(cw::fitting::parse_criterion("Level-Error").has_value());
}

TEST_CASE("acceptance: too-few-levels at, inside and outside the minimum", "[fitting]") {
  // Rule: distinct fitted levels < min_levels fails (calibration-practice.md §5.1, e.g. ≥ 6
  // levels for bioanalysis); excluded levels do not count.
  std::vector<std::string> levels;
  const FitResult f = from_table(
      {{"1", 1, 0}, {"2", 2, 0}, {"3", 3, 0}, {"4", 4, 0}, {"5", 5, 0}, {"6", 6, 0, true}}, levels);
  AcceptanceCriteria c;
  c.min_levels = 5;  // exactly at the minimum: passes
  CHECK(evaluate_acceptance(f, levels, c).accepted);
  c.min_levels = 4;
  CHECK(evaluate_acceptance(f, levels, c).accepted);
  c.min_levels = 6;  // the sixth level is excluded
  const Acceptance a = evaluate_acceptance(f, levels, c);
  CHECK_FALSE(a.accepted);
  REQUIRE(a.failures.size() == 1);
  CHECK(a.failures[0].criterion == Criterion::TooFewLevels);
  CHECK(a.failures[0].value == 5);
  CHECK(a.failures[0].limit == 6);
  CHECK(a.failures[0].detail == "5 distinct levels fitted, at least 6 required");
}

TEST_CASE("acceptance: r2-below-min is strict", "[fitting]") {
  // Rule: fails only when r² < min_r2 (limits inclusive); EPA-style r² ≥ 0.99 (§5.1 [M]).
  std::vector<std::string> levels;
  FitResult f = from_table({{"1", 1, 0}, {"2", 2, 0}, {"3", 3, 0}}, levels);
  AcceptanceCriteria c;
  c.min_r2 = 0.995;
  f.r2 = 0.995;  // exactly at the limit
  CHECK(evaluate_acceptance(f, levels, c).accepted);
  f.r2 = 0.99501;
  CHECK(evaluate_acceptance(f, levels, c).accepted);
  f.r2 = 0.99499;
  const Acceptance a = evaluate_acceptance(f, levels, c);
  CHECK_FALSE(a.accepted);
  REQUIRE(a.failures.size() == 1);
  CHECK(a.failures[0].criterion == Criterion::R2BelowMin);
  CHECK(a.failures[0].detail == "r\u00b2 0.99499 below minimum 0.995");
  CHECK(a.failures[0].value == 0.99499);
  CHECK(a.failures[0].limit == 0.995);
}

TEST_CASE("acceptance: level-error at, inside and outside the %RE limit", "[fitting]") {
  // Rule: a point is within when |%RE| <= limit (inclusive), every failing level is a failure
  // when min_levels_within is absent.
  AcceptanceCriteria c;
  c.max_error_pct = 15;
  std::vector<std::string> levels;
  for (double re : {15.0, -15.0, 14.99, -14.99}) {
    INFO("%RE " << re);
    const FitResult f = from_table({{"1", 1, 0}, {"2", 2, re}, {"3", 3, 0}}, levels);
    const Acceptance a = evaluate_acceptance(f, levels, c);
    CHECK(a.accepted);
    CHECK(a.points[1].within_limits);
    CHECK(a.points[1].limit_pct == 15);
  }
  for (double re : {15.01, -15.01}) {
    INFO("%RE " << re);
    const FitResult f = from_table({{"1", 1, 0}, {"2", 2, re}, {"3", 3, 0}}, levels);
    const Acceptance a = evaluate_acceptance(f, levels, c);
    CHECK_FALSE(a.accepted);
    CHECK_FALSE(a.points[1].within_limits);
    REQUIRE(a.failures.size() == 1);
    CHECK(a.failures[0].criterion == Criterion::LevelError);
    CHECK(a.failures[0].level == std::optional<std::string>("2"));
    CHECK(a.failures[0].value == re);
    CHECK(a.failures[0].limit == 15);
    CHECK(a.failures[0].detail == std::string("level 2 (nominal 2): %RE ") + (re > 0 ? "+" : "-") +
                                      "15.01 % outside \u00b115 %");
  }
}

TEST_CASE("acceptance: level-error detail names the level and its worst point", "[fitting]") {
  // Detail format documented for level-error: "level 1 (nominal 0.5): %RE +24.3 % outside ±20 %";
  // the worst point of the level is named, with the count when replicates fail.
  AcceptanceCriteria c;
  c.max_error_pct = 15;
  c.max_error_pct_lowest = 20;
  std::vector<std::string> levels;
  const FitResult f = from_table(
      {{"1", 0.5, 24.3}, {"2", 1, 3}, {"3", 2, -16}, {"3", 2, -19.5}, {"3", 2, 1}}, levels);
  const Acceptance a = evaluate_acceptance(f, levels, c);
  REQUIRE(a.failures.size() == 2);
  CHECK(a.failures[0].detail == "level 1 (nominal 0.5): %RE +24.3 % outside \u00b120 %");
  CHECK(a.failures[1].detail ==
        "level 3 (nominal 2): %RE -19.5 % outside \u00b115 % (2 of 3 points outside)");
  CHECK(a.failures[1].value == -19.5);
}

TEST_CASE("acceptance: a zero calibrator is neither the lowest level nor counted", "[fitting]") {
  // The lowest-level limit belongs to the LLOQ, the lowest non-zero calibrator
  // (calibration-practice.md §4.4, §5.1: ICH M10 ±20 % at the LLOQ); levels are counted
  // non-zero (Standard Methods 6020 B, ≥ 5 non-zero levels for a line).
  AcceptanceCriteria c;
  c.max_error_pct = 15;
  c.max_error_pct_lowest = 20;
  c.min_levels = 5;
  std::vector<std::string> levels;
  const FitResult f = from_table(
      {{"0", 0, 0}, {"1", 2, -18.3}, {"2", 5, 1}, {"3", 10, -1}, {"4", 20, 2}, {"5", 50, 0}},
      levels);
  const Acceptance a = evaluate_acceptance(f, levels, c);
  CHECK(a.accepted);
  CHECK_FALSE(a.points[0].judged);
  CHECK(a.points[1].limit_pct == 20);  // the LLOQ, not the blank
  CHECK(a.points[2].limit_pct == 15);

  const FitResult four =
      from_table({{"0", 0, 0}, {"1", 2, 0}, {"2", 5, 0}, {"3", 10, 0}, {"4", 20, 0}}, levels);
  CHECK(four.n_levels == 5);
  const Acceptance b = evaluate_acceptance(four, levels, c);
  CHECK_FALSE(b.accepted);
  REQUIRE(b.failures.size() == 1);
  CHECK(b.failures[0].criterion == Criterion::TooFewLevels);
  CHECK(b.failures[0].value == 4);
  CHECK(b.failures[0].detail == "4 distinct non-zero levels fitted, at least 5 required");
}

TEST_CASE("acceptance: lowest-level limit applies only to the lowest level", "[fitting]") {
  // ICH M10 (2022) §3 / FDA BMV 2018 via calibration-practice.md §5.1 [P2]: ±20 % at the LLOQ,
  // ±15 % elsewhere.
  AcceptanceCriteria c;
  c.max_error_pct = 15;
  c.max_error_pct_lowest = 20;
  std::vector<std::string> levels;
  {
    const FitResult f = from_table({{"L1", 1, 20.0}, {"L2", 2, 14.0}, {"L3", 5, 0}}, levels);
    const Acceptance a = evaluate_acceptance(f, levels, c);
    CHECK(a.accepted);  // exactly at the lowest-level limit
    CHECK(a.points[0].limit_pct == 20);
    CHECK(a.points[1].limit_pct == 15);
  }
  {
    const FitResult f = from_table({{"L1", 1, 20.01}, {"L2", 2, 0}, {"L3", 5, 0}}, levels);
    const Acceptance a = evaluate_acceptance(f, levels, c);
    CHECK_FALSE(a.accepted);
    REQUIRE(a.failures.size() == 1);
    CHECK(a.failures[0].level == std::optional<std::string>("L1"));
    CHECK(a.failures[0].limit == 20);
  }
  {
    // 18 % passes at the lowest level but fails at the second one.
    const FitResult f = from_table({{"L1", 1, 18}, {"L2", 2, 18}, {"L3", 5, 0}}, levels);
    const Acceptance a = evaluate_acceptance(f, levels, c);
    CHECK_FALSE(a.accepted);
    REQUIRE(a.failures.size() == 1);
    CHECK(a.failures[0].level == std::optional<std::string>("L2"));
    CHECK(a.failures[0].limit == 15);
    CHECK(a.points[0].within_limits);
    CHECK_FALSE(a.points[1].within_limits);
  }
  {
    // Input order does not matter: the lowest nominal decides, wherever it appears.
    const FitResult f = from_table({{"L3", 5, 0}, {"L2", 2, 18}, {"L1", 1, 18}}, levels);
    const Acceptance a = evaluate_acceptance(f, levels, c);
    REQUIRE(a.failures.size() == 1);
    CHECK(a.failures[0].level == std::optional<std::string>("L2"));
  }
  {
    // The lowest-level limit moves to the lowest level that is still fitted.
    const FitResult f =
        from_table({{"L1", 1, 0, true}, {"L2", 2, 18}, {"L3", 5, 0}, {"L4", 10, 0}}, levels);
    const Acceptance a = evaluate_acceptance(f, levels, c);
    CHECK(a.accepted);
    CHECK(a.points[1].limit_pct == 20);
  }
}

TEST_CASE("acceptance: bioanalytical rule accepts 6 of 8 levels and rejects 5 of 8", "[fitting]") {
  // ICH M10 (2022) §3 / FDA BMV 2018, as summarised in calibration-practice.md §5.1 [P2]:
  // ≥ 75 % of the calibration levels within ±15 % (±20 % at the LLOQ), ≥ 6 levels.
  std::vector<std::string> levels;
  {
    // Levels 3 (+16.2 %) and 6 (-15.5 %) fail: 6/8 = 75 % within, exactly the limit.
    const FitResult f = from_table(eight_levels(16.2, -15.5, 9.0), levels);
    const Acceptance a = evaluate_acceptance(f, levels, bioanalytical());
    CHECK(a.accepted);
    CHECK(a.failures.empty());
    REQUIRE(a.warnings.size() == 2);
    CHECK(a.warnings[0].criterion == Criterion::LevelError);
    CHECK(a.warnings[0].level == std::optional<std::string>("3"));
    CHECK(a.warnings[1].level == std::optional<std::string>("6"));
    CHECK(a.points[0].within_limits);  // -18 % at the lowest level, limit ±20 %
    CHECK(a.points[4].within_limits);  // +14.9 %
  }
  {
    // Level 8 (+15.1 %) fails as well: 5/8 = 62.5 % < 75 %.
    const FitResult f = from_table(eight_levels(16.2, -15.5, 15.1), levels);
    const Acceptance a = evaluate_acceptance(f, levels, bioanalytical());
    CHECK_FALSE(a.accepted);
    REQUIRE_FALSE(a.failures.empty());
    CHECK(a.failures[0].criterion == Criterion::TooFewLevelsWithin);
    CHECK(a.failures[0].value == 0.625);
    CHECK(a.failures[0].limit == 0.75);
    CHECK(a.failures[0].detail ==
          "5 of 8 levels (62.5 %) within their %RE limits, at least 75 % required; failing: "
          "3, 6, 8");
    CHECK(count(a.failures, Criterion::LevelError) == 3);
    CHECK(a.warnings.empty());
  }
}

TEST_CASE("acceptance: excluded points are not judged", "[fitting]") {
  // Rule: a level is within when all its non-excluded points are; an excluded point's %RE does
  // not count (it reports judged = false, within_limits = false).
  AcceptanceCriteria c;
  c.max_error_pct = 15;
  std::vector<std::string> levels;
  const FitResult f =
      from_table({{"1", 1, 2}, {"2", 2, 60, true}, {"2", 2, 3}, {"3", 3, -1}}, levels);
  const Acceptance a = evaluate_acceptance(f, levels, c);
  CHECK(a.accepted);
  CHECK_FALSE(a.points[1].judged);
  CHECK_FALSE(a.points[1].within_limits);
  CHECK(a.points[2].judged);
  CHECK(a.points[2].within_limits);
}

TEST_CASE("acceptance: rf-rsd-above-max at, inside and outside the limit", "[fitting]") {
  // Rule: fails when the response-factor %RSD > max (EPA 8000D ≤ 20 % [M], §5.1).
  std::vector<std::string> levels;
  FitResult f = from_table({{"1", 1, 0}, {"2", 2, 0}, {"3", 3, 0}}, levels);
  f.model = Model::MeanResponseFactor;
  AcceptanceCriteria c;
  c.max_rf_rsd_pct = 20;
  f.rf_rsd_pct = 20;  // exactly at the limit
  CHECK(evaluate_acceptance(f, levels, c).accepted);
  f.rf_rsd_pct = 19.99;
  CHECK(evaluate_acceptance(f, levels, c).accepted);
  f.rf_rsd_pct = 20.01;
  const Acceptance a = evaluate_acceptance(f, levels, c);
  CHECK_FALSE(a.accepted);
  REQUIRE(a.failures.size() == 1);
  CHECK(a.failures[0].criterion == Criterion::RfRsdAboveMax);
  CHECK(a.failures[0].detail == "response-factor %RSD 20.01 % above maximum 20 %");
}

TEST_CASE("acceptance: not-monotonic quadratic with the vertex inside or at the range",
          "[fitting]") {
  // Rule (calibration-practice.md §1.4): b + 2c·x keeps one sign on [x_min, x_max], i.e. the
  // vertex -b/(2c) lies outside the range. Vertex of y = 10x - 0.5x² is x = 10.
  std::vector<std::string> levels;
  FitResult f = from_table({{"1", 1, 0}, {"2", 4, 0}, {"3", 7, 0}, {"4", 12, 0}}, levels);
  f.model = Model::Quadratic;
  f.slope = 10;
  f.quadratic = -0.5;
  f.range_low = 1;
  f.range_high = 12;  // vertex inside
  Acceptance a = evaluate_acceptance(f, levels, AcceptanceCriteria{});
  CHECK_FALSE(a.accepted);
  REQUIRE(a.failures.size() == 1);
  CHECK(a.failures[0].criterion == Criterion::NotMonotonic);
  CHECK(a.failures[0].value == 10);
  CHECK_THAT(a.failures[0].detail, Contains("vertex at x = 10 within [1, 12]"));
  f.range_high = 10;  // vertex exactly at the end of the range: still within [low, high]
  CHECK_FALSE(evaluate_acceptance(f, levels, AcceptanceCriteria{}).accepted);
  f.range_high = 9.99;  // just outside
  CHECK(evaluate_acceptance(f, levels, AcceptanceCriteria{}).accepted);
}

TEST_CASE("acceptance: synthetic S1 unweighted fails at the low end, 1/x^2 passes", "[fitting]") {
  // calibration-practice.md §9 S1 [C]: unweighted %RE at x = 1 is +24.34586497 (outside ±20 %),
  // all other levels within ±15 %; with 1/x² every level is within ±3.3 %. Criteria: ICH M10
  // style ±15 %/±20 % (§5.1 [P2]).
  const std::vector<cw::fitting::Observation> data = {
      {1, 10.9}, {2, 20.3}, {5, 52.8}, {10, 100.1}, {20, 209.0}, {50, 498.0}, {100, 1041.0}};
  const std::vector<std::string> levels = {"1", "2", "3", "4", "5", "6", "7"};
  AcceptanceCriteria c;
  c.max_error_pct = 15;
  c.max_error_pct_lowest = 20;
  c.min_levels = 5;
  const FitResult unweighted = cw::fitting::fit(Model::Linear, Weighting::None, data);
  const Acceptance a = evaluate_acceptance(unweighted, levels, c);
  CHECK_FALSE(a.accepted);
  REQUIRE(a.failures.size() == 1);
  CHECK(a.failures[0].detail == "level 1 (nominal 1): %RE +24.3 % outside \u00b120 %");
  CHECK_THAT(a.failures[0].value, WithinRel(24.34586497, 1e-9));
  // With the 75 % rule the same curve passes, and level 1 becomes a warning (6/7 within).
  c.min_levels_within = 0.75;
  const Acceptance b = evaluate_acceptance(unweighted, levels, c);
  CHECK(b.accepted);
  REQUIRE(b.warnings.size() == 1);
  CHECK(b.warnings[0].level == std::optional<std::string>("1"));

  const FitResult weighted = cw::fitting::fit(Model::Linear, Weighting::InvX2, data);
  c.min_levels_within.reset();
  CHECK(evaluate_acceptance(weighted, levels, c).accepted);
  c.max_error_pct = 3.2;  // level 2 of the 1/x² fit is at -3.252047852 %
  const Acceptance d = evaluate_acceptance(weighted, levels, c);
  CHECK_FALSE(d.accepted);
  REQUIRE(d.failures.size() == 1);
  CHECK(d.failures[0].level == std::optional<std::string>("2"));
}
