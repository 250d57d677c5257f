// SPDX-License-Identifier: Apache-2.0
// Cross-checks fit() against the GNU Scientific Library on seeded random calibration sets: every
// model solved by least squares, every weighting.
#include <catch2/catch.hpp>
#include <cmath>
#include <cstddef>
#include <random>
#include <string>
#include <vector>

#include <gsl/gsl_fit.h>
#include <gsl/gsl_matrix.h>
#include <gsl/gsl_multifit.h>
#include <gsl/gsl_vector.h>

#include "fitting/fit.h"

namespace {

using cw::fitting::FitResult;
using cw::fitting::Model;
using cw::fitting::Observation;
using cw::fitting::Weighting;

// Reference: GSL 2.7, gsl_fit_linear / gsl_fit_wlinear (straight line), gsl_fit_mul /
// gsl_fit_wmul (line through the origin) and gsl_multifit_wlinear (quadratic, SVD).
constexpr double kRel = 1e-9;
constexpr int kSetsPerCombination = 14;  // 3 models × 5 weightings × 14 = 210 sets

struct Reference {
  double beta[3] = {0, 0, 0};  // intercept, slope, quadratic
  double cov[3][3] = {{0, 0, 0}, {0, 0, 0}, {0, 0, 0}};
  double sse_normalised = 0;  // Σw'e² with w' = n·w/Σw
};

double raw_weight(Weighting weighting, double x, double y) {
  switch (weighting) {
    case Weighting::None:
      return 1;
    case Weighting::InvX:
      return 1 / x;
    case Weighting::InvX2:
      return 1 / (x * x);
    case Weighting::InvY:
      return 1 / y;
    case Weighting::InvY2:
      return 1 / (y * y);
  }
  return 1;
}

// GSL's weighted routines return the unscaled (XᵀWX)⁻¹ for raw weights; our covariance is
// chisq_raw/(n - p) times that, whatever the normalisation of the weights.
Reference gsl_reference(Model model, Weighting weighting, const std::vector<double>& x,
                        const std::vector<double>& y) {
  const std::size_t n = x.size();
  std::vector<double> w(n);
  double sum_w = 0;
  for (std::size_t i = 0; i < n; ++i) {
    w[i] = raw_weight(weighting, x[i], y[i]);
    sum_w += w[i];
  }
  Reference ref;
  double chisq = 0;
  if (model == Model::Linear) {
    double c0, c1, cov00, cov01, cov11;
    if (weighting == Weighting::None) {
      // gsl_fit_linear already scales its covariance by sumsq/(n - 2).
      gsl_fit_linear(x.data(), 1, y.data(), 1, n, &c0, &c1, &cov00, &cov01, &cov11, &chisq);
    } else {
      gsl_fit_wlinear(x.data(), 1, w.data(), 1, y.data(), 1, n, &c0, &c1, &cov00, &cov01, &cov11,
                      &chisq);
      const double s2 = chisq / static_cast<double>(n - 2);
      cov00 *= s2;
      cov01 *= s2;
      cov11 *= s2;
    }
    ref.beta[0] = c0;
    ref.beta[1] = c1;
    ref.cov[0][0] = cov00;
    ref.cov[0][1] = ref.cov[1][0] = cov01;
    ref.cov[1][1] = cov11;
  } else if (model == Model::LinearThroughOrigin) {
    double c1, cov11;
    if (weighting == Weighting::None) {
      gsl_fit_mul(x.data(), 1, y.data(), 1, n, &c1, &cov11, &chisq);  // scaled by sumsq/(n - 1)
    } else {
      gsl_fit_wmul(x.data(), 1, w.data(), 1, y.data(), 1, n, &c1, &cov11, &chisq);
      cov11 *= chisq / static_cast<double>(n - 1);
    }
    ref.beta[1] = c1;
    ref.cov[1][1] = cov11;
  } else {
    gsl_matrix* design = gsl_matrix_alloc(n, 3);
    gsl_vector* wv = gsl_vector_alloc(n);
    gsl_vector* yv = gsl_vector_alloc(n);
    gsl_vector* c = gsl_vector_alloc(3);
    gsl_matrix* cov = gsl_matrix_alloc(3, 3);
    for (std::size_t i = 0; i < n; ++i) {
      gsl_matrix_set(design, i, 0, 1.0);
      gsl_matrix_set(design, i, 1, x[i]);
      gsl_matrix_set(design, i, 2, x[i] * x[i]);
      gsl_vector_set(wv, i, w[i]);
      gsl_vector_set(yv, i, y[i]);
    }
    gsl_multifit_linear_workspace* work = gsl_multifit_linear_alloc(n, 3);
    gsl_multifit_wlinear(design, wv, yv, c, cov, &chisq, work);
    const double s2 = chisq / static_cast<double>(n - 3);
    for (std::size_t i = 0; i < 3; ++i) {
      ref.beta[i] = gsl_vector_get(c, i);
      for (std::size_t j = 0; j < 3; ++j) ref.cov[i][j] = s2 * gsl_matrix_get(cov, i, j);
    }
    gsl_multifit_linear_free(work);
    gsl_matrix_free(cov);
    gsl_vector_free(c);
    gsl_vector_free(yv);
    gsl_vector_free(wv);
    gsl_matrix_free(design);
  }
  ref.sse_normalised = static_cast<double>(n) * chisq / sum_w;
  return ref;
}

struct Set {
  std::vector<double> x, y;
};

// A calibration design: 3-12 levels (4-12 for the quadratic), 1-3 replicates per level, the
// lowest level between 1e-3 and 10, a span of up to 3 decades, linear or geometric spacing,
// constant or proportional noise, responses kept positive.
Set random_set(std::mt19937& rng, Model model) {
  std::uniform_real_distribution<double> unit(0.0, 1.0);
  std::normal_distribution<double> gauss(0.0, 1.0);
  const int min_levels = model == Model::Quadratic ? 4 : 3;
  const int levels = std::uniform_int_distribution<int>(min_levels, 12)(rng);
  const double low = std::pow(10.0, -3.0 + 4.0 * unit(rng));
  const double high = low * std::pow(10.0, 0.3 + 2.7 * unit(rng));
  const bool geometric = unit(rng) < 0.5;
  const double b = std::pow(10.0, -1.0 + 4.0 * unit(rng));
  const double a = model == Model::LinearThroughOrigin ? 0.0 : b * low * (-0.5 + 2.5 * unit(rng));
  // Curvature that keeps the quadratic monotonic: slope b·(1 - k·x/high) > 0 for k < 1.
  const double c = model == Model::Quadratic ? -b * (0.05 + 0.35 * unit(rng)) / (2 * high) : 0.0;
  const bool proportional = unit(rng) < 0.5;
  const double cv = 0.005 + 0.045 * unit(rng);
  const double top = a + b * high + c * high * high;
  Set set;
  for (int k = 0; k < levels; ++k) {
    const double t = static_cast<double>(k) / (levels - 1);
    const double x = geometric ? low * std::pow(high / low, t) : low + (high - low) * t;
    const double truth = a + b * x + c * x * x;
    const int replicates = std::uniform_int_distribution<int>(1, 3)(rng);
    for (int r = 0; r < replicates; ++r) {
      const double sd = proportional ? cv * truth : 0.2 * cv * top;
      double y = truth + sd * gauss(rng);
      if (y <= 0) y = 0.5 * truth;
      set.x.push_back(x);
      set.y.push_back(y);
    }
  }
  return set;
}

bool agree(double ours, double reference, double rel) {
  return std::abs(ours - reference) <= rel * std::abs(reference);
}

}  // namespace

TEST_CASE("fit: agrees with GSL on 210 seeded random calibration sets", "[fitting][gsl]") {
  // Reference values: GSL 2.7 (see gsl_reference above); fixed seed, so every run is the same.
  std::mt19937 rng(20240305u);
  const Model models[] = {Model::Linear, Model::LinearThroughOrigin, Model::Quadratic};
  const Weighting weightings[] = {Weighting::None, Weighting::InvX, Weighting::InvX2,
                                  Weighting::InvY, Weighting::InvY2};
  int sets = 0;
  for (Model model : models) {
    for (Weighting weighting : weightings) {
      for (int k = 0; k < kSetsPerCombination; ++k) {
        const Set set = random_set(rng, model);
        std::vector<Observation> data;
        for (std::size_t i = 0; i < set.x.size(); ++i) data.push_back({set.x[i], set.y[i]});
        const FitResult ours = cw::fitting::fit(model, weighting, data);
        const Reference ref = gsl_reference(model, weighting, set.x, set.y);
        ++sets;
        INFO("set " << sets << ": " << cw::fitting::to_string(model) << ", "
                    << cw::fitting::to_string(weighting) << ", n = " << set.x.size());
        const double beta[3] = {ours.intercept, ours.slope, ours.quadratic};
        const int first = model == Model::LinearThroughOrigin ? 1 : 0;
        const int last = model == Model::Quadratic ? 2 : 1;
        for (int i = first; i <= last; ++i) {
          INFO("parameter " << i << ": ours " << beta[i] << ", GSL " << ref.beta[i]);
          CHECK(agree(beta[i], ref.beta[i], kRel));
          for (int j = first; j <= last; ++j) {
            const double ours_cov =
                ours.covariance[static_cast<std::size_t>(i)][static_cast<std::size_t>(j)];
            INFO("covariance " << i << j << ": ours " << ours_cov << ", GSL " << ref.cov[i][j]);
            CHECK(agree(ours_cov, ref.cov[i][j], kRel));
          }
        }
        CHECK(agree(ours.sse, ref.sse_normalised, kRel));
      }
    }
  }
  CHECK(sets >= 200);
}
