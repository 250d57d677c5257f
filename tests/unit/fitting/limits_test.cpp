// SPDX-License-Identifier: Apache-2.0
// Checks the detection and quantification limits by definition (ICH Q2 with σ at the low end,
// DIN 32645:2008-11 calibration method), the choice between them, and the mean-response-factor
// model's agreement with the 1/x²-weighted line through the origin.
#include <catch2/catch.hpp>
#include <cmath>
#include <cstddef>
#include <string>
#include <vector>

#include "fitting/fit.h"

namespace {

using Catch::Matchers::Contains;
using Catch::Matchers::WithinAbs;
using Catch::Matchers::WithinRel;
using cw::fitting::DinLimits;
using cw::fitting::DinParameters;
using cw::fitting::fit;
using cw::fitting::FitError;
using cw::fitting::FitResult;
using cw::fitting::inverse_predict;
using cw::fitting::LimitDefinition;
using cw::fitting::Model;
using cw::fitting::Observation;
using cw::fitting::Prediction;
using cw::fitting::Weighting;

// [C] values (calibration-practice.md §9, calibration-check-values.py: exact rational arithmetic,
// quantiles to about 12 digits) are quoted to 10 significant digits: checked to 1e-9 relative.
constexpr double kRel = 1e-9;

std::vector<Observation> xy(const std::vector<double>& x, const std::vector<double>& y) {
  std::vector<Observation> out;
  for (std::size_t i = 0; i < x.size(); ++i) out.push_back({x[i], y[i]});
  return out;
}

// M1: Miller & Miller, ch. 5 fluorescence example (calibration-practice.md §9 M1).
std::vector<Observation> miller_m1() {
  return xy({0, 2, 4, 6, 8, 10, 12}, {2.1, 5.0, 9.0, 12.6, 17.3, 21.0, 24.7});
}

// S1: synthetic weighted line (calibration-practice.md §9 S1).
std::vector<Observation> synthetic_s1() {
  return xy({1, 2, 5, 10, 20, 50, 100}, {10.9, 20.3, 52.8, 100.1, 209.0, 498.0, 1041.0});
}

}  // namespace

TEST_CASE("din32645_limits: Miller & Miller M1 check values", "[fitting][limits]") {
  // calibration-practice.md §9 M1, DIN 32645 with α = β = 0.01, k = 3, m = 1 [C]:
  // s_x0 = 0.2242319329, x_NG = 0.9130328581, x_EG = 1.826065716, x_BG = 2.999900549 (iterated).
  const FitResult f = fit(Model::Linear, Weighting::None, miller_m1());
  REQUIRE(f.din.has_value());
  const DinLimits& d = *f.din;
  CHECK(d.dof == 5);
  CHECK(d.parameters.alpha == 0.01);
  CHECK(d.parameters.beta == 0.01);
  CHECK(d.parameters.k == 3);
  CHECK(d.parameters.m == 1);
  CHECK_THAT(d.method_sd, WithinRel(0.2242319329, kRel));
  CHECK_THAT(d.critical_value, WithinRel(0.9130328581, kRel));
  CHECK_THAT(d.detection_limit, WithinRel(1.826065716, kRel));
  REQUIRE(d.quantification_limit.has_value());
  CHECK_THAT(*d.quantification_limit, WithinRel(2.999900549, kRel));
  CHECK(d.iterations > 1);
  // y_k = a + b·x_NG with a = 85/56, b = 1081/560 (§9 M1 [C]).
  CHECK_THAT(d.critical_response, WithinRel(85.0 / 56.0 + 1081.0 / 560.0 * 0.9130328581, kRel));

  // The iterated x_BG is the positive root of its squared equation, x² = K²(A + (x - xbar)²/Qx)
  // with K = k·s_x0·t(0.995; 5), A = 1/m + 1/n, xbar = 6, Qx = Sxx = 112 (§9 M1 data); solved
  // here in closed form as an independent route. t(0.995; 5) = 4.032142984 (§9 quantiles [C]).
  const double big_k = 3 * 0.2242319329 * 4.032142984;
  const double qa = 1 - big_k * big_k / 112;
  const double qb = 2 * big_k * big_k * 6 / 112;
  const double qc = -big_k * big_k * (1 + 1.0 / 7 + 36.0 / 112);
  const double closed_form = (-qb + std::sqrt(qb * qb - 4 * qa * qc)) / (2 * qa);
  CHECK_THAT(*d.quantification_limit, WithinRel(closed_form, 1e-8));
}

TEST_CASE("din32645_limits: alpha, beta, k and m are parameters", "[fitting][limits]") {
  const FitResult f = fit(Model::Linear, Weighting::None, miller_m1());
  // α = 0.05, β = 0.01: x_EG/x_NG = 1 + t(0.99; 5)/t(0.95; 5) = 1 + 3.364929999/2.015048373
  // (t(0.99; 5) from §9 [C]; t(0.95; 5) = 2.015 in printed t tables, from memory).
  const auto d = cw::fitting::din32645_limits(f, DinParameters{0.05, 0.01, 3, 1});
  REQUIRE(d.has_value());
  CHECK_THAT(d->detection_limit / d->critical_value, WithinAbs(1 + 3.364929999 / 2.015, 0.001));
  // m = 4 readings: only the 1/m under the root changes; with §9 M1 n = 7, xbar = 6, Sxx = 112:
  // x_NG(m=4)/x_NG(m=1) = sqrt(1/4 + 1/7 + 36/112)/sqrt(1 + 1/7 + 36/112) (formula §4.2).
  const auto four = cw::fitting::din32645_limits(f, DinParameters{0.01, 0.01, 3, 4});
  REQUIRE(four.has_value());
  CHECK_THAT(four->critical_value / f.din->critical_value,
             WithinRel(std::sqrt(0.25 + 1.0 / 7 + 36.0 / 112) / std::sqrt(1 + 1.0 / 7 + 36.0 / 112),
                       1e-12));
  // k = 2 (50 % relative uncertainty) lowers x_BG below the k = 3 value.
  const auto two = cw::fitting::din32645_limits(f, DinParameters{0.01, 0.01, 2, 1});
  REQUIRE(two.has_value());
  REQUIRE(two->quantification_limit.has_value());
  CHECK(*two->quantification_limit < *f.din->quantification_limit);

  CHECK_THROWS_AS(cw::fitting::din32645_limits(f, DinParameters{0, 0.01, 3, 1}), FitError);
  CHECK_THROWS_AS(cw::fitting::din32645_limits(f, DinParameters{0.01, 0.5, 3, 1}), FitError);
  CHECK_THROWS_AS(cw::fitting::din32645_limits(f, DinParameters{0.01, 0.01, 0, 1}), FitError);
  CHECK_THROWS_AS(cw::fitting::din32645_limits(f, DinParameters{0.01, 0.01, 3, 0}), FitError);
}

TEST_CASE("din32645_limits: only for the unweighted straight line", "[fitting][limits]") {
  // DIN 32645's calibration method assumes y = a + b·x with one response SD (§4.2).
  CHECK_FALSE(fit(Model::Linear, Weighting::InvX, synthetic_s1()).din.has_value());
  CHECK_FALSE(fit(Model::Quadratic, Weighting::None, synthetic_s1()).din.has_value());
  CHECK_FALSE(fit(Model::LinearThroughOrigin, Weighting::None, synthetic_s1()).din.has_value());
  CHECK_FALSE(fit(Model::MeanResponseFactor, Weighting::None, synthetic_s1()).din.has_value());
  CHECK(fit(Model::Linear, Weighting::None, synthetic_s1()).din.has_value());
}

TEST_CASE("din32645_limits: no quantification limit when 1/k is never reached",
          "[fitting][limits]") {
  // A very poor line: k·s_x0·t(0.995; f) >= sqrt(Sxx), so the relative uncertainty 33 % is not
  // reached at any concentration (§4.2 fixed point has no finite solution).
  const FitResult f =
      fit(Model::Linear, Weighting::None, xy({1, 2, 3, 4, 5}, {1.0, 9.0, 0.5, 12.0, 6.0}));
  REQUIRE(f.din.has_value());
  CHECK(f.din->critical_value > 0);
  CHECK_FALSE(f.din->quantification_limit.has_value());
  CHECK_FALSE(cw::fitting::reporting_limits(f, LimitDefinition::Din32645).has_value());
}

TEST_CASE("reporting_limits: the definition picks the LOD and LOQ", "[fitting][limits]") {
  const FitResult f = fit(Model::Linear, Weighting::None, miller_m1());
  // ICH Q2 on §9 M1 [C]: 3.3·s_y/x/b = 0.7399653784, 10·s_y/x/b = 2.242319329.
  const auto ich = cw::fitting::reporting_limits(f, LimitDefinition::IchQ2);
  REQUIRE(ich.has_value());
  CHECK(ich->definition == LimitDefinition::IchQ2);
  CHECK_THAT(ich->lod, WithinRel(0.7399653784, kRel));
  CHECK_THAT(ich->loq, WithinRel(2.242319329, kRel));
  CHECK_THAT(ich->description, Contains("ICH Q2") && Contains("s(y/x)"));
  // DIN 32645 on §9 M1 [C]: LOD = x_NG = 0.9130328581, LOQ = x_BG = 2.999900549.
  const auto din = cw::fitting::reporting_limits(f, LimitDefinition::Din32645);
  REQUIRE(din.has_value());
  CHECK_THAT(din->lod, WithinRel(0.9130328581, kRel));
  CHECK_THAT(din->loq, WithinRel(2.999900549, kRel));
  CHECK_THAT(din->description, Contains("DIN 32645") && Contains("x_NG") && Contains("x_BG"));
  // A curve kept without lod_definition (fitted before it existed) is still described.
  FitResult kept = f;
  kept.lod_definition.clear();
  const auto kept_ich = cw::fitting::reporting_limits(kept, LimitDefinition::IchQ2);
  REQUIRE(kept_ich.has_value());
  CHECK_THAT(kept_ich->description, Contains("ICH Q2: sigma = residual SD"));
  // A weighted line has no DIN limits.
  const FitResult weighted = fit(Model::Linear, Weighting::InvX, synthetic_s1());
  CHECK_FALSE(cw::fitting::reporting_limits(weighted, LimitDefinition::Din32645).has_value());
  CHECK(cw::fitting::reporting_limits(weighted, LimitDefinition::IchQ2).has_value());

  // Tokens for the method file.
  CHECK(cw::fitting::to_string(LimitDefinition::IchQ2) == "ich-q2");
  CHECK(cw::fitting::to_string(LimitDefinition::Din32645) == "din-32645");
  CHECK(cw::fitting::parse_limit_definition("din-32645") == LimitDefinition::Din32645);
  CHECK(cw::fitting::parse_limit_definition("ich-q2") == LimitDefinition::IchQ2);
  CHECK_FALSE(cw::fitting::parse_limit_definition("ICH").has_value());
}

TEST_CASE("fit: weighted ICH limits take sigma at the lowest calibrator", "[fitting][limits]") {
  // §9 S1 [C]: s_(y/x)w and b per weighting; 1/x² normalised weight of x = 1: 5.372217959.
  // σ = s_w/sqrt(w'(x_low)) with w'(x_low) = n·w(x_low)/Σw; for 1/x, Σ1/x = 1.88 (by hand:
  // 1 + 0.5 + 0.2 + 0.1 + 0.05 + 0.02 + 0.01), so w'(1) = 7/1.88.
  struct Row {
    Weighting weighting;
    double s_w, b, w_low;
  };
  const Row rows[] = {
      {Weighting::None, 9.017318836, 10.35049404, 1.0},
      {Weighting::InvX, 2.555728025, 10.2656287, 7.0 / 1.88},
      {Weighting::InvX2, 0.6592465437, 10.19428203, 5.372217959},
  };
  for (const Row& row : rows) {
    INFO(cw::fitting::to_string(row.weighting));
    const FitResult f = fit(Model::Linear, row.weighting, synthetic_s1());
    const double sigma = row.s_w / std::sqrt(row.w_low);
    CHECK_THAT(f.lod_sigma, WithinRel(sigma, kRel));
    CHECK_THAT(f.lod_slope, WithinRel(row.b, kRel));
    CHECK_THAT(f.lod, WithinRel(3.3 * sigma / row.b, kRel));
    CHECK_THAT(f.loq, WithinRel(10 * sigma / row.b, kRel));
    if (row.weighting == Weighting::None) {
      CHECK_THAT(f.lod_definition, Contains("residual SD s(y/x)"));
    } else {
      CHECK_THAT(f.lod_definition,
                 Contains("lowest calibrator") &&
                     Contains(std::string(cw::fitting::to_string(row.weighting))));
    }
  }
}

TEST_CASE("fit: ICH sigma at the low end does not move with calibrators added at the top",
          "[fitting][limits]") {
  // S1 (§9) through the origin with 1/x² weights, then the same readings scaled tenfold added as
  // a decade of higher calibrators: every response factor y/x appears twice, so the slope (the
  // mean RF) is unchanged and Σ(RF - b)² doubles. By the algebra of §1.3 (w' = n·w/Σw):
  //  - σ = s_w/sqrt(w'(x_low)) = s_RF·x_low scales only by its degrees of freedom,
  //    sqrt(2·6/13);
  //  - s_w itself, the σ of the former definition, also carries n/Σw, which grows by 2/1.01
  //    (Σ1/x² gains a hundredth), so it rises by a further sqrt(2/1.01) ≈ 1.41 although nothing
  //    changed at the low end.
  const std::vector<Observation> s1 = synthetic_s1();
  std::vector<Observation> extended = s1;
  for (const auto& o : s1) extended.push_back({10 * o.x, 10 * o.y});
  const FitResult once = fit(Model::LinearThroughOrigin, Weighting::InvX2, s1);
  const FitResult wider = fit(Model::LinearThroughOrigin, Weighting::InvX2, extended);
  CHECK_THAT(wider.slope, WithinRel(once.slope, 1e-12));
  CHECK_THAT(wider.lod_sigma, WithinRel(once.lod_sigma * std::sqrt(12.0 / 13.0), 1e-12));
  CHECK_THAT(wider.residual_sd,
             WithinRel(once.residual_sd * std::sqrt(12.0 / 13.0) * std::sqrt(2 / 1.01), 1e-12));
}

TEST_CASE("fit: quadratic ICH limits use the slope at the lowest calibrator", "[fitting][limits]") {
  // §9 S2 quadratic [C]: b = 65947/6600, c = -197/1320, s_y2 = 0.101375817; x_low = 1:
  // S = b + 2c·1, LOD = 3.3·s_y2/S.
  const FitResult f = fit(Model::Quadratic, Weighting::None,
                          xy({1, 2, 3, 4, 5, 6, 7, 8, 9, 10},
                             {11.9, 21.3, 30.7, 39.5, 48.4, 56.5, 64.7, 72.3, 79.9, 87.0}));
  const double slope = 65947.0 / 6600.0 + 2 * (-197.0 / 1320.0);
  CHECK_THAT(f.lod_slope, WithinRel(slope, 1e-12));
  CHECK_THAT(f.lod, WithinRel(3.3 * 0.101375817 / slope, kRel));
  CHECK_THAT(f.lod_definition, Contains("b + 2c*x at the lowest calibrator"));
}

TEST_CASE("inverse_predict: mean response factor equals the 1/x^2 line through the origin",
          "[fitting][limits]") {
  // The mean of ratios is the 1/x²-weighted least-squares slope through the origin; its
  // relative-error interval x0·(s_RF/RFbar)·sqrt(1/m + 1/n) and its ICH σ = s_RF·x_low are that
  // fit's §3.3 interval and its σ at the lowest calibrator, identically (algebra in inverse.cpp
  // and fit.cpp). Checked to 1e-12 relative on §9 S3 and on the S1 data.
  const std::vector<std::vector<Observation>> sets = {
      xy({1, 5, 10, 50, 100}, {1020, 5150, 10080, 49700, 98900}),
      xy({1, 2, 5, 10, 20, 50, 100}, {10.9, 20.3, 52.8, 100.1, 209.0, 498.0, 1041.0}),
  };
  for (const auto& data : sets) {
    const FitResult mrf = fit(Model::MeanResponseFactor, Weighting::None, data);
    const FitResult line = fit(Model::LinearThroughOrigin, Weighting::InvX2, data);
    CHECK_THAT(mrf.slope, WithinRel(line.slope, 1e-12));
    CHECK_THAT(mrf.lod, WithinRel(line.lod, 1e-12));
    CHECK_THAT(mrf.loq, WithinRel(line.loq, 1e-12));
    for (double y0 :
         {data.front().y * 1.3, 0.5 * (data.front().y + data.back().y), data.back().y * 0.9}) {
      for (int m : {1, 2, 5}) {
        INFO("y0 " << y0 << ", m " << m);
        const Prediction a = inverse_predict(mrf, y0, m);
        const Prediction b = inverse_predict(line, y0, m);
        CHECK(a.dof == b.dof);
        CHECK_THAT(a.x0, WithinRel(b.x0, 1e-12));
        CHECK_THAT(a.sd_x0, WithinRel(b.sd_x0, 1e-12));
        CHECK_THAT(a.ci_low, WithinRel(b.ci_low, 1e-12));
        CHECK_THAT(a.ci_high, WithinRel(b.ci_high, 1e-12));
      }
    }
  }
}
