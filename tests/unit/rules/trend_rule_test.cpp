// SPDX-License-Identifier: Apache-2.0
// The trend-violation rule and the trend analysis it shares with the `trend` command: a
// constructed drift that completes a listed Westgard rule at the curve's own check makes it
// stale from that check; near misses, unlisted rules, 1-2s alone, violations completed at an
// older curve's check and limits not yet established do not; with check-failed it is reported
// too; facts after T never change the answer for T. Recoveries are constructed here on method
// targets mean 100 %, s 2 %, so a recovery is 100 + 2·z.
#include <catch2/catch.hpp>

#include "rules/curve_facts.h"
#include "rules/rule.h"
#include "rules/trend.h"

namespace {

using namespace cw;

Instant t(const char* iso) {
  return parse_instant(iso);
}

/// One method, instrument and lot; curve 1 (acquired 08:00) and an older curve 0 of the same
/// group (acquired the day before).
struct World {
  LabZone zone = LabZone::named("UTC");
  Method method;
  Instrument instrument;
  Lot lot;
  Curve older;
  Curve curve;
  std::vector<Check> group;  ///< every check of the group, in time order
  std::int64_t next_id = 1;

  explicit World(std::vector<std::string> trend_rules, bool targets = true) {
    MethodVersion v1;
    v1.id = MethodVersionId{1};
    v1.method_id = MethodId{1};
    v1.version = 1;
    v1.effective_at = t("2026-01-01T00:00:00Z");
    v1.definition.code = "M";
    v1.definition.unit = "mg/L";
    v1.definition.calibration.valid_for = parse_duration("30 days");
    v1.definition.calibration.review_required = false;
    v1.definition.check.tolerance_pct = 10;
    v1.definition.check.trend_rules = std::move(trend_rules);
    if (targets) {
      v1.definition.check.trend_mean = 100;
      v1.definition.check.trend_sd = 2;
    }
    method.id = MethodId{1};
    method.code = "M";
    method.versions = {v1};
    instrument.id = InstrumentId{1};
    lot.id = LotId{1};
    lot.expires_on = parse_date("2027-12-31");
    for (Curve* c : {&older, &curve}) {
      c->method_id = MethodId{1};
      c->method_version_id = MethodVersionId{1};
      c->instrument_id = InstrumentId{1};
      c->analyte = "nitrate";
      c->verdict = Verdict::Accepted;
    }
    older.id = CurveId{0};
    older.acquired_at = t("2026-03-01T08:00:00Z");
    curve.id = CurveId{1};
    curve.acquired_at = t("2026-03-02T08:00:00Z");
  }

  /// A check standard of nominal 10 at `iso` against `c` with `recovery` percent.
  void check(const Curve& c, const char* iso, double recovery) {
    Check k;
    k.id = CheckId{next_id++};
    k.curve_id = c.id;
    k.kind = CheckKind::Check;
    k.nominal = 10;
    k.measured = recovery / 10;
    k.recovery_pct = recovery;
    k.limit_low = 90;
    k.limit_high = 110;
    k.passed = recovery >= 90 && recovery <= 110;
    k.occurred_at = t(iso);
    group.push_back(k);
  }

  rules::CurveFacts facts() const {
    rules::CurveFacts f;
    f.curve = &curve;
    f.method = &method;
    f.instrument = &instrument;
    f.lots = {&lot};
    for (const auto& k : group) {
      if (k.curve_id == curve.id) f.checks.push_back(k);
    }
    f.group_checks = group;
    return f;
  }

  CurveStatus at(const char* iso) const { return rules::evaluate(facts(), t(iso), zone); }
};

std::vector<std::string> reasons(const CurveStatus& s) {
  std::vector<std::string> out;
  for (const auto& f : s.reasons) out.emplace_back(to_string(f.reason));
  std::sort(out.begin(), out.end());
  return out;
}

}  // namespace

TEST_CASE("trend-violation: a drift completing 2-2s at the curve's check makes it stale",
          "[rules]") {
  World w({"2-2s"});
  w.check(w.curve, "2026-03-02T09:00:00Z", 101.0);  // z +0.5
  w.check(w.curve, "2026-03-02T10:00:00Z", 104.5);  // z +2.25
  w.check(w.curve, "2026-03-02T11:00:00Z", 104.2);  // z +2.1: the second beyond +2s
  CHECK(w.at("2026-03-02T10:30:00Z").state == CurveState::Active);
  const CurveStatus s = w.at("2026-03-02T11:00:00Z");
  CHECK(s.state == CurveState::Stale);
  REQUIRE(reasons(s) == std::vector<std::string>{"trend-violation"});
  CHECK(s.reasons[0].since == t("2026-03-02T11:00:00Z"));
  CHECK_THAT(s.reasons[0].message, Catch::Contains("2-2s at check 3"));
  CHECK_THAT(s.reasons[0].message, Catch::Contains("recovery 104.2 %"));
}

TEST_CASE("trend-violation: near misses and unlisted rules leave the curve active", "[rules]") {
  SECTION("the second result exactly at +2s does not exceed it") {
    World w({"2-2s"});
    w.check(w.curve, "2026-03-02T09:00:00Z", 104.5);
    w.check(w.curve, "2026-03-02T10:00:00Z", 104.0);  // z = 2 exactly: not beyond
    CHECK(w.at("2026-03-02T12:00:00Z").state == CurveState::Active);
  }
  SECTION("2-2s violated but the method lists only 1-3s") {
    World w({"1-3s"});
    w.check(w.curve, "2026-03-02T09:00:00Z", 104.5);
    w.check(w.curve, "2026-03-02T10:00:00Z", 104.2);
    CHECK(w.at("2026-03-02T12:00:00Z").state == CurveState::Active);
  }
  SECTION("1-2s listed alone is a warning and never makes a curve stale") {
    World w({"1-2s"});
    w.check(w.curve, "2026-03-02T09:00:00Z", 105.0);  // z +2.5
    CHECK(w.at("2026-03-02T12:00:00Z").state == CurveState::Active);
  }
  SECTION("no trend rules at all") {
    World w({});
    w.check(w.curve, "2026-03-02T09:00:00Z", 107.0);  // z +3.5, 1-3s
    CHECK(w.at("2026-03-02T12:00:00Z").state == CurveState::Active);
  }
}

TEST_CASE("trend-violation: a violation completed at an older curve's check does not count",
          "[rules]") {
  World w({"2-2s", "4-1s"});
  w.check(w.older, "2026-03-01T09:00:00Z", 104.5);
  w.check(w.older, "2026-03-01T10:00:00Z", 104.2);  // 2-2s completed on the older curve
  w.check(w.curve, "2026-03-02T09:00:00Z", 100.5);
  CHECK(w.at("2026-03-02T12:00:00Z").state == CurveState::Active);
  // A streak that runs across the recalibration counts where it is completed: 4-1s here.
  World d({"4-1s"});
  d.check(d.older, "2026-03-01T09:00:00Z", 102.5);
  d.check(d.older, "2026-03-01T10:00:00Z", 102.4);
  d.check(d.older, "2026-03-01T11:00:00Z", 102.6);
  d.check(d.curve, "2026-03-02T09:00:00Z", 102.3);  // the fourth beyond +1s
  const CurveStatus s = d.at("2026-03-02T12:00:00Z");
  REQUIRE(reasons(s) == std::vector<std::string>{"trend-violation"});
  CHECK_THAT(s.reasons[0].message, Catch::Contains("4-1s at check 4"));
}

TEST_CASE("trend-violation: limits from fewer than 20 passing checks make nothing stale",
          "[rules]") {
  // Without targets, limits come from the passing checks: recoveries alternating 99 and 101
  // (mean 100, s = 1.054 for 10 of them, 1.026 for 20) and then a check at 112 %, which fails
  // 90–110 % (so it is not among the passing checks) and lies beyond 3s (constructed here).
  const auto series = [](World& w, int n) {
    for (int i = 0; i < n; ++i) {
      const std::string iso =
          "2026-03-02T09:" + std::string(i < 10 ? "0" : "") + std::to_string(i) + ":00Z";
      w.check(w.curve, iso.c_str(), i % 2 ? 101.0 : 99.0);
    }
  };
  World few({"1-3s"}, /*targets=*/false);
  series(few, 10);
  few.check(few.curve, "2026-03-02T10:00:00Z", 112.0);
  const rules::TrendAnalysis t1 = rules::analyse_trend(
      few.group, few.method.versions[0].definition.check, parse_instant("2026-03-02T11:00:00Z"));
  REQUIRE(t1.limits);
  CHECK_FALSE(t1.established);
  CHECK(t1.limits->n == 10);
  CHECK(t1.limits->mean == Approx(100.0).epsilon(1e-12));
  CHECK(t1.limits->sd == Approx(1.0540925534).epsilon(1e-9));  // sqrt(10/9)
  REQUIRE(t1.violations.size() == 2);                          // shown on the chart (z = 11.4) ...
  CHECK(t1.violations[0].rule == rules::WestgardRule::R1_2s);
  CHECK(t1.violations[1].rule == rules::WestgardRule::R1_3s);
  // ... but no reason to stop using the curve beyond the failed check itself.
  CHECK(reasons(few.at("2026-03-02T11:00:00Z")) == std::vector<std::string>{"check-failed"});

  World many({"1-3s"}, /*targets=*/false);
  series(many, 22);
  many.check(many.curve, "2026-03-02T10:00:00Z", 112.0);
  const rules::TrendAnalysis t2 = rules::analyse_trend(
      many.group, many.method.versions[0].definition.check, parse_instant("2026-03-02T11:00:00Z"));
  REQUIRE(t2.limits);
  CHECK(t2.established);
  CHECK(t2.limits->n == 20);
  CHECK(t2.limits->sd == Approx(1.0259783521).epsilon(1e-9));  // sqrt(20/19)
  CHECK(reasons(many.at("2026-03-02T11:00:00Z")) ==
        std::vector<std::string>{"check-failed", "trend-violation"});
}

TEST_CASE("trend-violation: reported together with check-failed", "[rules]") {
  World w({"1-3s"});
  w.check(w.curve, "2026-03-02T09:00:00Z", 115.0);  // fails 90–110 % and z +7.5
  CHECK(reasons(w.at("2026-03-02T10:00:00Z")) ==
        std::vector<std::string>{"check-failed", "trend-violation"});
}

TEST_CASE("trend-violation: facts after T never change the answer for T", "[rules]") {
  World w({"2-2s", "1-3s"});
  w.check(w.curve, "2026-03-02T09:00:00Z", 100.5);
  w.check(w.curve, "2026-03-02T10:00:00Z", 99.0);
  const CurveStatus before = w.at("2026-03-02T10:30:00Z");
  w.check(w.curve, "2026-03-02T11:00:00Z", 107.0);  // 1-3s after T
  w.check(w.curve, "2026-03-02T12:00:00Z", 104.5);  // 2-2s after T
  const CurveStatus after = w.at("2026-03-02T10:30:00Z");
  CHECK(before.state == CurveState::Active);
  CHECK(after.state == before.state);
  CHECK(after.reasons == before.reasons);
  CHECK(w.at("2026-03-02T12:00:00Z").state == CurveState::Stale);
}
