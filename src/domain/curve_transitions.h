// SPDX-License-Identifier: Apache-2.0
// What a person may do to a curve in each state: review (approve or reject) and retire, as one
// table of allowed transitions with the typed reason for each refusal.
#pragma once

#include <optional>
#include <span>

#include "domain/curve.h"
#include "domain/curve_state.h"

namespace cw {

enum class CurveAction { Approve, Reject, Retire };
std::string_view to_string(CurveAction a);  // "approve" | "reject" | "retire"

/// One row of the table: `action` from `from` is allowed, or refused with `refusal`.
struct CurveTransition {
  CurveAction action;
  CurveState from;
  std::optional<Reason> refusal;  ///< nullopt: allowed
};

/// The whole table, one row per (action, state).
std::span<const CurveTransition> curve_transitions();

/// Why `action` is refused on a curve in `state` with `verdict`, when the person acting is
/// (`actor_logged_it`) or is not the analyst who logged it; nullopt when it is allowed.
/// Precedence: a review by the analyst is refused as self-review whatever the state; a review of
/// a curve rejected by acceptance is refused as rejected; otherwise the table decides.
std::optional<Reason> transition_refusal(CurveAction action, CurveState state, Verdict verdict,
                                         bool actor_logged_it);

}  // namespace cw
