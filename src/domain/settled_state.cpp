// SPDX-License-Identifier: Apache-2.0
#include "domain/settled_state.h"

#include <algorithm>
#include <map>
#include <tuple>

namespace cw {
namespace {

/// The facts of `curve` at a moment `at` at or after its expiry moment. The first review at or
/// before `at` decides (as in the rules engine): later reviews of a decided curve are refused
/// when they are recorded.
SettledFacts facts_at(const SettledHistory& curve, Instant at) {
  SettledFacts f;
  f.verdict = curve.verdict;
  f.review_required = curve.review_required;
  const SettledReview* first = nullptr;
  for (const auto& r : curve.reviews) {
    if (r.at <= at && (first == nullptr || r.at < first->at)) first = &r;
  }
  if (first != nullptr) {
    f.reviewed = true;
    f.rejected_by_review = first->decision == ReviewDecision::Reject;
  }
  f.retired = std::any_of(curve.retirements.begin(), curve.retirements.end(),
                          [&](Instant x) { return x <= at; });
  return f;
}

}  // namespace

CurveState settled_state(const SettledFacts& f) {
  // The precedence of rules::evaluate() for a curve whose expiry moment has passed (so at least
  // the expired reason holds and it cannot be active).
  if (f.verdict == Verdict::Rejected || f.rejected_by_review) return CurveState::Rejected;
  if (f.retired) return CurveState::Retired;
  if (f.review_required && !f.reviewed) return CurveState::AwaitingReview;
  return CurveState::Stale;
}

std::vector<TallyStep> settled_steps(const SettledHistory& curve) {
  // The state can change only at the expiry moment and at reviews and retirements after it.
  std::vector<Instant> moments{curve.expires_at};
  for (const auto& r : curve.reviews) {
    if (r.at > curve.expires_at) moments.push_back(r.at);
  }
  for (Instant x : curve.retirements) {
    if (x > curve.expires_at) moments.push_back(x);
  }
  std::sort(moments.begin(), moments.end());
  moments.erase(std::unique(moments.begin(), moments.end()), moments.end());

  std::vector<TallyStep> steps;
  CurveState current = settled_state(facts_at(curve, moments.front()));
  steps.push_back({curve.instrument, moments.front(), current, +1});
  for (std::size_t i = 1; i < moments.size(); ++i) {
    const CurveState next = settled_state(facts_at(curve, moments[i]));
    if (next == current) continue;
    steps.push_back({curve.instrument, moments[i], current, -1});
    steps.push_back({curve.instrument, moments[i], next, +1});
    current = next;
  }
  return steps;
}

std::vector<TallyStep> tally_change(const SettledHistory* before, const SettledHistory& after) {
  // Net change per (instrument, moment, state); an instrument never changes, but the key keeps
  // the sum honest if it did.
  std::map<std::tuple<InstrumentId, Instant, CurveState>, int> net;
  for (const auto& s : settled_steps(after)) net[{s.instrument, s.at, s.state}] += s.delta;
  if (before != nullptr) {
    for (const auto& s : settled_steps(*before)) net[{s.instrument, s.at, s.state}] -= s.delta;
  }
  std::vector<TallyStep> out;
  for (const auto& [key, delta] : net) {
    if (delta == 0) continue;
    const auto& [instrument, at, state] = key;
    out.push_back({instrument, at, state, delta});
  }
  std::stable_sort(out.begin(), out.end(),
                   [](const TallyStep& a, const TallyStep& b) { return a.at < b.at; });
  return out;
}

std::map<std::pair<InstrumentId, CurveState>, std::int64_t> total_change(
    const std::vector<TallyStep>& steps) {
  std::map<std::pair<InstrumentId, CurveState>, std::int64_t> net;
  for (const auto& s : steps) net[{s.instrument, s.state}] += s.delta;
  std::erase_if(net, [](const auto& entry) { return entry.second == 0; });
  return net;
}

}  // namespace cw
