// SPDX-License-Identifier: Apache-2.0
// Curve views.
#include "report/curve_views.h"

#include <cmath>
#include <sstream>

#include "core/text.h"
#include "domain/quantitation.h"
#include "report/csv.h"
#include "report/numbers.h"
#include "report/table.h"

namespace cw::report {

const char* const kReviewCaution =
    "Curvewarden applies the rules your lab configured; it supports and never replaces your "
    "quality system, SOPs "
    "and regulations. A qualified person reviews results before release.";

namespace {

/// A %RE with as many decimals as it takes to show which side of its limit it lies on.
std::string signed_pct(const std::optional<double>& v, std::optional<double> limit) {
  if (!v) return "-";
  std::string s = limit ? format_fixed_against(*v, {*limit, -*limit}, 1) : format_fixed(*v, 1);
  if (*v >= 0) s = "+" + s;
  return s;
}

std::string opt_sig(const std::optional<double>& v, int digits) {
  return v ? format_sig(*v, digits) : "-";
}

std::string state_word(const CurveStatus& s) {
  return std::string(to_string(s.state));
}

bool has_term(const fitting::FitResult& f, int k) {
  using fitting::Model;
  if (k == 0) return f.model == Model::Linear || f.model == Model::Quadratic;
  if (k == 2) return f.model == Model::Quadratic;
  return true;
}

}  // namespace

std::string equation_text(const fitting::FitResult& f) {
  using fitting::Model;
  // One style for every parameter: six significant figures, an ASCII minus.
  auto term = [](double v, const std::string& suffix) {
    return std::string(v < 0 ? " - " : " + ") + format_sig(std::fabs(v), 6) + suffix;
  };
  switch (f.model) {
    case Model::Linear:
      return "y = " + format_sig(f.intercept, 6) + term(f.slope, "·x");
    case Model::LinearThroughOrigin:
      return "y = " + format_sig(f.slope, 6) + "·x";
    case Model::Quadratic:
      return "y = " + format_sig(f.intercept, 6) + term(f.slope, "·x") + term(f.quadratic, "·x²");
    case Model::MeanResponseFactor:
      return "y = RF·x with mean RF " + format_sig(f.slope, 6);
  }
  return "";
}

namespace {

Json limits_json(const app::CurveView& v) {
  const auto& f = v.curve.fit;
  const auto& rules = v.version.definition.calibration;
  Json ich = Json{
      {"lod", json_number(f.lod)},
      {"loq", json_number(f.loq)},
      {"sigma", f.lod_sigma > 0 ? Json(f.lod_sigma) : Json(nullptr)},
      {"slope", f.lod_slope != 0 ? Json(f.lod_slope) : Json(nullptr)},
      {"definition", f.lod_definition.empty() ? Json("ICH Q2: sigma = residual SD, S = slope b")
                                              : Json(f.lod_definition)}};
  Json din = nullptr;
  if (f.din) {
    din = {{"critical_value", f.din->critical_value},
           {"detection_limit", f.din->detection_limit},
           {"quantification_limit", json_number(f.din->quantification_limit)},
           {"critical_response", f.din->critical_response},
           {"method_sd", f.din->method_sd},
           {"alpha", f.din->parameters.alpha},
           {"beta", f.din->parameters.beta},
           {"k", f.din->parameters.k},
           {"m", f.din->parameters.m}};
  }
  return Json{{"reporting", std::string(fitting::to_string(rules.limits))},
              {"report_below", std::string(to_string(rules.report_limit))},
              {"release_limit", json_number(release_limit(v.curve, v.version.definition))},
              {"ich_q2", ich},
              {"din_32645", din}};
}

void print_limits(std::ostream& out, const app::CurveView& v, const std::string& pad) {
  const auto& f = v.curve.fit;
  const auto& rules = v.version.definition.calibration;
  const std::string& unit = v.version.definition.unit;
  const bool ich_reports = rules.limits == fitting::LimitDefinition::IchQ2;
  out << pad << "LOD " << (std::isfinite(f.lod) ? format_sig(f.lod, 3) : std::string("n/a"))
      << ", LOQ " << (std::isfinite(f.loq) ? format_sig(f.loq, 3) : std::string("n/a")) << " "
      << unit << " ("
      << (f.lod_definition.empty() ? std::string("ICH Q2: sigma = residual SD, S = slope b")
                                   : f.lod_definition)
      << "; 3.3σ/S and 10σ/S)" << (ich_reports ? " — reported" : "") << "\n";
  if (f.din) {
    out << pad << "DIN 32645 (α = " << format_shortest(f.din->parameters.alpha)
        << ", β = " << format_shortest(f.din->parameters.beta)
        << ", k = " << format_shortest(f.din->parameters.k) << "): critical value x_NG "
        << format_sig(f.din->critical_value, 3) << ", detection limit x_EG "
        << format_sig(f.din->detection_limit, 3) << ", quantification limit x_BG "
        << (f.din->quantification_limit ? format_sig(*f.din->quantification_limit, 3)
                                        : std::string("n/a"))
        << " " << unit << (ich_reports ? "" : " — reported") << "\n";
  }
  out << pad << "results below " << format_plain(release_limit(v.curve, v.version.definition), 6)
      << " " << unit << " are released as \"< limit\" ("
      << (rules.report_limit == ReportLimit::LowestCalibrator
              ? "the lowest calibrator"
              : std::string(rules.report_limit == ReportLimit::Loq ? "the LOQ" : "the LOD"))
      << ")\n";
}

}  // namespace

Json reasons_json(const CurveStatus& status) {
  Json list = Json::array();
  for (const auto& f : status.reasons) list.push_back(std::string(to_string(f.reason)));
  return list;
}

Json reason_details_json(const std::vector<Finding>& findings) {
  Json list = Json::array();
  for (const auto& f : findings) {
    list.push_back({{"reason", std::string(to_string(f.reason))},
                    {"since", f.since ? json_instant(*f.since) : Json(nullptr)},
                    {"message", f.message}});
  }
  return list;
}

Json curve_json(const app::CurveView& v, const LabZone& zone) {
  (void)zone;
  const Curve& c = v.curve;
  const auto& f = c.fit;
  const auto reporting = fitting::reporting_limits(f, v.version.definition.calibration.limits);
  Json lots = Json::array();
  for (const auto& l : v.lots) lots.push_back(l.code);
  Json points = Json::array();
  for (const auto& p : c.points) {
    points.push_back({{"level", p.level},
                      {"replicate", p.replicate},
                      {"nominal", p.nominal},
                      {"response", p.response},
                      {"is_response", json_number(p.is_response)},
                      {"y", p.y},
                      {"back_calculated", json_number(p.back_calculated)},
                      {"error_pct", json_number(p.error_pct)},
                      {"within_limits", p.within_limits},
                      {"excluded", p.excluded},
                      {"exclude_reason", json_optional(p.exclude_reason)},
                      {"line", p.source_line}});
  }
  auto findings = [](const std::vector<fitting::CriterionFinding>& list) {
    Json out = Json::array();
    for (const auto& x : list) {
      out.push_back({{"criterion", std::string(fitting::to_string(x.criterion))},
                     {"level", json_optional(x.level)},
                     {"value", json_number(x.value)},
                     {"limit", json_number(x.limit)},
                     {"detail", x.detail}});
    }
    return out;
  };
  Json mandel = nullptr;
  if (f.mandel) {
    mandel = {{"test_value", f.mandel->test_value},
              {"f_critical_99", f.mandel->f_critical_99},
              {"dof", f.mandel->dof_quadratic},
              {"s_y1", f.mandel->s_y1},
              {"s_y2", f.mandel->s_y2},
              {"linear_adequate", f.mandel->linear_adequate}};
  }
  Json reviews = Json::array();
  for (const auto& r : c.reviews) {
    reviews.push_back({{"decision", std::string(to_string(r.decision))},
                       {"reviewer", r.reviewer},
                       {"reason", r.reason},
                       {"at", json_instant(r.occurred_at)}});
  }
  Json retirements = Json::array();
  for (const auto& r : c.retirements) {
    retirements.push_back(
        {{"by", r.retired_by}, {"reason", r.reason}, {"at", json_instant(r.occurred_at)}});
  }
  Json signatures = Json::array();
  for (const auto& g : v.signatures) {
    signatures.push_back({{"user", g.code},
                          {"name", g.name},
                          {"meaning", g.meaning},
                          {"signed_at", json_instant(g.signed_at)},
                          {"signed_at_local", zone.format_local(g.signed_at)}});
  }
  return Json{
      {"id", c.id.value},
      {"calibration_id", c.calibration_id.value},
      {"analyte", c.analyte},
      {"method", v.method_code},
      {"method_version", v.version.version},
      {"instrument", v.instrument_code},
      {"lots", lots},
      {"acquired_at", json_instant(c.acquired_at)},
      {"analyst", c.analyst},
      {"unit", v.version.definition.unit},
      {"model", std::string(fitting::to_string(f.model))},
      {"weighting", std::string(fitting::to_string(f.weighting))},
      {"parameters", {{"intercept", f.intercept}, {"slope", f.slope}, {"quadratic", f.quadratic}}},
      {"standard_errors",
       {{"intercept", f.se_intercept}, {"slope", f.se_slope}, {"quadratic", f.se_quadratic}}},
      {"r2", f.r2},
      {"r2_definition", f.r2_definition},
      {"residual_sd", f.residual_sd},
      {"dof", f.dof},
      {"n_points", f.n_points},
      {"n_levels", f.n_levels},
      {"range", {{"low", f.range_low}, {"high", f.range_high}}},
      {"lod", json_number(reporting ? std::optional<double>(reporting->lod) : std::nullopt)},
      {"loq", json_number(reporting ? std::optional<double>(reporting->loq) : std::nullopt)},
      {"limits", limits_json(v)},
      {"rf_mean", f.rf_mean},
      {"rf_rsd_pct", f.rf_rsd_pct},
      {"mandel", mandel},
      {"verdict", std::string(to_string(c.verdict))},
      {"failed_criteria", tokens(c.failed_criteria)},
      {"criteria_failures", findings(c.acceptance.failures)},
      {"criteria_warnings", findings(c.acceptance.warnings)},
      {"state", state_word(v.status)},
      {"reasons", reasons_json(v.status)},
      {"state_cause", v.status.cause ? reason_details_json({*v.status.cause})[0] : Json(nullptr)},
      {"reason_details", reason_details_json(v.status.reasons)},
      {"as_of", json_instant(v.as_of)},
      {"expires_at", json_instant(c.expires_at)},
      {"reviews", reviews},
      {"retirements", retirements},
      {"signatures", signatures},
      {"points", points},
  };
}

Json curve_list_item_json(const app::CurveView& v) {
  return Json{{"id", v.curve.id.value},
              {"analyte", v.curve.analyte},
              {"method", v.method_code},
              {"method_version", v.version.version},
              {"instrument", v.instrument_code},
              {"state", state_word(v.status)},
              {"reasons", reasons_json(v.status)},
              {"acquired_at", json_instant(v.curve.acquired_at)},
              {"expires_at", json_instant(v.curve.expires_at)},
              {"verdict", std::string(to_string(v.curve.verdict))}};
}

void print_status(std::ostream& out, const CurveStatus& status, const LabZone& zone, int indent) {
  (void)zone;
  const std::string pad(static_cast<std::size_t>(indent), ' ');
  out << pad << "state: " << state_word(status);
  if (!status.reasons.empty()) {
    out << " (";
    for (std::size_t i = 0; i < status.reasons.size(); ++i) {
      out << (i ? ", " : "") << to_string(status.reasons[i].reason);
    }
    out << ")";
  }
  out << "\n";
  if (status.cause) out << pad << "  - " << status.cause->message << "\n";
  for (const auto& f : status.reasons)
    out << pad << "  - " << to_string(f.reason) << ": " << f.message << "\n";
}

void print_calibration_header(std::ostream& out, const app::CurveView& first, const LabZone& zone,
                              CalibrationId id) {
  out << "Calibration " << id.value << ": method " << first.method_code << " version "
      << first.version.version << ", instrument " << first.instrument_code << ", acquired "
      << zone.format_local(first.curve.acquired_at) << " by " << first.curve.analyst << "\n";
  out << "  lots:";
  for (const auto& l : first.lots) {
    out << " " << l.code << " (" << l.material << ", usable through "
        << format_date(l.effective_expires_on()) << ")";
  }
  out << "\n";
}

void print_curve_report(std::ostream& out, const app::CurveView& v, const LabZone& zone) {
  const Curve& c = v.curve;
  const auto& f = c.fit;
  const std::string& unit = v.version.definition.unit;
  out << "\nCurve " << c.id.value << "  " << c.analyte << "  ["
      << (c.verdict == Verdict::Accepted ? "ACCEPTED" : "REJECTED") << "]\n";
  out << "  model " << fitting::to_string(f.model) << ", weighting "
      << fitting::to_string(f.weighting);
  if (f.weighting != fitting::Weighting::None) out << " (weights scaled to sum n)";
  if (v.version.definition.internal_standard) {
    out << ", response = analyte / " << *v.version.definition.internal_standard;
  }
  out << "\n  " << equation_text(f) << "\n";
  Table params(
      {{"parameter"}, {"estimate", Table::Align::Right}, {"std. error", Table::Align::Right}});
  if (has_term(f, 0))
    params.add_row({"intercept", format_sig(f.intercept, 6), format_sig(f.se_intercept, 3)});
  params.add_row({f.model == fitting::Model::MeanResponseFactor ? "mean RF" : "slope",
                  format_sig(f.slope, 6), format_sig(f.se_slope, 3)});
  if (has_term(f, 2))
    params.add_row({"quadratic", format_sig(f.quadratic, 6), format_sig(f.se_quadratic, 3)});
  params.print(out, 4);
  out << "  r² " << r2_text(f, v.version.definition.calibration.min_r2) << " (" << f.r2_definition
      << ")\n";
  out << "  s(y/x) " << format_sig(f.residual_sd, 4) << ", " << f.n_points << " points at "
      << f.n_levels << " levels, " << f.dof << " degrees of freedom\n";
  out << "  working range " << format_shortest(f.range_low) << " to "
      << format_shortest(f.range_high) << " " << unit << "\n";
  print_limits(out, v, "  ");
  out << "  response factors: mean " << format_sig(f.rf_mean, 5) << ", %RSD "
      << format_fixed(f.rf_rsd_pct, 2) << " %\n";
  if (f.mandel) {
    out << "  Mandel test (ISO 8466-1): PW " << format_sig(f.mandel->test_value, 4)
        << (f.mandel->linear_adequate ? " ≤ " : " > ") << "F(0.99; 1, " << f.mandel->dof_quadratic
        << ") " << format_sig(f.mandel->f_critical_99, 4) << ": "
        << (f.mandel->linear_adequate
                ? "linear model adequate (a low-power test: a pass is weak evidence)"
                : "quadratic fits significantly better; narrow the range or review the model")
        << "\n";
  }
  Table points({{"level"},
                {"rep", Table::Align::Right},
                {"nominal", Table::Align::Right},
                {"response", Table::Align::Right},
                {"back-calc.", Table::Align::Right},
                {"%RE", Table::Align::Right},
                {""}});
  const bool with_is = v.version.definition.internal_standard.has_value();
  const auto& rules = v.version.definition.calibration;
  std::optional<double> lowest;
  for (const auto& p : c.points) {
    if (!p.excluded && (!lowest || p.nominal < *lowest)) lowest = p.nominal;
  }
  for (const auto& p : c.points) {
    std::string mark = p.excluded ? "excluded: " + p.exclude_reason.value_or("")
                                  : (p.within_limits ? "ok" : "FAIL");
    // Echoed inputs in their shortest round-trip form; the %RE against the limit that applies.
    std::string response = format_shortest(p.response);
    if (with_is && p.is_response) response += " / " + format_shortest(*p.is_response);
    const std::optional<double> limit = lowest && p.nominal == *lowest && rules.max_error_pct_lowest
                                            ? rules.max_error_pct_lowest
                                            : rules.max_error_pct;
    points.add_row({p.level, std::to_string(p.replicate), format_shortest(p.nominal), response,
                    opt_sig(p.back_calculated, 5), signed_pct(p.error_pct, limit), mark});
  }
  points.print(out, 4);
  if (c.verdict == Verdict::Accepted) {
    out << "  verdict: accepted";
    if (!c.acceptance.warnings.empty()) out << " (within the method's allowance)";
    out << "\n";
    for (const auto& w : c.acceptance.warnings) out << "    note: " << w.detail << "\n";
  } else {
    out << "  verdict: REJECTED\n";
    for (const auto& x : c.acceptance.failures) {
      out << "    - " << fitting::to_string(x.criterion) << ": " << x.detail << "\n";
    }
  }
  print_status(out, v.status, zone);
  out << "  expires " << zone.format_local(c.expires_at) << "\n";
  for (const auto& g : v.signatures) {
    out << "  signed: " << g.meaning << " by " << g.name << " (" << g.code << "), "
        << zone.format_local(g.signed_at) << "\n";
  }
}

namespace {

const std::vector<Table::Column>& curve_list_columns() {
  static const std::vector<Table::Column> columns{{"id", Table::Align::Right},
                                                  {"analyte"},
                                                  {"method"},
                                                  {"instrument"},
                                                  {"acquired"},
                                                  {"expires"},
                                                  {"state"},
                                                  {"reasons"}};
  return columns;
}

std::vector<std::string> curve_list_row(const app::CurveView& v, const LabZone& zone) {
  std::string reasons;
  for (const auto& f : v.status.reasons)
    reasons += (reasons.empty() ? "" : ", ") + std::string(to_string(f.reason));
  if (v.status.cause && reasons.empty() && v.status.state == CurveState::Rejected) {
    for (const auto& t : v.curve.failed_criteria) {
      reasons += (reasons.empty() ? "" : ", ") + std::string(fitting::to_string(t));
    }
  }
  return {std::to_string(v.curve.id.value),
          v.curve.analyte,
          v.method_code + " v" + std::to_string(v.version.version),
          v.instrument_code,
          zone.format_local(v.curve.acquired_at),
          zone.format_local(v.curve.expires_at),
          state_word(v.status),
          reasons};
}

}  // namespace

void print_curve_list(std::ostream& out, const std::vector<app::CurveView>& list,
                      const LabZone& zone) {
  if (list.empty()) {
    out << "No curves match.\n";
    return;
  }
  Table t(curve_list_columns());
  for (const auto& v : list) t.add_row(curve_list_row(v, zone));
  t.print(out);
}

void print_curve_list(std::ostream& out, const CurveSource& curves, const LabZone& zone) {
  const RowSource rows = [&](const RowSink& sink) {
    curves([&](const app::CurveView& v) { sink(curve_list_row(v, zone)); });
  };
  if (print_table(out, curve_list_columns(), rows, kCurveRowsHeld) == 0) {
    out << "No curves match.\n";
  }
}

CurveListWriter::CurveListWriter(std::ostream& out, Format format, Instant as_of)
    : out_(out), format_(format), as_of_(as_of) {}

void CurveListWriter::begin() {
  if (begun_) return;
  begun_ = true;
  if (format_ == Format::Json) {
    out_ << "{\n  \"as_of\": " << json_instant(as_of_).dump() << ",\n  \"curves\": [";
  } else {
    CsvWriter(out_, *csv_listing("curve list")).header();
  }
}

void CurveListWriter::add(const app::CurveView& v) {
  begin();
  if (format_ == Format::Json) {
    out_ << (count_ == 0 ? "\n" : ",\n");
    write_json(out_, curve_list_item_json(v), 4);
  } else {
    CsvWriter(out_, *csv_listing("curve list")).row(curve_list_item_json(v));
  }
  ++count_;
}

void CurveListWriter::end(const std::optional<Json>& error) {
  begin();
  if (format_ != Format::Json) return;
  out_ << (count_ == 0 ? "]" : "\n  ]");
  if (error) {
    out_ << ",\n  \"error\": ";
    std::ostringstream member;
    write_json(member, *error, 2);
    out_ << member.str().substr(2);  // the member's value starts on the key's line
  }
  out_ << "\n}\n";
}

}  // namespace cw::report
