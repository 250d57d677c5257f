// SPDX-License-Identifier: Apache-2.0
// Bracketing as a pure decision (product.md §5.4, calibration-practice.md §5.4) and the
// check-due refusal of quantitation: sequences constructed here, fed in injection order.
#include <catch2/catch.hpp>

#include <vector>

#include "domain/bracketing.h"
#include "domain/quantitation.h"

namespace {

using namespace cw;

Check passing(std::int64_t id) {
  Check k;
  k.id = CheckId{id};
  k.kind = CheckKind::Check;
  k.nominal = 10;
  k.measured = 10.1;
  k.recovery_pct = 101;
  k.limit_low = 90;
  k.limit_high = 110;
  k.passed = true;
  return k;
}

Check failing(std::int64_t id) {
  Check k = passing(id);
  k.measured = 8.6;
  k.recovery_pct = 86;
  k.passed = false;
  return k;
}

Check blank(std::int64_t id, bool passed) {
  Check k;
  k.id = CheckId{id};
  k.kind = CheckKind::Blank;
  k.measured = passed ? 0.01 : 0.2;
  k.limit_high = 0.05;
  k.passed = passed;
  return k;
}

std::vector<std::int64_t> ids(const std::vector<RerunDecision>& d) {
  std::vector<std::int64_t> out;
  for (const auto& x : d) out.push_back(x.result.value);
  return out;
}

}  // namespace

TEST_CASE("bracketing: samples between passing checks stay reported", "[domain]") {
  Bracket b(10, 0, {}, std::nullopt);
  CHECK(b.on_check(passing(1)).empty());
  for (std::int64_t r = 1; r <= 10; ++r) CHECK_FALSE(b.on_sample(ResultId{r}, true));
  CHECK(b.reported_since_check() == 10);
  CHECK(b.on_check(passing(2)).empty());
  CHECK(b.reported_since_check() == 0);
  CHECK(b.last_passing_check() == CheckId{2});
  CHECK(b.on_end().empty());
}

TEST_CASE("bracketing: a failing check flips every result since the last passing check",
          "[domain]") {
  Bracket b(10, 0, {}, std::nullopt);
  b.on_check(passing(1));
  b.on_sample(ResultId{1}, true);
  b.on_sample(ResultId{2}, true);
  b.on_check(passing(2));
  b.on_sample(ResultId{3}, true);
  b.on_sample(ResultId{4}, false);  // refused: nothing to bracket
  b.on_sample(ResultId{5}, true);
  const auto flipped = b.on_check(failing(3), 9);
  CHECK(ids(flipped) == std::vector<std::int64_t>{3, 5});
  for (const auto& d : flipped) {
    CHECK(d.reason == RerunReason::CheckFailed);
    CHECK(d.check == CheckId{3});
    CHECK_THAT(d.detail, Catch::Contains("check 3 at position 9 failed: recovery 86.0 %"));
  }
  CHECK(b.has_failed());
  // Later in the sequence the analyte stays failed: a reported sample (which the curve's state
  // would refuse anyway) is flipped at once, and a later passing check rescues nothing.
  const auto late = b.on_sample(ResultId{6}, true);
  REQUIRE(late);
  CHECK(late->reason == RerunReason::CheckFailed);
  CHECK(b.on_check(passing(4)).empty());
  CHECK(b.on_end().empty());
}

TEST_CASE("bracketing: samples beyond samples_per_check are rerun-required", "[domain]") {
  Bracket b(3, 0, {}, std::nullopt);
  b.on_check(passing(1));
  CHECK_FALSE(b.on_sample(ResultId{1}, true));
  CHECK_FALSE(b.on_sample(ResultId{2}, true));
  CHECK_FALSE(b.on_sample(ResultId{3}, true));
  const auto fourth = b.on_sample(ResultId{4}, true, 6);
  REQUIRE(fourth);
  CHECK(fourth->reason == RerunReason::SamplesPerCheck);
  CHECK(fourth->check == CheckId{1});
  CHECK_THAT(fourth->detail, Catch::Contains("reported sample number 4 since check 1"));
  CHECK_THAT(fourth->detail, Catch::Contains("allows 3"));
  // Refused samples do not count; the next passing check starts the count again and closes
  // the bracket of the first three (the fourth is already rerun-required, not open).
  CHECK_FALSE(b.on_sample(ResultId{5}, false));
  CHECK(b.on_check(passing(2)).empty());
  CHECK_FALSE(b.on_sample(ResultId{6}, true));
  // A failure now reaches back only to the passing check 2.
  CHECK(ids(b.on_check(failing(3))) == std::vector<std::int64_t>{6});
}

TEST_CASE(
    "bracketing: a sequence that ends without a closing check leaves its trailing "
    "results rerun-required",
    "[domain]") {
  // Two results reported before the sequence since the curve's last passing check (8): they
  // are the sequence's to close, but it does not own them.
  Bracket b(10, 2, {ResultId{101}, ResultId{102}}, CheckId{8});
  b.on_sample(ResultId{1}, true);
  b.on_sample(ResultId{2}, true);
  const auto end = b.on_end();
  CHECK(ids(end) == std::vector<std::int64_t>{1, 2});
  for (const auto& d : end) {
    CHECK(d.reason == RerunReason::NoClosingCheck);
    CHECK(d.check == CheckId{8});
  }
  // The count carried in from before the sequence counts toward samples_per_check.
  Bracket c(3, 2, {ResultId{101}, ResultId{102}}, CheckId{8});
  CHECK_FALSE(c.on_sample(ResultId{1}, true));
  CHECK(c.on_sample(ResultId{2}, true));  // the fourth since check 8
  // And a failing first check reaches back to them.
  Bracket d(10, 2, {ResultId{101}, ResultId{102}}, CheckId{8});
  d.on_sample(ResultId{1}, true);
  CHECK(ids(d.on_check(failing(9))) == std::vector<std::int64_t>{101, 102, 1});
}

TEST_CASE("bracketing: blanks never close a bracket, a failing blank fails it", "[domain]") {
  Bracket b(10, 0, {}, std::nullopt);
  b.on_check(passing(1));
  b.on_sample(ResultId{1}, true);
  CHECK(b.on_check(blank(2, true)).empty());
  CHECK(b.open_count() == 1);  // still open: a passing blank closes nothing
  const auto flipped = b.on_check(blank(3, false), 5);
  CHECK(ids(flipped) == std::vector<std::int64_t>{1});
  CHECK_THAT(flipped.front().detail, Catch::Contains("blank 3 at position 5 failed: measured 0.2"));
  CHECK_FALSE(closes_bracket(blank(4, true)));
  CHECK(closes_bracket(passing(5)));
  CHECK_FALSE(closes_bracket(failing(6)));
}

TEST_CASE("quantitation: check-due once samples_per_check results were reported", "[domain]") {
  CheckRules rules;
  rules.samples_per_check = 10;
  Curve curve;
  curve.id = CurveId{7};
  CHECK_FALSE(check_due(rules, curve, {9, CheckId{3}, std::nullopt}));
  const auto due = check_due(rules, curve, {10, CheckId{3}, std::nullopt});
  REQUIRE(due);
  CHECK(due->reason == Reason::CheckDue);
  CHECK_THAT(due->message, Catch::Contains("allows 10 sample(s) after a passing check; 10 have "
                                           "been reported from curve 7 since check 3"));
  const auto none = check_due(rules, curve, {10, std::nullopt, std::nullopt});
  REQUIRE(none);
  CHECK_THAT(none->message, Catch::Contains("since it was acquired"));
  rules.samples_per_check.reset();
  CHECK_FALSE(check_due(rules, curve, {1000, std::nullopt, std::nullopt}));
}

TEST_CASE("quantitation: check-failed when the check ending the moment's bracket failed",
          "[domain]") {
  ChecksSoFar so_far{0, CheckId{1}, std::nullopt};
  CHECK_FALSE(bracket_failed(so_far));  // no check logged for a later time
  so_far.next_check = passing(2);
  CHECK_FALSE(bracket_failed(so_far));  // the bracket is closed by a passing check
  Check later = failing(3);
  later.occurred_at = Instant{std::chrono::seconds{1'780'000'000}};
  so_far.next_check = later;
  const auto failed = bracket_failed(so_far);
  REQUIRE(failed);
  CHECK(failed->reason == Reason::CheckFailed);
  CHECK(failed->since == later.occurred_at);
  CHECK_THAT(failed->message, Catch::Contains("check 3 failed: recovery 86.0 %") &&
                                  Catch::Contains("every result of this bracket must be re-run"));
}
