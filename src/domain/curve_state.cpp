// SPDX-License-Identifier: Apache-2.0
// Text forms of curve states and reasons.
#include "domain/curve_state.h"

#include <array>
#include <utility>

namespace cw {
namespace {

constexpr std::array<std::pair<CurveState, std::string_view>, 5> kStates = {{
    {CurveState::Rejected, "rejected"},
    {CurveState::AwaitingReview, "awaiting-review"},
    {CurveState::Active, "active"},
    {CurveState::Stale, "stale"},
    {CurveState::Retired, "retired"},
}};

constexpr std::array<std::pair<Reason, std::string_view>, 15> kReasons = {{
    {Reason::Expired, "expired"},
    {Reason::MethodRevised, "method-revised"},
    {Reason::CheckFailed, "check-failed"},
    {Reason::CheckOverdue, "check-overdue"},
    {Reason::LotExpired, "lot-expired"},
    {Reason::LotWithdrawn, "lot-withdrawn"},
    {Reason::InstrumentServiced, "instrument-serviced"},
    {Reason::Superseded, "superseded"},
    {Reason::CurveRejected, "rejected"},
    {Reason::AwaitingReview, "awaiting-review"},
    {Reason::CurveRetired, "retired"},
    {Reason::NotYetAcquired, "not-yet-acquired"},
    {Reason::NoActiveCurve, "no-active-curve"},
    {Reason::AboveRange, "above-range"},
    {Reason::NoSolution, "no-solution"},
}};

}  // namespace

std::string_view to_string(CurveState s) {
  for (const auto& [state, text] : kStates) {
    if (state == s) return text;
  }
  return "";
}

std::optional<CurveState> parse_curve_state(std::string_view text) {
  for (const auto& [state, t] : kStates) {
    if (t == text) return state;
  }
  return std::nullopt;
}

std::string_view to_string(Reason r) {
  for (const auto& [reason, text] : kReasons) {
    if (reason == r) return text;
  }
  return "";
}

std::optional<Reason> parse_reason(std::string_view text) {
  for (const auto& [reason, t] : kReasons) {
    if (t == text) return reason;
  }
  return std::nullopt;
}

bool is_stale_reason(Reason r) {
  switch (r) {
    case Reason::Expired:
    case Reason::MethodRevised:
    case Reason::CheckFailed:
    case Reason::CheckOverdue:
    case Reason::LotExpired:
    case Reason::LotWithdrawn:
    case Reason::InstrumentServiced:
    case Reason::Superseded:
      return true;
    default:
      return false;
  }
}

std::vector<Finding> CurveStatus::blocking() const {
  std::vector<Finding> out;
  if (cause) out.push_back(*cause);
  out.insert(out.end(), reasons.begin(), reasons.end());
  return out;
}

}  // namespace cw
