// SPDX-License-Identifier: Apache-2.0
// Read-only questions: what expires soon, the status board, and provenance traces. Each reads
// one consistent snapshot.
#pragma once

#include <map>
#include <optional>
#include <string>
#include <vector>

#include "app/curve_view.h"
#include "app/session.h"
#include "domain/check.h"
#include "domain/run.h"

namespace cw::app {

// ---- expiring
struct ExpiringRequest {
  bool this_week = false;
  std::optional<Duration> within;  ///< default 7 days
  /// How many groups are decided together: bounds memory whatever the window holds (the answer
  /// does not depend on it; tests vary it).
  std::size_t chunk = 256;
};
/// An active curve whose validity ends in a window, as `expiring` and the status board list it
/// (read without its fit statistics, which neither shows).
struct ExpiringCurve {
  CurveId id;
  std::string analyte;
  std::string method_code;
  int method_version = 0;
  std::string instrument_code;
  Instant expires_at;
  std::string limited_by;  ///< "valid for 7 days" or "lot CODE expiry"
};
struct ExpiringOutcome {
  Instant from, to;
  std::vector<ExpiringCurve> curves;  ///< active at `from`-or-now, soonest first
};
ExpiringOutcome expiring(Session& s, const ExpiringRequest& request);

// ---- status board
struct InstrumentStatus {
  Instrument instrument;
  std::map<CurveState, long> counts;
  std::vector<ExpiringCurve> expiring_soon;                  ///< next 7 days
  std::vector<std::pair<std::string, std::string>> blocked;  ///< (method, analyte) w/o active curve
  std::vector<Check> recent_failures;
};
std::vector<InstrumentStatus> status_board(Session& s);

// ---- traces
struct ResultTrace {
  Result result;
  std::optional<CurveView> curve;  ///< state as of the result's time
  std::optional<Calibration> calibration;
  std::optional<MethodVersion> method_version;
  std::string method_code;
  std::optional<Instrument> instrument;
  std::vector<Lot> lots;
  /// The checks that bracket the result: for a run's result, the nearest check standards of
  /// its curve before and after its position in the run (before: the last one before the run
  /// when the run had none); otherwise the last check of the curve at or before the result and
  /// the first after it.
  std::optional<Check> check_before;
  std::optional<Check> check_after;
  std::optional<long> check_before_position;  ///< in the run, when it came from the run
  std::optional<long> check_after_position;
  std::optional<Run> run;                  ///< the run the result came from
  std::vector<ResultStatusEvent> history;  ///< status events, oldest first
};
ResultTrace trace_result(Session& s, ResultId id);

struct CurveTrace {
  CurveView curve;
  std::vector<Check> checks;
  std::vector<Result> results;
};
CurveTrace trace_curve(Session& s, CurveId id);

struct LotTrace {
  Lot lot;
  std::vector<CurveView> curves;
  std::vector<Result> results;
};
LotTrace trace_lot(Session& s, const std::string& code);

}  // namespace cw::app
