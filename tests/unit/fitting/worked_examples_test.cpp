// SPDX-License-Identifier: Apache-2.0
// Checks fits, inverse predictions, the Mandel test and quantiles against the worked examples of
// calibration-practice.md §9 (textbook values and exact check values).
#include <catch2/catch.hpp>
#include <cmath>
#include <cstddef>
#include <string>
#include <vector>

#include "fitting/fit.h"

namespace {

using Catch::Matchers::WithinAbs;
using Catch::Matchers::WithinRel;
using cw::fitting::fit;
using cw::fitting::FitResult;
using cw::fitting::inverse_predict;
using cw::fitting::Model;
using cw::fitting::Observation;
using cw::fitting::Prediction;
using cw::fitting::Weighting;

// [C] values (calibration-check-values.py, exact rational arithmetic) are quoted to 10
// significant digits, so they are checked to 1e-9 relative; exact fractions to 1e-12.
constexpr double kRel = 1e-9;
constexpr double kExact = 1e-12;

std::vector<Observation> xy(const std::vector<double>& x, const std::vector<double>& y) {
  std::vector<Observation> out;
  for (std::size_t i = 0; i < x.size(); ++i) out.push_back({x[i], y[i]});
  return out;
}

// Relative standard error of the back-calculated concentrations (calibration-practice.md §1.7):
// RSE = 100·sqrt(Σ((x_back - x)/x)²/(n - p)) = sqrt(Σ %RE²/(n - p)).
double rse(const FitResult& f, int parameters) {
  double sum = 0;
  for (const auto& p : f.points) sum += *p.error_pct * *p.error_pct;
  return std::sqrt(sum / (f.n_points - parameters));
}

// M1: Miller & Miller, Statistics and Chemometrics for Analytical Chemistry, ch. 5 fluorescence
// example (data and printed values from memory per calibration-practice.md §9 M1; exact values
// [C] from calibration-check-values.py).
std::vector<Observation> miller_m1() {
  return xy({0, 2, 4, 6, 8, 10, 12}, {2.1, 5.0, 9.0, 12.6, 17.3, 21.0, 24.7});
}

// S1: synthetic weighted line of calibration-practice.md §9 S1 (values [C]).
std::vector<Observation> synthetic_s1() {
  return xy({1, 2, 5, 10, 20, 50, 100}, {10.9, 20.3, 52.8, 100.1, 209.0, 498.0, 1041.0});
}

// S2: synthetic quadratic of calibration-practice.md §9 S2 (values [C]).
std::vector<Observation> synthetic_s2() {
  return xy({1, 2, 3, 4, 5, 6, 7, 8, 9, 10},
            {11.9, 21.3, 30.7, 39.5, 48.4, 56.5, 64.7, 72.3, 79.9, 87.0});
}

}  // namespace

TEST_CASE("fit: Miller & Miller M1 line matches the book and the exact values", "[fitting]") {
  const FitResult f = fit(Model::Linear, Weighting::None, miller_m1());
  // Book, rounded (Miller & Miller ch. 5, §9 M1 [M]).
  CHECK_THAT(f.slope, WithinAbs(1.93, 0.005));
  CHECK_THAT(f.intercept, WithinAbs(1.52, 0.005));
  CHECK_THAT(std::sqrt(f.r2), WithinAbs(0.9989, 0.00005));
  CHECK_THAT(f.se_slope, WithinAbs(0.0409, 0.00005));
  // The book's s_y/x 0.4329 and s_a 0.2950 come from its rounded a and b (§9 M1 note): one unit
  // of the last printed digit.
  CHECK_THAT(f.residual_sd, WithinAbs(0.4329, 0.0001));
  CHECK_THAT(f.se_intercept, WithinAbs(0.2950, 0.0001));
  // Exact [C]: b = 1081/560, a = 85/56.
  CHECK_THAT(f.slope, WithinRel(1081.0 / 560.0, kExact));
  CHECK_THAT(f.intercept, WithinRel(85.0 / 56.0, kExact));
  CHECK_THAT(std::sqrt(f.r2), WithinRel(0.9988795653, kRel));
  CHECK_THAT(f.r2, WithinRel(0.9977603861, kRel));
  CHECK_THAT(1 - (1 - f.r2) * (f.n_points - 1) / f.dof, WithinRel(0.9973124633, kRel));
  CHECK_THAT(f.residual_sd, WithinRel(0.4328477132, kRel));
  CHECK_THAT(f.se_slope, WithinRel(0.04090026446, kRel));
  CHECK_THAT(f.se_intercept, WithinRel(0.2949360014, kRel));
  CHECK_THAT(f.intercept / f.se_intercept, WithinRel(5.146394933, kRel));  // §2.6 intercept t
  CHECK(f.dof == 5);
  CHECK(f.n_levels == 7);
  CHECK(f.r2_definition.find("centred") != std::string::npos);
  // ICH Q2 (§4.1, [C]): 3.3·s_y/x/b and 10·s_y/x/b.
  CHECK_THAT(f.lod, WithinRel(0.7399653784, kRel));
  CHECK_THAT(f.loq, WithinRel(2.242319329, kRel));
  // Blank-based LOD of the book, 3·s_y/x/b: 0.67 pg/mL [M], 0.6726957986 [C].
  CHECK_THAT(3 * f.residual_sd / f.slope, WithinAbs(0.67, 0.005));
  CHECK_THAT(3 * f.residual_sd / f.slope, WithinRel(0.6726957986, kRel));
}

TEST_CASE("inverse_predict: Miller & Miller M1 x0, s_x0 and 95 % half-width", "[fitting]") {
  const FitResult f = fit(Model::Linear, Weighting::None, miller_m1());
  struct Case {
    double y0;
    int m;
    double book_x0, book_sd, book_half;  // printed, 2 decimals [M]; 0 = not printed
    double x0, sd, half;                 // [C]
  };
  const Case cases[] = {
      {2.9, 1, 0.72, 0.26, 0.68, 0.7160037003, 0.264569771, 0.6800982475},
      {13.5, 1, 6.21, 0.24, 0.62, 6.207215541, 0.2397542227, 0.6163078499},
      {23.0, 1, 11.13, 0.26, 0.68, 11.12858464, 0.2631932593, 0.6765598115},
      {13.5, 4, 0, 0, 0, 6.207215541, 0.1406133618, 0.3614581537},
  };
  for (const Case& c : cases) {
    INFO("y0 = " << c.y0 << ", m = " << c.m);
    const Prediction p = inverse_predict(f, c.y0, c.m);
    if (c.book_x0 != 0) {
      CHECK_THAT(p.x0, WithinAbs(c.book_x0, 0.005));
      CHECK_THAT(p.sd_x0, WithinAbs(c.book_sd, 0.005));
      CHECK_THAT(p.ci_high - p.x0, WithinAbs(c.book_half, 0.005));
    }
    CHECK_THAT(p.x0, WithinRel(c.x0, kRel));
    CHECK_THAT(p.sd_x0, WithinRel(c.sd, kRel));
    CHECK_THAT(p.ci_high - p.x0, WithinRel(c.half, kRel));
    CHECK_THAT(p.x0 - p.ci_low, WithinRel(c.half, kRel));
    CHECK_THAT(p.t_quantile, WithinRel(2.570581836, kRel));  // t(0.975; 5) [C]
    CHECK(p.dof == 5);
  }
}

TEST_CASE("fit: Mandel test on Miller & Miller M1 finds the line adequate", "[fitting]") {
  // §9 M1 [C]: s_y2 = 0.4104295079, PW = 1.561130742 < F(0.99; 1, 4) = 21.19768958.
  const FitResult f = fit(Model::Linear, Weighting::None, miller_m1());
  REQUIRE(f.mandel.has_value());
  CHECK_THAT(f.mandel->s_y1, WithinRel(0.4328477132, kRel));
  CHECK_THAT(f.mandel->s_y2, WithinRel(0.4104295079, kRel));
  CHECK_THAT(f.mandel->test_value, WithinRel(1.561130742, kRel));
  CHECK_THAT(f.mandel->f_critical_99, WithinRel(21.19768958, kRel));
  CHECK(f.mandel->dof_quadratic == 4);
  CHECK(f.mandel->linear_adequate);
}

TEST_CASE("fit: Harvey M2 line matches the published b and a", "[fitting]") {
  // Harvey, Analytical Chemistry 2.1, ch. 5, Table 5.1 / Example 5.9: b = 120.706, a = 0.209 [P];
  // the rest [C] (§9 M2).
  const FitResult f = fit(
      Model::Linear, Weighting::None,
      xy({0.000, 0.100, 0.200, 0.300, 0.400, 0.500}, {0.00, 12.36, 24.83, 35.91, 48.79, 60.42}));
  CHECK_THAT(f.slope, WithinAbs(120.706, 0.0005));
  CHECK_THAT(f.intercept, WithinAbs(0.209, 0.0005));
  CHECK_THAT(f.slope, WithinRel(120.7057143, kRel));
  CHECK_THAT(f.intercept, WithinRel(0.2085714286, kRel));
  CHECK_THAT(f.residual_sd, WithinRel(0.4032971255, kRel));
  CHECK_THAT(f.se_slope, WithinRel(0.9640645249, kRel));
  CHECK_THAT(f.se_intercept, WithinRel(0.29188503, kRel));
}

TEST_CASE("fit: Berthouex & Brown M3 HPLC dye line matches the published values", "[fitting]") {
  // Berthouex & Brown, Statistics for Environmental Engineers (2nd ed.), ch. 34 (data of Bailey,
  // Cox & Springer 1978): published [P] and exact [C] values of §9 M3.
  const FitResult f = fit(Model::Linear, Weighting::None,
                          xy({0.18, 0.35, 0.055, 0.022, 0.29, 0.15, 0.044, 0.028, 0.044, 0.073,
                              0.13, 0.088, 0.26, 0.16, 0.10},
                             {26.666, 50.651, 9.628, 4.634, 40.206, 21.369, 5.948, 4.245, 4.786,
                              11.321, 18.456, 12.865, 35.186, 24.245, 14.175}));
  CHECK(f.dof == 13);
  CHECK_THAT(f.intercept, WithinAbs(0.566, 0.0005));
  CHECK_THAT(f.slope, WithinAbs(139.759, 0.0005));
  CHECK_THAT(f.se_intercept, WithinAbs(0.473, 0.0005));
  CHECK_THAT(f.se_slope, WithinAbs(2.889, 0.0005));
  CHECK_THAT(f.sse, WithinAbs(15.523, 0.0005));
  CHECK_THAT(f.residual_sd * f.residual_sd, WithinAbs(1.194, 0.0005));
  CHECK_THAT(f.intercept, WithinRel(0.5664942257, kRel));
  CHECK_THAT(f.slope, WithinRel(139.7586558, kRel));
  CHECK_THAT(f.se_intercept, WithinRel(0.4734484869, kRel));
  CHECK_THAT(f.se_slope, WithinRel(2.889037286, kRel));
  CHECK_THAT(f.sse, WithinRel(15.52267814, kRel));
  CHECK_THAT(f.residual_sd * f.residual_sd, WithinRel(1.194052165, kRel));
}

TEST_CASE("inverse_predict: QUAM example A5 u(c0) with p = 2 readings", "[fitting]") {
  // Eurachem/CITAC QUAM 3rd ed. (2012), example A5: c0 = 0.26 mg/L, u(c0) = 0.018 mg/L [P];
  // B1 = 0.241, B0 = 0.0087, S = 0.005485645604, Sxx = 1.2, u(c0) = 0.01784557457 [C] (§9 M4).
  std::vector<Observation> data;
  const double conc[] = {0.1, 0.3, 0.5, 0.7, 0.9};
  const double absorbance[5][3] = {{0.028, 0.029, 0.029},
                                   {0.084, 0.083, 0.081},
                                   {0.135, 0.131, 0.133},
                                   {0.180, 0.181, 0.183},
                                   {0.215, 0.230, 0.216}};
  for (int level = 0; level < 5; ++level) {
    for (double a : absorbance[level]) data.push_back({conc[level], a});
  }
  const FitResult f = fit(Model::Linear, Weighting::None, data);
  CHECK_THAT(f.slope, WithinRel(0.241, kExact));
  CHECK_THAT(f.intercept, WithinRel(0.0087, kExact));
  CHECK_THAT(f.residual_sd, WithinRel(0.005485645604, kRel));
  CHECK_THAT(f.sxx_w, WithinRel(1.2, kExact));
  CHECK(f.n_points == 15);
  CHECK(f.n_levels == 5);
  // The response whose concentration is c0 = 0.26 on the published line B0 + B1·c0.
  const Prediction p = inverse_predict(f, 0.0087 + 0.241 * 0.26, 2);
  CHECK_THAT(p.x0, WithinRel(0.26, kExact));
  CHECK_THAT(p.sd_x0, WithinAbs(0.018, 0.0005));
  CHECK_THAT(p.sd_x0, WithinRel(0.01784557457, kRel));
  CHECK(p.dof == 13);
}

TEST_CASE("fit: synthetic S1 weighted 1/x^2 line and its inverse prediction", "[fitting]") {
  // §9 S1 "The 1/x² fit in detail" [C]: b = 2372974/232775, a = 5349/9311.
  const FitResult f = fit(Model::Linear, Weighting::InvX2, synthetic_s1());
  CHECK_THAT(f.slope, WithinRel(2372974.0 / 232775.0, kExact));
  CHECK_THAT(f.intercept, WithinRel(5349.0 / 9311.0, kExact));
  CHECK_THAT(f.se_slope, WithinRel(0.1373629056, kRel));
  CHECK_THAT(f.se_intercept, WithinRel(0.3183803684, kRel));
  CHECK_THAT(f.r2, WithinRel(0.9990930119, kRel));
  CHECK_THAT(f.residual_sd, WithinRel(0.6592465437, kRel));
  CHECK(f.r2_definition.find("weighted") != std::string::npos);
  CHECK_THAT(f.xbar_w, WithinRel(1.442824252, kRel));
  CHECK_THAT(f.ybar_w, WithinRel(15.28303914, kRel));
  CHECK_THAT(f.sxx_w, WithinRel(23.03333296, kRel));
  const double weights[] = {5.372217959,  1.34305449,     0.2148887183,   0.05372217959,
                            0.0134305449, 0.002148887183, 0.0005372217959};
  const double re[] = {1.28735081,  -3.252047852, 2.460414653, -2.371233313,
                       2.226678421, -2.410877658, 2.05971494};
  REQUIRE(f.points.size() == 7);
  for (std::size_t i = 0; i < 7; ++i) {
    INFO("point " << i + 1);
    CHECK_THAT(f.points[i].weight, WithinRel(weights[i], kRel));
    REQUIRE(f.points[i].error_pct.has_value());
    CHECK_THAT(*f.points[i].error_pct, WithinRel(re[i], kRel));
  }
  // Inverse at y0 = 30, m = 1 [C]: x0 = 2.88647284, w0 = 0.6447905645, s_x0w = 0.08638071144,
  // 95 % half-width 0.2220486878 with t(0.975; 5).
  const Prediction p = inverse_predict(f, 30.0, 1);
  CHECK_THAT(p.x0, WithinRel(2.88647284, kRel));
  CHECK_THAT((1 / (p.x0 * p.x0)) * f.n_points / f.sum_raw_weights, WithinRel(0.6447905645, kRel));
  CHECK_THAT(p.sd_x0, WithinRel(0.08638071144, kRel));
  CHECK_THAT(p.ci_high - p.x0, WithinRel(0.2220486878, kRel));
}

TEST_CASE("fit: synthetic S1 table, every weighting", "[fitting]") {
  // §9 S1 table and per-level %RE [C] (calibration-check-values.py).
  struct Row {
    Weighting weighting;
    double b, a, r2w, s, sum_abs_re;
    double re[7];
  };
  const Row rows[] = {
      {Weighting::None,
       10.35049404,
       -1.970411341,
       0.9995247231,
       9.017318836,
       45.2151604,
       {24.34586497, 7.581393008, 5.831491972, -1.385952251, 1.913208461, -3.391971544,
        0.7652781964}},
      {Weighting::InvX,
       10.2656287,
       0.308829326,
       0.9994862865,
       2.555728025,
       16.91781953,
       {3.171184039, -2.630558403, 2.265866479, -2.790979846, 1.645586874, -3.037371515,
        1.376272371}},
      {Weighting::InvX2,
       10.19428203,
       0.5744817957,
       0.9990930119,
       0.6592465437,
       16.06831765,
       {1.28735081, -3.252047852, 2.460414653, -2.371233313, 2.226678421, -2.410877658,
        2.05971494}},
      {Weighting::InvY,
       10.26145965,
       0.2971212834,
       0.9994773172,
       2.611736243,
       17.03834338,
       {3.327197891, -2.533950317, 2.330234722, -2.740075833, 1.692588522, -2.995695387,
        1.418600711}},
      {Weighting::InvY2,
       10.18422028,
       0.5698160352,
       0.99908902,
       0.6886823523,
       16.21231095,
       {1.433233794, -3.133556492, 2.570805695, -2.270197181, 2.329966494, -2.313545783,
        2.161005512}},
  };
  for (const Row& row : rows) {
    INFO("weighting " << cw::fitting::to_string(row.weighting));
    const FitResult f = fit(Model::Linear, row.weighting, synthetic_s1());
    CHECK_THAT(f.slope, WithinRel(row.b, kRel));
    CHECK_THAT(f.intercept, WithinRel(row.a, kRel));
    CHECK_THAT(f.r2, WithinRel(row.r2w, kRel));
    CHECK_THAT(f.residual_sd, WithinRel(row.s, kRel));
    double sum_abs = 0;
    for (std::size_t i = 0; i < 7; ++i) {
      REQUIRE(f.points[i].error_pct.has_value());
      CHECK_THAT(*f.points[i].error_pct, WithinRel(row.re[i], kRel));
      sum_abs += std::abs(*f.points[i].error_pct);
    }
    CHECK_THAT(sum_abs, WithinRel(row.sum_abs_re, kRel));
  }
}

TEST_CASE("fit: synthetic S2 quadratic, inverse at y0 = 60 and %RE per level", "[fitting]") {
  // §9 S2 [C]: a = 201/100, b = 65947/6600, c = -197/1320.
  const FitResult f = fit(Model::Quadratic, Weighting::None, synthetic_s2());
  CHECK_THAT(f.intercept, WithinRel(201.0 / 100.0, kExact));
  CHECK_THAT(f.slope, WithinRel(65947.0 / 6600.0, kExact));
  CHECK_THAT(f.quadratic, WithinRel(-197.0 / 1320.0, kExact));
  CHECK_THAT(f.residual_sd, WithinRel(0.101375817, kRel));
  CHECK_THAT(f.sse, WithinRel(0.07193939394, kRel));
  CHECK_THAT(f.se_intercept, WithinRel(0.1192333616, kRel));
  CHECK_THAT(f.se_slope, WithinRel(0.04979687851, kRel));
  CHECK_THAT(f.se_quadratic, WithinRel(0.004411816149, kRel));
  CHECK(f.dof == 7);
  REQUIRE(cw::fitting::quadratic_vertex(f).has_value());
  CHECK_THAT(*cw::fitting::quadratic_vertex(f), WithinRel(33.47563452, kRel));
  CHECK(cw::fitting::is_monotonic(f));
  CHECK_FALSE(f.mandel.has_value());  // Mandel is reported on the linear fit only
  const double re[] = {0.48771188,    -0.5159861796, 0.2098922634,  -0.2556946981, 0.3794693451,
                       -0.1810198866, 0.1068354306,  -0.1548829316, 0.0774387653,  -0.007784159655};
  for (std::size_t i = 0; i < 10; ++i) {
    INFO("level " << i + 1);
    REQUIRE(f.points[i].error_pct.has_value());
    // %RE near zero: the [C] value's own 10 digits bound the comparison.
    CHECK_THAT(*f.points[i].error_pct, WithinRel(re[i], kRel));
  }
  // Inverse at y0 = 60 [C]: x0 = 6.419107213 (the other root, 60.53216182, lies beyond the
  // vertex), s_x0 (m = 1) = 0.01383142739, 95 % half-width 0.03270612864 with t(0.975; 7).
  const Prediction p = inverse_predict(f, 60.0, 1);
  CHECK_THAT(p.x0, WithinRel(6.419107213, kRel));
  CHECK_THAT(p.sd_x0, WithinRel(0.01383142739, kRel));
  CHECK_THAT(p.ci_high - p.x0, WithinRel(0.03270612864, kRel));
  CHECK(p.dof == 7);
  REQUIRE(cw::fitting::back_calculate(f, 60.0).has_value());
  CHECK_THAT(*cw::fitting::back_calculate(f, 60.0), WithinRel(6.419107213, kRel));
}

TEST_CASE("fit: synthetic S2 linear fit fails the Mandel test", "[fitting]") {
  // §9 S2 [C]: linear b = 8.35030303, a = 5.293333333, r² = 0.9979473436, s_y1 = 1.216153898,
  // SSE 11.83224242; DS² = 11.76030303, PW = 1144.326032 > F(0.99; 1, 7) = 12.24638335.
  const FitResult f = fit(Model::Linear, Weighting::None, synthetic_s2());
  CHECK_THAT(f.slope, WithinRel(8.35030303, kRel));
  CHECK_THAT(f.intercept, WithinRel(5.293333333, kRel));
  CHECK_THAT(f.r2, WithinRel(0.9979473436, kRel));
  CHECK_THAT(f.residual_sd, WithinRel(1.216153898, kRel));
  CHECK_THAT(f.sse, WithinRel(11.83224242, kRel));
  REQUIRE(f.mandel.has_value());
  CHECK_THAT(f.mandel->s_y1, WithinRel(1.216153898, kRel));
  CHECK_THAT(f.mandel->s_y2, WithinRel(0.101375817, kRel));
  CHECK_THAT(f.mandel->ds2, WithinRel(11.76030303, kRel));
  CHECK_THAT(f.mandel->test_value, WithinRel(1144.326032, kRel));
  CHECK_THAT(f.mandel->f_critical_99, WithinRel(12.24638335, kRel));
  CHECK(f.mandel->dof_quadratic == 7);
  CHECK_FALSE(f.mandel->linear_adequate);
}

TEST_CASE("fit: synthetic S3 mean response factor and RSE identity", "[fitting]") {
  // §9 S3 [C]: RF = 1020, 1030, 1008, 994, 989; mean 1008.2; SD 17.21046193; %RSD 1.707048397;
  // RSE (average RF, p = 1) = %RSD = 1.707048397; RSE (line, p = 2) = 7.95584067.
  const auto data = xy({1, 5, 10, 50, 100}, {1020, 5150, 10080, 49700, 98900});
  const FitResult f = fit(Model::MeanResponseFactor, Weighting::None, data);
  CHECK_THAT(f.slope, WithinRel(1008.2, kExact));
  CHECK(f.intercept == 0);
  CHECK_THAT(f.rf_mean, WithinRel(1008.2, kExact));
  CHECK_THAT(f.rf_sd, WithinRel(17.21046193, kRel));
  CHECK_THAT(f.rf_rsd_pct, WithinRel(1.707048397, kRel));
  CHECK_THAT(f.se_slope, WithinRel(17.21046193 / std::sqrt(5.0), kRel));  // s_RF/sqrt(n)
  CHECK(f.dof == 4);
  CHECK_THAT(rse(f, 1), WithinRel(1.707048397, kRel));
  const double rf[] = {1020, 1030, 1008, 994, 989};
  for (std::size_t i = 0; i < 5; ++i) {  // x_back = y/RFbar, %RE = 100·(RF_i/RFbar - 1)
    CHECK_THAT(*f.points[i].error_pct, WithinRel(100 * (rf[i] / 1008.2 - 1), kExact));
  }

  const FitResult line = fit(Model::Linear, Weighting::None, data);
  CHECK_THAT(rse(line, 2), WithinRel(7.95584067, kRel));
  // The linear model reports the same response factors (§1.5 statistics over x > 0).
  CHECK_THAT(line.rf_rsd_pct, WithinRel(1.707048397, kRel));
}

TEST_CASE("fit: synthetic S3 internal standard via mean relative response factor", "[fitting]") {
  // §9 S3 [C]: C_is = 20; RRF mean 1.011619303, %RSD 1.248384118; the sample A_x = 30250,
  // A_is = 39900 gives C_extract = 14.98874846 (149.8874846 with DF = 10).
  const double c_is = 20;
  const double conc[] = {1, 5, 10, 50, 100};
  const double a_is[] = {40100, 39800, 40500, 39600, 40200};
  const double a_x[] = {2050, 10100, 20500, 100800, 199000};
  std::vector<Observation> data;  // amount ratio Q = C_x/C_is, response ratio R = A_x/A_is (§1.6)
  for (std::size_t i = 0; i < 5; ++i) data.push_back({conc[i] / c_is, a_x[i] / a_is[i]});
  const FitResult f = fit(Model::MeanResponseFactor, Weighting::None, data);
  CHECK_THAT(f.slope, WithinRel(1.011619303, kRel));
  CHECK_THAT(f.rf_rsd_pct, WithinRel(1.248384118, kRel));
  const auto q0 = cw::fitting::back_calculate(f, 30250.0 / 39900.0);
  REQUIRE(q0.has_value());
  CHECK_THAT(*q0 * c_is, WithinRel(14.98874846, kRel));
  CHECK_THAT(*q0 * c_is * 10, WithinRel(149.8874846, kRel));
}

TEST_CASE("student_t_quantile and f_quantile: values quoted in §9", "[fitting]") {
  using cw::fitting::f_quantile;
  using cw::fitting::student_t_quantile;
  // calibration-practice.md §9 quantiles [C] (agree with printed tables).
  CHECK_THAT(student_t_quantile(0.975, 4), WithinRel(2.776445105, kRel));
  CHECK_THAT(student_t_quantile(0.975, 5), WithinRel(2.570581836, kRel));
  CHECK_THAT(student_t_quantile(0.975, 8), WithinRel(2.306004135, kRel));
  CHECK_THAT(student_t_quantile(0.99, 5), WithinRel(3.364929999, kRel));
  CHECK_THAT(student_t_quantile(0.995, 5), WithinRel(4.032142984, kRel));
  CHECK_THAT(f_quantile(0.99, 1, 4), WithinRel(21.19768958, kRel));
  CHECK_THAT(f_quantile(0.99, 1, 7), WithinRel(12.24638335, kRel));
  CHECK_THAT(f_quantile(0.99, 9, 9), WithinRel(5.351128861, kRel));
  CHECK_THAT(f_quantile(0.95, 3, 10), WithinRel(3.708264819, kRel));
  // §2.2 table F(0.99; 1, f), f = 2..10, printed to 3 decimals [C].
  const double f99[] = {98.503, 34.116, 21.198, 16.258, 13.745, 12.246, 11.259, 10.561, 10.044};
  for (int f = 2; f <= 10; ++f) {
    INFO("f = " << f);
    CHECK_THAT(f_quantile(0.99, 1, f), WithinAbs(f99[f - 2], 0.0005));
  }
}
