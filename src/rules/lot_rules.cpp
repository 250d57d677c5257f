// SPDX-License-Identifier: Apache-2.0
// lot-expired (a lot's effective expiry day has ended, lab-local) and lot-withdrawn.
#include "rules/rule.h"

namespace cw::rules {

std::optional<Finding> lot_expired_rule(const RuleInput& in) {
  std::optional<Finding> found;
  for (const Lot* lot : in.facts.lots) {
    const Instant end = lot->expiry_instant(in.zone);
    if (end > in.at) continue;
    if (found && found->since && *found->since <= end) continue;
    std::string why = lot->in_use_expires_on() && *lot->in_use_expires_on() < lot->expires_on
                          ? "in-use period of " + std::to_string(*lot->in_use_days) +
                                " days from opening on " + format_date(*lot->opened_on) + " ended"
                          : "certificate expiry";
    found = Finding{Reason::LotExpired, end,
                    "lot " + lot->code + " expired at the end of " +
                        format_date(lot->effective_expires_on()) + " (" + why + ")"};
  }
  return found;
}

std::optional<Finding> lot_withdrawn_rule(const RuleInput& in) {
  std::optional<Finding> found;
  for (const Lot* lot : in.facts.lots) {
    if (!lot->is_withdrawn_at(in.at)) continue;
    if (found && found->since && *found->since <= lot->withdrawal->occurred_at) continue;
    found = Finding{Reason::LotWithdrawn, lot->withdrawal->occurred_at,
                    "lot " + lot->code + " was withdrawn " +
                        in.zone.format_local(lot->withdrawal->occurred_at) + ": " +
                        lot->withdrawal->reason};
  }
  return found;
}

}  // namespace cw::rules
