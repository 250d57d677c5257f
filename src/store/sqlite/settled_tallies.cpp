// SPDX-License-Identifier: Apache-2.0
#include "store/sqlite/settled_tallies.h"

#include <stdexcept>

#include "store/sqlite/bind.h"
#include "store/sqlite/settled_scan.h"
#include "store/sqlite/sql.h"

namespace cw::store::sqlite {
namespace {

void each_history(Database& db, const SettledHistorySink& each) {
  SQLite::Statement versions(*db.db, sql::kReviewRequiredByVersion);
  SQLite::Statement curves(*db.db, sql::kAllSettledCurves);
  SQLite::Statement reviews(*db.db, sql::kAllSettledReviews);
  SQLite::Statement retirements(*db.db, sql::kAllSettledRetirements);
  each_settled_history(versions, curves, reviews, retirements, db.path, each);
}

void insert_steps(Database& db, CurveId id, const std::vector<TallyStep>& steps, std::int64_t seq) {
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

}  // namespace

SettledHistory settled_history(Database& db, CurveId id) {
  auto& curve = db.statement(sql::kSettledCurve);
  auto& reviews = db.statement(sql::kSettledReviewsOf);
  auto& retirements = db.statement(sql::kSettledRetirementsOf);
  for (auto* s : {&curve, &reviews, &retirements}) bind_int(*s, ":curve", id.value);
  SettledHistory h;
  const bool found = read_settled_history(curve, reviews, retirements, db.path, h);
  for (auto* s : {&curve, &reviews, &retirements}) s->reset();
  if (!found) {
    throw std::logic_error("a settled history was asked of curve " + std::to_string(id.value) +
                           ", which is not stored");
  }
  return h;
}

void append_tally_steps(Database& db, CurveId id, const std::vector<TallyStep>& steps,
                        std::int64_t seq, LatestTotals& known) {
  insert_steps(db, id, steps, seq);
  append_settled_totals(db.statement(sql::kLatestSettledTotal),
                        db.statement(sql::kInsertSettledTotal), steps, seq, known);
}

void build_settled_tallies(Database& db) {
  each_history(db, [&](CurveId id, const SettledHistory& h, std::int64_t latest) {
    insert_steps(db, id, settled_steps(h), latest);
  });
}

void build_settled_tallies_step(Database& db, const Clock& /*clock*/) {
  build_settled_tallies(db);
}

void build_settled_totals(Database& db) {
  db.db->exec(sql::kBuildSettledTotals);
}

std::optional<std::string> settled_tallies_disagreement(Database& db) {
  SQLite::Statement stored(*db.db, sql::kStoredTallySteps);
  if (auto found = first_step_disagreement(
          stored, db.path, [&](const SettledHistorySink& sink) { each_history(db, sink); })) {
    return found;
  }
  SQLite::Statement totals(*db.db, sql::kSettledTotalsDisagreement);
  return first_totals_disagreement(totals);
}

}  // namespace cw::store::sqlite
