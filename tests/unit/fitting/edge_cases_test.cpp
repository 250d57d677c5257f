// SPDX-License-Identifier: Apache-2.0
// Checks the refusals and corner cases of fit(), back_calculate() and inverse_predict(): too few
// levels, undefined weights, excluded points, quadratic root choice, through-origin and mean-RF
// inverse prediction.
#include <catch2/catch.hpp>
#include <cmath>
#include <cstddef>
#include <limits>
#include <string>
#include <vector>

#include "core/error.h"
#include "fitting/acceptance.h"
#include "fitting/fit.h"

namespace {

using Catch::Matchers::Contains;
using Catch::Matchers::WithinAbs;
using Catch::Matchers::WithinRel;
using cw::fitting::back_calculate;
using cw::fitting::fit;
using cw::fitting::FitError;
using cw::fitting::FitResult;
using cw::fitting::inverse_predict;
using cw::fitting::Model;
using cw::fitting::Observation;
using cw::fitting::Prediction;
using cw::fitting::Weighting;

// Values marked [X] were computed for these tests with exact rational arithmetic (Python
// fractions, 50-digit decimal square roots, t quantile from calibration-check-values.py) using
// the formulas of calibration-practice.md §1.2, §1.5, §3.3 and §3.4; quoted to 10 digits.
constexpr double kRel = 1e-9;

std::vector<Observation> xy(const std::vector<double>& x, const std::vector<double>& y) {
  std::vector<Observation> out;
  for (std::size_t i = 0; i < x.size(); ++i) out.push_back({x[i], y[i]});
  return out;
}

std::string fit_error_message(Model model, Weighting weighting,
                              const std::vector<Observation>& data) {
  try {
    fit(model, weighting, data);
  } catch (const FitError& e) {
    return e.what();
  }
  return "(no error)";
}

std::vector<Observation> synthetic_s2() {  // calibration-practice.md §9 S2
  return xy({1, 2, 3, 4, 5, 6, 7, 8, 9, 10},
            {11.9, 21.3, 30.7, 39.5, 48.4, 56.5, 64.7, 72.3, 79.9, 87.0});
}

}  // namespace

TEST_CASE("fit: model and weighting names round-trip", "[fitting]") {
  // Tokens documented in fitting/fit.h (stored with the curve and typed on the command line).
  CHECK(cw::fitting::to_string(Model::Linear) == "linear");
  CHECK(cw::fitting::to_string(Model::LinearThroughOrigin) == "linear-through-origin");
  CHECK(cw::fitting::to_string(Model::Quadratic) == "quadratic");
  CHECK(cw::fitting::to_string(Model::MeanResponseFactor) == "mean-response-factor");
  CHECK(cw::fitting::to_string(Weighting::None) == "none");
  CHECK(cw::fitting::to_string(Weighting::InvX) == "1/x");
  CHECK(cw::fitting::to_string(Weighting::InvX2) == "1/x^2");
  CHECK(cw::fitting::to_string(Weighting::InvY) == "1/y");
  CHECK(cw::fitting::to_string(Weighting::InvY2) == "1/y^2");
  CHECK(cw::fitting::parse_model("quadratic") == Model::Quadratic);
  CHECK(cw::fitting::parse_model("mean-response-factor") == Model::MeanResponseFactor);
  CHECK_FALSE(cw::fitting::parse_model("Linear").has_value());
  CHECK_FALSE(cw::fitting::parse_model("").has_value());
  CHECK(cw::fitting::parse_weighting("1/x^2") == Weighting::InvX2);
  CHECK(cw::fitting::parse_weighting("none") == Weighting::None);
  CHECK_FALSE(cw::fitting::parse_weighting("1/x2").has_value());
  // Contract: 3 linear, 2 through-origin, 4 quadratic, 2 mean-response-factor.
  CHECK(cw::fitting::min_levels_to_fit(Model::Linear) == 3);
  CHECK(cw::fitting::min_levels_to_fit(Model::LinearThroughOrigin) == 2);
  CHECK(cw::fitting::min_levels_to_fit(Model::Quadratic) == 4);
  CHECK(cw::fitting::min_levels_to_fit(Model::MeanResponseFactor) == 2);
}

TEST_CASE("fit: too few distinct levels is refused with the counts", "[fitting]") {
  // fit.h: at least min_levels_to_fit distinct non-excluded levels (>= 1 residual degree of
  // freedom; calibration-practice.md §1: p coefficients need n - p >= 1).
  // Replicates do not add levels; excluded levels do not count.
  const auto two_levels = xy({1, 1, 2, 2}, {1.0, 1.1, 2.0, 2.1});
  CHECK_THROWS_AS(fit(Model::Linear, Weighting::None, two_levels), FitError);
  CHECK(fit_error_message(Model::Linear, Weighting::None, two_levels) ==
        "a linear fit needs at least 3 distinct concentration levels, but the data have 2 "
        "(excluded points not counted)");

  auto three_levels = xy({1, 2, 3}, {1.0, 2.1, 2.9});
  CHECK_THAT(fit_error_message(Model::Quadratic, Weighting::None, three_levels),
             Contains("needs at least 4") && Contains("have 3"));
  CHECK_NOTHROW(fit(Model::Linear, Weighting::None, three_levels));
  three_levels[2].excluded = true;
  CHECK_THAT(fit_error_message(Model::Linear, Weighting::None, three_levels), Contains("have 2"));

  const auto one_level = xy({5, 5, 5}, {1.0, 1.1, 0.9});
  CHECK_THAT(fit_error_message(Model::LinearThroughOrigin, Weighting::None, one_level),
             Contains("needs at least 2") && Contains("have 1"));
  CHECK_THAT(fit_error_message(Model::MeanResponseFactor, Weighting::None, one_level),
             Contains("needs at least 2") && Contains("have 1"));
  CHECK_THROWS_AS(fit(Model::Linear, Weighting::None, {}), FitError);
}

TEST_CASE("fit: FitError is a bad-input validation error", "[fitting]") {
  // Product contract (core/error.h): ValidationError, kind "bad-input", exit code 2.
  try {
    fit(Model::Linear, Weighting::None, xy({1, 2}, {1, 2}));
    FAIL("no error");
  } catch (const cw::ValidationError& e) {
    CHECK(e.kind() == "bad-input");
    CHECK(cw::to_int(e.exit_code()) == 2);
    CHECK_FALSE(e.hint().empty());
  }
}

TEST_CASE("fit: 1/x and 1/y weights refuse values they cannot weigh", "[fitting]") {
  // calibration-practice.md §1.3: 1/x, 1/x² undefined at x = 0; 1/y, 1/y² undefined for y <= 0.
  auto data =
      xy({0, 1, 2, 5, 10, 20, 50, 100}, {0.4, 10.9, 20.3, 52.8, 100.1, 209.0, 498.0, 1041.0});
  CHECK_THAT(fit_error_message(Model::Linear, Weighting::InvX, data),
             Contains("1/x") && Contains("point 1 has concentration 0"));
  CHECK_THAT(fit_error_message(Model::Quadratic, Weighting::InvX2, data),
             Contains("1/x^2") && Contains("concentration 0"));
  CHECK_NOTHROW(fit(Model::Linear, Weighting::InvY, data));
  CHECK_NOTHROW(fit(Model::Linear, Weighting::None, data));

  // With the blank excluded the 1/x² fit is the §9 S1 one [C]: b = 2372974/232775, a = 5349/9311.
  data[0].excluded = true;
  const FitResult f = fit(Model::Linear, Weighting::InvX2, data);
  CHECK_THAT(f.slope, WithinRel(2372974.0 / 232775.0, 1e-12));
  CHECK_THAT(f.intercept, WithinRel(5349.0 / 9311.0, 1e-12));
  CHECK(f.points[0].weight == 0);
  CHECK(f.range_low == 1);
  REQUIRE(f.points[0].back_calculated.has_value());
  CHECK_FALSE(f.points[0].error_pct.has_value());  // x = 0: %RE undefined
  CHECK_THAT(*f.points[0].back_calculated,
             WithinRel((0.4 - 5349.0 / 9311.0) / (2372974.0 / 232775.0), 1e-12));

  auto negative = xy({1, 2, 5, 10}, {-0.2, 20.3, 52.8, 100.1});
  CHECK_THAT(fit_error_message(Model::Linear, Weighting::InvY, negative),
             Contains("1/y") && Contains("point 1 has response -0.2"));
  CHECK_THAT(fit_error_message(Model::Linear, Weighting::InvY2, negative), Contains("1/y^2"));
}

TEST_CASE("fit: excluded points are not fitted but are back-calculated", "[fitting]") {
  // Miller & Miller M1 (§9 M1 [C]: b = 1081/560, a = 85/56) with an extra point (6, 20.0)
  // marked excluded in the middle: the fit must be the M1 fit; the excluded point reads back at
  // (20 - 85/56)/(1081/560) = 9.574468085, %RE +59.57446809 [X].
  std::vector<Observation> data =
      xy({0, 2, 4, 6, 8, 10, 12}, {2.1, 5.0, 9.0, 12.6, 17.3, 21.0, 24.7});
  data.insert(data.begin() + 3, Observation{6, 20.0, true});
  const FitResult f = fit(Model::Linear, Weighting::None, data);
  CHECK_THAT(f.slope, WithinRel(1081.0 / 560.0, 1e-12));
  CHECK_THAT(f.intercept, WithinRel(85.0 / 56.0, 1e-12));
  CHECK_THAT(f.residual_sd, WithinRel(0.4328477132, kRel));
  CHECK(f.n_points == 7);
  CHECK(f.n_levels == 7);
  REQUIRE(f.points.size() == 8);
  const auto& p = f.points[3];
  CHECK(p.excluded);
  CHECK(p.weight == 0);
  CHECK_THAT(p.fitted_y, WithinRel(13.1, 1e-12));
  REQUIRE(p.back_calculated.has_value());
  CHECK_THAT(*p.back_calculated, WithinRel(9.574468085, kRel));
  REQUIRE(p.error_pct.has_value());
  CHECK_THAT(*p.error_pct, WithinRel(59.57446809, kRel));
  double weight_sum = 0;
  for (const auto& q : f.points) weight_sum += q.weight;
  CHECK_THAT(weight_sum, WithinRel(7.0, 1e-12));  // normalised: Σw' = n (§1.3)
  // An excluded, non-finite point does not stop the fit.
  data.push_back({8, std::numeric_limits<double>::quiet_NaN(), true});
  const FitResult g = fit(Model::Linear, Weighting::None, data);
  CHECK_THAT(g.slope, WithinRel(1081.0 / 560.0, 1e-12));
  CHECK_FALSE(g.points.back().back_calculated.has_value());
  data.back().excluded = false;
  CHECK_THAT(fit_error_message(Model::Linear, Weighting::None, data),
             Contains("point 9") && Contains("not a finite number"));
}

TEST_CASE("fit: non-monotonic quadratic is flagged and cannot be read back", "[fitting]") {
  // y = 2 + 10x - 0.8x² on x = 1..10: vertex -b/(2c) = 6.25 inside [1, 10] (§1.4, §3.4).
  std::vector<Observation> data;
  for (int x = 1; x <= 10; ++x) data.push_back({double(x), 2 + 10.0 * x - 0.8 * x * x});
  const FitResult f = fit(Model::Quadratic, Weighting::None, data);
  CHECK_THAT(f.quadratic, WithinRel(-0.8, 1e-10));
  REQUIRE(cw::fitting::quadratic_vertex(f).has_value());
  CHECK_THAT(*cw::fitting::quadratic_vertex(f), WithinRel(6.25, 1e-10));
  CHECK_FALSE(cw::fitting::is_monotonic(f));
  CHECK_FALSE(back_calculate(f, 30.0).has_value());
  for (const auto& p : f.points) CHECK_FALSE(p.error_pct.has_value());
  try {
    inverse_predict(f, 30.0, 1);
    FAIL("no error");
  } catch (const FitError& e) {
    CHECK_THAT(std::string(e.what()), Contains("curve is not monotonic over its working range"));
  }
  const std::vector<std::string> levels = {"1", "2", "3", "4", "5", "6", "7", "8", "9", "10"};
  const auto a = cw::fitting::evaluate_acceptance(f, levels, cw::fitting::AcceptanceCriteria{});
  CHECK_FALSE(a.accepted);
  REQUIRE(a.failures.size() == 1);
  CHECK(a.failures[0].criterion == cw::fitting::Criterion::NotMonotonic);
  CHECK_THAT(a.failures[0].value, WithinRel(6.25, 1e-10));
  // Excluding the levels beyond the vertex makes the working range [1, 6] monotonic.
  for (auto& o : data) o.excluded = o.x > 6;
  const FitResult narrowed = fit(Model::Quadratic, Weighting::None, data);
  CHECK(cw::fitting::is_monotonic(narrowed));
  REQUIRE(back_calculate(narrowed, 2 + 10.0 * 3 - 0.8 * 9).has_value());
  CHECK_THAT(*back_calculate(narrowed, 2 + 10.0 * 3 - 0.8 * 9), WithinRel(3.0, 1e-10));
}

TEST_CASE("back_calculate: quadratic root on the branch holding the working range", "[fitting]") {
  // calibration-practice.md §3.4: keep the root on the working range's side of the vertex. The
  // data are exact parabolas, so the roots follow by hand from the factored forms.
  {
    // y = 100 - 20x + x², x = 11..20: vertex 10 left of the range; y = 25 has roots 5 and 15.
    std::vector<Observation> data;
    for (int x = 11; x <= 20; ++x) data.push_back({double(x), 100 - 20.0 * x + 1.0 * x * x});
    const FitResult f = fit(Model::Quadratic, Weighting::None, data);
    REQUIRE(back_calculate(f, 25.0).has_value());
    CHECK_THAT(*back_calculate(f, 25.0), WithinRel(15.0, 1e-10));
  }
  {
    // y = 200 - 10x + 0.2x², x = 1..10, decreasing: vertex 25 right of the range; y = 155 has
    // roots 5 and 45.
    std::vector<Observation> data;
    for (int x = 1; x <= 10; ++x) data.push_back({double(x), 200 - 10.0 * x + 0.2 * x * x});
    const FitResult f = fit(Model::Quadratic, Weighting::None, data);
    REQUIRE(back_calculate(f, 155.0).has_value());
    CHECK_THAT(*back_calculate(f, 155.0), WithinRel(5.0, 1e-10));
    const Prediction p = inverse_predict(f, 155.0, 1);
    CHECK_THAT(p.x0, WithinRel(5.0, 1e-10));
  }
}

TEST_CASE("inverse_predict: quadratic response beyond the parabola has no solution", "[fitting]") {
  // §9 S2 quadratic (a = 2.01, b = 65947/6600, c = -197/1320): its maximum response is
  // a - b²/(4c) = 169.2543... [X], so y0 = 170 has no real root (D < 0) and y0 = 169 has one.
  const FitResult f = fit(Model::Quadratic, Weighting::None, synthetic_s2());
  CHECK_FALSE(back_calculate(f, 170.0).has_value());
  CHECK(back_calculate(f, 169.0).has_value());
  try {
    inverse_predict(f, 170.0, 1);
    FAIL("no error");
  } catch (const FitError& e) {
    CHECK(std::string(e.what()) == "response 170 has no solution on this curve");
  }
}

TEST_CASE("inverse_predict: weighted quadratic, delta method", "[fitting]") {
  // S2 data, 1/x weights, y0 = 60, m = 2 [X]: a = 2.04390715667, b = 9.97501611863,
  // c = -0.147701189848, s = 0.0936515214255, SE = 0.0773854999729, 0.0438779680714,
  // 0.00448970603941; x0 = 6.42051998587, w0 = 0.531759347995, s_x0 = 0.0129580863294,
  // half-width 0.0306410051887 (t(0.975; 7)).
  const FitResult f = fit(Model::Quadratic, Weighting::InvX, synthetic_s2());
  CHECK_THAT(f.intercept, WithinRel(2.04390715667, kRel));
  CHECK_THAT(f.slope, WithinRel(9.97501611863, kRel));
  CHECK_THAT(f.quadratic, WithinRel(-0.147701189848, kRel));
  CHECK_THAT(f.residual_sd, WithinRel(0.0936515214255, kRel));
  CHECK_THAT(f.se_intercept, WithinRel(0.0773854999729, kRel));
  CHECK_THAT(f.se_slope, WithinRel(0.0438779680714, kRel));
  CHECK_THAT(f.se_quadratic, WithinRel(0.00448970603941, kRel));
  const Prediction p = inverse_predict(f, 60.0, 2);
  CHECK_THAT(p.x0, WithinRel(6.42051998587, kRel));
  CHECK_THAT(p.sd_x0, WithinRel(0.0129580863294, kRel));
  CHECK_THAT(p.ci_high - p.x0, WithinRel(0.0306410051887, kRel));
}

TEST_CASE("inverse_predict: quadratic on a narrow range far from zero", "[fitting]") {
  // Unweighted quadratics over ±4 at x ~ 1000 and ±40 at x ~ 100 000; y0 = the middle reading,
  // m = 1 [X] (exact fractions of the double inputs): x ~ 1e3: x0 = 999.997157979731,
  // s_x0 = 0.00387825411575; x ~ 1e5: x0 = 100000.200784512, s_x0 = 0.316110499814. The raw
  // gᵀ·Cov·g with g = (1, x0, x0²) keeps about 6 of these digits at 1e3 and none at 1e5.
  struct Case {
    std::vector<double> x, y;
    double y0, x0, sd;
  };
  const Case cases[] = {
      {{996, 997, 998, 999, 1000, 1001, 1002, 1003, 1004},
       {2490.743, 2493.259, 2495.781, 2498.300, 2500.789, 2503.285, 2505.796, 2508.259, 2510.733},
       2500.789,
       999.997157979731,
       0.00387825411575},
      {{99960, 99970, 99980, 99990, 100000, 100010, 100020, 100030, 100040},
       {3998.547, 3999.011, 3999.468, 3999.894, 4000.301, 4000.662, 4001.051, 4001.410, 4001.750},
       4000.301,
       100000.200784512,
       0.316110499814},
  };
  for (const Case& c : cases) {
    INFO("x0 " << c.x0);
    FitResult f = fit(Model::Quadratic, Weighting::None, xy(c.x, c.y));
    REQUIRE(f.design.has_value());
    const Prediction p = inverse_predict(f, c.y0, 1);
    CHECK_THAT(p.x0, WithinRel(c.x0, 1e-14));
    CHECK_THAT(p.sd_x0, WithinRel(c.sd, kRel));
    REQUIRE(back_calculate(f, c.y0).has_value());
    CHECK_THAT(*back_calculate(f, c.y0), WithinRel(c.x0, 1e-14));
    // Without the centred representation (a curve kept before it was stored) the raw form cannot
    // give 6 digits here: a FitError, never a clamped or wrong number.
    f.design.reset();
    try {
      inverse_predict(f, c.y0, 1);
      FAIL("no error");
    } catch (const FitError& e) {
      CHECK_THAT(std::string(e.what()), Contains("cannot be computed to 6 significant digits"));
    }
  }
}

TEST_CASE("inverse_predict: line through the origin, unweighted and 1/x", "[fitting]") {
  // x = 1, 2, 4, 8, 16; y = 2.05, 3.98, 8.1, 15.7, 32.4; y0 = 10, m = 2, f = n - 1 = 4 [X]:
  //   none: b = 2.01293255132, se_b = 0.0122853251717, s = 0.226863091247, R0² = 0.999851026111,
  //         x0 = 4.96787634213, s_x0 = 0.0852657982472, half-width 0.236735808184
  //   1/x:  b = 2.00741935484, se_b = 0.0141260307609, s = 0.126347060134, R0² = 0.999801966775,
  //         x0 = 4.98152016712, s_x0 = 0.0710794535974, half-width 0.197348201021
  const auto data = xy({1, 2, 4, 8, 16}, {2.05, 3.98, 8.1, 15.7, 32.4});
  struct Case {
    Weighting weighting;
    double b, se_b, s, r2, x0, sd, half;
  };
  const Case cases[] = {
      {Weighting::None, 2.01293255132, 0.0122853251717, 0.226863091247, 0.999851026111,
       4.96787634213, 0.0852657982472, 0.236735808184},
      {Weighting::InvX, 2.00741935484, 0.0141260307609, 0.126347060134, 0.999801966775,
       4.98152016712, 0.0710794535974, 0.197348201021},
  };
  for (const Case& c : cases) {
    INFO("weighting " << cw::fitting::to_string(c.weighting));
    const FitResult f = fit(Model::LinearThroughOrigin, c.weighting, data);
    CHECK(f.intercept == 0);
    CHECK(f.se_intercept == 0);
    CHECK(f.dof == 4);
    CHECK_THAT(f.slope, WithinRel(c.b, kRel));
    CHECK_THAT(f.se_slope, WithinRel(c.se_b, kRel));
    CHECK_THAT(f.residual_sd, WithinRel(c.s, kRel));
    CHECK_THAT(f.r2, WithinRel(c.r2, kRel));
    CHECK(f.r2_definition.find("uncentred") != std::string::npos);
    const Prediction p = inverse_predict(f, 10.0, 2);
    CHECK(p.dof == 4);
    CHECK_THAT(p.x0, WithinRel(c.x0, kRel));
    CHECK_THAT(p.sd_x0, WithinRel(c.sd, kRel));
    CHECK_THAT(p.ci_high - p.x0, WithinRel(c.half, kRel));
  }
}

TEST_CASE("inverse_predict: mean response factor, relative-error model", "[fitting]") {
  // §9 S3 external standard, y0 = 20000, m = 3 [X]: s = 1025.00295609 (descriptive), uncentred
  // R² = 0.999660552105, x0 = 19.8373338623; the mean of ratios has a constant relative error, so
  // s_x0 = x0·(s_RF/RFbar)·sqrt(1/m + 1/n) = 0.247302496481, half-width 0.686621805859
  // (t(0.975; 4)); ICH σ = s_RF·x_low (x_low = 1): LOD 3.3·σ/RFbar = 0.0563325970878, LOQ
  // 10·σ/RFbar = 0.17070483966.
  const FitResult f = fit(Model::MeanResponseFactor, Weighting::None,
                          xy({1, 5, 10, 50, 100}, {1020, 5150, 10080, 49700, 98900}));
  CHECK_THAT(f.residual_sd, WithinRel(1025.00295609, kRel));
  CHECK_THAT(f.r2, WithinRel(0.999660552105, kRel));
  CHECK_THAT(f.lod, WithinRel(0.0563325970878, kRel));
  CHECK_THAT(f.loq, WithinRel(0.17070483966, kRel));
  CHECK_THAT(f.lod_sigma, WithinRel(17.21046193 * 1, kRel));  // s_RF·x_low, §9 S3 [C]
  CHECK(f.lod_slope == f.rf_mean);
  CHECK_THAT(f.lod_definition, Contains("s_RF*x_low"));
  CHECK_THAT(f.covariance[1][1], WithinRel(17.21046193 * 17.21046193 / 5, kRel));
  CHECK_FALSE(f.design.has_value());
  CHECK_FALSE(f.din.has_value());
  const Prediction p = inverse_predict(f, 20000.0, 3);
  CHECK(p.dof == 4);
  CHECK_THAT(p.x0, WithinRel(19.8373338623, kRel));
  CHECK_THAT(p.sd_x0, WithinRel(0.247302496481, kRel));
  CHECK_THAT(p.ci_high - p.x0, WithinRel(0.686621805859, kRel));
  // The relative-error model has no interval at or below zero concentration.
  CHECK_THROWS_AS(inverse_predict(f, 0.0, 1), FitError);
}

TEST_CASE("fit: mean response factor refuses weighting and non-positive x", "[fitting]") {
  // §1.5: RF = y/x needs x > 0; the average-RF model is unweighted.
  const auto data = xy({1, 5, 10}, {1020, 5150, 10080});
  CHECK_THAT(fit_error_message(Model::MeanResponseFactor, Weighting::InvX, data),
             Contains("takes no weighting") && Contains("1/x"));
  const auto with_blank = xy({0, 1, 5, 10}, {3, 1020, 5150, 10080});
  CHECK_THAT(fit_error_message(Model::MeanResponseFactor, Weighting::None, with_blank),
             Contains("concentrations above 0") && Contains("point 1"));
  // The linear model on the same data reports response factors over x > 0 only (§1.5):
  // RF = 1020, 1030, 1008 -> mean 1019.333333 [X].
  const FitResult line = fit(Model::Linear, Weighting::None, with_blank);
  CHECK_THAT(line.rf_mean, WithinRel(3058.0 / 3.0, 1e-12));
}

TEST_CASE("inverse_predict: refuses bad m, confidence and undefined weights", "[fitting]") {
  // fit.h: m >= 1 readings, confidence in (0, 1); §3.2: w0 = w(x0) needs x0 > 0 for 1/x.
  const FitResult f =
      fit(Model::Linear, Weighting::InvX,
          xy({1, 2, 5, 10, 20, 50, 100}, {10.9, 20.3, 52.8, 100.1, 209.0, 498.0, 1041.0}));
  CHECK_THROWS_AS(inverse_predict(f, 30.0, 0), FitError);
  CHECK_THROWS_AS(inverse_predict(f, 30.0, 1, 1.0), FitError);
  CHECK_THROWS_AS(inverse_predict(f, 30.0, 1, 0.0), FitError);
  // §9 S1 1/x line (a = 0.308829326 [C]): y0 = 0 reads back below zero, where 1/x is undefined.
  try {
    inverse_predict(f, 0.0, 1);
    FAIL("no error");
  } catch (const FitError& e) {
    CHECK_THAT(std::string(e.what()), Contains("1/x weight is undefined"));
  }
  // 99 % interval uses t(0.995; 5) = 4.032142984 (§9 quantiles [C]).
  const Prediction p = inverse_predict(f, 30.0, 1, 0.99);
  CHECK_THAT(p.t_quantile, WithinRel(4.032142984, kRel));
  CHECK_THAT(p.ci_high - p.x0, WithinRel(4.032142984 * p.sd_x0, kRel));
}

TEST_CASE("fit: Mandel test needs N - 3 >= 1", "[fitting]") {
  // §2.2: PW = DS²/s_y2² with N - 3 degrees of freedom; with 3 points there are none.
  const FitResult three = fit(Model::Linear, Weighting::None, xy({1, 2, 3}, {1.1, 1.9, 3.2}));
  CHECK_FALSE(three.mandel.has_value());
  const FitResult four =
      fit(Model::Linear, Weighting::None, xy({1, 2, 3, 4}, {1.1, 1.9, 3.2, 3.9}));
  REQUIRE(four.mandel.has_value());
  CHECK(four.mandel->dof_quadratic == 1);
  CHECK_THAT(four.mandel->f_critical_99, WithinAbs(4052.181, 0.0005));  // F(0.99; 1, 1) table
}

TEST_CASE("fit: Mandel's test value keeps its digits on a very precise line", "[fitting]") {
  // Residual SD ~ 1e-4 against responses up to 123: SSE_lin - SSE_quad is a difference of two
  // nearly equal sums far below y², which left 8 to 10.5 correct digits (10.5 with 1/y² weights
  // even after the solver moved to extended precision). PW computed as the squared t statistic
  // of the quadratic term keeps them [X] (exact fractions of the double inputs): unweighted
  // 0.49818227206653, 1/x² 0.00672207085281116, 1/y² 0.00682523332071668.
  const auto data = xy({1, 2, 3, 4, 5, 6, 7, 8, 9, 10},
                       {12.357953, 24.703709, 37.049314, 49.394984, 61.740601, 74.086352, 86.432163,
                        98.777774, 111.123514, 123.469114});
  struct Case {
    Weighting weighting;
    double pw;
  };
  for (const Case& c :
       {Case{Weighting::None, 0.49818227206653}, Case{Weighting::InvX2, 0.00672207085281116},
        Case{Weighting::InvY2, 0.00682523332071668}}) {
    INFO(cw::fitting::to_string(c.weighting));
    const FitResult f = fit(Model::Linear, c.weighting, data);
    REQUIRE(f.mandel.has_value());
    CHECK_THAT(f.mandel->test_value, WithinRel(c.pw, 1e-11));
    // The fields stay consistent with their definitions: DS² = PW·s_y2², s_y1 = s_y/x.
    CHECK_THAT(f.mandel->ds2,
               WithinRel(f.mandel->test_value * f.mandel->s_y2 * f.mandel->s_y2, 1e-15));
    CHECK_THAT(f.mandel->s_y1, WithinRel(f.residual_sd, 1e-15));
    CHECK(f.mandel->linear_adequate);
  }
}
