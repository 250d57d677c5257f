// SPDX-License-Identifier: Apache-2.0
// Filling the curve report.
#include "report/curve_report_view.h"

#include <algorithm>
#include <cmath>
#include <map>
#include <set>

#include "core/text.h"
#include "domain/quantitation.h"
#include "domain/user.h"
#include "report/curve_plot_view.h"
#include "report/curve_views.h"
#include "report/numbers.h"

namespace cw::report {

namespace {

using fitting::Criterion;

bool failed(const Curve& c, Criterion k) {
  return std::any_of(c.acceptance.failures.begin(), c.acceptance.failures.end(),
                     [k](const fitting::CriterionFinding& f) { return f.criterion == k; });
}

std::string with_unit(double v, const std::string& unit) {
  return std::isfinite(v) ? format_sig(v, 3) + " " + unit : std::string("n/a");
}

/// The smallest nominal among fitted points: the level whose %RE limit may differ.
std::optional<double> lowest_nominal(const Curve& c) {
  std::optional<double> lowest;
  for (const auto& p : c.points) {
    if (!p.excluded && (!lowest || p.nominal < *lowest)) lowest = p.nominal;
  }
  return lowest;
}

std::optional<double> limit_of(const CalibrationRules& rules, const CalibrationPoint& p,
                               std::optional<double> lowest) {
  if (lowest && p.nominal == *lowest && rules.max_error_pct_lowest) {
    return rules.max_error_pct_lowest;
  }
  return rules.max_error_pct;
}

std::string signed_pct(double v, std::optional<double> limit) {
  std::string s = limit ? format_fixed_against(v, {*limit, -*limit}, 1) : format_fixed(v, 1);
  return v >= 0 ? "+" + s : s;
}

plot::ReportFit fit_of(const app::CurveView& v) {
  const Curve& c = v.curve;
  const auto& f = c.fit;
  const auto& def = v.version.definition;
  const auto& rules = def.calibration;
  plot::ReportFit out;
  out.model = std::string(fitting::to_string(f.model));
  out.weighting = std::string(fitting::to_string(f.weighting));
  if (f.weighting != fitting::Weighting::None) out.weighting += " (weights scaled to sum n)";
  out.equation = equation_text(f);
  if (f.model == fitting::Model::Linear || f.model == fitting::Model::Quadratic) {
    out.parameters.push_back(
        {"intercept", format_sig(f.intercept, 6), format_sig(f.se_intercept, 3)});
  }
  out.parameters.push_back({f.model == fitting::Model::MeanResponseFactor ? "mean RF" : "slope",
                            format_sig(f.slope, 6), format_sig(f.se_slope, 3)});
  if (f.model == fitting::Model::Quadratic) {
    out.parameters.push_back(
        {"quadratic", format_sig(f.quadratic, 6), format_sig(f.se_quadratic, 3)});
  }
  out.r2 = r2_text(f, rules.min_r2) + " (" + f.r2_definition + ")";
  out.residual_sd = format_sig(f.residual_sd, 4);
  out.dof = std::to_string(f.dof);
  const auto excluded = std::count_if(c.points.begin(), c.points.end(),
                                      [](const CalibrationPoint& p) { return p.excluded; });
  out.points = std::to_string(c.points.size()) +
               (excluded ? " (" + std::to_string(excluded) + " excluded)" : std::string()) +
               " at " + std::to_string(f.n_levels) + " levels";
  out.working_range =
      format_shortest(f.range_low) + " to " + format_shortest(f.range_high) + " " + def.unit;
  const bool ich_reports = rules.limits == fitting::LimitDefinition::IchQ2;
  out.limits.push_back({std::string("ICH Q2") + (ich_reports ? " (reported)" : ""),
                        with_unit(f.lod, def.unit), with_unit(f.loq, def.unit),
                        (f.lod_definition.empty() ? std::string("sigma = residual SD, S = slope b")
                                                  : f.lod_definition) +
                            "; LOD 3.3σ/S, LOQ 10σ/S"});
  if (f.din) {
    out.limits.push_back(
        {std::string("DIN 32645") + (ich_reports ? "" : " (reported)"),
         with_unit(f.din->detection_limit, def.unit),
         f.din->quantification_limit ? with_unit(*f.din->quantification_limit, def.unit)
                                     : std::string("n/a"),
         "calibration method, α = " + format_shortest(f.din->parameters.alpha) +
             ", β = " + format_shortest(f.din->parameters.beta) +
             ", k = " + format_shortest(f.din->parameters.k) + "; critical value x_NG " +
             with_unit(f.din->critical_value, def.unit)});
  }
  if (f.mandel) {
    out.mandel = "ISO 8466-1: PW " + format_sig(f.mandel->test_value, 4) +
                 (f.mandel->linear_adequate ? " ≤ " : " > ") + "F(0.99; 1, " +
                 std::to_string(f.mandel->dof_quadratic) + ") " +
                 format_sig(f.mandel->f_critical_99, 4) + ": " +
                 (f.mandel->linear_adequate
                      ? "linear model adequate (a low-power test: a pass is weak evidence)"
                      : "quadratic fits significantly better; narrow the range or review the "
                        "model");
  }
  return out;
}

std::vector<plot::ReportLevelRow> levels_of(const app::CurveView& v) {
  const Curve& c = v.curve;
  const auto& rules = v.version.definition.calibration;
  const bool with_is = v.version.definition.internal_standard.has_value();
  const auto lowest = lowest_nominal(c);
  std::vector<plot::ReportLevelRow> rows;
  for (const auto& p : c.points) {
    plot::ReportLevelRow r;
    r.level = p.level;
    r.replicate = p.replicate;
    r.nominal = format_shortest(p.nominal);
    r.response = format_shortest(p.response);
    if (with_is && p.is_response) r.response += " / " + format_shortest(*p.is_response);
    r.back_calculated = p.back_calculated ? format_sig(*p.back_calculated, 5) : "-";
    const auto limit = limit_of(rules, p, lowest);
    r.error_pct = p.error_pct ? signed_pct(*p.error_pct, limit) : "-";
    r.limit = limit ? "±" + format_shortest(*limit) : "-";
    if (p.excluded) {
      r.outcome = plot::PointOutcome::Excluded;
      r.reason = p.exclude_reason.value_or("");
    } else if (!p.within_limits) {
      r.outcome = plot::PointOutcome::Fail;
      r.reason = p.back_calculated ? "outside its %RE limit" : "no back-calculated value";
    }
    rows.push_back(std::move(r));
  }
  return rows;
}

/// Every criterion the method sets, with the value measured and whether it held. Whether it held
/// is the verdict recorded at logging; the value is recomputed from the stored points.
std::vector<plot::ReportCriterion> criteria_of(const app::CurveView& v) {
  const Curve& c = v.curve;
  const auto& f = c.fit;
  const auto& rules = v.version.definition.calibration;
  std::vector<plot::ReportCriterion> out;
  out.push_back({"calibration levels", std::to_string(f.n_levels),
                 "≥ " + std::to_string(rules.min_levels), !failed(c, Criterion::TooFewLevels)});
  if (rules.min_r2) {
    out.push_back({"coefficient of determination r²", r2_text(f, rules.min_r2),
                   "≥ " + format_shortest(*rules.min_r2), !failed(c, Criterion::R2BelowMin)});
  }
  if (rules.max_error_pct || rules.max_error_pct_lowest) {
    const auto lowest = lowest_nominal(c);
    double worst = 0;
    double worst_lowest = 0;
    std::map<std::string, bool> level_within;
    for (const auto& p : c.points) {
      if (p.excluded) continue;
      auto [it, inserted] = level_within.emplace(p.level, true);
      it->second = it->second && p.within_limits;
      if (!p.error_pct) continue;
      double& w =
          lowest && p.nominal == *lowest && rules.max_error_pct_lowest ? worst_lowest : worst;
      if (std::fabs(*p.error_pct) > std::fabs(w)) w = *p.error_pct;
    }
    const bool levels_ok = !failed(c, Criterion::LevelError);
    if (rules.max_error_pct) {
      out.push_back({"worst %RE of a back-calculated point", signed_pct(worst, rules.max_error_pct),
                     "±" + format_shortest(*rules.max_error_pct) +
                         (rules.max_error_pct_lowest ? " (other levels)" : ""),
                     levels_ok || rules.min_levels_within.has_value()});
    }
    if (rules.max_error_pct_lowest) {
      out.push_back({"worst %RE at the lowest level",
                     signed_pct(worst_lowest, rules.max_error_pct_lowest),
                     "±" + format_shortest(*rules.max_error_pct_lowest),
                     levels_ok || rules.min_levels_within.has_value()});
    }
    if (rules.min_levels_within) {
      const auto within = std::count_if(level_within.begin(), level_within.end(),
                                        [](const auto& kv) { return kv.second; });
      out.push_back({"levels within their %RE limit",
                     std::to_string(within) + " of " + std::to_string(level_within.size()),
                     "≥ " + format_shortest(*rules.min_levels_within * 100) + " %",
                     !failed(c, Criterion::TooFewLevelsWithin)});
    }
  }
  if (rules.max_rf_rsd_pct) {
    out.push_back({"%RSD of the response factors", format_fixed(f.rf_rsd_pct, 2) + " %",
                   "≤ " + format_shortest(*rules.max_rf_rsd_pct) + " %",
                   !failed(c, Criterion::RfRsdAboveMax)});
  }
  if (f.model == fitting::Model::Quadratic) {
    out.push_back({"monotonic over the working range",
                   failed(c, Criterion::NotMonotonic) ? "vertex inside the range"
                                                      : "no vertex inside the range",
                   "no vertex", !failed(c, Criterion::NotMonotonic)});
  }
  return out;
}

std::string review_action(const CurveReview& r) {
  return std::string(r.decision == ReviewDecision::Approve ? "approved" : "rejected") +
         " the curve: " + r.reason;
}

std::string local_text(const std::string& utc, const LabZone& zone) {
  try {
    return zone.format_local(parse_instant(utc));
  } catch (const std::exception&) {
    return utc;
  }
}

}  // namespace

plot::CurveReport curve_report_of(const app::CurveReportFacts& facts, const LabZone& zone,
                                  const ReportOrigin& origin) {
  const app::CurveView& v = facts.view;
  const Curve& c = v.curve;
  const auto& def = v.version.definition;
  plot::CurveReport r;
  r.frame.lab = facts.lab_name;
  r.frame.generated_at = zone.format_local(origin.generated_at);
  r.frame.created_at = origin.generated_at;
  r.frame.generated_by = origin.generated_by;
  r.frame.tool_version = origin.tool_version;

  r.curve_id = std::to_string(c.id.value);
  r.calibration_id = std::to_string(c.calibration_id.value);
  r.analyte = c.analyte;
  r.method_code = v.method_code;
  r.method_version = std::to_string(v.version.version);
  r.method_title = def.title;
  r.instrument_code = v.instrument_code;
  r.instrument_name = facts.instrument.name.value_or("");
  for (const auto& l : v.lots) {
    plot::ReportLot lot;
    lot.code = l.code;
    lot.material = l.material;
    lot.certificate = l.certificate.value_or("");
    lot.expires = format_date(l.effective_expires_on());
    if (l.withdrawal) {
      lot.note =
          "withdrawn " + zone.format_local(l.withdrawal->occurred_at) + ": " + l.withdrawal->reason;
    }
    r.lots.push_back(std::move(lot));
  }
  r.acquired_at = zone.format_local(c.acquired_at);
  r.note = facts.calibration.note.value_or("");
  r.analyst = {c.analyst, r.acquired_at, "logged the calibration", std::nullopt};
  for (const auto& rev : c.reviews) {
    if (rev.occurred_at > v.as_of) continue;
    r.reviewer = plot::PersonLine{rev.reviewer, zone.format_local(rev.occurred_at),
                                  review_action(rev), std::nullopt};
    // The review's electronic signature (21 CFR 11.50): given in the same act, by the same user.
    for (const auto& g : v.signatures) {
      if (g.signed_at == rev.occurred_at && g.code == canonical_user_code(rev.reviewer)) {
        r.reviewer->signature =
            plot::SignatureManifestation{g.name, zone.format_local(g.signed_at), g.meaning};
      }
    }
  }
  r.fit = fit_of(v);
  r.levels = levels_of(v);
  r.plot = curve_plot_of(v, origin.generated_at);
  r.accepted = c.verdict == Verdict::Accepted;
  r.criteria = criteria_of(v);
  r.state = std::string(to_string(v.status.state));
  r.state_at = zone.format_local(v.as_of);
  r.usable = v.status.state == CurveState::Active;
  if (v.status.cause) r.state_reasons.push_back(v.status.cause->message);
  for (const auto& f : v.status.reasons) {
    r.state_reasons.push_back(std::string(to_string(f.reason)) + ": " + f.message);
  }
  r.valid_until = zone.format_local(c.expires_at);
  for (const auto& e : facts.entries) {
    r.audit.entries.push_back({e.seq, local_text(e.recorded_at, zone), e.actor, e.action,
                               e.entity_kind + " " + e.entity_id});
  }
  if (facts.head) {
    r.audit.head_seq = facts.head->seq;
    r.audit.head_hash = facts.head->hash;
  }
  return r;
}

}  // namespace cw::report
