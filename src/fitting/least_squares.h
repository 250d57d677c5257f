// SPDX-License-Identifier: Apache-2.0
// Internal to fitting/: the weighted QR least-squares solver behind fit(), kept in one translation
// unit so that Eigen is compiled once.
#pragma once

#include <array>
#include <vector>

namespace cw::fitting::detail {

/// Polynomial designs the solver knows.
enum class Design {
  Line,               ///< columns 1, x
  LineThroughOrigin,  ///< column x
  Quadratic,          ///< columns 1, x, x²
};

/// Solution in the raw parameterisation (intercept, slope, quadratic; 0 where absent).
struct LeastSquares {
  std::array<double, 3> beta{};
  /// (XᵀWX)⁻¹ for the weights passed in, raw parameterisation; multiply by s² for the covariance.
  std::array<std::array<double, 3>, 3> unscaled_covariance{};
  std::vector<double> residuals;  ///< y - ŷ per point, evaluated on the centred, scaled design
  double sse = 0;                 ///< Σw·e²
};

/// Weighted least squares by Householder QR of the weighted, centred and scaled design. Throws
/// FitError when the design is numerically rank-deficient. Preconditions: equal sizes, w > 0.
LeastSquares solve_least_squares(Design design, const std::vector<double>& x,
                                 const std::vector<double>& y, const std::vector<double>& w);

}  // namespace cw::fitting::detail
