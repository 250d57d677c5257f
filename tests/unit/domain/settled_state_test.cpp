// SPDX-License-Identifier: Apache-2.0
// The steps of a settled curve's state (domain/settled_state.h), worked by hand: the precedence
// is the contract's (product.md §5.2: rejected, then retired, then awaiting review, else stale
// once expired), the moments are the expiry and later reviews and retirements.
#include <catch2/catch.hpp>

#include "domain/settled_state.h"

namespace {

using cw::CurveState;
using cw::TallyStep;

cw::Instant at(const char* text) {
  return cw::parse_instant(text);
}

cw::SettledHistory curve(bool review_required) {
  cw::SettledHistory h;
  h.instrument = cw::InstrumentId{7};
  h.expires_at = at("2026-03-10T08:00:00Z");
  h.review_required = review_required;
  return h;
}

TallyStep step(const char* when, CurveState state, int delta) {
  return {cw::InstrumentId{7}, at(when), state, delta};
}

}  // namespace

TEST_CASE("settled steps: one step at the expiry when nothing happens after it",
          "[domain][settled]") {
  auto h = curve(false);
  CHECK(cw::settled_steps(h) == std::vector{step("2026-03-10T08:00:00Z", CurveState::Stale, 1)});
  h.verdict = cw::Verdict::Rejected;
  CHECK(cw::settled_steps(h) == std::vector{step("2026-03-10T08:00:00Z", CurveState::Rejected, 1)});
  // A review before the expiry decides the state it settles in.
  auto r = curve(true);
  CHECK(cw::settled_steps(r) ==
        std::vector{step("2026-03-10T08:00:00Z", CurveState::AwaitingReview, 1)});
  r.reviews.push_back({at("2026-03-01T09:00:00Z"), cw::ReviewDecision::Reject});
  CHECK(cw::settled_steps(r) == std::vector{step("2026-03-10T08:00:00Z", CurveState::Rejected, 1)});
}

TEST_CASE("settled steps: reviews and retirements after the expiry move the curve",
          "[domain][settled]") {
  auto h = curve(true);
  h.reviews.push_back({at("2026-03-12T10:00:00Z"), cw::ReviewDecision::Approve});
  h.retirements.push_back(at("2026-03-20T00:00:00Z"));
  CHECK(cw::settled_steps(h) == std::vector{
                                    step("2026-03-10T08:00:00Z", CurveState::AwaitingReview, 1),
                                    step("2026-03-12T10:00:00Z", CurveState::AwaitingReview, -1),
                                    step("2026-03-12T10:00:00Z", CurveState::Stale, 1),
                                    step("2026-03-20T00:00:00Z", CurveState::Stale, -1),
                                    step("2026-03-20T00:00:00Z", CurveState::Retired, 1),
                                });
  // The first review decides: a rejection after an approval changes nothing.
  h.reviews.push_back({at("2026-03-15T10:00:00Z"), cw::ReviewDecision::Reject});
  CHECK(cw::settled_steps(h).size() == 5);
  // A retirement does not hide a rejection (rejected comes first).
  auto r = curve(false);
  r.retirements.push_back(at("2026-03-11T00:00:00Z"));
  r.reviews.push_back({at("2026-03-12T00:00:00Z"), cw::ReviewDecision::Reject});
  CHECK(cw::settled_steps(r) == std::vector{
                                    step("2026-03-10T08:00:00Z", CurveState::Stale, 1),
                                    step("2026-03-11T00:00:00Z", CurveState::Stale, -1),
                                    step("2026-03-11T00:00:00Z", CurveState::Retired, 1),
                                    step("2026-03-12T00:00:00Z", CurveState::Retired, -1),
                                    step("2026-03-12T00:00:00Z", CurveState::Rejected, 1),
                                });
}

TEST_CASE("tally change: what to append when a fact arrives, back-dated or not",
          "[domain][settled]") {
  auto before = curve(true);
  // A new curve: its steps.
  CHECK(cw::tally_change(nullptr, before) == cw::settled_steps(before));
  // An approval before the expiry, recorded late: the curve settles stale instead.
  auto after = before;
  after.reviews.push_back({at("2026-03-02T00:00:00Z"), cw::ReviewDecision::Approve});
  CHECK(cw::tally_change(&before, after) ==
        std::vector{step("2026-03-10T08:00:00Z", CurveState::AwaitingReview, -1),
                    step("2026-03-10T08:00:00Z", CurveState::Stale, 1)});
  // A back-dated retirement before an existing one: the retired step moves earlier.
  auto retired = curve(false);
  retired.retirements.push_back(at("2026-04-01T00:00:00Z"));
  auto earlier = retired;
  earlier.retirements.push_back(at("2026-03-20T00:00:00Z"));
  CHECK(cw::tally_change(&retired, earlier) ==
        std::vector{step("2026-03-20T00:00:00Z", CurveState::Stale, -1),
                    step("2026-03-20T00:00:00Z", CurveState::Retired, 1),
                    step("2026-04-01T00:00:00Z", CurveState::Stale, 1),
                    step("2026-04-01T00:00:00Z", CurveState::Retired, -1)});
  // A fact that changes nothing appends nothing.
  auto again = earlier;
  again.retirements.push_back(at("2026-05-01T00:00:00Z"));
  CHECK(cw::tally_change(&earlier, again).empty());
}

TEST_CASE("total change: the running totals move by the net of the steps, whatever their moments",
          "[domain][settled]") {
  using Key = std::pair<cw::InstrumentId, CurveState>;
  const cw::InstrumentId seven{7};
  // The back-dated retirement above: stale and retired each -1 and +1 at two moments; the
  // totals do not move (the curve ends retired either way).
  CHECK(cw::total_change({step("2026-03-20T00:00:00Z", CurveState::Stale, -1),
                          step("2026-03-20T00:00:00Z", CurveState::Retired, 1),
                          step("2026-04-01T00:00:00Z", CurveState::Stale, 1),
                          step("2026-04-01T00:00:00Z", CurveState::Retired, -1)})
            .empty());
  // A late approval: one fewer awaiting review, one more stale.
  CHECK(cw::total_change({step("2026-03-10T08:00:00Z", CurveState::AwaitingReview, -1),
                          step("2026-03-10T08:00:00Z", CurveState::Stale, 1)}) ==
        std::map<Key, std::int64_t>{{{seven, CurveState::AwaitingReview}, -1},
                                    {{seven, CurveState::Stale}, 1}});
  // A new curve retired after its expiry: +1 stale, then -1 stale +1 retired: net retired.
  auto retired = curve(false);
  retired.retirements.push_back(at("2026-04-01T00:00:00Z"));
  CHECK(cw::total_change(cw::settled_steps(retired)) ==
        std::map<Key, std::int64_t>{{{seven, CurveState::Retired}, 1}});
}
