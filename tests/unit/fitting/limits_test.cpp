// SPDX-License-Identifier: Apache-2.0
// Checks the ICH Q2 detection and quantification limits with σ at the low end of the range, and
// the mean-response-factor model's agreement with the 1/x²-weighted line through the origin.
#include <catch2/catch.hpp>
#include <cmath>
#include <cstddef>
#include <string>
#include <vector>

#include "fitting/fit.h"

namespace {

using Catch::Matchers::Contains;
using Catch::Matchers::WithinRel;
using cw::fitting::fit;
using cw::fitting::FitResult;
using cw::fitting::inverse_predict;
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

// S1: synthetic weighted line (calibration-practice.md §9 S1).
std::vector<Observation> synthetic_s1() {
  return xy({1, 2, 5, 10, 20, 50, 100}, {10.9, 20.3, 52.8, 100.1, 209.0, 498.0, 1041.0});
}

}  // namespace

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
