// SPDX-License-Identifier: Apache-2.0
// The transition table of review and retirement: complete, and deciding what a person may do to
// a curve in each state, with the typed reason of every refusal.
#include <catch2/catch.hpp>
#include <set>
#include <utility>

#include "domain/curve_transitions.h"

using cw::CurveAction;
using cw::CurveState;
using cw::Reason;
using cw::Verdict;

TEST_CASE("transitions: the table has exactly one row per action and state", "[domain]") {
  std::set<std::pair<CurveAction, CurveState>> seen;
  for (const auto& row : cw::curve_transitions()) {
    CHECK(seen.insert({row.action, row.from}).second);
  }
  for (CurveAction a : {CurveAction::Approve, CurveAction::Reject, CurveAction::Retire}) {
    for (CurveState s : cw::kAllCurveStates) CHECK(seen.count({a, s}) == 1);
  }
}

TEST_CASE("transitions: review decides only a curve that waits for it", "[domain]") {
  for (CurveAction a : {CurveAction::Approve, CurveAction::Reject}) {
    CHECK_FALSE(cw::transition_refusal(a, CurveState::AwaitingReview, Verdict::Accepted, false));
    for (CurveState s :
         {CurveState::Active, CurveState::Stale, CurveState::Rejected, CurveState::Retired}) {
      CHECK(cw::transition_refusal(a, s, Verdict::Accepted, false) == Reason::NotAwaitingReview);
    }
  }
}

TEST_CASE(
    "transitions: self-review is refused whatever the state, and a rejected curve is never "
    "reviewed",
    "[domain]") {
  for (CurveState s : cw::kAllCurveStates) {
    CHECK(cw::transition_refusal(CurveAction::Approve, s, Verdict::Accepted, true) ==
          Reason::SelfReview);
    CHECK(cw::transition_refusal(CurveAction::Reject, s, Verdict::Rejected, true) ==
          Reason::SelfReview);
    CHECK(cw::transition_refusal(CurveAction::Approve, s, Verdict::Rejected, false) ==
          Reason::CurveRejected);
  }
}

TEST_CASE("transitions: retirement withdraws any curve that could still be used", "[domain]") {
  for (CurveState s : {CurveState::AwaitingReview, CurveState::Active, CurveState::Stale}) {
    CHECK_FALSE(cw::transition_refusal(CurveAction::Retire, s, Verdict::Accepted, true));
  }
  CHECK(cw::transition_refusal(CurveAction::Retire, CurveState::Retired, Verdict::Accepted,
                               false) == Reason::NotRetirable);
  CHECK(cw::transition_refusal(CurveAction::Retire, CurveState::Rejected, Verdict::Rejected,
                               false) == Reason::NotRetirable);
}
