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

// The quadratic in the coordinates it is read in: y = p0 + p1·v + p2·v², x = origin + unit·v.
// With the solver's design these are the centred, scaled u (origin = centre, unit = scale), where
// the coefficients are of the size of the responses; without it the raw x (origin 0, unit 1).
struct Parabola {
  double p0, p1, p2;
  double origin, unit;
};

Parabola parabola(const FitResult& fit) {
  if (fit.design && fit.design->parameters == 3) {
    const ScaledDesign& d = *fit.design;
    return {d.coefficients[0], d.coefficients[1], d.coefficients[2], d.centre, d.scale};
  }
  return {fit.intercept, fit.slope, fit.quadratic, 0.0, 1.0};
}

double to_v(const Parabola& q, double x) {
  return (x - q.origin) / q.unit;
}

// |p2| is negligible when the quadratic term changes the slope over the working range by less
// than rounding: |2·p2·v| <= eps·|p1| for every v in the range. Then the curve is read as a line.
bool quadratic_term_negligible(const FitResult& fit) {
  const Parabola q = parabola(fit);
  const double reach =
      std::max(std::abs(to_v(q, fit.range_low)), std::abs(to_v(q, fit.range_high)));
  return std::abs(2 * q.p2 * reach) <= std::numeric_limits<double>::epsilon() * std::abs(q.p1);
}

bool is_quadratic(const FitResult& fit) {
  return fit.model == Model::Quadratic && parabola(fit).p2 != 0 && !quadratic_term_negligible(fit);
}

Root invert(const FitResult& fit, double y) {
  if (!is_quadratic(fit)) {
    if (fit.model == Model::Quadratic) {
      // Read as the line p0 + p1·v in its own coordinates.
      const Parabola q = parabola(fit);
      if (q.p1 == 0) return {RootStatus::ZeroSlope, 0};
      return {RootStatus::Ok, q.origin + q.unit * ((y - q.p0) / q.p1)};
    }
    if (fit.slope == 0) return {RootStatus::ZeroSlope, 0};
    // a = 0 for the through-origin and mean-RF models.
    return {RootStatus::Ok, (y - fit.intercept) / fit.slope};
  }
  // §3.4: p2·v² + p1·v + (p0 - y) = 0 in the coordinates of parabola(). The root is taken on the
  // branch of the parabola that holds the working range; a vertex inside the range makes the
  // inverse ambiguous.
  const Parabola q = parabola(fit);
  const double vertex = -q.p1 / (2 * q.p2);
  const double low = to_v(q, fit.range_low);
  const double high = to_v(q, fit.range_high);
  if (vertex >= low && vertex <= high) return {RootStatus::NotMonotonic, 0};
  const double discriminant = q.p1 * q.p1 - 4 * q.p2 * (q.p0 - y);
  if (discriminant < 0) return {RootStatus::NoRealRoot, 0};
  // Cancellation-free pair: s = -(p1 + sign(p1)·sqrt(D))/2, roots s/p2 and (p0 - y)/s.
  const double s = -(q.p1 + std::copysign(std::sqrt(discriminant), q.p1)) / 2;
  const double v = [&] {
    if (s == 0) return vertex;  // p1 = 0 and D = 0: the double root
    const double r1 = s / q.p2;
    const double r2 = (q.p0 - y) / s;
    const bool right_branch = low > vertex;
    return right_branch ? std::max(r1, r2) : std::min(r1, r2);
  }();
  return {RootStatus::Ok, q.origin + q.unit * v};
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

// §3.4, delta method for the quadratic: Var(x0) ≈ (s²/(m·w0) + gᵀ·Cov·g)/E², with g the
// gradient of the fitted response at x0 with respect to the coefficients and E = dy/dx at x0.
// Evaluated in the solver's u = (x - centre)/scale: g_u = (1, u0, u0²), Cov_u = s²·R⁻¹R⁻ᵀ, so
// gᵀ·Cov·g = s²·|R⁻ᵀg_u|², a sum of squares with no cancellation, and E = (β1 + 2β2·u0)/scale.
// (The raw form with g = (1, x0, x0²) is the same number in exact arithmetic, but its terms are
// ~(x0/range)⁴ times larger than the result: 6-7 digits left at x ~ 1000, none at 100 000.)
double quadratic_sd(const FitResult& fit, double x0, int m, double w0) {
  const double s2 = fit.residual_sd * fit.residual_sd;
  double fit_variance = 0;
  double local_slope = 0;
  if (fit.design && fit.design->parameters == 3) {
    const ScaledDesign& d = *fit.design;
    const double u0 = (x0 - d.centre) / d.scale;
    const double g[3] = {1.0, u0, u0 * u0};
    double squares = 0;
    for (std::size_t j = 0; j < 3; ++j) {
      double z = 0;  // (R⁻ᵀg)_j = Σ_{i<=j} R⁻¹_ij·g_i (R⁻¹ is upper triangular)
      for (std::size_t i = 0; i <= j; ++i) z += d.r_inverse[i][j] * g[i];
      squares += z * z;
    }
    fit_variance = s2 * squares;
    local_slope = (d.coefficients[1] + 2 * d.coefficients[2] * u0) / d.scale;
  } else {
    // No centred representation (a result kept from before it was stored): the raw form, with a
    // bound on its rounding error. Each covariance entry carries a few ulps of its terms, the sum
    // of nine terms a few more; 32·eps·Σ|terms| is a generous bound. If the bound does not leave
    // 6 significant digits of the variance, or the sum comes out negative, refuse rather than
    // clamp.
    const double g[3] = {1.0, x0, x0 * x0};
    double magnitude = 0;
    for (std::size_t i = 0; i < 3; ++i) {
      for (std::size_t j = 0; j < 3; ++j) {
        const double term = g[i] * fit.covariance[i][j] * g[j];
        fit_variance += term;
        magnitude += std::abs(term);
      }
    }
    const double error_bound = 32 * std::numeric_limits<double>::epsilon() * magnitude;
    const double total = s2 / (m * w0) + fit_variance;
    if (!(fit_variance >= 0) || !(error_bound <= 1e-6 * total)) {
      throw FitError("the variance of the concentration at x = " + format_number(x0) +
                         " cannot be computed to 6 significant digits from this curve's raw "
                         "parameter covariance (its terms cancel)",
                     "refit the curve so that its centred, scaled representation is kept");
    }
    local_slope = fit.slope + 2 * fit.quadratic * x0;
  }
  if (local_slope == 0) {
    throw FitError("the curve is flat at x = " + format_number(x0) +
                   ", so no interval can be given there");
  }
  return std::sqrt(s2 / (m * w0) + fit_variance) / std::abs(local_slope);
}

}  // namespace

std::optional<double> quadratic_vertex(const FitResult& fit) {
  if (fit.model != Model::Quadratic) return std::nullopt;
  const Parabola q = parabola(fit);
  if (q.p2 == 0) return std::nullopt;
  return q.origin + q.unit * (-q.p1 / (2 * q.p2));
}

bool is_monotonic(const FitResult& fit) {
  const std::optional<double> vertex = quadratic_vertex(fit);
  if (!vertex || quadratic_term_negligible(fit)) return true;
  return !(*vertex >= fit.range_low && *vertex <= fit.range_high);
}

double predict_response(const FitResult& fit, double x) {
  if (fit.design) {
    const ScaledDesign& d = *fit.design;
    const double u = (x - d.centre) / d.scale;
    switch (d.parameters) {
      case 1:
        return d.coefficients[0] * u;
      case 2:
        return d.coefficients[0] + d.coefficients[1] * u;
      case 3:
        return d.coefficients[0] + (d.coefficients[1] + d.coefficients[2] * u) * u;
      default:
        break;
    }
  }
  return fit.intercept + (fit.slope + fit.quadratic * x) * x;
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
    case Model::Quadratic:
      sd = quadratic_sd(fit, x0, m, w0);
      break;
    case Model::MeanResponseFactor: {
      // The mean of ratios RFbar = Σ(y_i/x_i)/n assumes a constant relative error: y_i/x_i
      // scatters about RF with SD σ_RF, estimated by s_RF (n - 1 degrees of freedom). Then
      // x0 = y0/RFbar with y0 the mean of m readings of relative SD s_RF/RF, and to first order
      //   s_x0 = x0·(s_RF/RFbar)·sqrt(1/m + 1/n),  f = n - 1.
      // This is exactly the §3.3 through-origin interval of the 1/x²-weighted line (whose slope is
      // RFbar): s² = (n/Σw)·s_RF², Σw'x² = n²/Σw, w0 = (1/x0²)·n/Σw give the same expression.
      if (!(x0 > 0)) {
        throw FitError(
            "the mean-response-factor interval needs a predicted concentration above 0, "
            "got " +
                format_number(x0),
            "its relative-error model has no interval at or below zero");
      }
      sd = x0 * (fit.rf_sd / fit.rf_mean) * std::sqrt(1.0 / m + 1.0 / n);
      break;
    }
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
