// SPDX-License-Identifier: Apache-2.0
// check-failed (a check against the curve failed at or before T) and check-overdue (the
// method's check_every passed since the last passing check, or since acquisition).
#include "core/text.h"
#include "rules/rule.h"

namespace cw::rules {
namespace {

std::string describe_check(const Check& k, const std::string& unit, const LabZone& zone) {
  std::string s = std::string(to_string(k.kind)) + " " + std::to_string(k.id.value) + " at " +
                  zone.format_local(k.occurred_at) + ": ";
  if (!k.measured)
    return s + "response " + format_shortest(k.response) + " has no solution on the curve";
  s += "measured " + format_sig(*k.measured, 4) + " " + unit;
  if (k.kind == CheckKind::Check) {
    s += " against nominal " + format_shortest(k.nominal) + " (recovery " +
         format_fixed_against(*k.recovery_pct, {k.limit_low.value_or(0), k.limit_high.value_or(0)},
                              1) +
         " %, allowed " + format_shortest(k.limit_low.value_or(0)) + "–" +
         format_shortest(k.limit_high.value_or(0)) + " %)";
  } else if (k.limit_high) {
    s += " (blank limit " + format_sig(*k.limit_high, 4) + " " + unit + ")";
  }
  return s;
}

}  // namespace

std::optional<Finding> check_failed_rule(const RuleInput& in) {
  const std::string& unit = in.facts.version().definition.unit;
  const Check* first = nullptr;
  int failures = 0;
  for (const auto& k : in.facts.checks) {
    if (k.occurred_at > in.at || k.passed) continue;
    if (first == nullptr) first = &k;
    ++failures;
  }
  if (first == nullptr) return std::nullopt;
  std::string message = describe_check(*first, unit, in.zone);
  if (failures > 1) message += " (" + std::to_string(failures - 1) + " later failure(s) as well)";
  return Finding{Reason::CheckFailed, first->occurred_at, message};
}

std::optional<Finding> check_overdue_rule(const RuleInput& in) {
  const auto& every = in.facts.version().definition.check.check_every;
  if (!every) return std::nullopt;
  Instant last = in.facts.curve->acquired_at;
  bool any = false;
  for (const auto& k : in.facts.checks) {
    if (k.occurred_at <= in.at && k.passed && k.occurred_at >= last) {
      last = k.occurred_at;
      any = true;
    }
  }
  const Instant due = add_duration_unchecked(last, *every, in.zone);
  if (due > in.at) return std::nullopt;
  return Finding{Reason::CheckOverdue, due,
                 "a passing check is due every " + to_string(*every) + "; " +
                     (any ? "the last passed " : "none since acquisition ") +
                     in.zone.format_local(last) + ", so one was due " + in.zone.format_local(due)};
}

}  // namespace cw::rules
