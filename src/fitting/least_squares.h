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

/// Solution in the raw parameterisation (intercept, slope, quadratic; 0 where absent) and in the
/// centred, scaled one the solver worked in, u = (x - centre)/scale.
struct LeastSquares {
  std::array<double, 3> beta{};
  /// (XᵀWX)⁻¹ for the weights passed in, raw parameterisation; multiply by s² for the covariance.
  std::array<std::array<double, 3>, 3> unscaled_covariance{};
  std::vector<double> residuals;  ///< y - ŷ per point, evaluated on the centred, scaled design
  double sse = 0;                 ///< Σw·e²
  int parameters = 0;             ///< 1 through-origin (u), 2 line (1, u), 3 quadratic (1, u, u²)
  double centre = 0;              ///< weighted mean of x (0 for the line through the origin)
  double scale = 1;               ///< sqrt(Σw(x - centre)²/Σw)
  /// Coefficients of the columns in u, top `parameters` entries used.
  std::array<double, 3> beta_scaled{};
  /// R⁻¹ (upper triangular) of the QR factor of the weighted design in u: (X_uᵀWX_u)⁻¹ = R⁻¹R⁻ᵀ.
  std::array<std::array<double, 3>, 3> r_inverse{};
};

/// Weighted least squares by Householder QR of the weighted, centred and scaled design, carried
/// out in extended precision (long double) and rounded to double once at the end. Throws FitError
/// when the design is numerically rank-deficient. Preconditions: equal sizes, w > 0.
LeastSquares solve_least_squares(Design design, const std::vector<double>& x,
                                 const std::vector<double>& y, const std::vector<double>& w);

}  // namespace cw::fitting::detail
