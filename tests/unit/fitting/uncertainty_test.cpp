// SPDX-License-Identifier: Apache-2.0
// Checks the relative uncertainty budget of one result (Eurachem/CITAC QUAM, 3rd ed. 2012).
#include <catch2/catch.hpp>
#include <cmath>
#include <vector>

#include "fitting/fit.h"
#include "fitting/uncertainty.h"

namespace {

using Catch::Matchers::WithinAbs;
using Catch::Matchers::WithinRel;
using cw::fitting::combine_relative_uncertainties;
using cw::fitting::FitError;
using cw::fitting::UncertaintyBudget;
using cw::fitting::UncertaintyComponent;

}  // namespace

TEST_CASE("uncertainty: QUAM example A5 calibration component", "[fitting][uncertainty]") {
  // Eurachem/CITAC QUAM 3rd ed. (2012), example A5 (Cd by AAS): c0 = 0.26 mg/L, u(c0) = 0.018
  // mg/L [P]; from the listed calibration data, p = 2 readings, n = 15, u(c0) = 0.01784557457 [C]
  // (calibration-practice.md §9 M4).
  std::vector<cw::fitting::Observation> data;
  const double conc[] = {0.1, 0.3, 0.5, 0.7, 0.9};
  const double absorbance[5][3] = {{0.028, 0.029, 0.029},
                                   {0.084, 0.083, 0.081},
                                   {0.135, 0.131, 0.133},
                                   {0.180, 0.181, 0.183},
                                   {0.215, 0.230, 0.216}};
  for (int level = 0; level < 5; ++level) {
    for (double a : absorbance[level]) data.push_back({conc[level], a});
  }
  const auto f = cw::fitting::fit(cw::fitting::Model::Linear, cw::fitting::Weighting::None, data);
  const auto p = cw::fitting::inverse_predict(f, 0.0087 + 0.241 * 0.26, 2);
  CHECK_THAT(p.sd_x0, WithinRel(0.01784557457, 1e-9));
  const UncertaintyComponent calibration = cw::fitting::calibration_component(p);
  CHECK(calibration.name == "calibration");
  CHECK_THAT(calibration.relative_u, WithinRel(0.01784557457 / 0.26, 1e-9));
  CHECK_THAT(calibration.relative_u * 0.26, WithinAbs(0.018, 0.0005));  // QUAM's printed u(c0)

  // Alone in the budget it is the combined relative uncertainty; U = 2·u_c.
  const UncertaintyBudget alone = combine_relative_uncertainties({calibration});
  CHECK_THAT(alone.combined_relative_u, WithinRel(0.01784557457 / 0.26, 1e-9));
  CHECK(alone.coverage_factor == 2);
  CHECK_THAT(alone.expanded_relative_u, WithinRel(2 * 0.01784557457 / 0.26, 1e-9));
}

TEST_CASE("uncertainty: relative components combine as the root sum of squares",
          "[fitting][uncertainty]") {
  // QUAM rule for products and quotients, u_c(y)/y = sqrt(Σ(u(x_i)/x_i)²); checked on values whose
  // root sum of squares is exact by hand: sqrt(0.03² + 0.04²) = 0.05 and
  // sqrt(0.02² + 0.03² + 0.06²) = sqrt(0.0049) = 0.07.
  const UncertaintyBudget two =
      combine_relative_uncertainties({{"calibration", 0.03}, {"reference material", 0.04}});
  CHECK_THAT(two.combined_relative_u, WithinRel(0.05, 1e-15));
  CHECK_THAT(two.expanded_relative_u, WithinRel(0.10, 1e-15));
  REQUIRE(two.components.size() == 2);
  CHECK(two.components[1].name == "reference material");

  const UncertaintyBudget three = combine_relative_uncertainties(
      {{"calibration", 0.02}, {"reference material", 0.03}, {"dilution", 0.06}}, 3.0);
  CHECK_THAT(three.combined_relative_u, WithinRel(0.07, 1e-15));
  CHECK(three.coverage_factor == 3);
  CHECK_THAT(three.expanded_relative_u, WithinRel(0.21, 1e-15));

  // Very small and very large components do not underflow or overflow the squares.
  const UncertaintyBudget tiny = combine_relative_uncertainties({{"a", 3e-200}, {"b", 4e-200}});
  CHECK_THAT(tiny.combined_relative_u, WithinRel(5e-200, 1e-15));

  CHECK(combine_relative_uncertainties({}).combined_relative_u == 0);
  CHECK_THROWS_AS(combine_relative_uncertainties({{"a", -0.01}}), FitError);
  CHECK_THROWS_AS(combine_relative_uncertainties({{"a", NAN}}), FitError);
  CHECK_THROWS_AS(combine_relative_uncertainties({{"a", 0.01}}, 0), FitError);
}

TEST_CASE("uncertainty: a certificate's expanded uncertainty as a relative component",
          "[fitting][uncertainty]") {
  // u/x = U/(k·|x|) (QUAM: a certificate's U divided by its coverage factor): 1000 ± 2 mg/L with
  // k = 2 gives 0.001; with k = 2.5 (hypothetical certificate) 0.0008.
  CHECK_THAT(cw::fitting::relative_standard_uncertainty(1000, 2), WithinRel(0.001, 1e-15));
  CHECK_THAT(cw::fitting::relative_standard_uncertainty(1000, 2, 2.5), WithinRel(0.0008, 1e-15));
  CHECK_THROWS_AS(cw::fitting::relative_standard_uncertainty(0, 2), FitError);
  CHECK_THROWS_AS(cw::fitting::relative_standard_uncertainty(1000, -1), FitError);
  CHECK_THROWS_AS(cw::fitting::relative_standard_uncertainty(1000, 2, 0), FitError);
  cw::fitting::Prediction zero{};
  CHECK_THROWS_AS(cw::fitting::calibration_component(zero), FitError);
}
