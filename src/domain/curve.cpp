// SPDX-License-Identifier: Apache-2.0
// Text forms of curve enums.
#include "domain/curve.h"

namespace cw {

std::string_view to_string(Verdict v) {
  return v == Verdict::Accepted ? "accepted" : "rejected";
}
std::string_view to_string(ReviewDecision d) {
  return d == ReviewDecision::Approve ? "approve" : "reject";
}

}  // namespace cw
