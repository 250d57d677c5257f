// SPDX-License-Identifier: Apache-2.0
// The trend of a check standard (product.md §5.5): recoveries over time for one method,
// instrument and analyte with their control limits and Westgard violations, as of --at.
#pragma once

#include <optional>
#include <string>
#include <vector>

#include "app/session.h"
#include "domain/check.h"
#include "rules/westgard.h"

namespace cw::app {

struct TrendRequest {
  std::string method;
  std::string instrument;
  std::string analyte;
  std::optional<long> last;  ///< show only the last N points (all rules still see every point)
};

struct TrendPoint {
  Check check;
  double recovery_pct = 0;
  std::optional<double> z;  ///< (recovery − mean) / s, when there are limits
};

struct TrendViolation {
  rules::Violation violation;
  bool makes_stale = false;  ///< named by the method's trend_rules (and not a warning)
};

struct TrendOutcome {
  std::string method_code;
  int method_version = 0;
  std::string instrument_code;
  std::string analyte;
  Instant as_of;
  std::vector<std::string> trend_rules;  ///< the method's, in force at --at
  std::optional<rules::Limits> limits;
  bool established = false;        ///< violations can make curves stale (rules::TrendAnalysis)
  std::string no_limits;           ///< why there are none
  long total_points = 0;           ///< before --last
  std::vector<TrendPoint> points;  ///< time order (the last N with --last)
  std::vector<TrendViolation> violations;  ///< at the points shown
};

TrendOutcome trend(Session& s, const TrendRequest& request);

}  // namespace cw::app
