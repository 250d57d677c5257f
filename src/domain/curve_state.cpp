// SPDX-License-Identifier: Apache-2.0
// Text forms of curve states and reasons.
#include "domain/curve_state.h"

#include "domain/enum_text.h"

namespace cw {
namespace {

constexpr std::pair<CurveState, std::string_view> kStates[] = {
    {CurveState::Rejected, "rejected"}, {CurveState::AwaitingReview, "awaiting-review"},
    {CurveState::Active, "active"},     {CurveState::Stale, "stale"},
    {CurveState::Retired, "retired"},
};

constexpr std::pair<Reason, std::string_view> kReasons[] = {
    {Reason::Expired, "expired"},
    {Reason::MethodRevised, "method-revised"},
    {Reason::CheckFailed, "check-failed"},
    {Reason::CheckOverdue, "check-overdue"},
    {Reason::LotExpired, "lot-expired"},
    {Reason::LotWithdrawn, "lot-withdrawn"},
    {Reason::InstrumentServiced, "instrument-serviced"},
    {Reason::Superseded, "superseded"},
    {Reason::TrendViolation, "trend-violation"},
    {Reason::CurveRejected, "rejected"},
    {Reason::AwaitingReview, "awaiting-review"},
    {Reason::CurveRetired, "retired"},
    {Reason::NotYetAcquired, "not-yet-acquired"},
    {Reason::NoActiveCurve, "no-active-curve"},
    {Reason::AboveRange, "above-range"},
    {Reason::NoSolution, "no-solution"},
    {Reason::CheckDue, "check-due"},
    {Reason::SelfReview, "self-review"},
    {Reason::NotAwaitingReview, "not-awaiting-review"},
    {Reason::NotRetirable, "not-retirable"},
    {Reason::ZoneFixed, "zone-fixed"},
    {Reason::AlreadyImported, "already-imported"},
    {Reason::NotPermitted, "not-permitted"},
    {Reason::WrongPassphrase, "wrong-passphrase"},
    {Reason::UserLocked, "user-locked"},
};

}  // namespace

std::string_view to_string(CurveState s) {
  return text_of(kStates, s);
}

std::optional<CurveState> parse_curve_state(std::string_view text) {
  return value_of(kStates, text);
}

std::string_view to_string(Reason r) {
  return text_of(kReasons, r);
}

std::optional<Reason> parse_reason(std::string_view text) {
  return value_of(kReasons, text);
}

std::vector<Reason> all_reasons() {
  std::vector<Reason> out;
  for (const auto& [reason, text] : kReasons) out.push_back(reason);
  return out;
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
    case Reason::TrendViolation:
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
