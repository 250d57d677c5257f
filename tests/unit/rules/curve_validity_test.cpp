// SPDX-License-Identifier: Apache-2.0
// The rules engine: each stale reason alone and in pairs, state precedence, boundaries, and
// the property that facts after T never change the answer for T.
#include <catch2/catch.hpp>
#include <random>

#include "rules/curve_facts.h"

namespace {

using namespace cw;
using namespace std::chrono_literals;

Instant t(const char* iso) {
  return parse_instant(iso);
}

/// A small world: one method (v1, optionally more versions), one instrument, one lot, one curve.
struct World {
  LabZone zone = LabZone::named("Europe/Berlin");
  Method method;
  Instrument instrument;
  Lot lot;
  Curve curve;
  std::vector<Check> checks;

  World() {
    MethodVersion v1;
    v1.id = MethodVersionId{1};
    v1.method_id = MethodId{1};
    v1.version = 1;
    v1.effective_at = t("2026-01-01T00:00:00Z");
    v1.definition.code = "M";
    v1.definition.unit = "mg/L";
    v1.definition.calibration.valid_for = parse_duration("7 days");
    v1.definition.calibration.review_required = false;
    method.id = MethodId{1};
    method.code = "M";
    method.versions = {v1};
    instrument.id = InstrumentId{1};
    instrument.code = "IC-1";
    lot.id = LotId{1};
    lot.code = "LOT-A";
    lot.expires_on = parse_date("2026-12-31");
    curve.id = CurveId{1};
    curve.method_id = MethodId{1};
    curve.method_version_id = MethodVersionId{1};
    curve.instrument_id = InstrumentId{1};
    curve.acquired_at = t("2026-03-02T08:00:00Z");
    curve.analyst = "alice";
    curve.analyte = "nitrate";
    curve.verdict = Verdict::Accepted;
  }

  rules::CurveFacts facts() const {
    rules::CurveFacts f;
    f.curve = &curve;
    f.method = &method;
    f.instrument = &instrument;
    f.lots = {&lot};
    f.checks = checks;
    return f;
  }

  CurveStatus at(const char* iso) const { return rules::evaluate(facts(), t(iso), zone); }

  void add_check(CheckId id, const char* iso, bool passed) {
    Check k;
    k.id = id;
    k.curve_id = curve.id;
    k.nominal = 10;
    k.measured = passed ? 10.1 : 8.0;
    k.recovery_pct = passed ? 101.0 : 80.0;
    k.limit_low = 90;
    k.limit_high = 110;
    k.passed = passed;
    k.occurred_at = t(iso);
    checks.push_back(k);
  }
};

std::vector<std::string> reason_tokens(const CurveStatus& s) {
  std::vector<std::string> out;
  for (const auto& f : s.reasons) out.emplace_back(to_string(f.reason));
  std::sort(out.begin(), out.end());
  return out;
}

}  // namespace

TEST_CASE("rules: a fresh accepted curve without review is active", "[rules]") {
  World w;
  const auto s = w.at("2026-03-02T09:00:00Z");
  CHECK(s.state == CurveState::Active);
  CHECK(s.reasons.empty());
}

TEST_CASE("rules: expired exactly at acquired + valid_for, not a second before", "[rules]") {
  World w;
  // 7 calendar days in Europe/Berlin from 2026-03-02 09:00 local: 2026-03-09 09:00 local
  // (both dates in CET, UTC+1), i.e. 08:00Z.
  CHECK(w.at("2026-03-09T07:59:59Z").state == CurveState::Active);
  const auto s = w.at("2026-03-09T08:00:00Z");
  CHECK(s.state == CurveState::Stale);
  CHECK(reason_tokens(s) == std::vector<std::string>{"expired"});
  CHECK(*s.reasons[0].since == t("2026-03-09T08:00:00Z"));
}

TEST_CASE("rules: calendar days keep the lab-local wall clock across a DST change", "[rules]") {
  World w;
  // Acquired Monday 2026-03-23 09:00 CET (08:00Z). CEST starts on 2026-03-29 (last Sunday of
  // March, EU rule), so 7 days later 09:00 local is 07:00Z, not 08:00Z.
  w.curve.acquired_at = t("2026-03-23T08:00:00Z");
  CHECK(w.at("2026-03-30T06:59:59Z").state == CurveState::Active);
  CHECK(w.at("2026-03-30T07:00:00Z").state == CurveState::Stale);
}

TEST_CASE("rules: method-revised from the new version's effective time", "[rules]") {
  World w;
  MethodVersion v2 = w.method.versions[0];
  v2.id = MethodVersionId{2};
  v2.version = 2;
  v2.effective_at = t("2026-03-03T12:00:00Z");
  v2.reason = "new column";
  w.method.versions.push_back(v2);
  CHECK(w.at("2026-03-03T11:59:59Z").state == CurveState::Active);
  const auto s = w.at("2026-03-03T12:00:00Z");
  CHECK(reason_tokens(s) == std::vector<std::string>{"method-revised"});
  CHECK_THAT(s.reasons[0].message, Catch::Contains("version 2") && Catch::Contains("new column"));
}

TEST_CASE("rules: check-failed from the failing check on, one minute before is still active",
          "[rules]") {
  World w;
  w.add_check(CheckId{1}, "2026-03-02T10:00:00Z", false);
  CHECK(w.at("2026-03-02T09:59:00Z").state == CurveState::Active);
  const auto s = w.at("2026-03-02T10:01:00Z");
  CHECK(s.state == CurveState::Stale);
  CHECK(reason_tokens(s) == std::vector<std::string>{"check-failed"});
  // A later passing check does not revive a curve whose check failed.
  w.add_check(CheckId{2}, "2026-03-02T11:00:00Z", true);
  CHECK(reason_tokens(w.at("2026-03-02T11:30:00Z")) == std::vector<std::string>{"check-failed"});
}

TEST_CASE("rules: check-overdue after check_every, cleared by a passing check", "[rules]") {
  World w;
  w.method.versions[0].definition.check.check_every = parse_duration("12 hours");
  CHECK(w.at("2026-03-02T19:59:59Z").state == CurveState::Active);
  CHECK(reason_tokens(w.at("2026-03-02T20:00:00Z")) == std::vector<std::string>{"check-overdue"});
  w.add_check(CheckId{1}, "2026-03-02T21:00:00Z", true);
  CHECK(w.at("2026-03-02T21:00:00Z").state == CurveState::Active);
  CHECK(reason_tokens(w.at("2026-03-03T09:00:00Z")) == std::vector<std::string>{"check-overdue"});
  // A failing check does not reset the clock.
  w.add_check(CheckId{2}, "2026-03-03T08:00:00Z", false);
  CHECK(reason_tokens(w.at("2026-03-03T09:00:00Z")) ==
        std::vector<std::string>{"check-failed", "check-overdue"});
}

TEST_CASE("rules: lot-expired at the end of the lab-local day, across a DST change", "[rules]") {
  World w;
  w.curve.acquired_at = t("2026-03-27T08:00:00Z");
  w.lot.expires_on = parse_date("2026-03-29");
  // 2026-03-29 is the day CEST begins (01:00Z); the day ends at 2026-03-30 00:00 CEST =
  // 2026-03-29T22:00Z.
  CHECK(w.at("2026-03-29T21:59:59Z").state == CurveState::Active);
  const auto s = w.at("2026-03-29T22:00:00Z");
  CHECK(reason_tokens(s) == std::vector<std::string>{"lot-expired"});
  CHECK(*s.reasons[0].since == t("2026-03-29T22:00:00Z"));
}

TEST_CASE("rules: the in-use expiry counts when it is earlier", "[rules]") {
  World w;
  w.lot.opened_on = parse_date("2026-02-20");
  w.lot.in_use_days = 14;  // in use until 2026-03-06, earlier than the certificate's 2026-12-31
  CHECK(w.at("2026-03-06T22:59:59Z").state ==
        CurveState::Active);  // 2026-03-07 00:00 CET = 2026-03-06T23:00Z
  CHECK(reason_tokens(w.at("2026-03-06T23:00:00Z")) == std::vector<std::string>{"lot-expired"});
}

TEST_CASE("rules: lot-withdrawn and instrument-serviced hold from their events", "[rules]") {
  World w;
  w.lot.withdrawal = LotWithdrawal{"contaminated", t("2026-03-03T10:00:00Z")};
  w.instrument.service = {{ServiceDirection::Out, "detector lamp", t("2026-03-04T10:00:00Z")},
                          {ServiceDirection::Back, "lamp replaced", t("2026-03-04T15:00:00Z")}};
  CHECK(w.at("2026-03-03T09:59:59Z").state == CurveState::Active);
  CHECK(reason_tokens(w.at("2026-03-03T10:00:00Z")) == std::vector<std::string>{"lot-withdrawn"});
  // Returning the instrument to service does not revive the curve.
  CHECK(reason_tokens(w.at("2026-03-05T00:00:00Z")) ==
        std::vector<std::string>{"instrument-serviced", "lot-withdrawn"});
}

TEST_CASE("rules: service before acquisition does not count", "[rules]") {
  World w;
  w.instrument.service = {{ServiceDirection::Out, "pm", t("2026-03-01T08:00:00Z")},
                          {ServiceDirection::Back, "done", t("2026-03-01T12:00:00Z")}};
  CHECK(w.at("2026-03-02T09:00:00Z").state == CurveState::Active);
}

TEST_CASE("rules: every pair of stale reasons is reported together", "[rules]") {
  // Each reason has a setter; every pair must give exactly the two tokens.
  using Setter = void (*)(World&);
  const std::vector<std::pair<std::string, Setter>> reasons = {
      {"expired", [](World&) {}},  // handled by the time asked
      {"method-revised",
       [](World& w) {
         MethodVersion v2 = w.method.versions[0];
         v2.id = MethodVersionId{2};
         v2.version = 2;
         v2.effective_at = t("2026-03-05T00:00:00Z");
         w.method.versions.push_back(v2);
       }},
      {"check-failed", [](World& w) { w.add_check(CheckId{9}, "2026-03-05T00:00:00Z", false); }},
      {"check-overdue",
       [](World& w) {
         w.method.versions[0].definition.check.check_every = parse_duration("3 days");
       }},
      {"lot-expired", [](World& w) { w.lot.expires_on = parse_date("2026-03-04"); }},
      {"lot-withdrawn",
       [](World& w) {
         w.lot.withdrawal = LotWithdrawal{"recall", t("2026-03-05T00:00:00Z")};
       }},
      {"instrument-serviced",
       [](World& w) {
         w.instrument.service = {{ServiceDirection::Out, "repair", t("2026-03-05T00:00:00Z")}};
       }},
  };
  for (std::size_t i = 0; i < reasons.size(); ++i) {
    for (std::size_t j = i + 1; j < reasons.size(); ++j) {
      World w;
      reasons[i].second(w);
      reasons[j].second(w);
      const bool expired = reasons[i].first == "expired" || reasons[j].first == "expired";
      // 2026-03-06 is before the 7-day expiry (03-09); 2026-03-10 is after it.
      const auto s = w.at(expired ? "2026-03-10T00:00:00Z" : "2026-03-06T00:00:00Z");
      std::vector<std::string> expected = {reasons[i].first, reasons[j].first};
      std::sort(expected.begin(), expected.end());
      INFO(reasons[i].first << " + " << reasons[j].first);
      CHECK(s.state == CurveState::Stale);
      CHECK(reason_tokens(s) == expected);
    }
  }
}

TEST_CASE("rules: state precedence: rejected, retired, awaiting-review, stale", "[rules]") {
  World w;
  w.method.versions[0].definition.calibration.review_required = true;
  SECTION("awaiting review until approved, then active") {
    CHECK(w.at("2026-03-02T09:00:00Z").state == CurveState::AwaitingReview);
    w.curve.reviews.push_back({ReviewDecision::Approve, "bob", "ok", t("2026-03-02T10:00:00Z")});
    CHECK(w.at("2026-03-02T09:59:59Z").state == CurveState::AwaitingReview);
    CHECK(w.at("2026-03-02T10:00:00Z").state == CurveState::Active);
  }
  SECTION("a reviewer's rejection is final") {
    w.curve.reviews.push_back(
        {ReviewDecision::Reject, "bob", "bad peak shape", t("2026-03-02T10:00:00Z")});
    const auto s = w.at("2026-03-02T11:00:00Z");
    CHECK(s.state == CurveState::Rejected);
    CHECK_THAT(s.cause->message, Catch::Contains("bob") && Catch::Contains("bad peak shape"));
  }
  SECTION("retired beats stale reasons") {
    w.curve.reviews.push_back({ReviewDecision::Approve, "bob", "ok", t("2026-03-02T10:00:00Z")});
    w.curve.retirements.push_back({"carol", "column changed", t("2026-03-03T10:00:00Z")});
    CHECK(w.at("2026-03-03T09:00:00Z").state == CurveState::Active);
    CHECK(w.at("2026-03-10T00:00:00Z").state == CurveState::Retired);
  }
  SECTION("failed acceptance is rejected whatever else holds") {
    w.curve.verdict = Verdict::Rejected;
    w.curve.failed_criteria = {cw::fitting::Criterion::R2BelowMin};
    CHECK(w.at("2026-03-02T09:00:00Z").state == CurveState::Rejected);
  }
}

TEST_CASE("rules: superseded by a newer active curve of the same group", "[rules]") {
  World w;
  Curve newer = w.curve;
  newer.id = CurveId{2};
  newer.acquired_at = t("2026-03-03T08:00:00Z");
  rules::CurveFacts newer_facts = w.facts();
  newer_facts.curve = &newer;
  const auto before = rules::evaluate(w.facts(), t("2026-03-03T07:59:59Z"), w.zone, {&newer_facts});
  CHECK(before.state == CurveState::Active);
  const auto after = rules::evaluate(w.facts(), t("2026-03-03T08:00:00Z"), w.zone, {&newer_facts});
  CHECK(reason_tokens(after) == std::vector<std::string>{"superseded"});
  // A newer curve that is not active (here rejected) does not supersede.
  newer.verdict = Verdict::Rejected;
  CHECK(rules::evaluate(w.facts(), t("2026-03-03T09:00:00Z"), w.zone, {&newer_facts}).state ==
        CurveState::Active);
}

TEST_CASE("rules: facts after T never change the answer for T (random histories)", "[rules]") {
  std::mt19937 rng(20261201);
  std::uniform_int_distribution<int> minutes(0, 14 * 24 * 60);
  std::bernoulli_distribution coin(0.5);
  const Instant base = t("2026-03-02T08:00:00Z");
  auto at_minute = [&](int m) { return base + std::chrono::minutes{m}; };
  for (int trial = 0; trial < 300; ++trial) {
    World all;
    all.method.versions[0].definition.calibration.review_required = coin(rng);
    if (coin(rng)) all.method.versions[0].definition.check.check_every = parse_duration("12 hours");
    std::vector<std::pair<Instant, std::function<void(World&)>>> events;
    // Random events with their times; each is applied to a world only when it is <= T there.
    const int n = 1 + static_cast<int>(rng() % 8);
    for (int e = 0; e < n; ++e) {
      const Instant when = at_minute(minutes(rng));
      switch (rng() % 6) {
        case 0:
          events.push_back({when, [when](World& w) {
                              w.add_check(CheckId{static_cast<std::int64_t>(w.checks.size() + 1)},
                                          format_utc(when).c_str(), true);
                            }});
          break;
        case 1:
          events.push_back({when, [when](World& w) {
                              w.add_check(CheckId{static_cast<std::int64_t>(w.checks.size() + 1)},
                                          format_utc(when).c_str(), false);
                            }});
          break;
        case 2:
          events.push_back({when, [when](World& w) {
                              if (!w.lot.withdrawal) w.lot.withdrawal = LotWithdrawal{"r", when};
                            }});
          break;
        case 3:
          events.push_back({when, [when](World& w) {
                              w.instrument.service.push_back({ServiceDirection::Out, "s", when});
                            }});
          break;
        case 4:
          events.push_back(
              {when, [when](World& w) {
                 w.curve.reviews.push_back({ReviewDecision::Approve, "bob", "ok", when});
               }});
          break;
        default:
          events.push_back({when, [when](World& w) {
                              MethodVersion v = w.method.versions.back();
                              v.id = MethodVersionId{v.id.value + 1};
                              v.version += 1;
                              v.effective_at = when;
                              w.method.versions.push_back(v);
                            }});
      }
    }
    std::sort(events.begin(), events.end(),
              [](const auto& a, const auto& b) { return a.first < b.first; });
    for (auto& [when, apply] : events) apply(all);
    for (int probe = 0; probe < 5; ++probe) {
      const Instant T = at_minute(minutes(rng));
      World upto;
      upto.method.versions[0].definition = all.method.versions[0].definition;
      for (auto& [when, apply] : events) {
        if (when <= T) apply(upto);
      }
      const CurveStatus full = rules::evaluate(all.facts(), T, all.zone);
      const CurveStatus partial = rules::evaluate(upto.facts(), T, upto.zone);
      INFO("trial " << trial << " T " << format_utc(T));
      CHECK(full.state == partial.state);
      CHECK(reason_tokens(full) == reason_tokens(partial));
    }
  }
}
