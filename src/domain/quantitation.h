// SPDX-License-Identifier: Apache-2.0
// The quantitation decision (product.md §5.3): given a curve, its state at the moment and a
// reading, whether a value may be reported, the value with its interval and uncertainty budget,
// whether it is censored ("< limit"), its flags, or every reason for a refusal. Pure: the caller
// loads the facts and records the outcome.
#pragma once

#include <optional>
#include <string>
#include <vector>

#include "domain/check.h"
#include "domain/check_judgement.h"
#include "domain/curve.h"
#include "domain/curve_state.h"
#include "domain/lot.h"
#include "domain/method.h"

namespace cw {

/// One sample reading, as given.
struct QuantitationReading {
  double response = 0;  ///< the mean of the m readings
  std::optional<double> is_response;
  int replicates = 1;   ///< m, the number of readings the response is the mean of
  double dilution = 1;  ///< multiplies the concentration, its interval and its limit
};

struct QuantitationDecision {
  ResultStatus status = ResultStatus::Refused;
  std::optional<double> x0;  ///< instrument-level concentration (the estimate, when there is one)
  std::optional<double> sd_x0;                           ///< its standard deviation (s_x0)
  std::optional<double> concentration, ci_low, ci_high;  ///< released value and interval × dilution
  std::vector<ResultFlag> flags;
  std::vector<Finding> reasons;                  ///< every reason for a refusal
  bool censored = false;                         ///< released as "< reporting_limit"
  std::optional<double> reporting_limit;         ///< censored: the limit × dilution
  std::optional<double> computed_concentration;  ///< censored: x0 × dilution, for the record
  std::optional<ResultUncertainty> uncertainty;  ///< reported, uncensored values
  std::optional<double> suggested_dilution;      ///< above the range: a usual dilution factor
};

/// The concentration a result must reach to be released as a number on `curve` under `method`
/// (ReportLimit): the lowest non-zero fitted calibrator, or the reporting LOQ or LOD of the
/// method's limit definition.
double release_limit(const Curve& curve, const MethodDefinition& method);

/// What the curve has reported since its last passing check standard: the method's
/// samples_per_check limits how many samples may follow a passing check (product.md §5.4).
struct ChecksSoFar {
  long reported_since_check = 0;              ///< reported results since that check
  std::optional<CheckId> last_passing_check;  ///< nullopt: none since the curve was acquired
  /// The first check standard or blank on the curve after the moment that closes or fails the
  /// moment's bracket (a quantitation given an earlier time than checks already logged): a
  /// failed one means the bracket is already known to need re-running.
  std::optional<Check> next_check;
};

/// Decides a quantitation on `curve` (made under `method` from `lots`) whose state at the moment is
/// `status`:
/// - refused with every blocking reason unless the curve is active, and with check-due when
///   `so_far` is given and the method's samples_per_check samples have been reported since the
///   last passing check (a check standard is due first), and with check-failed when the check
///   that ends the moment's bracket (`so_far.next_check`, logged for a later time) failed;
/// - refused as above-range when the estimate exceeds the highest calibrator ("dilute and re-run",
///   with a suggested factor);
/// - censored below the release limit (release_limit()): released as "< limit × dilution", never
///   as a bare or negative number, the estimate kept for the record; a response below the
///   curve's response at its lowest calibrator is censored even when it has no solution on the
///   curve (a blank: a zero response under 1/x weighting);
/// - refused as no-solution when the response cannot be read on the curve otherwise;
/// - otherwise reported with its 95 % interval and its uncertainty budget: the calibration
///   (s_x0/x0), each lot's certified value for the analyte (U/(k·value)), and the dilution (the
///   method's dilution_pct, when the factor is not 1), combined as the root sum of squares and
///   expanded with k = 2 (Eurachem/CITAC QUAM 3rd ed. 2012). The flag below-range marks a value
///   released below the lowest calibrator (a method that reports down to its LOQ or LOD).
/// Throws ValidationError (naming the labels) for a reading that is bad input.
QuantitationDecision decide_quantitation(const Curve& curve, const CurveStatus& status,
                                         const MethodDefinition& method,
                                         const std::vector<const Lot*>& lots,
                                         const QuantitationReading& reading,
                                         const ReadingLabels& labels = {},
                                         const std::optional<ChecksSoFar>& so_far = std::nullopt);

/// Copies what `d` decided into `result` (status, estimate, interval, flags, reasons, censoring,
/// uncertainty): one place, so that every path that records a result records all of it.
void record_decision(Result& result, const QuantitationDecision& d);

/// The check-due finding when `so_far` has used up the method's samples_per_check, else nullopt.
std::optional<Finding> check_due(const CheckRules& rules, const Curve& curve,
                                 const ChecksSoFar& so_far);

/// Finding check-failed when the check that ends the moment's bracket (`so_far.next_check`)
/// failed; nullopt otherwise.
std::optional<Finding> bracket_failed(const ChecksSoFar& so_far);

/// The refusal when no curve could be chosen: `reasons` say why.
QuantitationDecision refuse_without_curve(std::vector<Finding> reasons);

/// The smallest usual dilution factor that brings `x0` below 80 % of the highest calibrator
/// (common practice: aim for the upper middle of the range, not its edge).
std::optional<double> suggest_dilution(double x0, double range_high);

}  // namespace cw
