// SPDX-License-Identifier: Apache-2.0
// The state of a curve once its expiry moment has passed (a "settled" curve), and the steps in
// which an instrument's count of settled curves per state changes over time.
//
// A settled curve can no longer be active; only its verdict, its method version's review
// requirement, its first review and its retirements choose between rejected, retired,
// awaiting-review and stale. Its state is therefore a step function of time, starting at its
// expiry moment and changing at most at a later review or retirement. `status` counts an
// instrument's settled curves by adding up these steps (the store keeps them as derived rows,
// appended as facts arrive) instead of deciding every curve of the instrument's history again.
#pragma once

#include <cstdint>
#include <map>
#include <utility>
#include <vector>

#include "core/time.h"
#include "domain/curve.h"
#include "domain/curve_state.h"
#include "domain/ids.h"

namespace cw {

/// What decides the state of a settled curve at a moment.
struct SettledFacts {
  Verdict verdict = Verdict::Accepted;
  bool rejected_by_review = false;  ///< its first review at or before the moment rejected it
  bool retired = false;             ///< retired at or before the moment
  bool review_required = false;     ///< its method version requires review
  bool reviewed = false;            ///< reviewed (either way) at or before the moment
};

/// The state of a settled curve; the same precedence as the rules engine's evaluate().
CurveState settled_state(const SettledFacts& facts);

/// One review as far as a settled state is concerned.
struct SettledReview {
  Instant at;
  ReviewDecision decision = ReviewDecision::Approve;
};

/// Everything recorded about one curve that its settled state depends on.
struct SettledHistory {
  InstrumentId instrument;
  Instant expires_at;
  Verdict verdict = Verdict::Accepted;
  bool review_required = false;
  std::vector<SettledReview> reviews;  ///< in the order recorded (time, then id)
  std::vector<Instant> retirements;
};

/// From `at` on, `delta` more (or fewer) settled curves of `instrument` are in `state`.
struct TallyStep {
  InstrumentId instrument;
  Instant at;
  CurveState state = CurveState::Stale;
  int delta = 0;
  bool operator==(const TallyStep&) const = default;
};

/// The steps of one curve: +1 in its state at its expiry moment, then -1/+1 at each later
/// review or retirement that changes its state. Summed over an instrument's curves up to a
/// moment T, they give how many of its curves are settled in each state at T.
std::vector<TallyStep> settled_steps(const SettledHistory& curve);

/// The steps to append when a curve's history changes from `before` to `after` (a new review or
/// retirement, back-dated or not): after's steps minus before's, net zero steps left out, in
/// time order (one moment's in the order of CurveState). `before` empty (nullptr) for a new curve.
std::vector<TallyStep> tally_change(const SettledHistory* before, const SettledHistory& after);

/// How much `steps` change each instrument's total per state, whatever their moments (net zero
/// left out). The store keeps, beside the steps, each instrument's running total per state, so
/// that its count at T is the total less the steps after T: few when T is about now, however
/// long the history.
std::map<std::pair<InstrumentId, CurveState>, std::int64_t> total_change(
    const std::vector<TallyStep>& steps);

}  // namespace cw
