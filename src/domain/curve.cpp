// SPDX-License-Identifier: Apache-2.0
// Text forms of curve enums.
#include "domain/curve.h"

#include "domain/enum_text.h"

#include <stdexcept>
#include <string>

namespace cw {
namespace {

constexpr std::pair<Verdict, std::string_view> kVerdicts[] = {{Verdict::Accepted, "accepted"},
                                                              {Verdict::Rejected, "rejected"}};
constexpr std::pair<ReviewDecision, std::string_view> kDecisions[] = {
    {ReviewDecision::Approve, "approve"}, {ReviewDecision::Reject, "reject"}};

}  // namespace

std::string_view to_string(Verdict v) {
  return text_of(kVerdicts, v);
}
std::optional<Verdict> parse_verdict(std::string_view text) {
  return value_of(kVerdicts, text);
}
std::string_view to_string(ReviewDecision d) {
  return text_of(kDecisions, d);
}
std::optional<ReviewDecision> parse_review_decision(std::string_view text) {
  return value_of(kDecisions, text);
}

double lowest_calibrator(const Curve& curve) {
  // Every curve has its points stored; a curve read without them would give the fit's range,
  // which starts at a zero calibrator, and release or verify below the lowest real one.
  if (curve.points.empty()) {
    if (curve.lowest_level) return *curve.lowest_level;
    throw std::logic_error("curve " + std::to_string(curve.id.value) +
                           " was read without its points, which its lowest calibrator needs");
  }
  std::optional<double> lowest;
  for (const auto& p : curve.points) {
    if (p.excluded || !(p.nominal > 0)) continue;
    if (!lowest || p.nominal < *lowest) lowest = p.nominal;
  }
  return lowest.value_or(curve.fit.range_low);
}

}  // namespace cw
