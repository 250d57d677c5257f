// SPDX-License-Identifier: Apache-2.0
// instrument-serviced: the instrument was taken out of service after the curve was acquired
// (returning it to service does not revive the curve: recalibrate).
#include "rules/rule.h"

namespace cw::rules {

std::optional<Finding> instrument_serviced_rule(const RuleInput& in) {
  const Curve& c = *in.facts.curve;
  for (const auto& e : in.facts.instrument->service) {
    if (e.direction != ServiceDirection::Out || e.occurred_at <= c.acquired_at ||
        e.occurred_at > in.at)
      continue;
    return Finding{Reason::InstrumentServiced, e.occurred_at,
                   "instrument " + in.facts.instrument->code + " was taken out of service " +
                       in.zone.format_local(e.occurred_at) + " (" + e.reason + ")"};
  }
  return std::nullopt;
}

}  // namespace cw::rules
