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
  using Real = long double;
  using Matrix = Eigen::Matrix<Real, Eigen::Dynamic, Eigen::Dynamic>;
  using Vector = Eigen::Matrix<Real, Eigen::Dynamic, 1>;
  const auto n = static_cast<Eigen::Index>(x.size());
  const int p = parameter_count(design);

  // Centre x at its weighted mean and scale it by its weighted spread, so the columns 1, u, u²
  // are of order one whatever the units and span of the concentrations (calibration-practice.md
  // §1.4: QR on centred, scaled x, never the normal equations). A line through the origin keeps
  // x uncentred (centring would add an intercept) and is only scaled. Centre and scale are
  // rounded to double before use, so the u of the stored representation is exactly the u fitted.
  //
  // The whole solve runs in long double (a 64-bit significand on x86-64, 11 bits more than
  // double): the raw intercept a = b0 - b1·c/s + b2·c²/s² cancels about log10(|ybar|/|a|) digits
  // (3 on NIST Norris and Pontius), and a narrow range far from zero makes the residuals tiny next
  // to y. The extra bits absorb both losses, so the results rounded to double keep the digits the
  // double inputs carry.
  Real sum_w = 0;
  Real sum_wx = 0;
  Real sum_wy = 0;
  for (std::size_t i = 0; i < x.size(); ++i) {
    sum_w += w[i];
    sum_wx += static_cast<Real>(w[i]) * x[i];
    sum_wy += static_cast<Real>(w[i]) * y[i];
  }
  const bool through_origin = design == Design::LineThroughOrigin;
  const double centre = through_origin ? 0.0 : static_cast<double>(sum_wx / sum_w);
  Real spread2 = 0;
  for (std::size_t i = 0; i < x.size(); ++i) {
    const Real d = static_cast<Real>(x[i]) - centre;
    spread2 += w[i] * d * d;
  }
  const double scale = static_cast<double>(std::sqrt(spread2 / sum_w));
  if (!(scale > 0) || !std::isfinite(scale)) {
    throw FitError("the concentrations do not spread enough to fit this model");
  }
  // Responses are centred too where the design has an intercept (it absorbs the shift): the
  // rounding the QR commits is then relative to the spread of y, not to its size.
  const Real y_shift = through_origin ? Real(0) : sum_wy / sum_w;

  Matrix design_matrix(n, p);
  Vector rhs(n);
  std::vector<Real> u(x.size());
  for (Eigen::Index i = 0; i < n; ++i) {
    const auto k = static_cast<std::size_t>(i);
    const Real root_w = std::sqrt(static_cast<Real>(w[k]));
    u[k] = (static_cast<Real>(x[k]) - centre) / scale;
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
    rhs(i) = root_w * (y[k] - y_shift);
  }

  const Eigen::HouseholderQR<Matrix> qr(design_matrix);
  const Matrix r = qr.matrixQR().topLeftCorner(p, p).template triangularView<Eigen::Upper>();
  for (int k = 0; k < p; ++k) {
    const Real column_norm = design_matrix.col(k).norm();
    // Rank test at double precision: a design that double could not resolve is refused even
    // though the extended solve would return numbers for it.
    if (!(std::abs(r(k, k)) >
          64 * static_cast<Real>(std::numeric_limits<double>::epsilon()) * column_norm)) {
      throw FitError("the calibration levels are too few or too close together to fit this model");
    }
  }
  // Coefficients for y - y_shift; the shift is added to the constant term after the residuals.
  const Vector beta_centred = qr.solve(rhs);

  // Residuals from the centred, scaled form: no cancellation between large raw terms.
  LeastSquares out;
  out.parameters = p;
  out.centre = centre;
  out.scale = scale;
  out.residuals.resize(x.size());
  Real sse = 0;
  for (std::size_t i = 0; i < x.size(); ++i) {
    Real fitted = 0;
    switch (design) {
      case Design::Line:
        fitted = beta_centred(0) + beta_centred(1) * u[i];
        break;
      case Design::LineThroughOrigin:
        fitted = beta_centred(0) * u[i];
        break;
      case Design::Quadratic:
        fitted = beta_centred(0) + (beta_centred(1) + beta_centred(2) * u[i]) * u[i];
        break;
    }
    const Real residual = (y[i] - y_shift) - fitted;
    out.residuals[i] = static_cast<double>(residual);
    sse += w[i] * residual * residual;
  }
  out.sse = static_cast<double>(sse);
  Vector beta_scaled = beta_centred;
  if (!through_origin) beta_scaled(0) += y_shift;

  // Back to the raw parameterisation, beta_raw = J·beta_scaled, with u = (x - c)/s:
  //   a = b0 - b1·c/s + b2·c²/s²,  b = b1/s - 2·b2·c/s²,  c2 = b2/s².
  Matrix jacobian = Matrix::Zero(p, p);
  const Real s = scale;
  const Real cs = static_cast<Real>(centre) / s;
  switch (design) {
    case Design::Line:
      jacobian << 1, -cs, 0, 1 / s;
      break;
    case Design::LineThroughOrigin:
      jacobian << 1 / s;
      break;
    case Design::Quadratic:
      jacobian << 1, -cs, cs * cs, 0, 1 / s, -2 * cs / s, 0, 0, 1 / (s * s);
      break;
  }
  const Vector beta_raw = jacobian * beta_scaled;

  // (XᵀWX)⁻¹ = R⁻¹R⁻ᵀ for the scaled design; raw: J·R⁻¹R⁻ᵀ·Jᵀ = K·Kᵀ with K = J·R⁻¹ (triangular
  // solve, no explicit normal matrix), so the diagonal is a sum of squares.
  const Matrix r_inverse = r.template triangularView<Eigen::Upper>().solve(Matrix::Identity(p, p));
  const Matrix k_factor = jacobian * r_inverse;
  const Matrix unscaled = k_factor * k_factor.transpose();

  for (int i = 0; i < p; ++i) {
    const auto ui = static_cast<std::size_t>(i);
    out.beta[static_cast<std::size_t>(raw_index(design, i))] = static_cast<double>(beta_raw(i));
    out.beta_scaled[ui] = static_cast<double>(beta_scaled(i));
    for (int j = 0; j < p; ++j) {
      const auto uj = static_cast<std::size_t>(j);
      out.unscaled_covariance[static_cast<std::size_t>(raw_index(design, i))]
                             [static_cast<std::size_t>(raw_index(design, j))] =
          static_cast<double>(unscaled(i, j));
      out.r_inverse[ui][uj] = static_cast<double>(r_inverse(i, j));
    }
  }
  return out;
}

}  // namespace cw::fitting::detail
