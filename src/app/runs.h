// SPDX-License-Identifier: Apache-2.0
// Runs: a day's instrument sequence imported in one command (product.md §5.4), and the listings
// of runs, results and checks. The run file is read and checked in full before the write lock
// is taken; then, in one transaction, it is read again row by row and each row is decided as it
// comes (samples quantified, checks and blanks judged, bracketing applied) and written with its
// audit entry. Nothing holds the whole file or all its results in memory.
#pragma once

#include <functional>
#include <optional>
#include <string>
#include <vector>

#include "app/session.h"
#include "audit/audit_entry.h"
#include "domain/check.h"
#include "domain/curve_state.h"
#include "domain/run.h"
#include "store/audit_trail.h"
#include "store/runs.h"

namespace cw::app {

/// Where a run import stands, for a progress line.
struct RunProgress {
  enum class Phase { Checking, Importing };
  Phase phase = Phase::Checking;
  long rows = 0;   ///< rows done
  long total = 0;  ///< rows in the file (0 while it is first read)
};

struct RunImportRequest {
  std::string file;
  std::string method;
  std::string instrument;
  bool again = false;                    ///< import a file imported before, on purpose
  std::optional<std::string> reason;     ///< why (required with `again`)
  std::optional<ColumnMapping> columns;  ///< --columns; else the instrument's saved mapping
  /// Called every few thousand rows (nothing else may be printed meanwhile).
  std::function<void(const RunProgress&)> progress;
};

/// The curve a run measured an analyte against, and its state when the run began.
struct RunCurve {
  std::string analyte;
  CurveId curve;
  CurveStatus status_at_start;
};

/// A check or blank of the run that failed.
struct RunFailure {
  long position = 0;
  std::string analyte;
  CheckId check;
  std::string description;
};

struct RunImportOutcome {
  Run run;
  std::string method_code;
  int method_version = 0;
  std::string instrument_code;
  std::string unit;
  std::string columns_source;  ///< "--columns", "the saved columns of instrument X" or ""
  std::vector<std::string> ignored_columns;
  std::vector<RunCurve> curves;
  std::vector<RunFailure> failures;
  std::vector<RunAnalyteSummary> summary;
  long status_events = 0;  ///< rerun-required events written
};

/// Imports a run file. Refused (recorded, RefusedError) when the same file was imported before
/// and `again` is not given, or when an analyte of the file has no curve that its checks can be
/// judged against. Bad input anywhere in the file: ValidationError naming file:line:column,
/// nothing written.
RunImportOutcome import_run(Session& s, const RunImportRequest& request);

/// A run with the names a reader needs and its counts per analyte.
struct RunView {
  Run run;
  std::string method_code;
  int method_version = 0;
  std::string instrument_code;
  std::string unit;
  std::vector<RunAnalyteSummary> summary;
};

/// Runs acquired at or before --at, oldest first.
std::vector<RunView> list_runs(Session& s);

/// Receives a run's rows one at a time.
class RunVisitor {
 public:
  virtual ~RunVisitor() = default;
  virtual void begin(const RunView& run) = 0;
  virtual void result(const store::RunResultRow& row) = 0;
  virtual void check(const store::RunCheckRow& row) = 0;
  virtual void end(const RunView& run) = 0;
};

/// Shows a run from one read snapshot: begin, every sample row (position order), every check and
/// blank row (position order), end. NotFoundError for an unknown id.
void show_run(Session& s, RunId id, RunVisitor& visitor);

/// What a printed run report shows besides the rows: the lab, the names behind the codes, the
/// run's own audit entries (its import and any refusal) and the head of the trail.
struct RunReportContext {
  std::string lab_name;
  std::string method_title;
  std::optional<std::string> instrument_name;
  std::vector<audit::AuditEntry> entries;
  std::optional<store::ChainHead> head;
};
/// show_run() and the report's context, from the same snapshot.
RunReportContext show_run_for_report(Session& s, RunId id, RunVisitor& visitor);

// ---- listings
struct ResultListRequest {
  std::optional<std::string> sample;
  std::optional<ResultStatus> status;
  std::optional<Instant> since;
  std::optional<RunId> run;
};
/// Results matching the request, occurred at or before --at, in time order, one at a time with
/// the unit of their method (empty when unknown).
void list_results(Session& s, const ResultListRequest& request,
                  const std::function<void(const Result&, const std::string& unit)>& fn);

/// A result with its status history and the run it came from.
struct ResultDetail {
  Result result;
  std::string unit;
  std::vector<ResultStatusEvent> history;
};
ResultDetail show_result(Session& s, ResultId id);

struct CheckListRequest {
  std::optional<CurveId> curve;
  std::optional<Instant> since;
};
/// Checks and blanks occurred at or before --at, in time order.
std::vector<Check> list_checks(Session& s, const CheckListRequest& request);

}  // namespace cw::app
