// SPDX-License-Identifier: Apache-2.0
// Use cases of calibration curves: log (fit, judge, store), show, list, review, retire.
#pragma once

#include <optional>
#include <string>
#include <vector>

#include "app/fact_loader.h"
#include "app/session.h"
#include "domain/curve.h"
#include "domain/curve_state.h"

namespace cw::app {

/// A curve with everything a reader needs, and its state at a moment.
struct CurveView {
  Curve curve;
  std::string method_code;
  MethodVersion version;
  std::string instrument_code;
  std::vector<Lot> lots;
  CurveStatus status;
  Instant as_of;
};

CurveView make_view(FactLoader& facts, CurveId id, Instant at);

struct CurveLogRequest {
  std::string method;
  std::string instrument;
  std::vector<std::string> lots;  ///< codes (a comma-separated option may hold several)
  std::string points;
  std::optional<std::string> note;
};

struct CurveLogOutcome {
  CalibrationId calibration_id;
  std::vector<CurveView> curves;
  std::vector<std::string> warnings;
  bool any_rejected = false;
};

/// Validates everything, fits one curve per analyte, judges each against the method
/// version in force at the acquisition time (--at), and stores the calibration with its
/// curves in one transaction. Rejected curves are stored too.
CurveLogOutcome log_calibration(Session& s, const CurveLogRequest& request);

struct CurveListRequest {
  std::optional<std::string> state;
  std::optional<std::string> method;
  std::optional<std::string> instrument;
  std::optional<std::string> analyte;
};
std::vector<CurveView> list_curves(Session& s, const CurveListRequest& request);
CurveView show_curve(Session& s, CurveId id);

/// Second-person review. Refused (recorded, RefusedError) when the reviewer logged the
/// calibration, the curve was rejected by acceptance, or it is not awaiting review.
CurveView review_curve(Session& s, CurveId id, ReviewDecision decision, const std::string& reason);
/// Withdraws a curve from use (refused when already retired or rejected).
CurveView retire_curve(Session& s, CurveId id, const std::string& reason);

/// Throws ValidationError when the session's moment (--at) is before the curve was acquired.
void require_acquired(const Session& s, const Curve& c);

/// Parses a curve id given on the command line ("17").
CurveId parse_curve_id(const std::string& text);

/// Records a refusal in its own transaction and throws RefusedError with `message`.
[[noreturn]] void refuse(Session& s, const std::string& action, const std::string& entity_kind,
                         const std::string& entity_id, const std::vector<std::string>& reasons,
                         const std::string& message, const std::string& hint = {});

}  // namespace cw::app
