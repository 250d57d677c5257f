// SPDX-License-Identifier: Apache-2.0
// Inputs of the report tests: a nitrate calibration fitted for real and filled into a
// CurveReport as a caller would (numbers formatted, instants as lab-local text), and an
// imported run of any length with censored values, refusals, re-runs and a failed check.
#pragma once

#include <chrono>
#include <cmath>
#include <cstdio>
#include <set>
#include <string>
#include <utility>
#include <vector>

#include "fitting/fit.h"
#include "plot/curve_report.h"
#include "plot/run_report.h"
#include "plot/ticks.h"

namespace report_test {

using cw::plot::format_significant;

// 2024-03-05T13:30:00Z, the instant the reports pretend to be generated at.
inline const cw::Instant kGenerated = std::chrono::sys_days{std::chrono::year{2024} / 3 / 5} +
                                      std::chrono::hours{13} + std::chrono::minutes{30};

inline const char* const kHeadHash =
    "9f2c4e1a7b3d5f60819a2b3c4d5e6f708192a3b4c5d6e7f8091a2b3c4d5e6f70";

inline cw::plot::ReportFrame frame() {
  cw::plot::ReportFrame f;
  f.lab = "Riverside Water Laboratory";
  f.generated_at = "2024-03-05 14:30 +01:00";
  f.created_at = kGenerated;
  f.generated_by = "mlopez";
  f.tool_version = "curvewarden 0.9.0";
  return f;
}

inline cw::plot::AuditReference audit(std::vector<cw::plot::AuditEntryRef> entries) {
  cw::plot::AuditReference a;
  a.entries = std::move(entries);
  a.head_seq = 57;
  a.head_hash = kHeadHash;
  a.verification = "chain verified: 57 entries, intact";
  return a;
}

// Deterministic scatter in [-1, 1].
inline double scatter(int i) {
  return std::sin(i * 2.399963);
}

inline std::string fixed(double v, int decimals) {
  char buffer[64];
  std::snprintf(buffer, sizeof buffer, "%.*f", decimals, v);
  return buffer;
}

/// A nitrate calibration by ion chromatography: `levels` nominal concentrations in mg/L with
/// `replicates` injections each, unweighted straight line; `excluded` lists (level index,
/// replicate) pairs left out of the fit.
inline cw::plot::CurveReport curve_report(const std::vector<double>& levels, int replicates,
                                          std::set<std::pair<int, int>> excluded = {}) {
  using cw::fitting::Model;
  using cw::fitting::Weighting;
  std::vector<cw::fitting::Observation> observations;
  std::vector<cw::plot::CurvePlotPoint> points;
  int i = 0;
  for (std::size_t level = 0; level < levels.size(); ++level) {
    for (int rep = 1; rep <= replicates; ++rep, ++i) {
      const double x = levels[level];
      double y = 1500 + 8400 * x;
      y *= 1 + 0.012 * scatter(i);
      y += 250 * scatter(i + 101);
      const bool out = excluded.count({static_cast<int>(level), rep}) > 0;
      if (out) y *= 1.35;
      observations.push_back({x, y, out});
      cw::plot::CurvePlotPoint p;
      p.nominal = x;
      p.response = y;
      p.level = "L" + std::to_string(level + 1);
      p.replicate = rep;
      p.excluded = out;
      if (out) p.exclusion_reason = "air bubble in the sample loop";
      points.push_back(p);
    }
  }
  const cw::fitting::FitResult fit = cw::fitting::fit(Model::Linear, Weighting::None, observations);

  cw::plot::CurveReport r;
  r.frame = frame();
  r.curve_id = "17";
  r.calibration_id = "9";
  r.analyte = "nitrate";
  r.method_code = "NITRATE-IC";
  r.method_version = "2";
  r.method_title = "Anions in drinking water by ion chromatography";
  r.instrument_code = "IC-02";
  r.instrument_name = "ion chromatograph, conductivity detector";
  r.lots = {{"NO3-2291", "nitrate stock standard 1000 mg/L", "CRM-2291-B", "2025-06-30", ""},
            {"MIX-0147", "seven-anion mix 100 mg/L", "CoA 0147/23", "2024-11-30", ""}};
  r.acquired_at = "2024-03-01 09:12 +01:00";
  r.analyst = {"jdoe (Jane Doe)", "2024-03-01 09:40 +01:00", "logged the calibration", {}};
  r.reviewer = cw::plot::PersonLine{"akim (Alex Kim)", "2024-03-01 11:05 +01:00",
                                    "approved: all criteria met", std::nullopt};

  cw::plot::ReportFit& f = r.fit;
  f.model = "linear";
  f.weighting = "unweighted";
  f.equation = "y = " + format_significant(fit.intercept, 5) + " + " +
               format_significant(fit.slope, 6) + "\u00b7x";
  f.parameters = {
      {"intercept a", format_significant(fit.intercept, 5),
       format_significant(fit.se_intercept, 3)},
      {"slope b", format_significant(fit.slope, 6), format_significant(fit.se_slope, 3)}};
  f.r2 = fixed(fit.r2, 6);
  f.residual_sd = format_significant(fit.residual_sd, 4);
  f.dof = std::to_string(fit.dof);
  f.points = std::to_string(points.size()) + " (" + std::to_string(excluded.size()) +
             " excluded) at " + std::to_string(levels.size()) + " levels";
  f.working_range =
      format_significant(fit.range_low) + "\u2013" + format_significant(fit.range_high) + " mg/L";
  f.limits.push_back({"ICH Q2(R2)", format_significant(fit.lod, 3) + " mg/L",
                      format_significant(fit.loq, 3) + " mg/L",
                      "LOD = 3.3\u00b7\u03c3/S, LOQ = 10\u00b7\u03c3/S; " + fit.lod_definition});
  if (fit.din) {
    f.limits.push_back(
        {"DIN 32645", format_significant(fit.din->detection_limit, 3) + " mg/L",
         fit.din->quantification_limit
             ? format_significant(*fit.din->quantification_limit, 3) + " mg/L"
             : "\u2013",
         "calibration method, \u03b1 = \u03b2 = 0.01, k = 3, m = 1: x_NG from the prediction "
         "interval at the blank, x_EG = 2\u00b7x_NG, x_BG = k\u00b7s_x0 at x_BG"});
  }
  if (fit.mandel) {
    f.mandel = "test value " + format_significant(fit.mandel->test_value, 3) +
               " against F(0.99; 1, " + std::to_string(fit.mandel->dof_quadratic) +
               ") = " + format_significant(fit.mandel->f_critical_99, 4) + ": " +
               (fit.mandel->linear_adequate ? "the straight line is adequate"
                                            : "a quadratic fits significantly better");
  }

  bool any_fail = false;
  for (std::size_t k = 0; k < points.size(); ++k) {
    const cw::fitting::PointFit& pf = fit.points[k];
    const double limit = points[k].nominal == levels.front() ? 20 : 15;
    points[k].error_pct = pf.error_pct;
    points[k].within_limits =
        !points[k].excluded && (!pf.error_pct || std::abs(*pf.error_pct) <= limit);
    cw::plot::ReportLevelRow row;
    row.level = points[k].level;
    row.replicate = points[k].replicate;
    row.nominal = format_significant(points[k].nominal);
    row.response = fixed(points[k].response, 0);
    row.back_calculated = pf.back_calculated ? format_significant(*pf.back_calculated, 4) : "-";
    row.error_pct = pf.error_pct ? (*pf.error_pct >= 0 ? "+" : "") + fixed(*pf.error_pct, 1) : "-";
    row.limit = "\u00b1" + fixed(limit, 0);
    if (points[k].excluded) {
      row.outcome = cw::plot::PointOutcome::Excluded;
      row.reason = points[k].exclusion_reason;
    } else if (!points[k].within_limits) {
      row.outcome = cw::plot::PointOutcome::Fail;
      row.reason = "|%RE| above the level's limit";
      any_fail = true;
    }
    r.levels.push_back(row);
  }

  cw::plot::CurvePlot& plot = r.plot;
  plot.title = "Curve 17 \u00b7 NITRATE-IC v2 \u00b7 IC-02";
  plot.analyte = "nitrate";
  plot.unit = "mg/L";
  plot.response_label = "peak area";
  plot.fit = fit;
  plot.points = points;
  plot.range_low = fit.range_low;
  plot.range_high = fit.range_high;
  plot.lod = fit.lod;
  plot.loq = fit.loq;
  plot.error_limit_pct = 15;
  plot.lowest_error_limit_pct = 20;
  plot.r2 = fit.r2;
  plot.equation = f.equation;
  plot.page.created_at = kGenerated;

  r.accepted = fit.r2 >= 0.995 && !any_fail && fit.n_levels >= 5;
  r.criteria = {
      {"distinct levels fitted", std::to_string(fit.n_levels), "\u2265 5", fit.n_levels >= 5},
      {"coefficient of determination r\u00b2", fixed(fit.r2, 6), "\u2265 0.995", fit.r2 >= 0.995},
      {"%RE of every back-calculated point", any_fail ? "outside at some levels" : "all within",
       "\u00b115 % (\u00b120 % at the lowest level)", !any_fail},
      {"levels within their %RE limits", any_fail ? "not all" : "100 %", "100 %", !any_fail},
  };
  r.state = "active";
  r.state_at = "2024-03-05 14:30 +01:00";
  r.usable = true;
  r.valid_until = "2024-03-15 09:12 +01:00";
  r.audit = audit({{41, "2024-03-01 09:40 +01:00", "jdoe", "curve.log", "calibration 9"},
                   {44, "2024-03-01 11:05 +01:00", "akim", "curve.review", "curve 17"},
                   {52, "2024-03-04 08:15 +01:00", "jdoe", "check.log", "check 23"}});
  return r;
}

/// A run of `rows` sample results over three anions with a check standard every 20 positions;
/// the check at position 261 fails, so the nitrate results after it are to be re-run.
inline cw::plot::RunReport run_report(int rows) {
  cw::plot::RunReport r;
  r.frame = frame();
  r.run_id = "31";
  r.file_name = "IC-02_2024-03-04_sequence-A.csv";
  r.file_sha256 = "3a7bd3e2360a3d29eea436fcfb7e44c735d117c42d1c1835420b6b9942dd4f1b";
  r.method_code = "ANIONS-IC";
  r.method_version = "4";
  r.method_title = "Anions in drinking water by ion chromatography";
  r.instrument_code = "IC-02";
  r.instrument_name = "ion chromatograph, conductivity detector";
  r.imported_at = "2024-03-04 17:02 +01:00";
  r.imported_by = "jdoe";

  const char* const analytes[] = {"nitrate", "chloride", "sulfate"};
  int position = 0;
  int failed_at = -1;
  std::vector<cw::plot::ReportBracketing> summary(3);
  for (std::size_t a = 0; a < 3; ++a) summary[a].analyte = analytes[a];
  for (int i = 0; i < rows; ++i) {
    if (i % 20 == 0) {
      ++position;
      const int a = (i / 20) % 3;
      const bool fails = position > 250 && failed_at < 0 && a == 0;
      const double recovery = fails ? 84.2 : 100 + 4 * scatter(i);
      if (fails) failed_at = position;
      r.checks.push_back({position, analytes[a], "10.0 mg/L", fixed(recovery / 10, 2) + " mg/L",
                          fixed(recovery, 1) + " %", "90\u2013110 %", !fails});
      ++(fails ? summary[static_cast<std::size_t>(a)].checks_failed
               : summary[static_cast<std::size_t>(a)].checks_passed);
    }
    ++position;
    cw::plot::ReportSampleRow s;
    s.position = position;
    s.sample = "WS-24-" + std::to_string(1000 + i / 3);
    const int a = i % 3;
    s.analyte = analytes[a];
    s.result_id = std::to_string(5000 + i);
    const double value = 2 + 30 * (0.5 + 0.5 * scatter(i + 7));
    cw::plot::ReportBracketing& b = summary[static_cast<std::size_t>(a)];
    if (a == 0 && failed_at > 0) {
      s.status = cw::plot::SampleStatus::RerunRequired;
      s.value = fixed(value, 2) + " mg/L";
      s.reasons =
          "bracketing check at position " + std::to_string(failed_at) + " failed (84.2 % recovery)";
      ++b.rerun_required;
    } else if (i % 37 == 5) {
      s.status = cw::plot::SampleStatus::Refused;
      s.value = "refused";
      s.reasons = "response above the working range (0.5\u2013100 mg/L); dilute and re-inject";
      ++b.refused;
    } else if (i % 23 == 3) {
      s.value = "< 0.50 mg/L";
      s.censored = true;
      s.flags = "below LOQ";
      ++b.reported;
      ++b.censored;
    } else {
      s.value = fixed(value, 2) + " mg/L";
      s.uncertainty = "\u00b1 " + fixed(value * 0.06, 2);
      if (i % 11 == 4) s.flags = "diluted \u00d710";
      ++b.reported;
    }
    r.samples.push_back(s);
  }
  for (auto& b : summary) {
    b.outcome = b.checks_failed > 0 ? "results after the check at position " +
                                          std::to_string(failed_at) + " are to be re-run"
                                    : "every result bracketed by passing checks";
  }
  r.bracketing = summary;
  r.audit = audit({{55, "2024-03-04 17:02 +01:00", "jdoe", "run.import", "run 31"}});
  return r;
}

}  // namespace report_test
