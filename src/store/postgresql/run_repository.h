// SPDX-License-Identifier: Apache-2.0
// Internal to the PostgreSQL backend: runs, their membership, status events and the listings of
// results and checks.
#pragma once

#include "store/postgresql/audit_repository.h"
#include "store/postgresql/database.h"
#include "store/runs.h"

namespace cw::store::postgresql {

class PgRuns final : public RunReader, public RunWriter {
 public:
  /// `w` is the write state of a write unit, nullptr in a read unit.
  PgRuns(Database& db, WriteState* w) : db_(db), w_(w) {}

  std::optional<Run> run(RunId id) override;
  std::vector<Run> runs(Instant until) override;
  std::vector<Run> runs_with_sha256(const std::string& sha256) override;
  void each_run_result(RunId id, const std::function<void(const RunResultRow&)>& fn) override;
  void each_run_check(RunId id, const std::function<void(const RunCheckRow&)>& fn) override;
  std::vector<RunAnalyteSummary> run_summary(RunId id) override;
  void each_result(const ResultFilter& f, const std::function<void(const Result&)>& fn) override;
  std::vector<Check> checks(const CheckFilter& f) override;
  std::vector<ResultStatusEvent> status_events_of(ResultId id) override;

  RunId add_run(const Run& r) override;
  void add_run_result(RunId run, long position, ResultId result) override;
  void add_run_check(RunId run, long position, CheckId check,
                     const std::optional<std::string>& label) override;
  StatusEventId add_status_event(const ResultStatusEvent& e) override;

 private:
  WriteState& writing();
  Run run_of(Statement& s);
  std::vector<Run> runs_of(Statement& s);

  Database& db_;
  WriteState* w_;
};

}  // namespace cw::store::postgresql
