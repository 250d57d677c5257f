// SPDX-License-Identifier: Apache-2.0
// Views of runs, listings and trends.
#include "report/run_views.h"

#include <algorithm>
#include <cmath>

#include "core/text.h"
#include "report/curve_views.h"
#include "report/quantitation_views.h"
#include "report/table.h"
#include "rules/trend.h"

namespace cw::report {
namespace {

std::string dump(const Json& j) {
  return j.dump(2, ' ', false, nlohmann::json::error_handler_t::replace);
}

Json mapping_json(const ColumnMapping& m) {
  Json j = Json::object();
  for (const auto& [name, header] : m) j[name] = header;
  return j;
}

Json run_result_json(const store::RunResultRow& row) {
  const Result& r = row.result;
  Json j{{"position", row.position},
         {"sample", r.sample},
         {"analyte", r.analyte},
         {"result_id", r.id.value},
         {"status", std::string(to_string(r.current_status()))},
         {"concentration", json_number(r.concentration)},
         {"censored", r.censored ? Json("<") : Json(nullptr)},
         {"reporting_limit", json_number(r.reporting_limit)},
         {"flags", tokens(r.flags)},
         {"reasons", reason_tokens(r.reasons)},
         {"ci_low", json_number(r.ci_low)},
         {"ci_high", json_number(r.ci_high)},
         {"response", r.response},
         {"is_response", json_number(r.is_response)},
         {"dilution", r.dilution},
         {"curve_id", r.curve_id ? Json(r.curve_id->value) : Json(nullptr)},
         {"recorded_status", std::string(to_string(r.status))},
         {"rerun", r.latest_event ? status_event_json(*r.latest_event) : Json(nullptr)},
         {"reason_details", reason_details_json(r.reasons)}};
  return j;
}

Json run_check_json(const store::RunCheckRow& row) {
  const Check& k = row.check;
  return Json{{"position", row.position},
              {"analyte", row.analyte},
              {"check_id", k.id.value},
              {"kind", std::string(to_string(k.kind))},
              {"label", json_optional(row.label)},
              {"nominal", k.nominal},
              {"measured", json_number(k.measured)},
              {"recovery_pct", json_number(k.recovery_pct)},
              {"passed", k.passed},
              {"response", k.response},
              {"is_response", json_number(k.is_response)},
              {"limit_low", json_number(k.limit_low)},
              {"limit_high", json_number(k.limit_high)},
              {"curve_id", k.curve_id.value}};
}

std::string check_value_text(const Check& k, const std::string& unit) {
  if (!k.measured) return "no solution on the curve";
  std::string s = format_sig(*k.measured, 4) + " " + unit;
  if (k.recovery_pct) s += ", recovery " + format_fixed(*k.recovery_pct, 1) + " %";
  return s;
}

}  // namespace

Json run_summary_json(const std::vector<RunAnalyteSummary>& summary) {
  Json j = Json::object();
  for (const auto& a : summary) {
    j[a.analyte] = {{"samples", a.samples},
                    {"reported", a.reported},
                    {"below_range", a.below_range},
                    {"refused", a.refused},
                    {"rerun_required", a.rerun_required},
                    {"checks_passed", a.checks_passed},
                    {"checks_failed", a.checks_failed},
                    {"blanks_passed", a.blanks_passed},
                    {"blanks_failed", a.blanks_failed}};
  }
  return j;
}

Json run_list_item_json(const app::RunView& v) {
  return Json{{"run_id", v.run.id.value},
              {"file_sha256", v.run.file_sha256},
              {"file_name", v.run.file_name},
              {"method", v.method_code},
              {"method_version", v.method_version},
              {"instrument", v.instrument_code},
              {"acquired_at", json_instant(v.run.acquired_at)},
              {"analyst", v.run.analyst},
              {"rows", v.run.rows},
              {"columns", mapping_json(v.run.columns)},
              {"again_reason", json_optional(v.run.again_reason)},
              {"unit", v.unit},
              {"summary", run_summary_json(v.summary)}};
}

void print_run_summary(std::ostream& out, const std::vector<RunAnalyteSummary>& summary) {
  Table t({{"analyte"},
           {"samples", Table::Align::Right},
           {"reported", Table::Align::Right},
           {"below range", Table::Align::Right},
           {"refused", Table::Align::Right},
           {"re-run", Table::Align::Right},
           {"checks passed", Table::Align::Right},
           {"checks failed", Table::Align::Right},
           {"blanks passed", Table::Align::Right},
           {"blanks failed", Table::Align::Right}});
  for (const auto& a : summary) {
    t.add_row({a.analyte, std::to_string(a.samples), std::to_string(a.reported),
               std::to_string(a.below_range), std::to_string(a.refused),
               std::to_string(a.rerun_required), std::to_string(a.checks_passed),
               std::to_string(a.checks_failed), std::to_string(a.blanks_passed),
               std::to_string(a.blanks_failed)});
  }
  t.print(out, 2);
}

void print_run_list(std::ostream& out, const std::vector<app::RunView>& runs, const LabZone& zone) {
  if (runs.empty()) {
    out << "No runs imported.\n";
    return;
  }
  Table t({{"run", Table::Align::Right},
           {"acquired"},
           {"method"},
           {"instrument"},
           {"rows", Table::Align::Right},
           {"re-run", Table::Align::Right},
           {"refused", Table::Align::Right},
           {"failed checks", Table::Align::Right},
           {"file"}});
  for (const auto& v : runs) {
    long rerun = 0, refused = 0, failed = 0;
    for (const auto& a : v.summary) {
      rerun += a.rerun_required;
      refused += a.refused;
      failed += a.checks_failed + a.blanks_failed;
    }
    t.add_row({std::to_string(v.run.id.value), zone.format_local(v.run.acquired_at),
               v.method_code + " v" + std::to_string(v.method_version), v.instrument_code,
               std::to_string(v.run.rows), std::to_string(rerun), std::to_string(refused),
               std::to_string(failed),
               v.run.file_name + (v.run.again_reason ? " (imported again)" : "")});
  }
  t.print(out);
}

void RunJsonWriter::begin(const app::RunView& run) {
  Json head = run_list_item_json(run);
  head.erase("summary");
  for (auto& [key, value] : extra_.items()) head[key] = value;
  // The header's members, then the row arrays opened by hand: the rows follow one by one.
  std::string text = dump(head);
  text.erase(text.find_last_of('}'));
  while (!text.empty() && (text.back() == '\n' || text.back() == ' ')) text.pop_back();
  out_ << text << ",\n  \"results\": [";
}

void RunJsonWriter::result(const store::RunResultRow& row) {
  out_ << (first_result_ ? "\n" : ",\n");
  first_result_ = false;
  write_json(out_, run_result_json(row), 4);
}

void RunJsonWriter::check(const store::RunCheckRow& row) {
  if (!in_checks_) {
    out_ << (first_result_ ? "]" : "\n  ]") << ",\n  \"checks\": [";
    in_checks_ = true;
  }
  out_ << (first_check_ ? "\n" : ",\n");
  first_check_ = false;
  write_json(out_, run_check_json(row), 4);
}

void RunJsonWriter::end(const app::RunView& run) {
  if (!in_checks_) {
    out_ << (first_result_ ? "]" : "\n  ]") << ",\n  \"checks\": [";
    in_checks_ = true;
  }
  out_ << (first_check_ ? "]" : "\n  ]") << ",\n  \"summary\": ";
  std::string summary = dump(run_summary_json(run.summary));
  // Indent the summary's inner lines under its key.
  std::string indented;
  for (char c : summary) {
    indented += c;
    if (c == '\n') indented += "  ";
  }
  out_ << indented;
  if (error_) {
    out_ << ",\n  \"error\": ";
    std::string e = dump(*error_);
    std::string ie;
    for (char c : e) {
      ie += c;
      if (c == '\n') ie += "  ";
    }
    out_ << ie;
  }
  out_ << "\n}\n";
}

void RunTextWriter::begin(const app::RunView& v) {
  unit_ = v.unit;
  for (const auto& a : v.summary) analyte_width_ = std::max(analyte_width_, a.analyte.size());
  out_ << "Run " << v.run.id.value << ": method " << v.method_code << " v" << v.method_version
       << ", instrument " << v.instrument_code << ", imported "
       << zone_.format_local(v.run.acquired_at) << " by " << v.run.analyst << "\n";
  out_ << "  file " << v.run.file_name << "  sha256 " << v.run.file_sha256 << "  (" << v.run.rows
       << " rows)\n";
  if (!v.run.columns.empty()) {
    out_ << "  columns " << column_mapping_text(v.run.columns) << "\n";
  }
  if (v.run.again_reason) out_ << "  imported again: " << *v.run.again_reason << "\n";
  print_run_summary(out_, v.summary);
}

void RunTextWriter::result(const store::RunResultRow& row) {
  if (!results_started_) {
    out_ << "Samples:\n";
    StreamTable(out_,
                {{"pos", Table::Align::Right},
                 {"sample"},
                 {"analyte"},
                 {"result", Table::Align::Right},
                 {"status"},
                 {"value"}},
                {6, 16, analyte_width_, 7, 14, 0}, 2)
        .header();
    results_started_ = true;
  }
  const Result& r = row.result;
  std::string value = result_value_text(r, unit_);
  if (r.status == ResultStatus::Refused) {
    for (const auto& f : r.reasons) value += " " + std::string(to_string(f.reason));
  }
  if (r.latest_event) value += ": " + r.latest_event->detail;
  StreamTable(out_,
              {{"pos", Table::Align::Right},
               {"sample"},
               {"analyte"},
               {"result", Table::Align::Right},
               {"status"},
               {"value"}},
              {6, 16, analyte_width_, 7, 14, 0}, 2)
      .row({std::to_string(row.position), r.sample, r.analyte, std::to_string(r.id.value),
            std::string(to_string(r.current_status())), value});
}

void RunTextWriter::check(const store::RunCheckRow& row) {
  const std::vector<Table::Column> columns = {
      {"pos", Table::Align::Right},   {"kind"}, {"label"}, {"analyte"},
      {"check", Table::Align::Right}, {""},     {"value"}};
  const std::vector<std::size_t> widths = {6, 5, 12, analyte_width_, 6, 6, 0};
  if (!checks_started_) {
    out_ << "Checks and blanks:\n";
    StreamTable(out_, columns, widths, 2).header();
    checks_started_ = true;
  }
  const Check& k = row.check;
  StreamTable(out_, columns, widths, 2)
      .row({std::to_string(row.position), std::string(to_string(k.kind)), row.label.value_or(""),
            row.analyte, std::to_string(k.id.value), k.passed ? "passed" : "FAILED",
            check_value_text(k, unit_)});
}

void RunTextWriter::end(const app::RunView& v) {
  (void)v;
  if (!results_started_) out_ << "No sample rows.\n";
  if (!checks_started_) out_ << "No check or blank rows.\n";
}

Json run_import_extra_json(const app::RunImportOutcome& o) {
  Json curves = Json::array();
  for (const auto& c : o.curves) {
    curves.push_back({{"analyte", c.analyte},
                      {"curve_id", c.curve.value},
                      {"state_at_start", std::string(to_string(c.status_at_start.state))},
                      {"reasons_at_start", reasons_json(c.status_at_start)}});
  }
  Json failures = Json::array();
  for (const auto& f : o.failures) {
    failures.push_back({{"position", f.position},
                        {"analyte", f.analyte},
                        {"check_id", f.check.value},
                        {"detail", f.description}});
  }
  Json ignored = Json::array();
  for (const auto& c : o.ignored_columns) ignored.push_back(c);
  return Json{{"curves", curves},
              {"columns_source", o.columns_source.empty() ? Json(nullptr) : Json(o.columns_source)},
              {"ignored_columns", ignored},
              {"status_events", o.status_events},
              {"failed_checks", failures}};
}

void print_run_import(std::ostream& out, const app::RunImportOutcome& o, const LabZone& zone) {
  out << "Run " << o.run.id.value << ": " << o.run.rows << " rows of " << o.run.file_name
      << " imported for method " << o.method_code << " v" << o.method_version << ", instrument "
      << o.instrument_code << ", at " << zone.format_local(o.run.acquired_at) << " by "
      << o.run.analyst << "\n";
  out << "  sha256 " << o.run.file_sha256 << "\n";
  if (!o.columns_source.empty()) {
    out << "  columns read through " << o.columns_source << ": "
        << column_mapping_text(o.run.columns) << "\n";
  }
  if (!o.ignored_columns.empty()) {
    std::string list;
    for (const auto& c : o.ignored_columns) list += (list.empty() ? "" : ", ") + quote(c);
    out << "  columns not used: " << list << "\n";
  }
  if (o.run.again_reason) out << "  imported again: " << *o.run.again_reason << "\n";
  for (const auto& c : o.curves) {
    out << "  " << c.analyte << ": curve " << c.curve.value << ", "
        << to_string(c.status_at_start.state) << " at the start of the run";
    if (!c.status_at_start.reasons.empty()) {
      out << " (";
      bool first = true;
      for (const auto& f : c.status_at_start.reasons) {
        out << (first ? "" : ", ") << to_string(f.reason);
        first = false;
      }
      out << ")";
    }
    out << "\n";
  }
  print_run_summary(out, o.summary);
  if (!o.failures.empty()) {
    out << "Failed checks and blanks:\n";
    for (const auto& f : o.failures) out << "  " << f.analyte << ": " << f.description << "\n";
  }
  if (o.status_events > 0) {
    out << o.status_events << " result(s) marked rerun-required; see 'curvewarden run show "
        << o.run.id.value << "'\n";
  }
  out << kReviewCaution << "\n";
}

ResultListWriter::ResultListWriter(std::ostream& out, Format format, const LabZone& zone)
    : out_(out), format_(format), zone_(zone) {
  if (format_ == Format::Csv) csv_.emplace(out_, *csv_listing("result list"));
}

void ResultListWriter::begin() {
  if (format_ == Format::Json) out_ << "{\n  \"results\": [";
  if (format_ == Format::Csv) csv_->header();
}

void ResultListWriter::add(const Result& r, const std::string& unit) {
  if (format_ != Format::Text) {
    Json j = result_json(r);
    j["unit"] = unit.empty() ? Json(nullptr) : Json(unit);
    if (format_ == Format::Csv) {
      csv_->row(j);
    } else {
      out_ << (count_ == 0 ? "\n" : ",\n");
      write_json(out_, j, 4);
    }
  } else {
    const std::vector<Table::Column> columns = {
        {"id", Table::Align::Right},  {"sample"}, {"analyte"}, {"at"}, {"status"},
        {"run", Table::Align::Right}, {"value"}};
    const std::vector<std::size_t> widths = {7, 16, 10, 23, 14, 5, 0};
    if (count_ == 0) StreamTable(out_, columns, widths).header();
    StreamTable(out_, columns, widths)
        .row({std::to_string(r.id.value), r.sample, r.analyte, zone_.format_local(r.occurred_at),
              std::string(to_string(r.current_status())),
              r.run_id ? std::to_string(r.run_id->value) : "-", result_value_text(r, unit)});
  }
  ++count_;
}

void ResultListWriter::end() {
  if (format_ == Format::Json) {
    out_ << (count_ == 0 ? "]\n}\n" : "\n  ]\n}\n");
  } else if (format_ == Format::Text) {
    out_ << count_ << " result(s)\n";
  }
}

Json result_detail_json(const app::ResultDetail& d) {
  Json j = result_json(d.result);
  j["unit"] = d.unit.empty() ? Json(nullptr) : Json(d.unit);
  Json history = Json::array();
  for (const auto& e : d.history) history.push_back(status_event_json(e));
  j["status_history"] = history;
  return j;
}

void print_result_detail(std::ostream& out, const app::ResultDetail& d, const LabZone& zone) {
  const Result& r = d.result;
  out << "Result " << r.id.value << "  sample " << r.sample << "  " << r.analyte << "\n";
  out << "  " << to_string(r.current_status()) << ": " << result_value_text(r, d.unit) << "\n";
  out << "  quantified " << zone.format_local(r.occurred_at) << " by " << r.analyst
      << " from response " << format_plain(r.response) << ", dilution " << format_plain(r.dilution);
  if (r.curve_id) out << ", curve " << r.curve_id->value;
  if (r.run_id) out << ", run " << r.run_id->value << " position " << r.run_position.value_or(0);
  out << "\n";
  for (const auto& f : r.reasons) out << "  - " << to_string(f.reason) << ": " << f.message << "\n";
  out << "Status history:\n";
  out << "  " << zone.format_local(r.occurred_at) << "  " << to_string(r.status) << "\n";
  for (const auto& e : d.history) {
    out << "  " << zone.format_local(e.occurred_at) << "  " << to_string(e.status) << " ("
        << to_string(e.reason) << "): " << e.detail << "\n";
  }
}

Json check_list_json(const std::vector<Check>& checks) {
  Json list = Json::array();
  for (const auto& k : checks) list.push_back(check_json(k));
  return Json{{"checks", list}};
}

void print_check_list(std::ostream& out, const std::vector<Check>& checks, const LabZone& zone) {
  if (checks.empty()) {
    out << "No checks.\n";
    return;
  }
  Table t({{"id", Table::Align::Right},
           {"curve", Table::Align::Right},
           {"kind"},
           {"at"},
           {"measured", Table::Align::Right},
           {"recovery", Table::Align::Right},
           {""},
           {"run", Table::Align::Right}});
  for (const auto& k : checks) {
    t.add_row({std::to_string(k.id.value), std::to_string(k.curve_id.value),
               std::string(to_string(k.kind)), zone.format_local(k.occurred_at),
               k.measured ? format_sig(*k.measured, 4) : "-",
               k.recovery_pct ? format_fixed(*k.recovery_pct, 1) + " %" : "-",
               k.passed ? "passed" : "FAILED", k.run_id ? std::to_string(k.run_id->value) : "-"});
  }
  t.print(out);
}

Json trend_json(const app::TrendOutcome& t) {
  Json points = Json::array();
  for (const auto& p : t.points) {
    points.push_back({{"check_id", p.check.id.value},
                      {"at", json_instant(p.check.occurred_at)},
                      {"recovery_pct", p.recovery_pct},
                      {"curve_id", p.check.curve_id.value},
                      {"run_id", p.check.run_id ? Json(p.check.run_id->value) : Json(nullptr)},
                      {"passed", p.check.passed},
                      {"z", json_number(p.z)}});
  }
  Json violations = Json::array();
  for (const auto& v : t.violations) {
    violations.push_back({{"rule", std::string(rules::to_string(v.violation.rule))},
                          {"check_id", v.violation.check_id.value},
                          {"at", json_instant(v.violation.at)},
                          {"warning_only", v.violation.warning_only},
                          {"makes_stale", v.makes_stale}});
  }
  Json limits = nullptr;
  if (t.limits) {
    limits = {
        {"warn_low", t.limits->warn_low},
        {"warn_high", t.limits->warn_high},
        {"low", t.limits->low},
        {"high", t.limits->high},
        {"basis", t.limits->basis == rules::LimitsBasis::MethodTargets ? "method-targets"
                                                                       : "last-passing-checks"},
        {"n", t.limits->n},
        {"established", t.established}};
  }
  return Json{{"method", t.method_code},
              {"method_version", t.method_version},
              {"instrument", t.instrument_code},
              {"analyte", t.analyte},
              {"as_of", json_instant(t.as_of)},
              {"points", points},
              {"mean", t.limits ? Json(t.limits->mean) : Json(nullptr)},
              {"sd", t.limits ? Json(t.limits->sd) : Json(nullptr)},
              {"limits", limits},
              {"no_limits", t.limits ? Json(nullptr) : Json(t.no_limits)},
              {"violations", violations},
              {"trend_rules", t.trend_rules},
              {"total_points", t.total_points}};
}

void print_trend(std::ostream& out, const app::TrendOutcome& t, const LabZone& zone) {
  out << "Trend of the " << t.analyte << " check standard, method " << t.method_code << " v"
      << t.method_version << ", instrument " << t.instrument_code << ", as of "
      << zone.format_local(t.as_of) << "\n";
  if (t.limits) {
    const auto& l = *t.limits;
    out << "  limits "
        << (l.basis == rules::LimitsBasis::MethodTargets
                ? std::string("set by the method")
                : "from the last " + std::to_string(l.n) + " passing checks")
        << ": mean " << format_fixed(l.mean, 2) << " %, s " << format_sig(l.sd, 3) << " %; ±2s "
        << format_fixed(l.warn_low, 2) << "–" << format_fixed(l.warn_high, 2) << " %, ±3s "
        << format_fixed(l.low, 2) << "–" << format_fixed(l.high, 2) << " %\n";
    if (!t.established) {
      out << "  fewer than " << rules::kLimitChecks
          << " passing checks: the limits are not yet established, and no violation makes a "
             "curve stale\n";
    }
  } else {
    out << "  no control limits: " << t.no_limits << "\n";
  }
  std::string rules_text;
  for (const auto& r : t.trend_rules) rules_text += (rules_text.empty() ? "" : ", ") + r;
  out << "  rules that make a curve stale (the method's trend_rules): "
      << (rules_text.empty() ? "none" : rules_text) << "\n";
  if (t.points.empty()) {
    out << "No check standards with a recovery.\n";
    return;
  }
  if (static_cast<long>(t.points.size()) < t.total_points) {
    out << "  the last " << t.points.size() << " of " << t.total_points << " checks\n";
  }
  // The chart: z from −4 to +4, six characters per s; | at ±3s, : at ±2s, + at the mean.
  constexpr int kPerSd = 6;
  constexpr int kWidth = 8 * kPerSd + 1;
  const auto column = [&](double z) { return static_cast<int>(std::lround((z + 4) * kPerSd)); };
  std::string axis(kWidth, ' ');
  const auto label = [&](double z, const std::string& text) {
    const int at = column(z) - static_cast<int>(text.size()) / 2;
    for (std::size_t i = 0; i < text.size(); ++i) {
      if (at + static_cast<int>(i) >= 0 && at + static_cast<int>(i) < kWidth) {
        axis[static_cast<std::size_t>(at) + i] = text[i];
      }
    }
  };
  if (t.limits) {
    label(-3, "-3s");
    label(-2, "-2s");
    label(0, "mean");
    label(2, "+2s");
    label(3, "+3s");
  }
  Table table({{"at"},
               {"check", Table::Align::Right},
               {"recovery", Table::Align::Right},
               {""},
               {t.limits ? axis : std::string()},
               {"rules"}});
  for (const auto& p : t.points) {
    std::string rules;
    bool rejecting = false, warning = false;
    for (const auto& v : t.violations) {
      if (v.violation.check_id != p.check.id) continue;
      rules += (rules.empty() ? "" : " ") + std::string(rules::to_string(v.violation.rule));
      if (v.violation.warning_only) {
        warning = true;
      } else {
        rejecting = true;
      }
      if (v.makes_stale) rules += "*";
    }
    std::string chart;
    if (p.z) {
      chart.assign(kWidth, ' ');
      chart[static_cast<std::size_t>(column(-3))] = '|';
      chart[static_cast<std::size_t>(column(3))] = '|';
      chart[static_cast<std::size_t>(column(-2))] = ':';
      chart[static_cast<std::size_t>(column(2))] = ':';
      chart[static_cast<std::size_t>(column(0))] = '+';
      const char mark = rejecting ? 'X' : (warning ? '!' : 'o');
      if (*p.z < -4) {
        chart[0] = '<';
      } else if (*p.z > 4) {
        chart[kWidth - 1] = '>';
      } else {
        chart[static_cast<std::size_t>(column(*p.z))] = mark;
      }
    }
    table.add_row({zone.format_local(p.check.occurred_at), std::to_string(p.check.id.value),
                   format_fixed(p.recovery_pct, 1) + " %", p.check.passed ? "" : "FAILED", chart,
                   rules});
  }
  table.print(out, 2);
  if (!t.violations.empty()) {
    out << "  o in control, ! warning (1-2s), X rejection rule violated; * makes the curve stale "
           "under the method's trend_rules\n";
  }
}

}  // namespace cw::report
