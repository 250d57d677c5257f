// SPDX-License-Identifier: Apache-2.0
// Judges a fitted calibration curve against configured acceptance criteria (calibration-practice.md
// §5.1): number of levels, r², %RE per back-calculated point and per level, fraction of levels
// within limits, response-factor %RSD and monotonicity of a quadratic.
#pragma once

#include <optional>
#include <string>
#include <string_view>
#include <vector>

#include "fitting/fit.h"

namespace cw::fitting {

/// Acceptance criteria of an initial calibration. Every limit is a configurable default set by
/// the method; an absent limit is not checked. Limits are inclusive: a value exactly at its limit
/// passes.
struct AcceptanceCriteria {
  int min_levels = 0;                   ///< distinct non-excluded levels (FitResult::n_levels)
  std::optional<double> min_r2;         ///< fails when r2 < min_r2
  std::optional<double> max_error_pct;  ///< |%RE| limit of each back-calculated point, percent
  /// |%RE| limit at the lowest level, percent (falls back to max_error_pct).
  std::optional<double> max_error_pct_lowest;
  /// Fraction in (0, 1] of levels that must be within their %RE limits; absent = every level.
  std::optional<double> min_levels_within;
  std::optional<double> max_rf_rsd_pct;  ///< %RSD of the response factors, percent
};

/// Which criterion a finding is about.
enum class Criterion {
  TooFewLevels,
  R2BelowMin,
  LevelError,
  TooFewLevelsWithin,
  RfRsdAboveMax,
  NotMonotonic,
};

/// "too-few-levels", "r2-below-min", "level-error", "too-few-levels-within", "rf-rsd-above-max",
/// "not-monotonic".
std::string_view to_string(Criterion criterion);
/// Inverse of to_string(Criterion); nullopt for anything else.
std::optional<Criterion> parse_criterion(std::string_view text);

/// One failed (or warned) criterion with the facts behind it.
struct CriterionFinding {
  Criterion criterion;
  std::string detail;                ///< plain words, e.g. "r² 0.9912 below minimum 0.995"
  std::optional<std::string> level;  ///< the level label, for level-error
  /// The measured value and its limit in the criterion's own unit: level count, r², signed worst
  /// %RE of the level (NaN when a point has no back-calculated value), fraction of levels within,
  /// %RSD; for not-monotonic the vertex x, with limit NaN (no scalar limit).
  double value;
  double limit;
};

/// Judgement of one input point (same order as FitResult::points).
struct PointJudgement {
  /// |%RE| <= limit_pct. False for excluded points; true for x = 0 points and where no limit
  /// applies; false for a judged point without a back-calculated value.
  bool within_limits;
  /// The |%RE| limit that applies to the point in percent (the lowest-level limit for points of
  /// the lowest level); +infinity when no %RE limit is configured for it.
  double limit_pct;
  /// True when the point's %RE was judged: false for excluded points and for points at x = 0,
  /// which have no %RE.
  bool judged;
};

/// Outcome of the acceptance evaluation.
struct Acceptance {
  bool accepted = false;                   ///< no failures
  std::vector<CriterionFinding> failures;  ///< criteria that reject the curve
  std::vector<CriterionFinding> warnings;  ///< failing levels within an accepted fraction
  std::vector<PointJudgement> points;      ///< per input point, input order
};

/// Evaluates `criteria` for `fit`. `point_levels[i]` names the level of fit.points[i] (levels are
/// grouped by this label; a level's nominal is the x of its first non-excluded point). The
/// lowest level is the fitted level with the smallest nominal. Level rules: a level is within
/// when all its judged points are; with min_levels_within absent every failing level is a
/// level-error failure; with it present, a passing fraction below it gives too-few-levels-within
/// followed by the level-error findings as failures, and otherwise the failing levels are
/// level-error warnings. A quadratic whose vertex lies in [range_low, range_high] always fails
/// not-monotonic. Throws std::invalid_argument when point_levels and fit.points differ in size.
Acceptance evaluate_acceptance(const FitResult& fit, const std::vector<std::string>& point_levels,
                               const AcceptanceCriteria& criteria);

}  // namespace cw::fitting
