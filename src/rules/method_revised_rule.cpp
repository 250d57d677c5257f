// SPDX-License-Identifier: Apache-2.0
// method-revised: a newer version of the curve's method is in force at T.
#include "rules/rule.h"

namespace cw::rules {

std::optional<Finding> method_revised_rule(const RuleInput& in) {
  const MethodVersion& own = in.facts.version();
  const MethodVersion* in_force = in.facts.method->version_at(in.at);
  if (in_force == nullptr || in_force->version <= own.version) return std::nullopt;
  // The first newer version is when the curve stopped matching its method.
  const MethodVersion* first_newer = nullptr;
  for (const auto& v : in.facts.method->versions) {
    if (v.version > own.version && v.effective_at <= in.at &&
        (first_newer == nullptr || v.version < first_newer->version)) {
      first_newer = &v;
    }
  }
  std::string message = "made under method " + in.facts.method->code + " version " +
                        std::to_string(own.version) + "; version " +
                        std::to_string(first_newer->version) + " took effect " +
                        in.zone.format_local(first_newer->effective_at);
  if (first_newer->reason) message += " (" + *first_newer->reason + ")";
  if (in_force != first_newer)
    message += "; version " + std::to_string(in_force->version) + " is in force now";
  return Finding{Reason::MethodRevised, first_newer->effective_at, message};
}

}  // namespace cw::rules
