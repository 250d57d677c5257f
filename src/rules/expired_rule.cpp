// SPDX-License-Identifier: Apache-2.0
// expired: acquired + the method version's valid_for is at or before T.
#include "domain/expiry.h"
#include "rules/rule.h"

namespace cw::rules {

std::optional<Finding> expired_rule(const RuleInput& in) {
  const Curve& c = *in.facts.curve;
  const Duration valid_for = in.facts.version().definition.calibration.valid_for;
  const Instant end =
      expiry_of(c.acquired_at, in.facts.version(), in.facts.lots, in.zone).valid_until;
  if (end > in.at) return std::nullopt;
  return Finding{Reason::Expired, end,
                 "valid for " + to_string(valid_for) + " from acquisition (" +
                     in.zone.format_local(c.acquired_at) + "): expired " +
                     in.zone.format_local(end)};
}

}  // namespace cw::rules
