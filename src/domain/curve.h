// SPDX-License-Identifier: Apache-2.0
// A calibration (one acquisition) and its curves (one per analyte), with points, reviews and
// retirements. Facts only: the state of a curve at a moment is derived by rules/.
#pragma once

#include <optional>
#include <string>
#include <vector>

#include "core/time.h"
#include "domain/ids.h"
#include "fitting/acceptance.h"
#include "fitting/fit.h"

namespace cw {

struct CalibrationPoint {
  long source_line = 0;  ///< line in the points file
  std::string level;
  int replicate = 1;
  double nominal = 0;
  double response = 0;
  std::optional<double> is_response;  ///< internal-standard response
  double y = 0;                       ///< the fitted response (ratio with an internal standard)
  std::optional<double> back_calculated;
  std::optional<double> error_pct;
  bool within_limits = false;
  bool excluded = false;
  std::optional<std::string> exclude_reason;
};

enum class Verdict { Accepted, Rejected };
std::string_view to_string(Verdict v);  // "accepted" | "rejected"
std::optional<Verdict> parse_verdict(std::string_view text);

enum class ReviewDecision { Approve, Reject };
std::string_view to_string(ReviewDecision d);  // "approve" | "reject"
std::optional<ReviewDecision> parse_review_decision(std::string_view text);

struct CurveReview {
  ReviewDecision decision = ReviewDecision::Approve;
  std::string reviewer;
  std::string reason;
  Instant occurred_at;
};

struct CurveRetirement {
  std::string retired_by;
  std::string reason;
  Instant occurred_at;
};

struct Calibration {
  CalibrationId id;
  MethodVersionId method_version_id;
  InstrumentId instrument_id;
  Instant acquired_at;
  std::string analyst;
  std::optional<std::string> note;
  std::string points_file;
  std::string points_sha256;
  std::vector<LotId> lots;
};

/// A curve's group: the curves of one method on one instrument for one analyte, of which at
/// most one is active at a time (product.md §5.2, `superseded`).
struct CurveGroup {
  MethodId method;
  InstrumentId instrument;
  std::string analyte;

  auto operator<=>(const CurveGroup&) const = default;
};

struct Curve {
  CurveId id;
  CalibrationId calibration_id;
  MethodId method_id;
  MethodVersionId method_version_id;
  InstrumentId instrument_id;
  Instant acquired_at;
  std::string analyst;
  std::string analyte;
  fitting::FitResult fit;  ///< points are in `points`, not in fit.points
  fitting::Acceptance acceptance;
  Verdict verdict = Verdict::Rejected;
  std::vector<fitting::Criterion> failed_criteria;  ///< each failing criterion once, in order
  Instant expires_at;
  std::vector<CalibrationPoint> points;
  /// lowest_calibrator() as the store reads it with the statistics (a curve read without its
  /// points); nullopt when not read.
  std::optional<double> lowest_level;
  std::vector<CurveReview> reviews;          ///< in time order
  std::vector<CurveRetirement> retirements;  ///< in time order
};

/// The lowest calibrator that is not a blank, among the levels fitted (not excluded): a zero
/// level bounds nothing from below (calibration-practice.md §4.4, LLOQ); the fit's range_low
/// when every level is excluded or zero. From `lowest_level` when the points were not read; a
/// logic_error when neither was (a curve read with its state only).
double lowest_calibrator(const Curve& curve);

}  // namespace cw
