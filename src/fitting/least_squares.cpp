// SPDX-License-Identifier: Apache-2.0
// Weighted polynomial least squares by Householder QR; the only translation unit that sees Eigen.
#include "fitting/least_squares.h"

#include <Eigen/Dense>
#include <cmath>
#include <cstddef>
#include <limits>

#include "fitting/fit.h"

namespace cw::fitting::detail {
namespace {

int parameter_count(Design design) {
  switch (design) {
    case Design::Line:
      return 2;
    case Design::LineThroughOrigin:
      return 1;
    case Design::Quadratic:
      return 3;
  }
  return 0;
}

// Position of each scaled column's coefficient in the raw (intercept, slope, quadratic) order.
int raw_index(Design design, int column) {
  return design == Design::LineThroughOrigin ? 1 : column;
}

}  // namespace

LeastSquares solve_least_squares(Design design, const std::vector<double>& x,
                                 const std::vector<double>& y, const std::vector<double>& w) {
  const auto n = static_cast<Eigen::Index>(x.size());
  const int p = parameter_count(design);

  // Centre x at its weighted mean and scale it by its weighted spread, so the columns 1, u, u²
  // are of order one whatever the units and span of the concentrations (calibration-practice.md
  // §1.4: QR on centred, scaled x, never the normal equations). A line through the origin keeps
  // x uncentred (centring would add an intercept) and is only scaled.
  double sum_w = 0;
  double sum_wx = 0;
  for (std::size_t i = 0; i < x.size(); ++i) {
    sum_w += w[i];
    sum_wx += w[i] * x[i];
  }
  const double centre = design == Design::LineThroughOrigin ? 0.0 : sum_wx / sum_w;
  double spread2 = 0;
  for (std::size_t i = 0; i < x.size(); ++i) spread2 += w[i] * (x[i] - centre) * (x[i] - centre);
  const double scale = std::sqrt(spread2 / sum_w);
  if (!(scale > 0) || !std::isfinite(scale)) {
    throw FitError("the concentrations do not spread enough to fit this model");
  }

  Eigen::MatrixXd design_matrix(n, p);
  Eigen::VectorXd rhs(n);
  std::vector<double> u(x.size());
  for (Eigen::Index i = 0; i < n; ++i) {
    const auto k = static_cast<std::size_t>(i);
    const double root_w = std::sqrt(w[k]);
    u[k] = (x[k] - centre) / scale;
    switch (design) {
      case Design::Line:
        design_matrix(i, 0) = root_w;
        design_matrix(i, 1) = root_w * u[k];
        break;
      case Design::LineThroughOrigin:
        design_matrix(i, 0) = root_w * u[k];
        break;
      case Design::Quadratic:
        design_matrix(i, 0) = root_w;
        design_matrix(i, 1) = root_w * u[k];
        design_matrix(i, 2) = root_w * u[k] * u[k];
        break;
    }
    rhs(i) = root_w * y[k];
  }

  const Eigen::HouseholderQR<Eigen::MatrixXd> qr(design_matrix);
  const Eigen::MatrixXd r = qr.matrixQR().topLeftCorner(p, p).triangularView<Eigen::Upper>();
  for (int k = 0; k < p; ++k) {
    const double column_norm = design_matrix.col(k).norm();
    if (!(std::abs(r(k, k)) > 64 * std::numeric_limits<double>::epsilon() * column_norm)) {
      throw FitError("the calibration levels are too few or too close together to fit this model");
    }
  }
  const Eigen::VectorXd beta_scaled = qr.solve(rhs);

  // Residuals from the centred, scaled form: no cancellation between large raw terms.
  LeastSquares out;
  out.residuals.resize(x.size());
  for (std::size_t i = 0; i < x.size(); ++i) {
    double fitted = 0;
    switch (design) {
      case Design::Line:
        fitted = beta_scaled(0) + beta_scaled(1) * u[i];
        break;
      case Design::LineThroughOrigin:
        fitted = beta_scaled(0) * u[i];
        break;
      case Design::Quadratic:
        fitted = beta_scaled(0) + (beta_scaled(1) + beta_scaled(2) * u[i]) * u[i];
        break;
    }
    out.residuals[i] = y[i] - fitted;
    out.sse += w[i] * out.residuals[i] * out.residuals[i];
  }

  // Back to the raw parameterisation, beta_raw = J·beta_scaled, with u = (x - c)/s:
  //   a = b0 - b1·c/s + b2·c²/s²,  b = b1/s - 2·b2·c/s²,  c2 = b2/s².
  Eigen::MatrixXd jacobian = Eigen::MatrixXd::Zero(p, p);
  const double cs = centre / scale;
  switch (design) {
    case Design::Line:
      jacobian << 1, -cs, 0, 1 / scale;
      break;
    case Design::LineThroughOrigin:
      jacobian << 1 / scale;
      break;
    case Design::Quadratic:
      jacobian << 1, -cs, cs * cs, 0, 1 / scale, -2 * cs / scale, 0, 0, 1 / (scale * scale);
      break;
  }
  const Eigen::VectorXd beta_raw = jacobian * beta_scaled;

  // (XᵀWX)⁻¹ = R⁻¹R⁻ᵀ for the scaled design; raw: J·R⁻¹R⁻ᵀ·Jᵀ = K·Kᵀ with K = J·R⁻¹ (triangular
  // solve, no explicit normal matrix), so the diagonal is a sum of squares.
  const Eigen::MatrixXd r_inverse =
      r.triangularView<Eigen::Upper>().solve(Eigen::MatrixXd::Identity(p, p));
  const Eigen::MatrixXd k_factor = jacobian * r_inverse;
  const Eigen::MatrixXd unscaled = k_factor * k_factor.transpose();

  for (int i = 0; i < p; ++i) {
    out.beta[static_cast<std::size_t>(raw_index(design, i))] = beta_raw(i);
    for (int j = 0; j < p; ++j) {
      out.unscaled_covariance[static_cast<std::size_t>(raw_index(design, i))]
                             [static_cast<std::size_t>(raw_index(design, j))] = unscaled(i, j);
    }
  }
  return out;
}

}  // namespace cw::fitting::detail
