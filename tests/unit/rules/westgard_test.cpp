// SPDX-License-Identifier: Apache-2.0
// Check-standard trending: control limits from passing checks, each Westgard rule with a sequence
// that violates it and a near miss that does not, the S5 example of calibration-practice.md §9,
// and the violations a method's trend_rules turn into reasons to stop using a curve.
#include <catch2/catch.hpp>
#include <chrono>
#include <cmath>
#include <cstddef>
#include <limits>
#include <map>
#include <set>
#include <string>
#include <vector>

#include "core/error.h"
#include "rules/westgard.h"

namespace {

using namespace cw;
using namespace cw::rules;
using namespace std::chrono_literals;

using Tokens = std::set<std::string>;

// [C] values (calibration-check-values.py) are quoted to 10 significant digits: 1e-9 relative.
constexpr double kRel = 1e-9;

const Instant kStart = parse_instant("2026-03-02T08:00:00Z");

/// Established limits of the rule examples of calibration-practice.md §9 S5: mean 100, s = 2,
/// so a recovery is 100 + 2·z.
Limits s5_limits() {
  return *limits_from_targets(100.0, 2.0);
}

/// One observation per z in each run; runs an hour apart, observations in a run a minute apart.
/// Check ids count from 1 in order. `keyed` false leaves every observation without a run key.
std::vector<ControlObservation> runs_of_z(const std::vector<std::vector<double>>& runs,
                                          bool keyed = true) {
  std::vector<ControlObservation> out;
  std::int64_t id = 1;
  for (std::size_t r = 0; r < runs.size(); ++r) {
    for (std::size_t k = 0; k < runs[r].size(); ++k) {
      ControlObservation o;
      o.check_id = CheckId{id++};
      o.at = kStart + std::chrono::hours(r) + std::chrono::minutes(k);
      o.recovery_pct = 100.0 + 2.0 * runs[r][k];
      if (keyed) o.run = static_cast<std::int64_t>(r + 1);
      out.push_back(o);
    }
  }
  return out;
}

/// One observation per run (one control per run).
std::vector<ControlObservation> series_of_z(const std::vector<double>& z) {
  std::vector<std::vector<double>> runs;
  for (double v : z) runs.push_back({v});
  return runs_of_z(runs);
}

/// The rule tokens violated at each observation, by check id (observations without any are
/// absent).
std::map<std::int64_t, Tokens> by_check(const std::vector<Violation>& found) {
  std::map<std::int64_t, Tokens> out;
  for (const auto& v : found) out[v.check_id.value].insert(std::string(to_string(v.rule)));
  return out;
}

/// The rule tokens violated in each run (1-based), given the observations evaluated.
std::map<std::int64_t, Tokens> by_run(const std::vector<ControlObservation>& obs,
                                      const std::vector<Violation>& found) {
  std::map<std::int64_t, std::int64_t> run_of;
  for (const auto& o : obs) run_of[o.check_id.value] = *o.run;
  std::map<std::int64_t, Tokens> out;
  for (const auto& v : found)
    out[run_of.at(v.check_id.value)].insert(std::string(to_string(v.rule)));
  return out;
}

/// The rule test of calibration-practice.md §9 S5: 25 recoveries, one control per run, a day
/// apart; check id and run key are the run number.
std::vector<ControlObservation> s5_series() {
  const std::vector<double> values = {101.0, 99.0,  104.6, 100.4, 98.2,  104.4, 104.2, 99.6,  93.4,
                                      100.6, 102.4, 102.6, 102.2, 102.8, 99.4,  100.8, 101.4, 100.6,
                                      101.8, 100.4, 101.2, 100.2, 101.6, 100.8, 101.0};
  std::vector<ControlObservation> out;
  for (std::size_t i = 0; i < values.size(); ++i) {
    ControlObservation o;
    o.check_id = CheckId{static_cast<std::int64_t>(i + 1)};
    o.at = kStart + std::chrono::hours(24 * i);
    o.recovery_pct = values[i];
    o.run = static_cast<std::int64_t>(i + 1);
    out.push_back(o);
  }
  return out;
}

std::vector<Violation> evaluate_all(const std::vector<ControlObservation>& obs) {
  return evaluate_westgard(obs, s5_limits(), all_westgard_rules());
}

/// Only the violations of one rule, as the check ids where they were reported.
std::vector<std::int64_t> where(const std::vector<ControlObservation>& obs, WestgardRule rule) {
  std::vector<std::int64_t> ids;
  for (const auto& v : evaluate_westgard(obs, s5_limits(), {rule})) ids.push_back(v.check_id.value);
  return ids;
}

using Ids = std::vector<std::int64_t>;

}  // namespace

TEST_CASE("westgard: each rule has one token, and parsing is its exact inverse", "[rules]") {
  // Tokens of product.md §4.1 (trend JSON) and of the method file's trend_rules.
  const std::vector<std::pair<WestgardRule, std::string>> expected = {
      {WestgardRule::R1_2s, "1-2s"}, {WestgardRule::R1_3s, "1-3s"}, {WestgardRule::R2_2s, "2-2s"},
      {WestgardRule::R4s, "R-4s"},   {WestgardRule::R4_1s, "4-1s"}, {WestgardRule::R10x, "10-x"},
  };
  REQUIRE(all_westgard_rules().size() == expected.size());
  for (const auto& [rule, token] : expected) {
    CHECK(to_string(rule) == token);
    CHECK(parse_westgard_rule(token) == rule);
    CHECK(all_westgard_rules().count(rule) == 1);
  }
  for (const char* other : {"", "1_2s", "1-2S", "r-4s", "R4s", " 1-3s", "10-x ", "10x", "2of3-2s",
                            "8-x", "1-2s,1-3s"}) {
    CHECK_FALSE(parse_westgard_rule(other).has_value());
  }
  CHECK(is_warning_only(WestgardRule::R1_2s));
  for (auto rule : {WestgardRule::R1_3s, WestgardRule::R2_2s, WestgardRule::R4s,
                    WestgardRule::R4_1s, WestgardRule::R10x}) {
    CHECK_FALSE(is_warning_only(rule));
  }
}

TEST_CASE("westgard: limits from the S5 baseline of 20 passing checks", "[rules]") {
  // calibration-practice.md §9 S5 baseline; [C]: mean 100.01, s 0.8527972549, 2s limits
  // 98.30440549 / 101.7155945, 3s limits 97.45160824 / 102.5683918.
  const std::vector<double> baseline = {100.4, 99.1,  101.2, 98.7,  100.9, 99.6,  100.2,
                                        101.5, 98.9,  99.8,  100.6, 99.3,  100.1, 101.0,
                                        98.5,  100.3, 99.9,  100.8, 99.4,  100.0};
  const auto l = limits_from_history(baseline);
  REQUIRE(l.has_value());
  CHECK(l->mean == Approx(100.01).epsilon(kRel));
  CHECK(l->sd == Approx(0.8527972549).epsilon(kRel));
  CHECK(l->warn_low == Approx(98.30440549).epsilon(kRel));
  CHECK(l->warn_high == Approx(101.7155945).epsilon(kRel));
  CHECK(l->low == Approx(97.45160824).epsilon(kRel));
  CHECK(l->high == Approx(102.5683918).epsilon(kRel));
  CHECK(l->basis == LimitsBasis::LastPassingChecks);
  CHECK(l->n == 20);

  SECTION("older checks before the last 20 do not count") {
    // Constructed here: five far-off values in front of the baseline change nothing.
    std::vector<double> longer = {50, 150, 50, 150, 50};
    longer.insert(longer.end(), baseline.begin(), baseline.end());
    const auto m = limits_from_history(longer);
    REQUIRE(m.has_value());
    CHECK(m->mean == Approx(100.01).epsilon(kRel));
    CHECK(m->sd == Approx(0.8527972549).epsilon(kRel));
    CHECK(m->n == 20);
  }
  SECTION("a smaller window takes the newest values") {
    // Constructed here, exact fractions: the last three (100.8, 99.4, 100.0) have mean 1501/15
    // and s² = 37/75.
    const auto m = limits_from_history(baseline, 3);
    REQUIRE(m.has_value());
    CHECK(m->mean == Approx(1501.0 / 15.0).epsilon(1e-12));
    CHECK(m->sd == Approx(std::sqrt(37.0 / 75.0)).epsilon(1e-12));
    CHECK(m->n == 3);
  }
  SECTION("fewer values than the window: all of them, and n says how many") {
    // Constructed here: 99 and 101 have mean 100 and s = sqrt(2).
    const auto m = limits_from_history({99.0, 101.0});
    REQUIRE(m.has_value());
    CHECK(m->mean == Approx(100.0).epsilon(1e-12));
    CHECK(m->sd == Approx(std::sqrt(2.0)).epsilon(1e-12));
    CHECK(m->warn_high == Approx(100.0 + 2 * std::sqrt(2.0)).epsilon(1e-12));
    CHECK(m->n == 2);
  }
}

TEST_CASE("westgard: no limits from fewer than two values or from values without spread",
          "[rules]") {
  // Constructed here: the sample SD needs n − 1 ≥ 1 and must be positive to define z.
  CHECK_FALSE(limits_from_history({}).has_value());
  CHECK_FALSE(limits_from_history({100.0}).has_value());
  CHECK_FALSE(limits_from_history({99.0, 101.0, 100.0}, 1).has_value());
  CHECK_FALSE(limits_from_history({99.0, 101.0, 100.0}, 0).has_value());
  CHECK_FALSE(limits_from_history({100.0, 100.0, 100.0}).has_value());
  // Only the window counts: spread before the last two values does not help.
  CHECK_FALSE(limits_from_history({90.0, 110.0, 100.0, 100.0}, 2).has_value());
  CHECK_FALSE(limits_from_history({99.0, std::numeric_limits<double>::quiet_NaN()}).has_value());
  CHECK_FALSE(limits_from_history({99.0, std::numeric_limits<double>::infinity()}).has_value());
}

TEST_CASE("westgard: limits from the method's targets", "[rules]") {
  // Constructed here: mean 100, s 5 give 2s limits 90 / 110 and 3s limits 85 / 115.
  const auto l = limits_from_targets(100.0, 5.0);
  REQUIRE(l.has_value());
  CHECK(l->warn_low == Approx(90.0).epsilon(1e-12));
  CHECK(l->warn_high == Approx(110.0).epsilon(1e-12));
  CHECK(l->low == Approx(85.0).epsilon(1e-12));
  CHECK(l->high == Approx(115.0).epsilon(1e-12));
  CHECK(l->basis == LimitsBasis::MethodTargets);
  CHECK(l->n == 0);
  CHECK_FALSE(limits_from_targets(100.0, 0.0).has_value());
  CHECK_FALSE(limits_from_targets(100.0, -1.0).has_value());
  CHECK_FALSE(limits_from_targets(std::numeric_limits<double>::quiet_NaN(), 2.0).has_value());
}

TEST_CASE("westgard: the S5 sequence, one control per run", "[rules]") {
  // calibration-practice.md §9 S5: established mean 100, s = 2, one control per run. Expected
  // flags [C]: run 3 (z 2.3) 1-2s only; run 6 (2.2) 1-2s; run 7 (2.1) 1-2s + 2-2s; run 9 (−3.3)
  // 1-2s + 1-3s; run 14 (1.4 after 1.2, 1.3, 1.1) 4-1s; run 25 10-x (runs 16–25 above the mean,
  // run 15 at −0.3 broke the earlier streak); all other runs none.
  const std::map<std::int64_t, Tokens> expected = {
      {3, {"1-2s"}},         {6, {"1-2s"}},  {7, {"1-2s", "2-2s"}},
      {9, {"1-2s", "1-3s"}}, {14, {"4-1s"}}, {25, {"10-x"}},
  };
  const auto keyed = s5_series();
  std::vector<ControlObservation> unkeyed = keyed;
  for (auto& o : unkeyed) o.run.reset();
  const auto found = evaluate_all(keyed);
  CHECK(by_run(keyed, found) == expected);
  // Each violation carries its observation's check and instant; only 1-2s is a warning.
  for (const auto& v : found) {
    const auto& o = keyed[static_cast<std::size_t>(v.check_id.value - 1)];
    CHECK(v.at == o.at);
    CHECK(v.warning_only == (v.rule == WestgardRule::R1_2s));
  }
  // Observations without a run key are each a run of their own: the same answer.
  CHECK(evaluate_all(unkeyed) == found);
  // Only the rules asked for are evaluated.
  CHECK(by_check(evaluate_westgard(keyed, s5_limits(), {WestgardRule::R10x})) ==
        std::map<std::int64_t, Tokens>{{25, {"10-x"}}});
  CHECK(evaluate_westgard(keyed, s5_limits(), {}).empty());
}

TEST_CASE("westgard: the S5 cases with two controls per run", "[rules]") {
  // calibration-practice.md §9 S5, two controls per run [C]: z = (+2.4, −2.1) → 1-2s + R-4s;
  // (+2.2, +2.3) → 1-2s + 2-2s within the run; (+0.5, −0.3) → none.
  SECTION("each run alone") {
    CHECK(by_run(runs_of_z({{2.4, -2.1}}), evaluate_all(runs_of_z({{2.4, -2.1}}))) ==
          std::map<std::int64_t, Tokens>{{1, {"1-2s", "R-4s"}}});
    CHECK(by_run(runs_of_z({{2.2, 2.3}}), evaluate_all(runs_of_z({{2.2, 2.3}}))) ==
          std::map<std::int64_t, Tokens>{{1, {"1-2s", "2-2s"}}});
    CHECK(evaluate_all(runs_of_z({{0.5, -0.3}})).empty());
  }
  SECTION("the three runs in sequence, as calibration-check-values.py evaluates them") {
    const auto obs = runs_of_z({{2.4, -2.1}, {2.2, 2.3}, {0.5, -0.3}});
    const auto found = evaluate_all(obs);
    CHECK(by_run(obs, found) ==
          std::map<std::int64_t, Tokens>{{1, {"1-2s", "R-4s"}}, {2, {"1-2s", "2-2s"}}});
    // Attributed to the observation completing the pattern: R-4s to the −2.1 (check 2), 2-2s to
    // the +2.3 (check 4); 1-2s to each of checks 1–4.
    CHECK(by_check(found) ==
          std::map<std::int64_t, Tokens>{
              {1, {"1-2s"}}, {2, {"1-2s", "R-4s"}}, {3, {"1-2s"}}, {4, {"1-2s", "2-2s"}}});
  }
}

TEST_CASE("westgard: 1-2s warns beyond 2s, not at exactly 2s", "[rules]") {
  // Definition: calibration-practice.md §8.2, |z| > 2, warning only. Values constructed here
  // (z = ±2 exactly is 104 / 96, exact in binary).
  CHECK(where(series_of_z({2.0, -2.0, 1.99, -1.99}), WestgardRule::R1_2s).empty());
  CHECK(where(series_of_z({2.01, 0.0, -2.01}), WestgardRule::R1_2s) == Ids{1, 3});
  const auto found = evaluate_westgard(series_of_z({2.01}), s5_limits(), {WestgardRule::R1_2s});
  REQUIRE(found.size() == 1);
  CHECK(found[0].warning_only);
}

TEST_CASE("westgard: 1-3s beyond 3s, not at exactly 3s", "[rules]") {
  // Definition: calibration-practice.md §8.2, |z| > 3. Values constructed here (z = ±3 exactly
  // is 106 / 94).
  CHECK(where(series_of_z({3.0, -3.0}), WestgardRule::R1_3s).empty());
  CHECK(where(series_of_z({3.0, -3.0}), WestgardRule::R1_2s) == Ids{1, 2});
  CHECK(where(series_of_z({3.01, 0.0, -3.01}), WestgardRule::R1_3s) == Ids{1, 3});
  const auto found = evaluate_westgard(series_of_z({-3.01}), s5_limits(), {WestgardRule::R1_3s});
  REQUIRE(found.size() == 1);
  CHECK_FALSE(found[0].warning_only);
}

TEST_CASE("westgard: 2-2s, two consecutive beyond the same 2s limit", "[rules]") {
  // Definition: calibration-practice.md §8.2 (one material in successive runs, or two materials
  // in one run). Sequences constructed here.
  SECTION("across runs, one control per run, either side") {
    CHECK(where(series_of_z({2.2, 2.3}), WestgardRule::R2_2s) == Ids{2});
    CHECK(where(series_of_z({-2.2, -2.3}), WestgardRule::R2_2s) == Ids{2});
  }
  SECTION("within one run, two controls") {
    CHECK(where(runs_of_z({{0.0}, {-2.2, -2.3}}), WestgardRule::R2_2s) == Ids{3});
  }
  SECTION("from the last control of one run to the first of the next") {
    CHECK(where(runs_of_z({{0.3, 2.2}, {2.3, 0.1}}), WestgardRule::R2_2s) == Ids{3});
  }
  SECTION("near misses") {
    CHECK(where(series_of_z({2.2, 2.0}), WestgardRule::R2_2s).empty());   // second at exactly 2s
    CHECK(where(series_of_z({2.2, -2.3}), WestgardRule::R2_2s).empty());  // opposite sides
    CHECK(where(series_of_z({2.2, 1.9, 2.3}), WestgardRule::R2_2s).empty());  // not consecutive
    CHECK(where(runs_of_z({{2.4, -2.1}}), WestgardRule::R2_2s).empty());      // that is R-4s
  }
  SECTION("a persisting shift is reported at each observation that completes a pair") {
    CHECK(where(series_of_z({2.2, 2.3, 2.1}), WestgardRule::R2_2s) == Ids{2, 3});
  }
}

TEST_CASE("westgard: R-4s, one control above +2s and another below −2s in one run", "[rules]") {
  // Definition: calibration-practice.md §8.2 (within-run only). Sequences constructed here.
  SECTION("within one run, either order, at the control that completes the pair") {
    CHECK(where(runs_of_z({{2.4, -2.1}}), WestgardRule::R4s) == Ids{2});
    CHECK(where(runs_of_z({{-2.1, 2.4}}), WestgardRule::R4s) == Ids{2});
    CHECK(where(runs_of_z({{2.4, 0.1, -2.1}}), WestgardRule::R4s) == Ids{3});
  }
  SECTION("reported once per run, again in a later run") {
    CHECK(where(runs_of_z({{2.4, -2.1, -2.5}, {0.0}, {-2.6, 2.1}}), WestgardRule::R4s) ==
          Ids{2, 6});
  }
  SECTION("across two runs is not R-4s") {
    CHECK(where(runs_of_z({{2.4}, {-2.1}}), WestgardRule::R4s).empty());
    CHECK(where(runs_of_z({{0.0, 2.4}, {-2.1, 0.0}}), WestgardRule::R4s).empty());
    // Without run keys every observation is a run of its own.
    CHECK(where(runs_of_z({{2.4, -2.1}}, false), WestgardRule::R4s).empty());
  }
  SECTION("a run key that differs splits the runs even at the same instant") {
    auto obs = runs_of_z({{2.4}, {-2.1}});
    obs[1].at = obs[0].at;
    CHECK(where(obs, WestgardRule::R4s).empty());
  }
  SECTION("near misses within one run") {
    // A range of 4.1s with the low control inside −2s: not a control beyond each limit.
    CHECK(where(runs_of_z({{2.5, -1.6}}), WestgardRule::R4s).empty());
    CHECK(where(runs_of_z({{2.2, -2.0}}), WestgardRule::R4s).empty());  // exactly −2s
    CHECK(where(runs_of_z({{2.2, 2.3}}), WestgardRule::R4s).empty());   // same side
  }
}

TEST_CASE("westgard: 4-1s, four consecutive beyond the same 1s limit", "[rules]") {
  // Definition: calibration-practice.md §8.2 (one material over 4 runs, or 2 materials over 2
  // runs). Sequences constructed here.
  SECTION("one control over four runs, either side") {
    CHECK(where(series_of_z({0.3, 1.2, 1.3, 1.1, 1.4}), WestgardRule::R4_1s) == Ids{5});
    CHECK(where(series_of_z({-1.2, -1.3, -1.1, -1.4}), WestgardRule::R4_1s) == Ids{4});
  }
  SECTION("two controls over two runs") {
    CHECK(where(runs_of_z({{1.5, 1.2}, {1.1, 1.3}}), WestgardRule::R4_1s) == Ids{4});
  }
  SECTION("near misses") {
    CHECK(where(series_of_z({1.2, 1.3, 1.1}), WestgardRule::R4_1s).empty());        // three only
    CHECK(where(series_of_z({1.2, 1.3, 1.1, 1.0}), WestgardRule::R4_1s).empty());   // exactly 1s
    CHECK(where(series_of_z({1.2, 1.3, -1.1, 1.4}), WestgardRule::R4_1s).empty());  // sides mix
    CHECK(where(series_of_z({1.2, 1.3, 0.9, 1.1, 1.4}), WestgardRule::R4_1s).empty());
  }
  SECTION("a persisting shift is reported at each observation that completes four") {
    CHECK(where(series_of_z({1.2, 1.3, 1.1, 1.4, 1.5}), WestgardRule::R4_1s) == Ids{4, 5});
  }
}

TEST_CASE("westgard: 10-x, ten consecutive on one side of the mean", "[rules]") {
  // Definition: calibration-practice.md §8.2 (a value exactly at the mean breaks the streak).
  // Sequences constructed here.
  const std::vector<double> ten_above = {0.4, 0.7, 0.3, 0.9, 0.2, 0.6, 0.1, 0.8, 0.4, 0.5};
  SECTION("ten above, ten below") {
    CHECK(where(series_of_z(ten_above), WestgardRule::R10x) == Ids{10});
    std::vector<double> ten_below;
    for (double z : ten_above) ten_below.push_back(-z);
    CHECK(where(series_of_z(ten_below), WestgardRule::R10x) == Ids{10});
  }
  SECTION("across runs with two controls per run") {
    CHECK(where(runs_of_z({{0.4, 0.7}, {0.3, 0.9}, {0.2, 0.6}, {0.1, 0.8}, {0.4, 0.5}}),
                WestgardRule::R10x) == Ids{10});
  }
  SECTION("nine on one side is not 10-x") {
    const std::vector<double> nine(ten_above.begin(), ten_above.end() - 1);
    CHECK(where(series_of_z(nine), WestgardRule::R10x).empty());
  }
  SECTION("a value exactly at the mean breaks the streak") {
    std::vector<double> z = ten_above;
    z.insert(z.begin() + 5, 0.0);  // eleven values, the sixth at the mean (recovery 100.0)
    CHECK(where(series_of_z(z), WestgardRule::R10x).empty());
  }
  SECTION("a value on the other side breaks the streak") {
    std::vector<double> z = ten_above;
    z[5] = -0.6;
    CHECK(where(series_of_z(z), WestgardRule::R10x).empty());
  }
  SECTION("a persisting shift is reported at each observation that completes ten") {
    std::vector<double> z = ten_above;
    z.push_back(0.3);
    CHECK(where(series_of_z(z), WestgardRule::R10x) == Ids{10, 11});
  }
}

TEST_CASE("westgard: the series must be in time order with finite values and usable limits",
          "[rules]") {
  auto obs = series_of_z({0.1, 0.2, 0.3});
  SECTION("two observations at the same instant are in order") {
    obs[1].at = obs[0].at;
    CHECK(evaluate_all(obs).empty());
  }
  SECTION("an earlier observation after a later one is refused") {
    obs[2].at = obs[0].at - 1s;
    CHECK_THROWS_AS(evaluate_all(obs), ValidationError);
  }
  SECTION("a recovery that is not a number is refused") {
    obs[1].recovery_pct = std::numeric_limits<double>::quiet_NaN();
    CHECK_THROWS_AS(evaluate_all(obs), ValidationError);
  }
  SECTION("limits without a positive SD are refused") {
    Limits l = s5_limits();
    l.sd = 0;
    CHECK_THROWS_AS(evaluate_westgard(obs, l, all_westgard_rules()), ValidationError);
  }
  SECTION("an empty series has no violations") {
    CHECK(evaluate_all({}).empty());
  }
}

TEST_CASE("westgard: the method's trend_rules decide which violations make a curve stale",
          "[rules]") {
  // Rule tokens of product.md §4.1; 1-2s is a warning only (calibration-practice.md §8.2).
  CHECK(rejection_rules({"1-2s", "2-2s", "10-x"}) ==
        std::set<WestgardRule>{WestgardRule::R2_2s, WestgardRule::R10x});
  CHECK(rejection_rules({"1-2s"}).empty());
  CHECK(rejection_rules({}).empty());
  CHECK(rejection_rules({"1-3s", "2-2s", "R-4s", "4-1s", "10-x", "1-2s"}).size() == 5);
  CHECK_THROWS_AS(rejection_rules({"2-2s", "2of3-2s"}), ValidationError);

  // On the S5 sequence (calibration-practice.md §9; violations as in the test above), a method
  // listing 1-2s, 1-3s and 10-x goes stale on run 9 (1-3s) and run 25 (10-x) only.
  const auto obs = s5_series();
  const auto found = evaluate_all(obs);
  const auto stale = stale_violations(found, {"1-2s", "1-3s", "10-x"});
  REQUIRE(stale.size() == 2);
  CHECK(stale[0].rule == WestgardRule::R1_3s);
  CHECK(stale[0].check_id == CheckId{9});
  CHECK(stale[0].at == obs[8].at);
  CHECK(stale[1].rule == WestgardRule::R10x);
  CHECK(stale[1].check_id == CheckId{25});
  CHECK(stale_violations(found, {"1-2s"}).empty());
  CHECK(stale_violations(found, {}).empty());
  CHECK(stale_violations({}, {"1-3s"}).empty());
}
