// SPDX-License-Identifier: Apache-2.0
#include "store/sqlite/settled_tallies.h"

#include <functional>
#include <map>
#include <tuple>
#include <unordered_map>

#include "store/sqlite/bind.h"
#include "store/sqlite/codec.h"
#include "store/sqlite/sql.h"

namespace cw::store::sqlite {
namespace {

using StepKey = std::tuple<InstrumentId, Instant, CurveState>;
using NetSteps = std::map<StepKey, std::int64_t>;

/// Calls `each` with every curve's settled history and its latest entry, in curve order: three
/// ordered scans merged, the method versions' review requirement read once.
void each_settled_history(
    Database& db,
    const std::function<void(CurveId, const SettledHistory&, std::int64_t latest_seq)>& each) {
  std::unordered_map<std::int64_t, bool> review_required;
  {
    SQLite::Statement v(*db.db, sql::kReviewRequiredByVersion);
    while (v.executeStep()) {
      review_required[v.getColumn(0).getInt64()] = v.getColumn(1).getInt64() != 0;
    }
  }
  SQLite::Statement curves(*db.db, sql::kAllSettledCurves);
  SQLite::Statement reviews(*db.db, sql::kAllSettledReviews);
  SQLite::Statement retirements(*db.db, sql::kAllSettledRetirements);
  bool more_reviews = reviews.executeStep();
  bool more_retirements = retirements.executeStep();
  while (curves.executeStep()) {
    const std::int64_t id = curves.getColumn(0).getInt64();
    SettledHistory h;
    h.instrument = InstrumentId{curves.getColumn(1).getInt64()};
    h.expires_at = stored_instant(curves.getColumn(2).getString(), "curves.expires_at", db.path);
    h.verdict =
        stored_enum(parse_verdict, curves.getColumn(3).getString(), "curves.verdict", db.path);
    const auto version = review_required.find(curves.getColumn(4).getInt64());
    h.review_required = version == review_required.end() || version->second;
    std::int64_t latest = curves.getColumn(5).getInt64();
    // Rows of curves that do not exist (a damaged store) are passed over.
    while (more_reviews && reviews.getColumn(0).getInt64() < id)
      more_reviews = reviews.executeStep();
    while (more_reviews && reviews.getColumn(0).getInt64() == id) {
      h.reviews.push_back(
          {stored_instant(reviews.getColumn(1).getString(), "curve_reviews.occurred_at", db.path),
           stored_enum(parse_review_decision, reviews.getColumn(2).getString(),
                       "curve_reviews.decision", db.path)});
      latest = std::max(latest, reviews.getColumn(3).getInt64());
      more_reviews = reviews.executeStep();
    }
    while (more_retirements && retirements.getColumn(0).getInt64() < id) {
      more_retirements = retirements.executeStep();
    }
    while (more_retirements && retirements.getColumn(0).getInt64() == id) {
      h.retirements.push_back(stored_instant(retirements.getColumn(1).getString(),
                                             "curve_retirements.occurred_at", db.path));
      latest = std::max(latest, retirements.getColumn(2).getInt64());
      more_retirements = retirements.executeStep();
    }
    each(CurveId{id}, h, latest);
  }
}

std::string describe(const NetSteps& steps) {
  if (steps.empty()) return "none";
  std::string out;
  for (const auto& [key, delta] : steps) {
    const auto& [instrument, at, state] = key;
    if (!out.empty()) out += ", ";
    out += (delta > 0 ? "+" : "") + std::to_string(delta) + " " + std::string(to_string(state)) +
           " from " + format_utc(at) + " (instrument " + std::to_string(instrument.value) + ")";
  }
  return out;
}

}  // namespace

SettledHistory settled_history(Database& db, CurveId id) {
  SettledHistory h;
  auto& c = db.statement(sql::kSettledCurve);
  bind_int(c, ":curve", id.value);
  if (!c.executeStep()) {
    throw std::logic_error("a settled history was asked of curve " + std::to_string(id.value) +
                           ", which is not stored");
  }
  h.instrument = InstrumentId{c.getColumn(0).getInt64()};
  h.expires_at = stored_instant(c.getColumn(1).getString(), "curves.expires_at", db.path);
  h.verdict = stored_enum(parse_verdict, c.getColumn(2).getString(), "curves.verdict", db.path);
  h.review_required = c.getColumn(3).getInt64() != 0;
  c.reset();
  auto& r = db.statement(sql::kSettledReviewsOf);
  bind_int(r, ":curve", id.value);
  while (r.executeStep()) {
    h.reviews.push_back(
        {stored_instant(r.getColumn(0).getString(), "curve_reviews.occurred_at", db.path),
         stored_enum(parse_review_decision, r.getColumn(1).getString(), "curve_reviews.decision",
                     db.path)});
  }
  r.reset();
  auto& x = db.statement(sql::kSettledRetirementsOf);
  bind_int(x, ":curve", id.value);
  while (x.executeStep()) {
    h.retirements.push_back(
        stored_instant(x.getColumn(0).getString(), "curve_retirements.occurred_at", db.path));
  }
  x.reset();
  return h;
}

void append_tally_steps(Database& db, CurveId id, const std::vector<TallyStep>& steps,
                        std::int64_t seq) {
  for (const auto& step : steps) {
    auto& s = db.statement(sql::kInsertTallyStep);
    bind_int(s, ":instrument", step.instrument.value);
    bind_instant(s, ":at", step.at);
    bind_text(s, ":state", std::string(to_string(step.state)));
    bind_int(s, ":delta", step.delta);
    bind_int(s, ":curve", id.value);
    bind_int(s, ":seq", seq);
    s.exec();
  }
}

void build_settled_tallies(Database& db) {
  each_settled_history(db, [&](CurveId id, const SettledHistory& h, std::int64_t latest) {
    append_tally_steps(db, id, settled_steps(h), latest);
  });
}

void build_settled_tallies_step(Database& db, const Clock& /*clock*/) {
  build_settled_tallies(db);
}

std::optional<std::string> settled_tallies_disagreement(Database& db) {
  SQLite::Statement stored(*db.db, sql::kStoredTallySteps);
  bool more = stored.executeStep();
  std::optional<std::string> found;
  // The stored steps of curve `id` (net, zero sums left out by the query), advancing `stored`.
  const auto stored_of = [&](std::int64_t id) {
    NetSteps out;
    while (more && stored.getColumn(0).getInt64() == id) {
      const StepKey key{
          InstrumentId{stored.getColumn(1).getInt64()},
          stored_instant(stored.getColumn(2).getString(), "settled_tallies.effective_at", db.path),
          stored_enum(parse_curve_state, stored.getColumn(3).getString(), "settled_tallies.state",
                      db.path)};
      out[key] += stored.getColumn(4).getInt64();
      more = stored.executeStep();
    }
    return out;
  };
  each_settled_history(db, [&](CurveId id, const SettledHistory& h, std::int64_t) {
    if (found) return;
    if (more && stored.getColumn(0).getInt64() < id.value) {
      found = "steps are stored for curve " + std::to_string(stored.getColumn(0).getInt64()) +
              ", which the facts do not explain";
      return;
    }
    NetSteps expected;
    for (const auto& s : settled_steps(h)) expected[{s.instrument, s.at, s.state}] += s.delta;
    const NetSteps got = stored_of(id.value);
    if (got != expected) {
      found = "curve " + std::to_string(id.value) + ": stored " + describe(got) +
              "; its facts give " + describe(expected);
    }
  });
  if (!found && more) {
    found = "steps are stored for curve " + std::to_string(stored.getColumn(0).getInt64()) +
            ", which the facts do not explain";
  }
  return found;
}

}  // namespace cw::store::sqlite
