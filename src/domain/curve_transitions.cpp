// SPDX-License-Identifier: Apache-2.0
// The transition table of review and retirement.
#include "domain/curve_transitions.h"

#include <array>

#include "domain/enum_text.h"

namespace cw {
namespace {

constexpr std::pair<CurveAction, std::string_view> kActions[] = {{CurveAction::Approve, "approve"},
                                                                 {CurveAction::Reject, "reject"},
                                                                 {CurveAction::Retire, "retire"}};

using S = CurveState;
using A = CurveAction;
constexpr std::optional<Reason> kAllowed = std::nullopt;

// Review decides a curve that waits for it, nothing else; retirement withdraws any curve that
// could still be (or become) usable.
constexpr std::array<CurveTransition, 15> kTable = {{
    {A::Approve, S::AwaitingReview, kAllowed},
    {A::Approve, S::Active, Reason::NotAwaitingReview},
    {A::Approve, S::Stale, Reason::NotAwaitingReview},
    {A::Approve, S::Rejected, Reason::NotAwaitingReview},
    {A::Approve, S::Retired, Reason::NotAwaitingReview},
    {A::Reject, S::AwaitingReview, kAllowed},
    {A::Reject, S::Active, Reason::NotAwaitingReview},
    {A::Reject, S::Stale, Reason::NotAwaitingReview},
    {A::Reject, S::Rejected, Reason::NotAwaitingReview},
    {A::Reject, S::Retired, Reason::NotAwaitingReview},
    {A::Retire, S::AwaitingReview, kAllowed},
    {A::Retire, S::Active, kAllowed},
    {A::Retire, S::Stale, kAllowed},
    {A::Retire, S::Rejected, Reason::NotRetirable},
    {A::Retire, S::Retired, Reason::NotRetirable},
}};

}  // namespace

std::string_view to_string(CurveAction a) {
  return text_of(kActions, a);
}

std::span<const CurveTransition> curve_transitions() {
  return kTable;
}

std::optional<Reason> transition_refusal(CurveAction action, CurveState state, Verdict verdict,
                                         bool actor_logged_it) {
  const bool review = action == CurveAction::Approve || action == CurveAction::Reject;
  if (review && actor_logged_it) return Reason::SelfReview;
  if (review && verdict == Verdict::Rejected) return Reason::CurveRejected;
  for (const auto& row : kTable) {
    if (row.action == action && row.from == state) return row.refusal;
  }
  return Reason::NotAwaitingReview;  // unreachable: the table covers every pair
}

}  // namespace cw
