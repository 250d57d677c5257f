// SPDX-License-Identifier: Apache-2.0
// The derived state of a curve at a moment and the typed reasons behind it (product.md §5.2),
// plus the reasons an action or a quantitation is refused. Each value has exactly one text form
// (curve_state.cpp); text that parses to no value is never silently read as another.
#pragma once

#include <optional>
#include <string>
#include <string_view>
#include <vector>

#include "core/time.h"

namespace cw {

enum class CurveState { Rejected, AwaitingReview, Active, Stale, Retired };

/// "rejected", "awaiting-review", "active", "stale", "retired".
std::string_view to_string(CurveState s);
std::optional<CurveState> parse_curve_state(std::string_view text);
/// Every state, in the order of the contract's table.
inline constexpr CurveState kAllCurveStates[] = {CurveState::Rejected, CurveState::AwaitingReview,
                                                 CurveState::Active, CurveState::Stale,
                                                 CurveState::Retired};

enum class Reason {
  // Stale reasons: a curve that was active stops being usable.
  Expired,             ///< acquired + the method's valid_for has passed
  MethodRevised,       ///< a newer version of its method is in force
  CheckFailed,         ///< a check standard or blank against it failed
  CheckOverdue,        ///< the method's check_every passed since the last passing check
  LotExpired,          ///< a lot it was made from expired
  LotWithdrawn,        ///< a lot it was made from was withdrawn
  InstrumentServiced,  ///< its instrument was taken out of service after it was acquired
  Superseded,          ///< a newer active curve exists for the same method, instrument, analyte
  TrendViolation,      ///< a Westgard rule the method's trend_rules name was violated
  // Why a curve cannot be used although no stale reason holds.
  CurveRejected,   ///< failed acceptance or rejected by a reviewer
  AwaitingReview,  ///< accepted but not yet approved
  CurveRetired,    ///< withdrawn from use by a person
  NotYetAcquired,  ///< the moment asked about is before the curve was acquired
  // Why a quantitation is refused although the curve is usable.
  NoActiveCurve,  ///< no active curve for the method, instrument and analyte
  AboveRange,     ///< above the highest calibrator: dilute and re-run
  NoSolution,     ///< the response has no solution on the curve
  CheckDue,       ///< the method's samples_per_check were reported since the last passing check
  // Why a review or a retirement is refused.
  SelfReview,         ///< the reviewer logged the calibration
  NotAwaitingReview,  ///< the curve is not waiting for a review
  NotRetirable,       ///< the curve is already retired or rejected
  // Why a change of the lab's settings is refused.
  ZoneFixed,  ///< the lab's zone cannot change once the store holds records
  // Why a run import is refused.
  AlreadyImported,  ///< the same file (same SHA-256) was imported before
  // Why a person's act is refused whatever the record.
  NotPermitted,     ///< the acting user's role does not allow the command
  WrongPassphrase,  ///< a signature was given with a passphrase that does not match
  UserLocked,       ///< the user is locked after repeated wrong passphrases
};

/// "expired", "method-revised", "check-failed", "check-overdue", "lot-expired",
/// "lot-withdrawn", "instrument-serviced", "superseded", "trend-violation", "rejected",
/// "awaiting-review", "retired", "not-yet-acquired", "no-active-curve", "above-range",
/// "no-solution", "check-due", "self-review", "not-awaiting-review", "not-retirable",
/// "zone-fixed", "already-imported", "not-permitted", "wrong-passphrase", "user-locked".
std::string_view to_string(Reason r);
std::optional<Reason> parse_reason(std::string_view text);
/// True for the reasons that make an active curve stale.
bool is_stale_reason(Reason r);
/// Every reason (for round-trip tests and documentation).
std::vector<Reason> all_reasons();

/// One reason that holds, with when it began and the facts behind it in plain words.
struct Finding {
  Reason reason;
  std::optional<Instant> since;
  std::string message;
  bool operator==(const Finding&) const = default;
};

struct CurveStatus {
  CurveState state = CurveState::Active;
  /// Every stale reason that holds at the moment (also shown for curves awaiting review).
  std::vector<Finding> reasons;
  /// Why the state is rejected, awaiting-review or retired.
  std::optional<Finding> cause;

  bool is_usable() const { return state == CurveState::Active; }
  /// The cause (if any) followed by the stale reasons: everything that stops quantitation.
  std::vector<Finding> blocking() const;
};

}  // namespace cw
