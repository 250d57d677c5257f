// SPDX-License-Identifier: Apache-2.0
// The pure decisions of the domain, on the Miller & Miller fluorescence calibration
// (calibration-practice.md §9 M1; exact values [C] from calibration-check-values.py): judging a
// check or blank, deciding a quantitation, and the expiry moment of a curve.
#include <catch2/catch.hpp>
#include <chrono>
#include <string>

#include "core/error.h"
#include "domain/check_judgement.h"
#include "domain/expiry.h"
#include "domain/quantitation.h"
#include "fitting/fit.h"

namespace {

using Catch::Matchers::WithinRel;

// §9 M1: x (pg/mL) = 0, 2, 4, 6, 8, 10, 12; y = 2.1, 5.0, 9.0, 12.6, 17.3, 21.0, 24.7.
cw::fitting::FitResult m1_fit() {
  std::vector<cw::fitting::Observation> obs;
  const double x[] = {0, 2, 4, 6, 8, 10, 12};
  const double y[] = {2.1, 5.0, 9.0, 12.6, 17.3, 21.0, 24.7};
  for (int i = 0; i < 7; ++i) obs.push_back({x[i], y[i], false});
  return cw::fitting::fit(cw::fitting::Model::Linear, cw::fitting::Weighting::None, obs);
}

cw::MethodDefinition method() {
  cw::MethodDefinition d;
  d.code = "FLUO";
  d.unit = "pg/mL";
  d.analytes = {"fluorescein"};
  d.check.tolerance_pct = 10;
  return d;
}

/// The §9 M1 curve with its calibrators (the levels its lowest calibrator is read from).
cw::Curve m1_curve() {
  cw::Curve c;
  c.id = cw::CurveId{1};
  c.analyte = "fluorescein";
  c.fit = m1_fit();
  c.verdict = cw::Verdict::Accepted;
  for (double level : {0, 2, 4, 6, 8, 10, 12}) {
    cw::CalibrationPoint p;
    p.nominal = level;
    c.points.push_back(p);
  }
  return c;
}

cw::CurveStatus active() {
  return cw::CurveStatus{};
}

template <class Fn>
cw::ValidationError validation_error(Fn&& fn) {
  try {
    fn();
  } catch (const cw::ValidationError& e) {
    return e;
  }
  FAIL("no ValidationError");
  return cw::ValidationError("");
}

}  // namespace

TEST_CASE("check judgement: recovery against the nominal and the method's tolerance", "[domain]") {
  const cw::Curve curve = m1_curve();
  // y0 = 13.5 reads back as x0 = 6.207215541 pg/mL (§9 M1 [C]): 103.45 % of a nominal of 6.
  const cw::Check pass =
      cw::judge_check({cw::CheckKind::Check, 6.0, 13.5, std::nullopt}, curve, method());
  REQUIRE(pass.measured.has_value());
  CHECK_THAT(*pass.measured, WithinRel(6.207215541, 1e-9));
  CHECK_THAT(*pass.recovery_pct, WithinRel(100 * 6.207215541 / 6, 1e-9));
  CHECK(*pass.limit_low == 90.0);
  CHECK(*pass.limit_high == 110.0);
  CHECK(pass.passed);
  // y0 = 23.0 reads back as 11.12858464 (§9 M1 [C]): 139 % of 8 fails.
  const cw::Check fail =
      cw::judge_check({cw::CheckKind::Check, 8.0, 23.0, std::nullopt}, curve, method());
  CHECK_THAT(*fail.measured, WithinRel(11.12858464, 1e-9));
  CHECK_FALSE(fail.passed);
}

TEST_CASE("check judgement: a blank passes below the method's limit, else below the LOD",
          "[domain]") {
  const cw::Curve curve = m1_curve();
  // y0 = 2.9 reads back as 0.7160037003 (§9 M1 [C]); the ICH LOD is 3.3·s/b = 0.7399653784.
  cw::MethodDefinition d = method();
  const cw::Check under_lod =
      cw::judge_check({cw::CheckKind::Blank, std::nullopt, 2.9, std::nullopt}, curve, d);
  CHECK_THAT(*under_lod.limit_high, WithinRel(0.7399653784, 1e-9));
  CHECK(under_lod.passed);
  d.check.blank_limit = 0.5;
  const cw::Check over_limit =
      cw::judge_check({cw::CheckKind::Blank, 0.0, 2.9, std::nullopt}, curve, d);
  CHECK(*over_limit.limit_high == 0.5);
  CHECK_FALSE(over_limit.passed);
}

TEST_CASE("check judgement: bad readings are bad input naming the option", "[domain]") {
  const cw::Curve curve = m1_curve();
  CHECK(
      validation_error([&] {
        cw::judge_check({cw::CheckKind::Check, std::nullopt, 13.5, std::nullopt}, curve, method());
      }).option() == "--nominal");
  CHECK(validation_error([&] {
          cw::judge_check({cw::CheckKind::Check, -1.0, 13.5, std::nullopt}, curve, method());
        }).option() == "--nominal");
  CHECK(validation_error([&] {
          cw::judge_check({cw::CheckKind::Blank, 2.0, 2.9, std::nullopt}, curve, method());
        }).option() == "--nominal");
  // A check outside the working range would be read by extrapolation (calibration-practice.md
  // §4.4); its ends are inside. The range starts at the lowest calibrator that is not a blank
  // (2 pg/mL, §9 M1), not at the fit's lowest level (the zero calibrator).
  const auto above = validation_error([&] {
    cw::judge_check({cw::CheckKind::Check, 12.5, 13.5, std::nullopt}, curve, method());
  });
  CHECK(above.option() == "--nominal");
  CHECK_THAT(above.what(), Catch::Contains("outside the curve's working range, 2 to 12"));
  CHECK_NOTHROW(cw::judge_check({cw::CheckKind::Check, 12.0, 13.5, std::nullopt}, curve, method()));
  cw::Curve with_points = m1_curve();
  const auto below = validation_error([&] {
    cw::judge_check({cw::CheckKind::Check, 1.0, 2.9, std::nullopt}, with_points, method());
  });
  CHECK_THAT(below.what(), Catch::Contains("outside the curve's working range, 2 to 12"));
  CHECK_NOTHROW(
      cw::judge_check({cw::CheckKind::Check, 2.0, 5.0, std::nullopt}, with_points, method()));
  with_points.points[1].excluded = true;  // an excluded level bounds nothing
  CHECK_THAT(
      validation_error([&] {
        cw::judge_check({cw::CheckKind::Check, 2.0, 5.0, std::nullopt}, with_points, method());
      }).what(),
      Catch::Contains("range, 4 to 12"));
  // Read without its points, the curve's lowest calibrator is the one the store read with its
  // statistics; read with neither, it is a mistake of the caller, never a range from zero.
  cw::Curve statistics_only = m1_curve();
  statistics_only.points.clear();
  CHECK_THROWS_AS(
      cw::judge_check({cw::CheckKind::Check, 6.0, 13.5, std::nullopt}, statistics_only, method()),
      std::logic_error);
  statistics_only.lowest_level = 2.0;
  CHECK_THAT(
      validation_error([&] {
        cw::judge_check({cw::CheckKind::Check, 1.0, 2.9, std::nullopt}, statistics_only, method());
      }).what(),
      Catch::Contains("range, 2 to 12"));
  // A nominal so small that 100·measured/nominal overflows to infinity (a curve whose lowest
  // calibrator is that small).
  statistics_only.lowest_level = 1e-308;
  const auto overflow = validation_error([&] {
    cw::judge_check({cw::CheckKind::Check, 1e-307, 13.5, std::nullopt}, statistics_only, method());
  });
  CHECK_THAT(overflow.what(), Catch::Contains("is not a finite number"));
  CHECK(validation_error([&] {
          cw::judge_check({cw::CheckKind::Check, 6.0, 13.5, 2.0}, curve, method());
        }).option() == "--is-response");
}

TEST_CASE("quantitation: a reported value with its interval follows §9 M1", "[domain]") {
  const cw::Curve c = m1_curve();
  const auto d = cw::decide_quantitation(c, active(), method(), {}, {13.5, std::nullopt, 1, 1.0});
  REQUIRE(d.status == cw::ResultStatus::Reported);
  CHECK_THAT(*d.x0, WithinRel(6.207215541, 1e-9));
  CHECK_THAT(*d.sd_x0, WithinRel(0.2397542227, 1e-8));
  CHECK_THAT(*d.ci_high - *d.concentration, WithinRel(0.6163078499, 1e-8));
  CHECK(d.reasons.empty());
  // Four readings averaging 13.5: s_x0 = 0.1406133618 (§9 M1 [C]); a tenfold dilution scales
  // the value and its interval.
  const auto diluted =
      cw::decide_quantitation(c, active(), method(), {}, {13.5, std::nullopt, 4, 10.0});
  CHECK_THAT(*diluted.sd_x0, WithinRel(0.1406133618, 1e-8));
  CHECK_THAT(*diluted.concentration, WithinRel(62.07215541, 1e-9));
  CHECK_THAT(*diluted.ci_high - *diluted.concentration, WithinRel(3.614581537, 1e-8));
}

TEST_CASE("quantitation: above the range is refused with a dilution, below it is flagged",
          "[domain]") {
  const cw::Curve c = m1_curve();
  // y0 = 30 reads as (30 - 85/56)/(1081/560) = 14.76 pg/mL, above the top calibrator (12): a
  // twofold dilution brings it to 7.4, under 80 % of 12 (common practice).
  const auto above =
      cw::decide_quantitation(c, active(), method(), {}, {30.0, std::nullopt, 1, 1.0});
  CHECK(above.status == cw::ResultStatus::Refused);
  REQUIRE(above.reasons.size() == 1);
  CHECK(above.reasons[0].reason == cw::Reason::AboveRange);
  CHECK(above.suggested_dilution == 2.0);
  CHECK_FALSE(above.concentration.has_value());
  // y0 = 1.0 reads below the intercept, and y0 = 2.5 about 0.51 pg/mL: both below the lowest
  // calibrator that is not a blank (2), released as "< 2" (a zero level bounds nothing).
  for (const double y : {1.0, 2.5}) {
    INFO(y);
    const auto below =
        cw::decide_quantitation(c, active(), method(), {}, {y, std::nullopt, 1, 1.0});
    CHECK(below.status == cw::ResultStatus::Reported);
    CHECK(below.flags == std::vector<cw::ResultFlag>{cw::ResultFlag::BelowRange});
    CHECK(below.censored);
    CHECK_FALSE(below.concentration.has_value());
    CHECK(below.reporting_limit == 2.0);
  }
}

TEST_CASE("quantitation: a curve that is not active refuses with every blocking reason",
          "[domain]") {
  cw::CurveStatus stale;
  stale.state = cw::CurveState::Stale;
  stale.reasons = {{cw::Reason::CheckFailed, std::nullopt, "check 4 failed"},
                   {cw::Reason::MethodRevised, std::nullopt, "version 2 took effect"}};
  const auto d =
      cw::decide_quantitation(m1_curve(), stale, method(), {}, {13.5, std::nullopt, 1, 1.0});
  CHECK(d.status == cw::ResultStatus::Refused);
  CHECK(d.reasons == stale.reasons);
  CHECK_FALSE(d.x0.has_value());
  // Bad input is refused before the state is looked at.
  CHECK(validation_error([&] {
          cw::decide_quantitation(m1_curve(), stale, method(), {}, {13.5, 2.0, 1, 1.0});
        }).option() == "--is-response");
}

TEST_CASE("quantitation: a dilution whose product overflows is bad input", "[domain]") {
  const auto e = validation_error([&] {
    cw::decide_quantitation(m1_curve(), active(), method(), {}, {13.5, std::nullopt, 1, 1e308});
  });
  CHECK(e.option() == "--dilution");
  CHECK_THAT(e.what(), Catch::Contains("is not a finite number"));
}

TEST_CASE("expiry: the earliest of valid_for and the end of a lot's expiry day", "[domain]") {
  const cw::LabZone berlin = cw::LabZone::named("Europe/Berlin");
  cw::MethodVersion v;
  v.definition.calibration.valid_for = cw::Duration{7, cw::Duration::Unit::Days};
  const cw::Instant acquired = cw::parse_instant("2026-03-02T09:00:00Z");
  cw::Lot late;
  late.code = "LATE";
  late.expires_on = {2027, 1, 31};
  cw::Lot soon;
  soon.code = "SOON";
  soon.expires_on = {2026, 3, 5};

  const auto by_interval = cw::expiry_of(acquired, v, {&late}, berlin);
  CHECK(by_interval.at == cw::parse_instant("2026-03-09T09:00:00Z"));
  CHECK(by_interval.limiting_lot == nullptr);

  // Usable through 5 March, lab-local: the day ends at midnight Berlin time (CET, +01:00).
  const auto by_lot = cw::expiry_of(acquired, v, {&late, &soon}, berlin);
  CHECK(by_lot.at == cw::parse_instant("2026-03-05T23:00:00Z"));
  CHECK(by_lot.valid_until == cw::parse_instant("2026-03-09T09:00:00Z"));
  REQUIRE(by_lot.limiting_lot != nullptr);
  CHECK(by_lot.limiting_lot->code == "SOON");
}
