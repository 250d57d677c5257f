// SPDX-License-Identifier: Apache-2.0
// The quantitation decision.
#include "domain/quantitation.h"

#include "core/error.h"
#include "core/number.h"
#include "core/text.h"

namespace cw {

std::optional<double> suggest_dilution(double x0, double range_high) {
  for (double df : {2.0, 5.0, 10.0, 20.0, 50.0, 100.0, 200.0, 500.0, 1000.0, 10000.0}) {
    if (x0 / df <= 0.8 * range_high) return df;
  }
  return std::nullopt;
}

QuantitationDecision refuse_without_curve(std::vector<Finding> reasons) {
  QuantitationDecision d;
  d.status = ResultStatus::Refused;
  d.reasons = std::move(reasons);
  return d;
}

std::optional<Finding> check_due(const CheckRules& rules, const Curve& curve,
                                 const ChecksSoFar& so_far) {
  if (!rules.samples_per_check || so_far.reported_since_check < *rules.samples_per_check) {
    return std::nullopt;
  }
  const std::string since = so_far.last_passing_check
                                ? "check " + std::to_string(so_far.last_passing_check->value)
                                : "it was acquired (no check standard has passed on it)";
  return Finding{Reason::CheckDue, std::nullopt,
                 "the method allows " + std::to_string(*rules.samples_per_check) +
                     " sample(s) after a passing check; " +
                     std::to_string(so_far.reported_since_check) +
                     " have been reported from curve " + std::to_string(curve.id.value) +
                     " since " + since + ": measure a check standard first"};
}

QuantitationDecision decide_quantitation(const Curve& curve, const CurveStatus& status,
                                         const MethodDefinition& method,
                                         const QuantitationReading& reading,
                                         const ReadingLabels& labels,
                                         const std::optional<ChecksSoFar>& so_far) {
  // Bad input is refused before anything else, whatever the curve's state.
  const double y = method.fitted_response(reading.response, reading.is_response, labels.response,
                                          labels.is_response);
  QuantitationDecision d;
  std::vector<Finding> blocking;
  if (!status.is_usable()) blocking = status.blocking();
  if (so_far) {
    if (auto due = check_due(method.check, curve, *so_far)) blocking.push_back(std::move(*due));
  }
  if (!blocking.empty()) return refuse_without_curve(std::move(blocking));
  const std::string& unit = method.unit;
  fitting::Prediction p{};
  try {
    p = fitting::inverse_predict(curve.fit, y, reading.replicates);
  } catch (const fitting::FitError& e) {
    return refuse_without_curve(
        {{Reason::NoSolution, std::nullopt,
          "response " + format_shortest(reading.response) + " cannot be read on curve " +
              std::to_string(curve.id.value) + ": " + e.what()}});
  }
  if (p.x0 > curve.fit.range_high) {
    d = refuse_without_curve({});
    d.x0 = p.x0;
    d.sd_x0 = p.sd_x0;
    d.suggested_dilution = suggest_dilution(p.x0, curve.fit.range_high);
    std::string message = "response " + format_shortest(reading.response) + " gives about " +
                          format_sig(p.x0, 3) + " " + unit + ", above the highest calibrator (" +
                          format_shortest(curve.fit.range_high) + " " + unit +
                          "): dilute and re-run";
    if (d.suggested_dilution) {
      message += " (e.g. a " + format_plain(*d.suggested_dilution) + "-fold dilution)";
    }
    d.reasons.push_back({Reason::AboveRange, std::nullopt, message});
    return d;
  }
  const std::string product = "the concentration (instrument level × " + labels.dilution + ")";
  d.status = ResultStatus::Reported;
  d.x0 = p.x0;
  d.sd_x0 = p.sd_x0;
  d.concentration = require_finite(p.x0 * reading.dilution, product, labels.dilution);
  d.ci_low = require_finite(p.ci_low * reading.dilution, product, labels.dilution);
  d.ci_high = require_finite(p.ci_high * reading.dilution, product, labels.dilution);
  if (p.x0 < curve.fit.range_low) {
    d.flags.push_back(ResultFlag::BelowRange);
    d.reporting_limit =
        require_finite(curve.fit.range_low * reading.dilution, product, labels.dilution);
  }
  return d;
}

}  // namespace cw
