// SPDX-License-Identifier: Apache-2.0
// The quantitation decision.
#include "domain/quantitation.h"

#include <algorithm>
#include <cmath>

#include "core/error.h"
#include "core/number.h"
#include "core/text.h"
#include "domain/bracketing.h"
#include "fitting/uncertainty.h"

namespace cw {
namespace {

/// True when the curve's response grows with concentration at its low end.
bool rising(const fitting::FitResult& fit) {
  return fit.slope + 2 * fit.quadratic * fit.range_low >= 0;
}

ResultUncertainty budget(const Curve& curve, const MethodDefinition& method,
                         const std::vector<const Lot*>& lots, const fitting::Prediction& p,
                         double dilution, double concentration) {
  std::vector<fitting::UncertaintyComponent> components;
  components.push_back(fitting::calibration_component(p));
  for (const Lot* lot : lots) {
    const CertifiedValue* v = lot->value_for(curve.analyte);
    if (v == nullptr || !v->uncertainty) continue;
    components.push_back({"lot " + lot->code, fitting::relative_standard_uncertainty(
                                                  v->value, *v->uncertainty, lot->coverage())});
  }
  if (dilution != 1 && method.uncertainty.dilution_pct) {
    components.push_back({"dilution", *method.uncertainty.dilution_pct / 100});
  }
  const fitting::UncertaintyBudget b = fitting::combine_relative_uncertainties(components, 2.0);
  ResultUncertainty u;
  for (const auto& c : b.components) u.components.push_back({c.name, c.relative_u});
  u.k = b.coverage_factor;
  u.combined = b.combined_relative_u * std::fabs(concentration);
  u.expanded = b.expanded_relative_u * std::fabs(concentration);
  return u;
}

}  // namespace

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

double release_limit(const Curve& curve, const MethodDefinition& method) {
  const auto& fit = curve.fit;
  if (method.calibration.report_limit != ReportLimit::LowestCalibrator) {
    if (const auto limits = fitting::reporting_limits(fit, method.calibration.limits)) {
      return method.calibration.report_limit == ReportLimit::Loq ? limits->loq : limits->lod;
    }
  }
  return lowest_calibrator(curve);
}

void record_decision(Result& result, const QuantitationDecision& d) {
  result.status = d.status;
  result.x0 = d.x0;
  result.sd_x0 = d.sd_x0;
  result.concentration = d.concentration;
  result.ci_low = d.ci_low;
  result.ci_high = d.ci_high;
  result.flags = d.flags;
  result.reasons = d.reasons;
  result.censored = d.censored;
  result.reporting_limit = d.reporting_limit;
  result.computed_concentration = d.computed_concentration;
  result.uncertainty = d.uncertainty;
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

std::optional<Finding> bracket_failed(const ChecksSoFar& so_far) {
  if (!so_far.next_check || so_far.next_check->passed) return std::nullopt;
  const Check& k = *so_far.next_check;
  return Finding{Reason::CheckFailed, k.occurred_at,
                 describe_failure(k, std::nullopt) +
                     ", at a later time with no passing check standard between: every result "
                     "of this bracket must be re-run"};
}

QuantitationDecision decide_quantitation(const Curve& curve, const CurveStatus& status,
                                         const MethodDefinition& method,
                                         const std::vector<const Lot*>& lots,
                                         const QuantitationReading& reading,
                                         const ReadingLabels& labels,
                                         const std::optional<ChecksSoFar>& so_far) {
  // Bad input is refused before anything else, whatever the curve's state.
  const double y = method.fitted_response(reading.response, reading.is_response, labels.response,
                                          labels.is_response);
  std::vector<Finding> blocking;
  if (!status.is_usable()) blocking = status.blocking();
  if (so_far) {
    if (auto due = check_due(method.check, curve, *so_far)) blocking.push_back(std::move(*due));
    const bool failed_already = std::any_of(blocking.begin(), blocking.end(), [](const Finding& f) {
      return f.reason == Reason::CheckFailed;
    });
    if (auto failed = bracket_failed(*so_far); failed && !failed_already) {
      blocking.push_back(std::move(*failed));
    }
  }
  if (!blocking.empty()) return refuse_without_curve(std::move(blocking));
  const auto& fit = curve.fit;
  const std::string& unit = method.unit;
  const std::string product = "the concentration (instrument level × " + labels.dilution + ")";
  const double limit = release_limit(curve, method);
  const auto estimate = fitting::back_calculate(fit, y);

  QuantitationDecision d;
  const auto censor = [&](std::optional<double> x) {
    d.status = ResultStatus::Reported;
    d.censored = true;
    d.flags.push_back(ResultFlag::BelowRange);
    d.reporting_limit = require_finite(limit * reading.dilution, product, labels.dilution);
    // The estimate is kept in its own field only; nothing else of a censored result is a
    // number (no instrument-level value, no interval).
    if (x)
      d.computed_concentration = require_finite(*x * reading.dilution, product, labels.dilution);
    return d;
  };
  if (!estimate) {
    // No solution: a response below the curve at its lowest calibrator is a non-detect.
    const double y_low = fitting::predict_response(fit, fit.range_low);
    if (rising(fit) ? y < y_low : y > y_low) return censor(std::nullopt);
    return refuse_without_curve(
        {{Reason::NoSolution, std::nullopt,
          "response " + format_shortest(reading.response) + " cannot be read on curve " +
              std::to_string(curve.id.value)}});
  }
  if (*estimate > fit.range_high) {
    d = refuse_without_curve({});
    d.x0 = *estimate;
    d.suggested_dilution = suggest_dilution(*estimate, fit.range_high);
    std::string message = "response " + format_shortest(reading.response) + " gives about " +
                          format_sig_against(*estimate, {fit.range_high}, 3) + " " + unit +
                          ", above the highest calibrator (" + format_shortest(fit.range_high) +
                          " " + unit + "): dilute and re-run";
    if (d.suggested_dilution) {
      message += " (e.g. a " + format_plain(*d.suggested_dilution) + "-fold dilution)";
    }
    d.reasons.push_back({Reason::AboveRange, std::nullopt, message});
    return d;
  }
  if (*estimate < limit) return censor(estimate);

  fitting::Prediction p{};
  try {
    p = fitting::inverse_predict(fit, y, reading.replicates);
  } catch (const fitting::FitError& e) {
    return refuse_without_curve(
        {{Reason::NoSolution, std::nullopt,
          "response " + format_shortest(reading.response) + " cannot be read on curve " +
              std::to_string(curve.id.value) + ": " + e.what()}});
  }
  d.status = ResultStatus::Reported;
  d.x0 = p.x0;
  d.sd_x0 = p.sd_x0;
  d.concentration = require_finite(p.x0 * reading.dilution, product, labels.dilution);
  d.ci_low = require_finite(p.ci_low * reading.dilution, product, labels.dilution);
  d.ci_high = require_finite(p.ci_high * reading.dilution, product, labels.dilution);
  if (p.x0 < fit.range_low) d.flags.push_back(ResultFlag::BelowRange);
  d.uncertainty = budget(curve, method, lots, p, reading.dilution, *d.concentration);
  return d;
}

}  // namespace cw
