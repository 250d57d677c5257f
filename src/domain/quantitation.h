// SPDX-License-Identifier: Apache-2.0
// The quantitation decision (product.md §5.3): given a curve, its state at the moment and a
// reading, whether a value may be reported, the value with its interval, its flags, or every
// reason for a refusal. Pure: the caller loads the facts and records the outcome.
#pragma once

#include <optional>
#include <string>
#include <vector>

#include "domain/check.h"
#include "domain/check_judgement.h"
#include "domain/curve.h"
#include "domain/curve_state.h"
#include "domain/method.h"

namespace cw {

/// One sample reading, as given.
struct QuantitationReading {
  double response = 0;  ///< the mean of the m readings
  std::optional<double> is_response;
  int replicates = 1;   ///< m, the number of readings the response is the mean of
  double dilution = 1;  ///< multiplies the concentration and its interval
};

struct QuantitationDecision {
  ResultStatus status = ResultStatus::Refused;
  std::optional<double> x0;                              ///< instrument-level concentration
  std::optional<double> sd_x0;                           ///< its standard deviation (s_x0)
  std::optional<double> concentration, ci_low, ci_high;  ///< x0 and its interval × dilution
  std::vector<ResultFlag> flags;
  std::vector<Finding> reasons;              ///< every reason for a refusal
  std::optional<double> reporting_limit;     ///< below the range: the limit × dilution
  std::optional<double> suggested_dilution;  ///< above the range: a usual dilution factor
};

/// What the curve has reported since its last passing check standard: the method's
/// samples_per_check limits how many samples may follow a passing check (product.md §5.4).
struct ChecksSoFar {
  long reported_since_check = 0;              ///< reported results since that check
  std::optional<CheckId> last_passing_check;  ///< nullopt: none since the curve was acquired
};

/// Decides a quantitation on `curve` (made under `method`) whose state at the moment is `status`.
/// Refused with every blocking reason unless the curve is active, and with check-due when
/// `so_far` is given and the method's samples_per_check samples have been reported since the
/// last passing check (a check standard is due first); refused as above-range when x0
/// exceeds the highest calibrator ("dilute and re-run", with a suggested factor); refused as
/// no-solution when the response cannot be read on the curve; reported with the below-range flag
/// and its reporting limit below the lowest calibrator. Throws ValidationError (naming the labels)
/// for a reading that is bad input: an internal-standard response missing or out of place, or a
/// concentration that overflows once multiplied by the dilution factor.
QuantitationDecision decide_quantitation(const Curve& curve, const CurveStatus& status,
                                         const MethodDefinition& method,
                                         const QuantitationReading& reading,
                                         const ReadingLabels& labels = {},
                                         const std::optional<ChecksSoFar>& so_far = std::nullopt);

/// The check-due finding when `so_far` has used up the method's samples_per_check, else nullopt.
std::optional<Finding> check_due(const CheckRules& rules, const Curve& curve,
                                 const ChecksSoFar& so_far);

/// The refusal when no curve could be chosen: `reasons` say why.
QuantitationDecision refuse_without_curve(std::vector<Finding> reasons);

/// The smallest usual dilution factor that brings `x0` below 80 % of the highest calibrator
/// (common practice: aim for the upper middle of the range, not its edge).
std::optional<double> suggest_dilution(double x0, double range_high);

}  // namespace cw
