// SPDX-License-Identifier: Apache-2.0
// Check-standard trending: Shewhart control limits and the Westgard multirules evaluated over a
// series of check recoveries (product.md §5.5, calibration-practice.md §8).
//
// Overview. limits_from_history() (or limits_from_targets()) establishes the mean and SD of the
// control material; evaluate_westgard() turns a time-ordered series of recoveries into the
// violations of the chosen rules; stale_violations() keeps those the method's trend_rules make
// reasons to stop using a curve. Pure arithmetic on values passed in: no clock, disk or store.
#pragma once

#include <cstddef>
#include <cstdint>
#include <optional>
#include <set>
#include <string>
#include <string_view>
#include <vector>

#include "core/time.h"
#include "domain/ids.h"

namespace cw::rules {

/// The Westgard multirules of product.md §5.5 (definitions in westgard.cpp).
enum class WestgardRule { R1_2s, R1_3s, R2_2s, R4s, R4_1s, R10x };

/// "1-2s", "1-3s", "2-2s", "R-4s", "4-1s", "10-x" (the tokens of method files and trend JSON).
std::string_view to_string(WestgardRule rule);
/// Inverse of to_string(WestgardRule); nullopt for anything else (matching is exact).
std::optional<WestgardRule> parse_westgard_rule(std::string_view text);
/// All six rules.
std::set<WestgardRule> all_westgard_rules();
/// True for 1-2s, which warns and never rejects a run on its own.
bool is_warning_only(WestgardRule rule);

/// One check-standard result on the control chart.
struct ControlObservation {
  CheckId check_id;
  Instant at;
  double recovery_pct = 0;  ///< 100 · measured / nominal, percent
  /// Groups observations measured in the same run (sequence): consecutive observations with the
  /// same key form one run. Observations without a key are each a run of their own.
  std::optional<std::int64_t> run;
};

/// Where the established mean and SD came from.
enum class LimitsBasis {
  LastPassingChecks,  ///< mean and sample SD of the last `n` passing checks
  MethodTargets,      ///< mean and SD set by the method
};

/// Established control limits of one control material, all in percent recovery.
struct Limits {
  double mean = 0;
  double sd = 0;         ///< the established s; always > 0
  double warn_low = 0;   ///< mean − 2s
  double warn_high = 0;  ///< mean + 2s
  double low = 0;        ///< mean − 3s (action limit)
  double high = 0;       ///< mean + 3s (action limit)
  LimitsBasis basis = LimitsBasis::LastPassingChecks;
  std::size_t n = 0;  ///< passing checks used (0 for method targets)
};

/// Limits from the last `last_n` values of `passing_recoveries` (time order, oldest first; all of
/// them when there are fewer): their mean and sample SD (n − 1). Returns nullopt, so that the
/// caller can say why no limits exist, when fewer than 2 values are used, a value is not finite
/// or the SD is 0 (no spread: every result would violate). Fewer than about 20 values give
/// usable but uncertain limits; `Limits::n` tells how many were used.
std::optional<Limits> limits_from_history(const std::vector<double>& passing_recoveries,
                                          std::size_t last_n = 20);

/// Limits from a method's target mean and SD (percent recovery); nullopt unless both are finite
/// and sd > 0.
std::optional<Limits> limits_from_targets(double mean, double sd);

/// One rule violated at one observation: the one that completes the pattern.
struct Violation {
  WestgardRule rule;
  CheckId check_id;
  Instant at;
  bool warning_only = false;  ///< 1-2s: inspect, do not reject on it alone

  bool operator==(const Violation&) const = default;
};

/// The violations of `rules_to_check` in a series of observations, ordered by observation and,
/// for one observation, in the order of WestgardRule. z = (x − mean)/sd with the established
/// limits; every limit is strict (z exactly 2 does not exceed 2s). Each rule is evaluated on
/// every observation, independently of the others (no 1-2s gate). Patterns over consecutive
/// results (2-2s, 4-1s, 10-x) follow the series in time order within and across runs (materials
/// are not told apart); R-4s looks within one run only. A pattern that persists is reported
/// again at every observation that completes it anew (R-4s once per run).
/// Throws ValidationError when the observations are not in time order, a recovery is not
/// finite, or the limits have no positive finite SD.
std::vector<Violation> evaluate_westgard(const std::vector<ControlObservation>& in_time_order,
                                         const Limits& limits,
                                         const std::set<WestgardRule>& rules_to_check);

/// The rules of a method's `trend_rules` that make a curve stale: each listed rule except 1-2s,
/// which is a warning only even when listed. Throws ValidationError on a token that is not one
/// of the six (the method-file parser accepts no other).
std::set<WestgardRule> rejection_rules(const std::vector<std::string>& trend_rules);

/// The violations among `found` that make the curve stale under the method's `trend_rules`
/// (those of rejection_rules(trend_rules), in their order in `found`).
std::vector<Violation> stale_violations(const std::vector<Violation>& found,
                                        const std::vector<std::string>& trend_rules);

}  // namespace cw::rules
