// SPDX-License-Identifier: Apache-2.0
// Uncertainty budget of one result from relative standard uncertainties (Eurachem/CITAC Guide
// "Quantifying Uncertainty in Analytical Measurement", 3rd ed. 2012, QUAM): for a result that is
// a product or quotient of its inputs, relative standard uncertainties combine as the root sum of
// squares, and the expanded uncertainty is U = k·u_c. Pure arithmetic; the caller names the
// components (calibration, reference material, dilution, ...).
#pragma once

#include <string>
#include <vector>

#include "fitting/fit.h"

namespace cw::fitting {

/// One component of an uncertainty budget: a name and its relative standard uncertainty u(x)/x
/// (a fraction, not percent).
struct UncertaintyComponent {
  std::string name;
  double relative_u = 0;
};

/// The combined and expanded relative uncertainty of one result.
struct UncertaintyBudget {
  std::vector<UncertaintyComponent> components;  ///< as given, in order
  double combined_relative_u = 0;                ///< u_c(y)/y = sqrt(Σ(u(x_i)/x_i)²)
  double coverage_factor = 2;                    ///< k
  double expanded_relative_u = 0;                ///< U/y = k·u_c(y)/y
};

/// Combines relative standard uncertainties by the root sum of squares and expands the result with
/// coverage factor k (QUAM 3rd ed.: u_c(y)/y = sqrt(Σ(u(x_i)/x_i)²) for products and quotients,
/// U = k·u_c, k = 2 for about 95 %). An empty list gives 0. Throws FitError for a component that is
/// negative or not finite, or k not above 0.
UncertaintyBudget combine_relative_uncertainties(
    const std::vector<UncertaintyComponent>& components, double coverage_factor = 2.0);

/// Relative standard uncertainty of a value quoted as `value ± expanded` with coverage factor k
/// (a certificate's U): u/x = U/(k·|x|). Throws FitError when value is 0 or not finite, expanded
/// is negative or not finite, or k is not above 0.
double relative_standard_uncertainty(double value, double expanded, double coverage_factor = 2.0);

/// The calibration component of a result read from a curve: u(c0)/c0 = s_x0/x0 (QUAM: u(c0) is
/// the standard deviation of the concentration predicted from the calibration line). Throws
/// FitError when x0 is not above 0.
UncertaintyComponent calibration_component(const Prediction& prediction,
                                           std::string name = "calibration");

}  // namespace cw::fitting
