// SPDX-License-Identifier: Apache-2.0
// Use cases of calibration curves: log (fit, judge, store), show, review, retire (the listing is
// curve_listing.h). Each write decides inside its one transaction; the points file is read and
// fitted before it.
#pragma once

#include <optional>
#include <string>
#include <vector>

#include "app/curve_view.h"
#include "app/session.h"
#include "domain/curve.h"
#include "domain/curve_state.h"
#include "domain/curve_transitions.h"
#include "domain/run.h"

namespace cw::app {

struct CurveLogRequest {
  std::string method;
  std::string instrument;
  std::vector<std::string> lots;  ///< lot codes, already checked, no duplicates
  std::string points;             ///< the points file's path
  std::optional<std::string> note;
  std::optional<ColumnMapping> columns;  ///< --columns; else the instrument's saved mapping
};

struct CurveLogOutcome {
  CalibrationId calibration_id;
  std::vector<CurveView> curves;
  std::vector<std::string> warnings;
  bool any_rejected = false;
};

/// A points file fitted and judged for one method version, not yet stored.
struct FittedPoints {
  std::string file_name;
  std::string sha256;         ///< of the file's text
  std::vector<Curve> curves;  ///< one per analyte, in the method's order
};

/// Parses `text` (the points file `file`) against `version` and fits and judges one curve per
/// analyte exactly as `curve log` does before storing them (for tools that build stores in
/// bulk). Throws ValidationError naming the file.
FittedPoints fit_points_text(const std::string& file, const std::string& text,
                             const MethodVersion& version);

/// Reads and fits the points file outside the write lock, then in one transaction checks the
/// method version in force at the acquisition time (--at), the instrument and the lots again,
/// and stores the calibration with one curve per analyte (rejected curves too).
CurveLogOutcome log_calibration(Session& s, const CurveLogRequest& request);

CurveView show_curve(Session& s, CurveId id);

/// Second-person review (approve or reject) or retirement, decided by the transition table on
/// the curve's state in the same transaction that records it; a refusal is recorded and thrown
/// as RefusedError.
CurveView change_curve(Session& s, CurveId id, CurveAction action, const std::string& reason);

/// Throws ValidationError when `at` is before the curve was acquired.
void require_acquired(Instant at, const Curve& c, const LabZone& zone);

}  // namespace cw::app
