// SPDX-License-Identifier: Apache-2.0
// Judging a check standard or a blank against a curve: measured concentration, recovery, limits
// and pass/fail (calibration-practice.md §5.2). Pure: the caller loads the curve and the method.
#pragma once

#include <optional>
#include <string>

#include "domain/check.h"
#include "domain/curve.h"
#include "domain/method.h"
#include "fitting/fit.h"

namespace cw {

/// One reading of a check standard or blank, as given (not yet on the fitted scale).
struct CheckReading {
  CheckKind kind = CheckKind::Check;
  std::optional<double> nominal;  ///< required for a check; absent or 0 for a blank
  double response = 0;
  std::optional<double> is_response;
};

/// Where each value of a reading came from, for messages ("--nominal", or a run file's column).
struct ReadingLabels {
  std::string nominal = "--nominal";
  std::string response = "--response";
  std::string is_response = "--is-response";
  std::string dilution = "--dilution";
};

/// The judged check (id, curve, analyst and time left for the caller to fill). A check passes
/// when its recovery 100·measured/nominal lies within 100 ± the method's tolerance (limits
/// inclusive); a blank passes when its measured concentration is below the method's blank_limit,
/// or below the curve's LOD (of the method's limit definition) when the method sets none. A
/// response with no solution on the curve fails. Throws ValidationError (naming the label) for a
/// missing or non-positive nominal of a check, a check's nominal outside the curve's working
/// range (from lowest_calibrator() to the highest: it would be read by extrapolation), a non-zero
/// nominal of a blank, a missing or extra
/// internal-standard response, or a recovery that overflows.
Check judge_check(const CheckReading& reading, const Curve& curve, const MethodDefinition& method,
                  const ReadingLabels& labels = {});

}  // namespace cw
