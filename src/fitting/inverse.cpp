// SPDX-License-Identifier: Apache-2.0
// Reading a curve backwards: back-calculation, the quadratic's root choice and inverse prediction
// with its interval (calibration-practice.md §3.1-§3.4).
#include <algorithm>
#include <cmath>
#include <cstddef>
#include <limits>
#include <string>

#include "fitting/fit.h"
#include "fitting/number_format.h"

namespace cw::fitting {
namespace {

using detail::format_number;

enum class RootStatus { Ok, ZeroSlope, NoRealRoot, NotMonotonic };

struct Root {
  RootStatus status;
  double x;
};

// |c| is negligible when the quadratic term changes the slope over the working range by less
// than rounding: |2c·x| <= eps·|b| for every x in the range. Then the curve is read as a line.
bool quadratic_term_negligible(const FitResult& fit) {
  const double reach = std::max(std::abs(fit.range_low), std::abs(fit.range_high));
  return std::abs(2 * fit.quadratic * reach) <=
         std::numeric_limits<double>::epsilon() * std::abs(fit.slope);
}

Root invert(const FitResult& fit, double y) {
  const double a = fit.intercept;
  const double b = fit.slope;
  const double c = fit.quadratic;
  const bool quadratic = fit.model == Model::Quadratic && c != 0 && !quadratic_term_negligible(fit);
  if (!quadratic) {
    if (b == 0) return {RootStatus::ZeroSlope, 0};
    return {RootStatus::Ok, (y - a) / b};  // a = 0 for the through-origin and mean-RF models
  }
  // §3.4: c·x² + b·x + (a - y) = 0. The root is taken on the branch of the parabola that holds
  // the working range; a vertex inside the range makes the inverse ambiguous.
  const double vertex = -b / (2 * c);
  if (vertex >= fit.range_low && vertex <= fit.range_high) return {RootStatus::NotMonotonic, 0};
  const double discriminant = b * b - 4 * c * (a - y);
  if (discriminant < 0) return {RootStatus::NoRealRoot, 0};
  // Cancellation-free pair: q = -(b + sign(b)·sqrt(D))/2, roots q/c and (a - y)/q.
  const double q = -(b + std::copysign(std::sqrt(discriminant), b)) / 2;
  if (q == 0) return {RootStatus::Ok, vertex};  // b = 0 and D = 0: the double root
  const double r1 = q / c;
  const double r2 = (a - y) / q;
  const bool right_branch = fit.range_low > vertex;
  return {RootStatus::Ok, right_branch ? std::max(r1, r2) : std::min(r1, r2)};
}

bool uses_x(Weighting weighting) {
  return weighting == Weighting::InvX || weighting == Weighting::InvX2;
}

// The unknown's weight on the calibration's normalised scale, w0 = w(x0 or y0)·n/Σw_raw (§3.2).
double unknown_weight(const FitResult& fit, double x0, double y0) {
  if (fit.weighting == Weighting::None) return 1.0;
  const double v = uses_x(fit.weighting) ? x0 : y0;
  if (!(v > 0)) {
    throw FitError(std::string("the unknown's ") + std::string(to_string(fit.weighting)) +
                       " weight is undefined: its " +
                       (uses_x(fit.weighting) ? "predicted concentration " : "response ") +
                       format_number(v) + " is not above 0",
                   "a weighted curve can only be read back where its weight is defined");
  }
  const bool squared = fit.weighting == Weighting::InvX2 || fit.weighting == Weighting::InvY2;
  const double raw = squared ? 1.0 / (v * v) : 1.0 / v;
  return raw * fit.n_points / fit.sum_raw_weights;
}

}  // namespace

std::optional<double> quadratic_vertex(const FitResult& fit) {
  if (fit.model != Model::Quadratic || fit.quadratic == 0) return std::nullopt;
  return -fit.slope / (2 * fit.quadratic);
}

bool is_monotonic(const FitResult& fit) {
  const std::optional<double> vertex = quadratic_vertex(fit);
  if (!vertex || quadratic_term_negligible(fit)) return true;
  return !(*vertex >= fit.range_low && *vertex <= fit.range_high);
}

std::optional<double> back_calculate(const FitResult& fit, double y) {
  if (!std::isfinite(y)) return std::nullopt;
  const Root root = invert(fit, y);
  if (root.status != RootStatus::Ok || !std::isfinite(root.x)) return std::nullopt;
  return root.x;
}

Prediction inverse_predict(const FitResult& fit, double y0_mean, int m, double confidence) {
  if (m < 1) {
    throw FitError("the number of readings of the unknown must be at least 1, got " +
                   std::to_string(m));
  }
  if (!(confidence > 0 && confidence < 1)) {
    throw FitError("the confidence level must lie between 0 and 1, got " +
                   format_number(confidence));
  }
  if (!std::isfinite(y0_mean)) throw FitError("the response of the unknown is not a finite number");

  const Root root = invert(fit, y0_mean);
  switch (root.status) {
    case RootStatus::Ok:
      break;
    case RootStatus::ZeroSlope:
      throw FitError("the curve has zero slope, so no concentration can be read from it");
    case RootStatus::NoRealRoot:
      throw FitError("response " + format_number(y0_mean) + " has no solution on this curve",
                     "the response lies beyond the extreme value of the parabola");
    case RootStatus::NotMonotonic:
      throw FitError("the curve is not monotonic over its working range (vertex at x = " +
                         format_number(*quadratic_vertex(fit)) + " within [" +
                         format_number(fit.range_low) + ", " + format_number(fit.range_high) +
                         "]), so response " + format_number(y0_mean) +
                         " has no unique concentration",
                     "narrow the working range or fit a linear model");
  }
  const double x0 = root.x;
  const double w0 = unknown_weight(fit, x0, y0_mean);
  const double s = fit.residual_sd;
  const double n = fit.n_points;
  const double b = fit.slope;
  double sd = 0;
  switch (fit.model) {
    case Model::Linear:
      // §3.1-3.2, Miller & Miller: (s/|b|)·sqrt(1/(m·w0) + 1/n + (y0 - ybar_w)²/(b²·Sxx_w)).
      sd = s / std::abs(b) *
           std::sqrt(1.0 / (m * w0) + 1.0 / n +
                     (y0_mean - fit.ybar_w) * (y0_mean - fit.ybar_w) / (b * b * fit.sxx_w));
      break;
    case Model::LinearThroughOrigin:
      // §3.3: (s/|b|)·sqrt(1/(m·w0) + y0²/(b²·Σw'x²)).
      sd = s / std::abs(b) * std::sqrt(1.0 / (m * w0) + y0_mean * y0_mean / (b * b * fit.sum_x2_w));
      break;
    case Model::Quadratic: {
      // §3.4, delta method: sqrt(s²/(m·w0) + gᵀ·Cov·g)/|E|, g = (1, x0, x0²), E = b + 2c·x0.
      const double g[3] = {1.0, x0, x0 * x0};
      double variance_of_fit = 0;
      for (std::size_t i = 0; i < 3; ++i) {
        for (std::size_t j = 0; j < 3; ++j) variance_of_fit += g[i] * fit.covariance[i][j] * g[j];
      }
      const double local_slope = b + 2 * fit.quadratic * x0;
      if (local_slope == 0) {
        throw FitError("the curve is flat at x = " + format_number(x0) +
                       ", so no interval can be given there");
      }
      sd = std::sqrt(s * s / (m * w0) + std::max(0.0, variance_of_fit)) / std::abs(local_slope);
      break;
    }
    case Model::MeanResponseFactor:
      // Delta method for x0 = y0/RF: Var = s²/(m·RF²) + x0²·se(RF)²/RF².
      sd = std::sqrt(s * s / (m * b * b) + x0 * x0 * fit.se_slope * fit.se_slope / (b * b));
      break;
  }
  Prediction out{};
  out.x0 = x0;
  out.sd_x0 = sd;
  out.dof = fit.dof;
  out.t_quantile = student_t_quantile((1.0 + confidence) / 2.0, fit.dof);
  out.ci_low = x0 - out.t_quantile * sd;
  out.ci_high = x0 + out.t_quantile * sd;
  return out;
}

}  // namespace cw::fitting
