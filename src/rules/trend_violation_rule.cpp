// SPDX-License-Identifier: Apache-2.0
// trend-violation: a Westgard rule named by the method's trend_rules was violated at a check
// standard measured against this curve, at or before T (product.md §5.5). The series is the
// whole group's (method, instrument, analyte): drift carries across curves, but a violation
// completed at an older curve's check does not make a newer curve stale. Limits taken from fewer
// than 20 passing checks are not yet established and make nothing stale.
#include "core/text.h"
#include "rules/rule.h"
#include "rules/trend.h"

namespace cw::rules {

std::optional<Finding> trend_violation_rule(const RuleInput& in) {
  const CheckRules& rules = in.facts.version().definition.check;
  if (rejection_rules(rules.trend_rules).empty()) return std::nullopt;
  const TrendAnalysis t = analyse_trend(in.facts.group_checks, rules, in.at);
  if (!t.limits || !t.established) return std::nullopt;
  std::optional<Violation> first;
  int count = 0;
  for (const auto& v : stale_violations(t.violations, rules.trend_rules)) {
    bool ours = false;
    for (const Check* k : t.checks) {
      ours = ours || (k->id == v.check_id && k->curve_id == in.facts.curve->id);
    }
    if (!ours) continue;
    if (!first) first = v;
    ++count;
  }
  if (!first) return std::nullopt;
  const Violation& v = *first;
  double recovery = 0;
  for (const auto& o : t.observations) {
    if (o.check_id == v.check_id) recovery = o.recovery_pct;
  }
  std::string message = "Westgard " + std::string(to_string(v.rule)) + " at check " +
                        std::to_string(v.check_id.value) + " " + in.zone.format_local(v.at) +
                        " (recovery " + format_fixed(recovery, 1) + " %; mean " +
                        format_fixed(t.limits->mean, 2) + " %, s " + format_sig(t.limits->sd, 3) +
                        " %)";
  if (count > 1) message += " and " + std::to_string(count - 1) + " later violation(s)";
  return Finding{Reason::TrendViolation, v.at, message};
}

}  // namespace cw::rules
