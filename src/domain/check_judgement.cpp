// SPDX-License-Identifier: Apache-2.0
// Check and blank judgement.
#include "domain/check_judgement.h"

#include <cmath>

#include "core/error.h"
#include "core/number.h"
#include "core/text.h"

namespace cw {

Check judge_check(const CheckReading& reading, const Curve& curve, const MethodDefinition& method,
                  const ReadingLabels& labels) {
  const fitting::FitResult& fit = curve.fit;
  Check k;
  k.kind = reading.kind;
  k.response = reading.response;
  k.is_response = reading.is_response;
  const double y = method.fitted_response(reading.response, reading.is_response, labels.response,
                                          labels.is_response);
  if (reading.kind == CheckKind::Check) {
    if (!reading.nominal) {
      throw option_error(labels.nominal, "a check needs " + labels.nominal + " CONC",
                         "the check standard's nominal concentration in " + method.unit);
    }
    if (!(*reading.nominal > 0)) {
      throw option_error(
          labels.nominal,
          labels.nominal + " must be above 0, got " + format_shortest(*reading.nominal),
          "the check standard's nominal concentration in " + method.unit);
    }
    // A check verifies the calibrated range: one outside it would be read by extrapolation
    // (calibration-practice.md §4.4, never extrapolate) and verify nothing.
    const double low = lowest_calibrator(curve);
    if (*reading.nominal < low || *reading.nominal > fit.range_high) {
      throw option_error(labels.nominal,
                         labels.nominal + " " + format_shortest(*reading.nominal) + " " +
                             method.unit + " lies outside the curve's working range, " +
                             format_shortest(low) + " to " + format_shortest(fit.range_high) + " " +
                             method.unit,
                         "a check standard verifies the calibrated range: give the nominal of "
                         "one within it (a mid-level standard is usual)");
    }
    k.nominal = *reading.nominal;
    k.limit_low = 100 - method.check.tolerance_pct;
    k.limit_high = 100 + method.check.tolerance_pct;
  } else {
    if (reading.nominal && *reading.nominal != 0) {
      throw option_error(labels.nominal,
                         "a blank has nominal 0; leave out " + labels.nominal + " or give 0");
    }
    k.nominal = 0;
    // The method's blank limit, else the LOD of the method's limit definition.
    if (method.check.blank_limit) {
      k.limit_high = *method.check.blank_limit;
    } else if (const auto limits = fitting::reporting_limits(fit, method.calibration.limits)) {
      k.limit_high = limits->lod;
    } else {
      k.limit_high = fit.lod;
    }
  }
  k.measured = fitting::back_calculate(fit, y);
  if (k.measured) {
    require_finite(*k.measured, "the concentration read from " + labels.response, labels.response);
  }
  if (reading.kind == CheckKind::Check) {
    if (k.measured) {
      k.recovery_pct = require_finite(
          100 * *k.measured / k.nominal,
          "the recovery from " + labels.response + " and " + labels.nominal, labels.nominal);
    }
    k.passed =
        k.recovery_pct && *k.recovery_pct >= *k.limit_low && *k.recovery_pct <= *k.limit_high;
  } else {
    k.passed = k.measured && *k.measured < *k.limit_high;
  }
  return k;
}

}  // namespace cw
