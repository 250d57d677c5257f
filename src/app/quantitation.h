// SPDX-License-Identifier: Apache-2.0
// Check standards and blanks against a curve, and quantitation of samples (product.md §5.3).
#pragma once

#include <optional>
#include <string>
#include <vector>

#include "app/curves.h"
#include "domain/check.h"

namespace cw::app {

struct CheckRequest {
  std::string curve;
  std::optional<double> nominal;
  double response = 0;
  std::optional<double> is_response;
  CheckKind kind = CheckKind::Check;
};

struct CheckOutcome {
  Check check;
  CurveView curve;                       ///< the curve with its state after the check
  std::vector<Result> affected_results;  ///< results since the last passing check, to re-run
  std::string unit;
};

/// Records a check or blank; a failure makes the curve stale (check-failed) and lists the
/// results quantified from it since its last passing check.
CheckOutcome log_check(Session& s, const CheckRequest& request);

struct QuantifyRequest {
  std::optional<std::string> curve;
  std::optional<std::string> method;
  std::optional<std::string> instrument;
  std::optional<std::string> analyte;
  std::vector<double> responses;  ///< one, or the m readings (their mean is used)
  std::optional<double> is_response;
  double dilution = 1;
  std::optional<int> replicates;  ///< m when `responses` holds their mean
  std::string sample;
};

struct QuantifyOutcome {
  Result result;
  std::optional<CurveView> curve;
  std::string unit;
  std::optional<std::string> report_as;  ///< e.g. "< 0.5 mg/L" below the working range
  std::optional<double> suggested_dilution;
  std::vector<Lot> lots;
  std::optional<int> method_version;
};

/// Quantifies one sample; refusals are recorded as results with status refused.
QuantifyOutcome quantify(Session& s, const QuantifyRequest& request);

}  // namespace cw::app
