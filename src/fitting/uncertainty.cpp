// SPDX-License-Identifier: Apache-2.0
// Root-sum-of-squares combination of relative standard uncertainties (Eurachem/CITAC QUAM, 3rd
// ed. 2012) and the conversions that feed it.
#include "fitting/uncertainty.h"

#include <algorithm>
#include <cmath>
#include <utility>

#include "fitting/number_format.h"

namespace cw::fitting {
namespace {

using detail::format_number;

void check_coverage_factor(double k) {
  if (!(k > 0) || !std::isfinite(k)) {
    throw FitError("the coverage factor k must be a number above 0, got " + format_number(k));
  }
}

}  // namespace

UncertaintyBudget combine_relative_uncertainties(
    const std::vector<UncertaintyComponent>& components, double coverage_factor) {
  check_coverage_factor(coverage_factor);
  double largest = 0;
  for (const auto& c : components) {
    if (!(c.relative_u >= 0) || !std::isfinite(c.relative_u)) {
      throw FitError("the relative standard uncertainty of '" + c.name +
                     "' must be a number of at least 0, got " + format_number(c.relative_u));
    }
    largest = std::max(largest, c.relative_u);
  }
  // QUAM, products and quotients: u_c(y)/y = sqrt(Σ(u(x_i)/x_i)²); summed as
  // largest·sqrt(Σ(u/largest)²) so that no square underflows or overflows.
  double sum = 0;
  if (largest > 0) {
    for (const auto& c : components) {
      const double ratio = c.relative_u / largest;
      sum += ratio * ratio;
    }
  }
  UncertaintyBudget out;
  out.components = components;
  out.coverage_factor = coverage_factor;
  out.combined_relative_u = largest * std::sqrt(sum);
  out.expanded_relative_u = coverage_factor * out.combined_relative_u;  // U = k·u_c
  return out;
}

double relative_standard_uncertainty(double value, double expanded, double coverage_factor) {
  check_coverage_factor(coverage_factor);
  if (!(value != 0) || !std::isfinite(value)) {
    throw FitError("a relative uncertainty needs a value other than 0, got " +
                   format_number(value));
  }
  if (!(expanded >= 0) || !std::isfinite(expanded)) {
    throw FitError("an expanded uncertainty must be a number of at least 0, got " +
                   format_number(expanded));
  }
  return expanded / (coverage_factor * std::abs(value));  // u/x = U/(k·|x|)
}

UncertaintyComponent calibration_component(const Prediction& prediction, std::string name) {
  if (!(prediction.x0 > 0)) {
    throw FitError("the calibration component needs a predicted concentration above 0, got " +
                   format_number(prediction.x0));
  }
  return {std::move(name), prediction.sd_x0 / prediction.x0};  // u(c0)/c0
}

}  // namespace cw::fitting
