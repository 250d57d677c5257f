// SPDX-License-Identifier: Apache-2.0
// Filling the run report.
#include "report/run_report_view.h"

#include "core/text.h"
#include "report/quantitation_views.h"

namespace cw::report {

namespace {

/// "3, 7, 12" or "3, 7, 12, … (40 in all)".
std::string positions_text(const std::vector<long>& positions) {
  std::string s;
  const std::size_t shown = std::min<std::size_t>(positions.size(), 12);
  for (std::size_t i = 0; i < shown; ++i) s += (i ? ", " : "") + std::to_string(positions[i]);
  if (positions.size() > shown) s += ", … (" + std::to_string(positions.size()) + " in all)";
  return s;
}

/// The reasons as their tokens, short enough for a table cell ("check-failed (check 8)");
/// `result show ID` gives each in full.
std::string reasons_text(const Result& r) {
  std::string s;
  for (const auto& f : r.reasons) s += (s.empty() ? "" : ", ") + std::string(to_string(f.reason));
  if (r.latest_event) {
    s += (s.empty() ? "" : "; ") + std::string(to_string(r.latest_event->reason));
    if (r.latest_event->check_id) {
      s += " (check " + std::to_string(r.latest_event->check_id->value) + ")";
    }
  }
  return s;
}

}  // namespace

void RunReportBuilder::begin(const app::RunView& v) {
  unit_ = v.unit;
  report_.run_id = std::to_string(v.run.id.value);
  report_.file_name = v.run.file_name;
  report_.file_sha256 = v.run.file_sha256;
  report_.method_code = v.method_code;
  report_.method_version = std::to_string(v.method_version);
  report_.instrument_code = v.instrument_code;
  report_.imported_at = zone_.format_local(v.run.acquired_at);
  report_.imported_by = v.run.analyst;
}

void RunReportBuilder::result(const store::RunResultRow& row) {
  const Result& r = row.result;
  Tally& t = tallies_[r.analyte];
  plot::ReportSampleRow s;
  s.position = static_cast<int>(row.position);
  s.sample = r.sample;
  s.analyte = r.analyte;
  s.result_id = std::to_string(r.id.value);
  s.censored = r.censored;
  switch (r.current_status()) {
    case ResultStatus::Reported:
      s.status = plot::SampleStatus::Reported;
      ++t.reported;
      if (r.censored) ++t.censored;
      break;
    case ResultStatus::Refused:
      s.status = plot::SampleStatus::Refused;
      ++t.refused;
      break;
    case ResultStatus::RerunRequired:
      s.status = plot::SampleStatus::RerunRequired;
      ++t.rerun;
      t.rerun_positions.push_back(row.position);
      if (r.latest_event) ++t.rerun_reasons[std::string(to_string(r.latest_event->reason))];
      break;
  }
  s.value = r.status == ResultStatus::Refused ? "refused" : released_text(r, unit_);
  if (r.uncertainty) {
    s.uncertainty = "± " + format_sig(r.uncertainty->expanded, 3);
    if (r.uncertainty->k != 2) s.uncertainty += " (k = " + format_shortest(r.uncertainty->k) + ")";
  }
  std::string flags;
  for (const auto& f : r.flags) flags += (flags.empty() ? "" : ", ") + std::string(to_string(f));
  if (r.dilution != 1) {
    flags += (flags.empty() ? "" : ", ") + std::string("diluted ×") + format_shortest(r.dilution);
  }
  s.flags = flags;
  s.reasons = reasons_text(r);
  report_.samples.push_back(std::move(s));
}

void RunReportBuilder::check(const store::RunCheckRow& row) {
  const Check& k = row.check;
  Tally& t = tallies_[row.analyte];
  plot::ReportCheckRow c;
  c.position = static_cast<int>(row.position);
  c.analyte = row.analyte + (k.kind == CheckKind::Blank ? " (blank)" : "");
  c.nominal = k.kind == CheckKind::Blank ? "blank" : format_shortest(k.nominal);
  c.measured = k.measured ? format_sig(*k.measured, 4) + " " + unit_ : "no solution";
  if (k.recovery_pct) {
    c.recovery = (k.limit_low && k.limit_high
                      ? format_fixed_against(*k.recovery_pct, {*k.limit_low, *k.limit_high}, 1)
                      : format_fixed(*k.recovery_pct, 1)) +
                 " %";
  }
  if (k.kind == CheckKind::Check && k.limit_low && k.limit_high) {
    c.limits = format_shortest(*k.limit_low) + "–" + format_shortest(*k.limit_high) + " %";
  } else if (k.kind == CheckKind::Blank && k.limit_high) {
    c.limits = "< " + format_sig(*k.limit_high, 3) + " " + unit_;
  }
  c.passed = k.passed;
  c.blank = k.kind == CheckKind::Blank;
  if (k.passed) {
    ++(c.blank ? t.blanks_passed : t.passed);
  } else {
    ++(c.blank ? t.blanks_failed : t.failed);
    t.failed_positions.push_back(row.position);
  }
  report_.checks.push_back(std::move(c));
}

void RunReportBuilder::end(const app::RunView& v) {
  (void)v;
  for (const auto& [analyte, t] : tallies_) {
    plot::ReportBracketing b;
    b.analyte = analyte;
    b.reported = static_cast<int>(t.reported);
    b.censored = static_cast<int>(t.censored);
    b.refused = static_cast<int>(t.refused);
    b.rerun_required = static_cast<int>(t.rerun);
    b.checks_passed = static_cast<int>(t.passed);
    b.checks_failed = static_cast<int>(t.failed);
    b.blanks_passed = static_cast<int>(t.blanks_passed);
    b.blanks_failed = static_cast<int>(t.blanks_failed);
    if (t.rerun == 0 && t.failed == 0 && t.blanks_failed == 0 && t.refused == 0) {
      b.outcome = "every sample bracketed by passing check standards";
    } else {
      std::string s;
      if (!t.failed_positions.empty()) {
        s = "check or blank failed at position " + positions_text(t.failed_positions);
      }
      if (t.rerun) {
        std::string why;
        for (const auto& [reason, n] : t.rerun_reasons) {
          why += (why.empty() ? "" : ", ") + reason + " " + std::to_string(n);
        }
        s += (s.empty() ? "" : "; ") + std::to_string(t.rerun) +
             " sample(s) to re-run at position " + positions_text(t.rerun_positions) +
             (why.empty() ? "" : " (" + why + ")");
      }
      if (t.refused) s += (s.empty() ? "" : "; ") + std::to_string(t.refused) + " refused";
      b.outcome = s;
    }
    report_.bracketing.push_back(std::move(b));
  }
}

plot::RunReport RunReportBuilder::finish(const app::RunReportContext& context,
                                         const ReportOrigin& origin) {
  report_.frame.lab = context.lab_name;
  report_.frame.generated_at = zone_.format_local(origin.generated_at);
  report_.frame.created_at = origin.generated_at;
  report_.frame.generated_by = origin.generated_by;
  report_.frame.tool_version = origin.tool_version;
  report_.method_title = context.method_title;
  report_.instrument_name = context.instrument_name.value_or("");
  for (const auto& e : context.entries) {
    std::string at = e.recorded_at;
    try {
      at = zone_.format_local(parse_instant(e.recorded_at));
    } catch (const std::exception&) {
    }
    report_.audit.entries.push_back(
        {e.seq, at, e.actor, e.action, e.entity_kind + " " + e.entity_id});
  }
  if (context.head) {
    report_.audit.head_seq = context.head->seq;
    report_.audit.head_hash = context.head->hash;
  }
  return std::move(report_);
}

}  // namespace cw::report
