// SPDX-License-Identifier: Apache-2.0
// Trend analysis of a check standard.
#include "rules/trend.h"

namespace cw::rules {

TrendAnalysis analyse_trend(const std::vector<Check>& group_checks, const CheckRules& rules,
                            Instant at) {
  TrendAnalysis t;
  std::vector<double> passing;
  for (const auto& k : group_checks) {
    if (k.kind != CheckKind::Check || k.occurred_at > at || !k.recovery_pct) continue;
    ControlObservation o;
    o.check_id = k.id;
    o.at = k.occurred_at;
    o.recovery_pct = *k.recovery_pct;
    if (k.run_id) o.run = k.run_id->value;
    t.observations.push_back(o);
    t.checks.push_back(&k);
    if (k.passed) passing.push_back(*k.recovery_pct);
  }
  if (rules.trend_mean && rules.trend_sd) {
    t.limits = limits_from_targets(*rules.trend_mean, *rules.trend_sd);
    t.established = t.limits.has_value();
  } else {
    t.limits = limits_from_history(passing, kLimitChecks);
    t.established = t.limits && t.limits->n >= kLimitChecks;
    if (!t.limits) {
      t.no_limits = passing.size() < 2
                        ? "fewer than 2 passing check standards to set limits from (" +
                              std::to_string(passing.size()) + ")"
                        : "the passing check standards all have the same recovery (no spread)";
    }
  }
  if (t.limits) t.violations = evaluate_westgard(t.observations, *t.limits, all_westgard_rules());
  return t;
}

}  // namespace cw::rules
