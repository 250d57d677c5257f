// SPDX-License-Identifier: Apache-2.0
// One stale rule: given the facts and a moment, the finding it makes (if its reason holds).
#pragma once

#include <optional>

#include "rules/curve_facts.h"

namespace cw::rules {

struct RuleInput {
  const CurveFacts& facts;
  Instant at;
  const LabZone& zone;
};

using RuleFn = std::optional<Finding> (*)(const RuleInput&);

struct RuleEntry {
  Reason reason;
  RuleFn evaluate;
  const char* summary;
};

/// Every stale rule except superseded (which needs the other curves), in reporting order.
const std::vector<RuleEntry>& stale_rules();

// The rules, one file each.
std::optional<Finding> expired_rule(const RuleInput& in);
std::optional<Finding> method_revised_rule(const RuleInput& in);
std::optional<Finding> check_failed_rule(const RuleInput& in);
std::optional<Finding> check_overdue_rule(const RuleInput& in);
std::optional<Finding> lot_expired_rule(const RuleInput& in);
std::optional<Finding> lot_withdrawn_rule(const RuleInput& in);
std::optional<Finding> instrument_serviced_rule(const RuleInput& in);
std::optional<Finding> trend_violation_rule(const RuleInput& in);

}  // namespace cw::rules
