// SPDX-License-Identifier: Apache-2.0
// Reading settled histories and comparing tally steps, for either backend: templates over a
// statement type with executeStep() and getColumn(i).getInt64() / getString() (SQLiteCpp's, and
// the PostgreSQL backend's, which mirrors it). No SQL here: each backend's settled_tallies.cpp
// prepares the statements of its own sql.h, binds them and hands them over, as the JSON forms of
// codec.h are shared.
#pragma once

#include <cstdint>
#include <functional>
#include <map>
#include <optional>
#include <string>
#include <tuple>
#include <unordered_map>
#include <vector>

#include "domain/settled_state.h"
#include "store/sqlite/codec.h"

namespace cw::store::sqlite {

/// Receives a curve's settled history and the latest entry among its facts.
using SettledHistorySink =
    std::function<void(CurveId, const SettledHistory&, std::int64_t latest_seq)>;

/// One curve's history from its bound statements: `curve` (instrument_id, expires_at, verdict,
/// review_required), `reviews` (occurred_at, decision) and `retirements` (occurred_at), each in
/// time order. False when `curve` has no row.
template <class Statement>
bool read_settled_history(Statement& curve, Statement& reviews, Statement& retirements,
                          const std::string& path, SettledHistory& h) {
  if (!curve.executeStep()) return false;
  h.instrument = InstrumentId{curve.getColumn(0).getInt64()};
  h.expires_at = stored_instant(curve.getColumn(1).getString(), "curves.expires_at", path);
  h.verdict = stored_enum(parse_verdict, curve.getColumn(2).getString(), "curves.verdict", path);
  h.review_required = curve.getColumn(3).getInt64() != 0;
  while (reviews.executeStep()) {
    h.reviews.push_back(
        {stored_instant(reviews.getColumn(0).getString(), "curve_reviews.occurred_at", path),
         stored_enum(parse_review_decision, reviews.getColumn(1).getString(),
                     "curve_reviews.decision", path)});
  }
  while (retirements.executeStep()) {
    h.retirements.push_back(stored_instant(retirements.getColumn(0).getString(),
                                           "curve_retirements.occurred_at", path));
  }
  return true;
}

/// Every curve's history, in curve order: `versions` (id, review_required) read first, then
/// `curves` (id, instrument_id, expires_at, verdict, method_version_id, audit_seq), `reviews`
/// (curve_id, occurred_at, decision, audit_seq) and `retirements` (curve_id, occurred_at,
/// audit_seq), each ordered by curve, merged.
template <class Statement>
void each_settled_history(Statement& versions, Statement& curves, Statement& reviews,
                          Statement& retirements, const std::string& path,
                          const SettledHistorySink& each) {
  std::unordered_map<std::int64_t, bool> review_required;
  while (versions.executeStep()) {
    review_required[versions.getColumn(0).getInt64()] = versions.getColumn(1).getInt64() != 0;
  }
  bool more_reviews = reviews.executeStep();
  bool more_retirements = retirements.executeStep();
  while (curves.executeStep()) {
    const std::int64_t id = curves.getColumn(0).getInt64();
    SettledHistory h;
    h.instrument = InstrumentId{curves.getColumn(1).getInt64()};
    h.expires_at = stored_instant(curves.getColumn(2).getString(), "curves.expires_at", path);
    h.verdict = stored_enum(parse_verdict, curves.getColumn(3).getString(), "curves.verdict", path);
    const auto version = review_required.find(curves.getColumn(4).getInt64());
    h.review_required = version == review_required.end() || version->second;
    std::int64_t latest = curves.getColumn(5).getInt64();
    // Rows of curves that do not exist (a damaged store) are passed over.
    while (more_reviews && reviews.getColumn(0).getInt64() < id)
      more_reviews = reviews.executeStep();
    while (more_reviews && reviews.getColumn(0).getInt64() == id) {
      h.reviews.push_back(
          {stored_instant(reviews.getColumn(1).getString(), "curve_reviews.occurred_at", path),
           stored_enum(parse_review_decision, reviews.getColumn(2).getString(),
                       "curve_reviews.decision", path)});
      latest = std::max(latest, reviews.getColumn(3).getInt64());
      more_reviews = reviews.executeStep();
    }
    while (more_retirements && retirements.getColumn(0).getInt64() < id) {
      more_retirements = retirements.executeStep();
    }
    while (more_retirements && retirements.getColumn(0).getInt64() == id) {
      h.retirements.push_back(stored_instant(retirements.getColumn(1).getString(),
                                             "curve_retirements.occurred_at", path));
      latest = std::max(latest, retirements.getColumn(2).getInt64());
      more_retirements = retirements.executeStep();
    }
    each(CurveId{id}, h, latest);
  }
}

/// The net steps of one curve, keyed by instrument, moment and state.
using NetSteps = std::map<std::tuple<InstrumentId, Instant, CurveState>, std::int64_t>;

/// The steps in words, for a report of a disagreement.
std::string describe_steps(const NetSteps& steps);

/// The first difference between the stored steps, `stored` (curve_id, instrument_id,
/// effective_at, state, net delta; zero sums left out; in curve order), and the steps of the
/// histories `histories` hands to its sink in curve order; nullopt when they agree.
template <class Statement>
std::optional<std::string> first_step_disagreement(
    Statement& stored, const std::string& path,
    const std::function<void(const SettledHistorySink&)>& histories) {
  bool more = stored.executeStep();
  std::optional<std::string> found;
  const auto unexplained = [&] {
    return "steps are stored for curve " + std::to_string(stored.getColumn(0).getInt64()) +
           ", which the facts do not explain";
  };
  histories([&](CurveId id, const SettledHistory& h, std::int64_t) {
    if (found) return;
    if (more && stored.getColumn(0).getInt64() < id.value) {
      found = unexplained();
      return;
    }
    NetSteps expected;
    for (const auto& s : settled_steps(h)) expected[{s.instrument, s.at, s.state}] += s.delta;
    NetSteps got;
    while (more && stored.getColumn(0).getInt64() == id.value) {
      got[{InstrumentId{stored.getColumn(1).getInt64()},
           stored_instant(stored.getColumn(2).getString(), "settled_tallies.effective_at", path),
           stored_enum(parse_curve_state, stored.getColumn(3).getString(), "settled_tallies.state",
                       path)}] += stored.getColumn(4).getInt64();
      more = stored.executeStep();
    }
    if (got != expected) {
      found = "curve " + std::to_string(id.value) + ": stored " + describe_steps(got) +
              "; its facts give " + describe_steps(expected);
    }
  });
  if (!found && more) found = unexplained();
  return found;
}

/// The latest running total (n, total) of each (instrument id, state) a write unit appended: the
/// next one of the same unit follows it without reading it back (the unit holds the write lock).
using LatestTotals =
    std::map<std::pair<std::int64_t, std::string>, std::pair<std::int64_t, std::int64_t>>;

/// Appends to `insert` (:instrument, :state, :n, :total, :seq) the next running total of each
/// (instrument, state) that `steps` change, after the latest one: from `known` when this unit
/// appended it, else as `latest` (:instrument, :state; columns n, total; nothing when there is
/// none yet) reads it.
template <class Statement>
void append_settled_totals(Statement& latest, Statement& insert,
                           const std::vector<TallyStep>& steps, std::int64_t seq,
                           LatestTotals& known) {
  for (const auto& [key, change] : total_change(steps)) {
    const std::string state(to_string(key.second));
    const std::int64_t instrument = key.first.value;
    std::int64_t n = 0;
    std::int64_t total = 0;
    if (auto found = known.find({instrument, state}); found != known.end()) {
      std::tie(n, total) = found->second;
    } else {
      latest.bind(":instrument", instrument);
      latest.bind(":state", state);
      if (latest.executeStep()) {
        n = latest.getColumn(0).getInt64();
        total = latest.getColumn(1).getInt64();
      }
      latest.reset();
    }
    known[{instrument, state}] = {n + 1, total + change};
    insert.bind(":instrument", instrument);
    insert.bind(":state", state);
    insert.bind(":n", n + 1);
    insert.bind(":total", total + change);
    insert.bind(":seq", seq);
    insert.exec();
    insert.reset();
  }
}

/// The first row of `totals` (instrument_id, state, latest running total, sum of its steps:
/// the rows where they differ), in words; nullopt when it has none.
template <class Statement>
std::optional<std::string> first_totals_disagreement(Statement& totals) {
  if (!totals.executeStep()) return std::nullopt;
  return "the settled totals of instrument id " + std::to_string(totals.getColumn(0).getInt64()) +
         ", " + totals.getColumn(1).getString() + ": the latest running total is " +
         std::to_string(totals.getColumn(2).getInt64()) + " where its tally steps add up to " +
         std::to_string(totals.getColumn(3).getInt64());
}

}  // namespace cw::store::sqlite
