// SPDX-License-Identifier: Apache-2.0
// The calibration report of one curve: identification, plot, fit, levels, verdict with every
// criterion, the state now, the audit entries, the cautions and fields to sign.
#pragma once

#include <optional>
#include <string>
#include <vector>

#include "plot/curve_plot.h"
#include "plot/report.h"

namespace cw::plot {

/// A reference-material lot used for the calibrators.
struct ReportLot {
  std::string code;
  std::string material;
  std::string certificate;  ///< certificate number or reference; may be empty
  std::string expires;      ///< expiry date as display text
  std::string note;         ///< e.g. "withdrawn 2024-03-04"; may be empty
};

/// One fitted parameter with its standard error, as display text.
struct ReportParameter {
  std::string name;  ///< e.g. "intercept", "slope"
  std::string estimate;
  std::string standard_error;
};

/// Limits of detection and quantitation by one definition.
struct ReportLimits {
  std::string basis;       ///< e.g. "ICH Q2(R2)", "DIN 32645"
  std::string lod;         ///< with its unit
  std::string loq;         ///< with its unit
  std::string definition;  ///< how they were computed, in words and symbols
};

/// The fit in numbers.
struct ReportFit {
  std::string model;      ///< e.g. "linear"
  std::string weighting;  ///< e.g. "1/x"
  std::string equation;   ///< e.g. "y = 1523 + 8391·x"
  std::vector<ReportParameter> parameters;
  std::string r2;
  std::string residual_sd;  ///< s(y/x), with its unit when it has one
  std::string dof;
  std::string points;         ///< e.g. "15 (1 excluded) at 5 levels"
  std::string working_range;  ///< e.g. "0.5–100 mg/L"
  std::vector<ReportLimits> limits;
  std::string mandel;  ///< Mandel's test and its conclusion; may be empty
};

/// How a calibration point came out.
enum class PointOutcome {
  Within,    ///< back-calculated within its %RE limit
  Fail,      ///< outside its limit
  Excluded,  ///< kept in the record, not fitted
};

/// One calibration point as display text.
struct ReportLevelRow {
  std::string level;
  int replicate = 1;
  std::string nominal;
  std::string response;
  std::string back_calculated;
  std::string error_pct;  ///< signed %RE, e.g. "+2.4"
  std::string limit;      ///< the %RE limit that applies, e.g. "±15"
  PointOutcome outcome = PointOutcome::Within;
  std::string reason;  ///< why it was excluded, or what failed
};

/// One acceptance criterion with its measured value and limit.
struct ReportCriterion {
  std::string name;   ///< e.g. "coefficient of determination r²"
  std::string value;  ///< e.g. "0.99962"
  std::string limit;  ///< e.g. "≥ 0.995"
  bool passed = true;
};

/// Everything the curve report shows.
struct CurveReport {
  ReportFrame frame;
  std::string curve_id;        ///< e.g. "17"
  std::string calibration_id;  ///< may be empty
  std::string analyte;
  std::string method_code;
  std::string method_version;  ///< e.g. "2"
  std::string method_title;
  std::string instrument_code;
  std::string instrument_name;  ///< may be empty
  std::vector<ReportLot> lots;
  std::string acquired_at;  ///< lab-local display text
  std::string note;         ///< the analyst's note; may be empty
  PersonLine analyst;
  std::optional<PersonLine> reviewer;  ///< nullopt: not reviewed (yet)
  ReportFit fit;
  std::vector<ReportLevelRow> levels;
  /// The curve plot, drawn on the report page as vector graphics. Its page size is not used:
  /// the report lays the plot out at 760 × 600 units and scales it to the text width.
  CurvePlot plot;
  bool accepted = false;  ///< the verdict at logging
  std::vector<ReportCriterion> criteria;
  std::string state;     ///< the state now, e.g. "active", "stale"
  std::string state_at;  ///< when the state was evaluated, lab-local display text
  bool usable = false;   ///< results may be quantified against the curve now
  std::vector<std::string> state_reasons;
  std::string valid_until;  ///< lab-local display text; may be empty
  AuditReference audit;
};

/// Lays out `report` on A4 pages and writes it to `path` as PDF; returns the number of pages.
/// Throws ValidationError when `path` does not end in ".pdf", when the plot is invalid (see
/// render_curve_plot()) or when the file cannot be written (no file is left behind then).
int render_curve_report(const CurveReport& report, const std::string& path);

}  // namespace cw::plot
