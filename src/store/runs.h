// SPDX-License-Identifier: Apache-2.0
// Runs (imported instrument sequences), their membership (which result or check came from which
// position of which run), and the status events of results: reading, streaming the rows of a
// run or a listing one at a time (so that memory does not grow with them), and appending.
#pragma once

#include <cstdint>
#include <functional>
#include <optional>
#include <string>
#include <vector>

#include "domain/check.h"
#include "domain/run.h"

namespace cw::store {

/// A sample row of a run with the result it produced (current status included).
struct RunResultRow {
  long position = 0;
  Result result;
};

/// A check or blank row of a run with its judged check.
struct RunCheckRow {
  long position = 0;
  std::optional<std::string> label;  ///< the row's sample column, when it named the check
  Check check;
  std::string analyte;  ///< the analyte of the check's curve
};

struct ResultFilter {
  std::optional<std::string> sample;
  std::optional<ResultStatus> status;  ///< the current status
  std::optional<Instant> since;        ///< occurred at or after
  std::optional<RunId> run;
  Instant until;  ///< occurred at or before
};

struct CheckFilter {
  std::optional<CurveId> curve;
  std::optional<Instant> since;  ///< occurred at or after
  Instant until;                 ///< occurred at or before
};

class RunReader {
 public:
  virtual ~RunReader() = default;
  virtual std::optional<Run> run(RunId id) = 0;
  /// Runs acquired at or before `until`, oldest first.
  virtual std::vector<Run> runs(Instant until) = 0;
  /// Runs imported from a file with this SHA-256, oldest first.
  virtual std::vector<Run> runs_with_sha256(const std::string& sha256) = 0;
  /// The sample rows of a run in position order, one at a time.
  virtual void each_run_result(RunId id, const std::function<void(const RunResultRow&)>& fn) = 0;
  /// The check and blank rows of a run in position order, one at a time.
  virtual void each_run_check(RunId id, const std::function<void(const RunCheckRow&)>& fn) = 0;
  /// Counts per analyte of a run, by the current status of its results.
  virtual std::vector<RunAnalyteSummary> run_summary(RunId id) = 0;

  /// Results matching `f` in time order, one at a time.
  virtual void each_result(const ResultFilter& f, const std::function<void(const Result&)>& fn) = 0;
  /// Checks matching `f` in time order.
  virtual std::vector<Check> checks(const CheckFilter& f) = 0;
  /// Every status event of a result, oldest first.
  virtual std::vector<ResultStatusEvent> status_events_of(ResultId id) = 0;
};

/// Appends run facts; every row joins the unit's current audit entry.
class RunWriter {
 public:
  virtual ~RunWriter() = default;
  virtual RunId add_run(const Run& r) = 0;
  virtual void add_run_result(RunId run, long position, ResultId result) = 0;
  virtual void add_run_check(RunId run, long position, CheckId check,
                             const std::optional<std::string>& label) = 0;
  virtual StatusEventId add_status_event(const ResultStatusEvent& e) = 0;
};

}  // namespace cw::store
