// SPDX-License-Identifier: Apache-2.0
#include "store/postgresql/settled_tallies.h"

#include <stdexcept>

#include "store/postgresql/bind.h"
#include "store/postgresql/sql.h"
#include "store/sqlite/settled_scan.h"

namespace cw::store::postgresql {

using sqlite::append_settled_totals;
using sqlite::each_settled_history;
using sqlite::first_step_disagreement;
using sqlite::first_totals_disagreement;
using sqlite::LatestTotals;
using sqlite::read_settled_history;
using sqlite::SettledHistorySink;

namespace {

void each_history(Database& db, const SettledHistorySink& each) {
  Statement versions(db, sql::kReviewRequiredByVersion, Rows::Streamed);
  Statement curves(db, sql::kAllSettledCurves, Rows::Streamed);
  Statement reviews(db, sql::kAllSettledReviews, Rows::Streamed);
  Statement retirements(db, sql::kAllSettledRetirements, Rows::Streamed);
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

void build_settled_totals(Database& db) {
  db.run_bulk(sql::kBuildSettledTotals);
}

std::optional<std::string> settled_tallies_disagreement(Database& db) {
  {
    Statement stored(db, sql::kStoredTallySteps, Rows::Streamed);
    if (auto found = first_step_disagreement(
            stored, db.path, [&](const SettledHistorySink& sink) { each_history(db, sink); })) {
      return found;
    }
  }
  Statement totals(db, sql::kSettledTotalsDisagreement);
  return first_totals_disagreement(totals);
}

}  // namespace cw::store::postgresql
