// SPDX-License-Identifier: Apache-2.0
// render_run_report(): the run report's sections as document blocks.
#include "plot/run_report.h"

#include <string>
#include <vector>

#include "plot/document.h"
#include "plot/report_parts.h"

namespace cw::plot {
namespace {

std::string status_display(SampleStatus status) {
  switch (status) {
    case SampleStatus::Reported:
      return "reported";
    case SampleStatus::Refused:
      return "REFUSED";
    case SampleStatus::RerunRequired:
      return "RE-RUN";
  }
  return "";
}

struct Totals {
  int reported = 0, censored = 0, refused = 0, rerun = 0, checks_passed = 0, checks_failed = 0,
      blanks_passed = 0, blanks_failed = 0;
};

Totals totals(const RunReport& r) {
  Totals t;
  for (const ReportSampleRow& s : r.samples) {
    switch (s.status) {
      case SampleStatus::Reported:
        ++t.reported;
        if (s.censored) ++t.censored;
        break;
      case SampleStatus::Refused:
        ++t.refused;
        break;
      case SampleStatus::RerunRequired:
        ++t.rerun;
        break;
    }
  }
  for (const ReportCheckRow& c : r.checks) {
    if (c.blank) {
      ++(c.passed ? t.blanks_passed : t.blanks_failed);
    } else {
      ++(c.passed ? t.checks_passed : t.checks_failed);
    }
  }
  return t;
}

void add_header(Document& d, const RunReport& r) {
  d.blocks.push_back(Heading{"1  Run"});
  KeyValueList kv;
  kv.entries.push_back({"Laboratory", r.frame.lab});
  kv.entries.push_back({"Run", r.run_id});
  kv.entries.push_back({"File", r.file_name});
  kv.entries.push_back({"File SHA-256", r.file_sha256, true});
  kv.entries.push_back(
      {"Method", detail::method_text(r.method_code, r.method_version, r.method_title)});
  kv.entries.push_back(
      {"Instrument", detail::instrument_text(r.instrument_code, r.instrument_name)});
  kv.entries.push_back(
      {"Imported", r.imported_at + (r.imported_by.empty() ? "" : " by " + r.imported_by)});
  d.blocks.push_back(kv);
}

void add_bracketing(Document& d, const RunReport& r) {
  d.blocks.push_back(Heading{"2  Bracketing outcome"});
  Table t;
  t.columns = {{"Analyte"},
               {"Reported", true},
               {"Below limit", true},
               {"Refused", true},
               {"Re-run", true},
               {"Checks passed", true},
               {"Checks failed", true},
               {"Blanks passed", true},
               {"Blanks failed", true},
               {"Outcome", false, true}};
  for (const ReportBracketing& b : r.bracketing) {
    Table::Row row{{b.analyte, std::to_string(b.reported), std::to_string(b.censored),
                    std::to_string(b.refused), std::to_string(b.rerun_required),
                    std::to_string(b.checks_passed), std::to_string(b.checks_failed),
                    std::to_string(b.blanks_passed), std::to_string(b.blanks_failed), b.outcome}};
    if (b.checks_failed + b.blanks_failed > 0 || b.rerun_required > 0) {
      row.style = Table::Row::Style::Strong;
    }
    t.rows.push_back(std::move(row));
  }
  t.empty_text = "no analytes";
  d.blocks.push_back(t);
}

void add_checks(Document& d, const RunReport& r) {
  d.blocks.push_back(Heading{"3  Checks"});
  Table t;
  t.columns = {{"Pos.", true},     {"Analyte"},      {"Nominal", true}, {"Measured", true},
               {"Recovery", true}, {"Limits", true}, {"Result"}};
  for (const ReportCheckRow& c : r.checks) {
    Table::Row row{{std::to_string(c.position), c.analyte, c.nominal, c.measured, c.recovery,
                    c.limits, c.passed ? "pass" : "FAIL"}};
    if (!c.passed) row.style = Table::Row::Style::Strong;
    t.rows.push_back(std::move(row));
  }
  t.empty_text = "no checks in this run";
  d.blocks.push_back(t);
}

void add_samples(Document& d, const RunReport& r) {
  d.blocks.push_back(Heading{"4  Samples"});
  d.blocks.push_back(Paragraph{
      "Released is what the result says: a value, \"< limit\" for a result below the reporting "
      "limit, or \"refused\". U is the expanded uncertainty (k = 2 unless shown). Reasons are "
      "named by their token; `curvewarden result show ID` gives each in full. Refused results "
      "and samples to re-run are in bold.",
      Paragraph::Style::Note});
  Table t;
  t.columns = {{"Pos.", true},          {"Result", true}, {"Sample", false, true}, {"Analyte"},
               {"Released", true},      {"U", true},      {"Flags", false, true},  {"Status"},
               {"Reasons", false, true}};
  for (const ReportSampleRow& s : r.samples) {
    Table::Row row{{std::to_string(s.position), s.result_id, s.sample, s.analyte, s.value,
                    s.uncertainty, s.flags, status_display(s.status), s.reasons}};
    if (s.status != SampleStatus::Reported) row.style = Table::Row::Style::Strong;
    t.rows.push_back(std::move(row));
  }
  t.empty_text = "no samples in this run";
  d.blocks.push_back(t);
}

}  // namespace

const char* to_string(SampleStatus status) {
  switch (status) {
    case SampleStatus::Reported:
      return "reported";
    case SampleStatus::Refused:
      return "refused";
    case SampleStatus::RerunRequired:
      return "rerun-required";
  }
  return "";
}

int render_run_report(const RunReport& r, const std::string& path) {
  std::string subtitle = "Run " + r.run_id + " \u00b7 " + r.method_code;
  if (!r.method_version.empty()) subtitle += " version " + r.method_version;
  subtitle += " \u00b7 " + r.instrument_code;
  Document d =
      detail::report_document(r.frame, "Run report", subtitle, "Run report \u00b7 run " + r.run_id);
  const Totals t = totals(r);
  std::string results = std::to_string(t.reported) + " reported";
  if (t.censored > 0) results += " (" + std::to_string(t.censored) + " <)";
  results += " \u00b7 " + std::to_string(t.refused) + " refused \u00b7 " + std::to_string(t.rerun) +
             " to re-run";
  const std::string checks = std::to_string(t.checks_passed) + " of " +
                             std::to_string(t.checks_passed + t.checks_failed) + " passed";
  Banner banner{
      {{"Results", results, t.refused + t.rerun > 0}, {"Checks", checks, t.checks_failed > 0}}};
  if (t.blanks_passed + t.blanks_failed > 0) {
    banner.items.push_back({"Blanks",
                            std::to_string(t.blanks_passed) + " of " +
                                std::to_string(t.blanks_passed + t.blanks_failed) + " passed",
                            t.blanks_failed > 0});
  }
  d.blocks.push_back(banner);
  add_header(d, r);
  add_bracketing(d, r);
  add_checks(d, r);
  add_samples(d, r);
  detail::add_audit_section(d, "5  Audit trail", r.audit);
  detail::add_caution_section(d, "6  Cautions", r.frame);
  return render_document(d, path);
}

}  // namespace cw::plot
