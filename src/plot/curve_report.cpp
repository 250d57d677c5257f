// SPDX-License-Identifier: Apache-2.0
// render_curve_report(): the curve report's sections as document blocks.
#include "plot/curve_report.h"

#include <string>
#include <vector>

#include "plot/document.h"
#include "plot/report_parts.h"

namespace cw::plot {
namespace {

using detail::instrument_text;
using detail::method_text;
using detail::person_text;

constexpr double kCurvePlotWidth = 760;
constexpr double kCurvePlotHeight = 600;

const char* outcome_text(PointOutcome outcome) {
  switch (outcome) {
    case PointOutcome::Within:
      return "within";
    case PointOutcome::Fail:
      return "FAIL";
    case PointOutcome::Excluded:
      return "excluded";
  }
  return "";
}

std::string count_text(std::size_t n, const char* one, const char* many) {
  return std::to_string(n) + " " + (n == 1 ? one : many);
}

std::string verdict_text(const CurveReport& r) {
  std::size_t passed = 0;
  for (const ReportCriterion& c : r.criteria) passed += c.passed ? 1 : 0;
  std::string text = r.accepted ? "accepted" : "rejected";
  text += " \u00b7 " + std::to_string(passed) + " of " + std::to_string(r.criteria.size()) +
          (r.criteria.size() == 1 ? " criterion met" : " criteria met");
  return text;
}

void add_identification(Document& d, const CurveReport& r) {
  d.blocks.push_back(Heading{"1  Identification"});
  KeyValueList kv;
  kv.entries.push_back({"Laboratory", r.frame.lab});
  std::string curve = r.curve_id;
  if (!r.calibration_id.empty()) curve += " (calibration " + r.calibration_id + ")";
  kv.entries.push_back({"Curve", curve});
  kv.entries.push_back({"Analyte", r.analyte});
  kv.entries.push_back({"Method", method_text(r.method_code, r.method_version, r.method_title)});
  kv.entries.push_back({"Instrument", instrument_text(r.instrument_code, r.instrument_name)});
  kv.entries.push_back({"Acquired", r.acquired_at});
  kv.entries.push_back({"Analyst", person_text(r.analyst)});
  kv.entries.push_back({"Reviewer", r.reviewer ? person_text(*r.reviewer) : "not reviewed"});
  if (!r.valid_until.empty()) kv.entries.push_back({"Valid until", r.valid_until});
  if (!r.note.empty()) kv.entries.push_back({"Note", r.note});
  d.blocks.push_back(kv);

  Table lots;
  lots.caption = "Reference-material lots";
  lots.columns = {{"Lot"},
                  {"Material", false, true},
                  {"Certificate", false, true},
                  {"Expires"},
                  {"Note", false, true}};
  for (const ReportLot& lot : r.lots) {
    lots.rows.push_back({{lot.code, lot.material, lot.certificate, lot.expires, lot.note}});
  }
  lots.empty_text = "no lots recorded";
  d.blocks.push_back(lots);
}

void add_fit(Document& d, const CurveReport& r) {
  const ReportFit& f = r.fit;
  d.blocks.push_back(Heading{"3  Fit"});
  KeyValueList model;
  model.entries.push_back(
      {"Model", f.model + (f.weighting.empty() ? "" : ", " + f.weighting + " weighting")});
  model.entries.push_back({"Equation", f.equation});
  model.entries.push_back({"Points", f.points});
  d.blocks.push_back(model);

  Table parameters;
  parameters.caption = "Parameters";
  parameters.columns = {{"Parameter", false, true}, {"Estimate", true}, {"Standard error", true}};
  for (const ReportParameter& p : f.parameters) {
    parameters.rows.push_back({{p.name, p.estimate, p.standard_error}});
  }
  d.blocks.push_back(parameters);

  KeyValueList statistics;
  statistics.entries.push_back({"r\u00b2", f.r2});
  statistics.entries.push_back({"s(y/x)", f.residual_sd});
  statistics.entries.push_back({"Degrees of freedom", f.dof});
  statistics.entries.push_back({"Working range", f.working_range});
  if (!f.mandel.empty()) statistics.entries.push_back({"Mandel's test", f.mandel});
  d.blocks.push_back(Space{4});
  d.blocks.push_back(statistics);

  Table limits;
  limits.caption = "Limits of detection and quantitation";
  limits.columns = {{"Basis"}, {"LOD", true}, {"LOQ", true}, {"Definition", false, true}};
  for (const ReportLimits& l : f.limits) {
    limits.rows.push_back({{l.basis, l.lod, l.loq, l.definition}});
  }
  limits.empty_text = "no limits computed";
  d.blocks.push_back(limits);
}

void add_levels(Document& d, const CurveReport& r) {
  d.blocks.push_back(Heading{"4  Calibration points"});
  Table t;
  t.columns = {{"Level"},
               {"Rep.", true},
               {"Nominal", true},
               {"Response", true},
               {"Back-calculated", true},
               {"%RE", true},
               {"Limit %", true},
               {"Outcome"},
               {"Reason", false, true}};
  for (const ReportLevelRow& l : r.levels) {
    Table::Row row{{l.level, std::to_string(l.replicate), l.nominal, l.response, l.back_calculated,
                    l.error_pct, l.limit, outcome_text(l.outcome), l.reason}};
    if (l.outcome == PointOutcome::Fail) row.style = Table::Row::Style::Strong;
    if (l.outcome == PointOutcome::Excluded) row.style = Table::Row::Style::Muted;
    t.rows.push_back(std::move(row));
  }
  t.empty_text = "no calibration points";
  d.blocks.push_back(t);
  d.blocks.push_back(
      Paragraph{"%RE is the relative error of the back-calculated concentration against the "
                "nominal one. Excluded points stay in the record (in grey) but were not fitted; "
                "FAIL marks a point outside the limit that applies to it.",
                Paragraph::Style::Note});
}

void add_verdict(Document& d, const CurveReport& r) {
  d.blocks.push_back(Heading{"5  Verdict and acceptance criteria"});
  d.blocks.push_back(Banner{{{"Verdict at logging", verdict_text(r), !r.accepted}}});
  Table t;
  t.columns = {{"Criterion", false, true}, {"Value"}, {"Limit", false, true}, {"Result"}};
  for (const ReportCriterion& c : r.criteria) {
    Table::Row row{{c.name, c.value, c.limit, c.passed ? "pass" : "FAIL"}};
    if (!c.passed) row.style = Table::Row::Style::Strong;
    t.rows.push_back(std::move(row));
  }
  t.empty_text = "no criteria configured";
  d.blocks.push_back(t);
}

void add_state(Document& d, const CurveReport& r) {
  d.blocks.push_back(Heading{"6  State now"});
  KeyValueList kv;
  kv.entries.push_back({"State", r.state});
  kv.entries.push_back({"Evaluated at", r.state_at});
  kv.entries.push_back({"Quantitation", r.usable
                                            ? "results may be quantified against this curve"
                                            : "results may not be quantified against this curve"});
  std::string reasons;
  for (const std::string& reason : r.state_reasons) {
    reasons += (reasons.empty() ? "" : "\n") + std::string("\u2022 ") + reason;
  }
  kv.entries.push_back({"Reasons", reasons.empty() ? "none" : reasons});
  d.blocks.push_back(kv);
}

}  // namespace

int render_curve_report(const CurveReport& r, const std::string& path) {
  std::string subtitle = "Curve " + r.curve_id;
  if (!r.analyte.empty()) subtitle += " \u00b7 " + r.analyte;
  subtitle += " \u00b7 " + r.method_code;
  if (!r.method_version.empty()) subtitle += " version " + r.method_version;
  subtitle += " \u00b7 " + r.instrument_code;
  Document d = detail::report_document(r.frame, "Calibration report", subtitle,
                                       "Calibration report \u00b7 curve " + r.curve_id);

  d.blocks.push_back(Banner{
      {{"Verdict at logging", verdict_text(r), !r.accepted},
       {"State now",
        r.state + (r.state_reasons.empty()
                       ? ""
                       : " \u00b7 " + count_text(r.state_reasons.size(), "reason", "reasons")),
        !r.usable}}});
  add_identification(d, r);

  d.blocks.push_back(Heading{"2  Calibration plot"});
  // The report chooses the drawing's proportions: wide enough for the key column, tall enough
  // for the key to list a few exclusions; the page scales it to the text width.
  CurvePlot plot = r.plot;
  plot.page.width = kCurvePlotWidth;
  plot.page.height = kCurvePlotHeight;
  Figure figure{plot, ""};
  d.blocks.push_back(figure);

  add_fit(d, r);
  add_levels(d, r);
  add_verdict(d, r);
  add_state(d, r);
  detail::add_audit_section(d, "7  Audit trail", r.audit);
  detail::add_caution_section(d, "8  Cautions", r.frame);

  d.blocks.push_back(Heading{"9  Sign-off"});
  SignatureFields sign;
  sign.fields.push_back(
      detail::signature_field("Analyst", &r.analyst, "I performed this calibration as recorded."));
  sign.fields.push_back(detail::signature_field("Reviewer", r.reviewer ? &*r.reviewer : nullptr,
                                                "I reviewed this calibration and its record."));
  d.blocks.push_back(sign);
  return render_document(d, path);
}

}  // namespace cw::plot
