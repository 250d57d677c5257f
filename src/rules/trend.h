// SPDX-License-Identifier: Apache-2.0
// The trend of a check standard for one method, instrument and analyte at a moment: the
// recoveries of its check standards in time order, the established control limits, and the
// Westgard violations among them (product.md §5.5). Shared by the `trend` command and the
// trend-violation rule, so that what the chart shows and what makes a curve stale agree.
#pragma once

#include <optional>
#include <string>
#include <vector>

#include "domain/check.h"
#include "domain/method.h"
#include "rules/westgard.h"

namespace cw::rules {

/// How many of the latest passing checks establish the limits when the method sets none
/// (calibration-practice.md §8.1: about 20 in-control results).
inline constexpr std::size_t kLimitChecks = 20;

struct TrendAnalysis {
  /// Check standards (not blanks) with a recovery, at or before the moment, in time order;
  /// checks of one run share its run key (R-4s looks within a run).
  std::vector<ControlObservation> observations;
  std::vector<const Check*> checks;  ///< the check of each observation
  std::optional<Limits> limits;
  /// The limits are established: set by the method, or from kLimitChecks passing checks
  /// (calibration-practice.md §8.1: the centre line of about 20 in-control results). Fewer give
  /// a chart to look at, but no violation of theirs makes a curve stale.
  bool established = false;
  std::string no_limits;              ///< why there are no limits (when there are none)
  std::vector<Violation> violations;  ///< every one of the six rules, in observation order
};

/// Analyses `group_checks` (the checks of every curve of one method, instrument and analyte, in
/// time order) at `at` with the method's check rules: limits from trend_mean and trend_sd when
/// the method sets them, else from the last kLimitChecks passing checks at or before `at`.
/// The returned pointers refer into `group_checks`.
TrendAnalysis analyse_trend(const std::vector<Check>& group_checks, const CheckRules& rules,
                            Instant at);

}  // namespace cw::rules
