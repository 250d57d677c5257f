// SPDX-License-Identifier: Apache-2.0
// SQL for runs, run membership, status events and the listings of results and checks. The rows
// of a run and of a listing are handed out one at a time from the open statement: memory does
// not grow with them.
#include "store/postgresql/run_repository.h"

#include <map>
#include <stdexcept>

#include "store/postgresql/bind.h"
#include "store/postgresql/curve_repository.h"
#include "store/postgresql/sql.h"

namespace cw::store::postgresql {

WriteState& PgRuns::writing() {
  if (w_ == nullptr) throw std::logic_error("a fact was appended through a read unit");
  return *w_;
}

Run PgRuns::run_of(Statement& s) {
  Run r;
  r.id = RunId{s.getColumn(0).getInt64()};
  r.method_id = MethodId{s.getColumn(1).getInt64()};
  r.method_version_id = MethodVersionId{s.getColumn(2).getInt64()};
  r.instrument_id = InstrumentId{s.getColumn(3).getInt64()};
  r.acquired_at = stored_instant(s.getColumn(4).getString(), "runs.acquired_at", db_.path);
  r.analyst = s.getColumn(5).getString();
  r.file_name = s.getColumn(6).getString();
  r.file_sha256 = s.getColumn(7).getString();
  r.rows = static_cast<long>(s.getColumn(8).getInt64());
  r.columns = column_mapping_from_json(
      parse_stored_json(s.getColumn(9).getString(), "runs.columns", db_.path), "runs.columns",
      db_.path);
  r.again_reason = opt_text(s.getColumn(10));
  return r;
}

std::vector<Run> PgRuns::runs_of(Statement& s) {
  std::vector<Run> out;
  while (s.executeStep()) out.push_back(run_of(s));
  s.reset();
  return out;
}

std::optional<Run> PgRuns::run(RunId id) {
  return guarded(db_, [&]() -> std::optional<Run> {
    auto& s = db_.statement(sql::kRunById);
    bind_int(s, ":id", id.value);
    auto list = runs_of(s);
    if (list.empty()) return std::nullopt;
    return list.front();
  });
}

std::vector<Run> PgRuns::runs(Instant until) {
  return guarded(db_, [&] {
    auto& s = db_.statement(sql::kRunsUntil);
    bind_instant(s, ":until", until);
    return runs_of(s);
  });
}

std::vector<Run> PgRuns::runs_with_sha256(const std::string& sha256) {
  return guarded(db_, [&] {
    auto& s = db_.statement(sql::kRunsWithSha256);
    bind_text(s, ":sha", sha256);
    return runs_of(s);
  });
}

void PgRuns::each_run_result(RunId id, const std::function<void(const RunResultRow&)>& fn) {
  guarded(db_, [&] {
    // Its own statement, not the cache: the caller may read other facts while it iterates.
    Statement s(db_, sql::kResultsOfRun, Rows::Streamed);
    bind_int(s, ":run", id.value);
    while (s.executeStep()) {
      RunResultRow row;
      row.result = read_result(s, db_.path);
      row.position = row.result.run_position.value_or(0);
      fn(row);
    }
  });
}

void PgRuns::each_run_check(RunId id, const std::function<void(const RunCheckRow&)>& fn) {
  guarded(db_, [&] {
    Statement s(db_, sql::kChecksOfRun, Rows::Streamed);
    bind_int(s, ":run", id.value);
    while (s.executeStep()) {
      RunCheckRow row;
      row.position = static_cast<long>(s.getColumn(0).getInt64());
      row.label = opt_text(s.getColumn(1));
      row.analyte = s.getColumn(2).getString();
      row.check = read_check(s, 3, false, db_.path);
      row.check.run_id = id;
      fn(row);
    }
  });
}

std::vector<RunAnalyteSummary> PgRuns::run_summary(RunId id) {
  return guarded(db_, [&] {
    std::map<std::string, RunAnalyteSummary> by_analyte;
    {
      auto& s = db_.statement(sql::kRunResultCounts);
      bind_int(s, ":run", id.value);
      while (s.executeStep()) {
        RunAnalyteSummary& a = by_analyte[s.getColumn(0).getString()];
        a.samples = static_cast<long>(s.getColumn(1).getInt64());
        a.reported = static_cast<long>(s.getColumn(2).getInt64());
        a.below_range = static_cast<long>(s.getColumn(3).getInt64());
        a.refused = static_cast<long>(s.getColumn(4).getInt64());
        a.rerun_required = static_cast<long>(s.getColumn(5).getInt64());
      }
      s.reset();
    }
    auto& s = db_.statement(sql::kRunCheckCounts);
    bind_int(s, ":run", id.value);
    while (s.executeStep()) {
      RunAnalyteSummary& a = by_analyte[s.getColumn(0).getString()];
      const CheckKind kind =
          stored_enum(parse_check_kind, s.getColumn(1).getString(), "checks.kind", db_.path);
      const bool passed = s.getColumn(2).getInt64() != 0;
      const long n = static_cast<long>(s.getColumn(3).getInt64());
      if (kind == CheckKind::Check) {
        (passed ? a.checks_passed : a.checks_failed) += n;
      } else {
        (passed ? a.blanks_passed : a.blanks_failed) += n;
      }
    }
    s.reset();
    std::vector<RunAnalyteSummary> out;
    for (auto& [analyte, summary] : by_analyte) {
      summary.analyte = analyte;
      out.push_back(summary);
    }
    return out;
  });
}

void PgRuns::each_result(const ResultFilter& f, const std::function<void(const Result&)>& fn) {
  guarded(db_, [&] {
    Statement s(db_, sql::kResultsFiltered, Rows::Streamed);
    bind_opt_text(s, ":sample", f.sample);
    if (f.since) {
      bind_instant(s, ":since", *f.since);
    } else {
      s.bind(":since");
    }
    bind_instant(s, ":until", f.until);
    bind_opt_int(s, ":run", opt_id(f.run));
    if (f.status) {
      bind_text(s, ":status", std::string(to_string(*f.status)));
    } else {
      s.bind(":status");
    }
    while (s.executeStep()) fn(read_result(s, db_.path));
  });
}

std::vector<Check> PgRuns::checks(const CheckFilter& f) {
  return guarded(db_, [&] {
    auto& s = db_.statement(sql::kChecksFiltered);
    bind_opt_int(s, ":curve", opt_id(f.curve));
    if (f.since) {
      bind_instant(s, ":since", *f.since);
    } else {
      s.bind(":since");
    }
    bind_instant(s, ":until", f.until);
    std::vector<Check> out;
    while (s.executeStep()) out.push_back(read_check(s, 0, true, db_.path));
    s.reset();
    return out;
  });
}

std::vector<ResultStatusEvent> PgRuns::status_events_of(ResultId id) {
  return guarded(db_, [&] {
    auto& s = db_.statement(sql::kStatusEventsOf);
    bind_int(s, ":id", id.value);
    std::vector<ResultStatusEvent> out;
    while (s.executeStep()) out.push_back(read_status_event(s, 0, db_.path));
    s.reset();
    return out;
  });
}

RunId PgRuns::add_run(const Run& r) {
  WriteState& w = writing();
  return guarded(db_, [&] {
    auto& s = db_.statement(returning_canonical(sql::kInsertRun, FactTable::Runs));
    bind_int(s, ":mv", r.method_version_id.value);
    bind_int(s, ":instrument", r.instrument_id.value);
    bind_instant(s, ":at", r.acquired_at);
    bind_text(s, ":analyst", r.analyst);
    bind_text(s, ":file", r.file_name);
    bind_text(s, ":sha", r.file_sha256);
    bind_int(s, ":rows", r.rows);
    bind_text(s, ":columns", column_mapping_to_json(r.columns).dump());
    bind_opt_text(s, ":again", r.again_reason);
    bind_int(s, ":seq", w.seq);
    const RunId id{w.insert_row(s, FactTable::Runs, db_.path)};
    return id;
  });
}

void PgRuns::add_run_result(RunId run, long position, ResultId result) {
  WriteState& w = writing();
  guarded(db_, [&] {
    auto& s = db_.statement(returning_canonical(sql::kInsertRunResult, FactTable::RunResults));
    bind_int(s, ":run", run.value);
    bind_int(s, ":position", position);
    bind_int(s, ":result", result.value);
    bind_int(s, ":seq", w.seq);
    w.insert_row(s, FactTable::RunResults, db_.path);
  });
}

void PgRuns::add_run_check(RunId run, long position, CheckId check,
                           const std::optional<std::string>& label) {
  WriteState& w = writing();
  guarded(db_, [&] {
    auto& s = db_.statement(returning_canonical(sql::kInsertRunCheck, FactTable::RunChecks));
    bind_int(s, ":run", run.value);
    bind_int(s, ":position", position);
    bind_int(s, ":check", check.value);
    bind_opt_text(s, ":label", label);
    bind_int(s, ":seq", w.seq);
    w.insert_row(s, FactTable::RunChecks, db_.path);
  });
}

StatusEventId PgRuns::add_status_event(const ResultStatusEvent& e) {
  WriteState& w = writing();
  if (e.status != ResultStatus::RerunRequired) {
    throw std::logic_error("a status event can only make a result rerun-required");
  }
  return guarded(db_, [&] {
    auto& s =
        db_.statement(returning_canonical(sql::kInsertStatusEvent, FactTable::ResultStatusEvents));
    bind_int(s, ":result", e.result_id.value);
    bind_text(s, ":status", std::string(to_string(e.status)));
    bind_text(s, ":reason", std::string(to_string(e.reason)));
    bind_text(s, ":detail", e.detail);
    bind_opt_int(s, ":check", opt_id(e.check_id));
    bind_opt_int(s, ":run", opt_id(e.run_id));
    bind_instant(s, ":at", e.occurred_at);
    bind_int(s, ":seq", w.seq);
    const StatusEventId id{w.insert_row(s, FactTable::ResultStatusEvents, db_.path)};
    return id;
  });
}

}  // namespace cw::store::postgresql
