// SPDX-License-Identifier: Apache-2.0
// A method and its immutable, numbered versions (the parsed method file).
#pragma once

#include <optional>
#include <string>
#include <vector>

#include "core/time.h"
#include "domain/ids.h"
#include "fitting/acceptance.h"
#include "fitting/fit.h"

namespace cw {

/// What a result must reach to be released as a number: below it a result is censored
/// ("< limit"). The lowest calibrator by default (never extrapolate below the range); a method may
/// report down to its limit of quantitation or of detection instead.
enum class ReportLimit { LowestCalibrator, Loq, Lod };
std::string_view to_string(ReportLimit r);  // "lowest-calibrator" | "loq" | "lod"
std::optional<ReportLimit> parse_report_limit(std::string_view text);

/// [calibration] of a method file.
struct CalibrationRules {
  fitting::Model model = fitting::Model::Linear;
  fitting::Weighting weighting = fitting::Weighting::None;
  int min_levels = 5;
  std::optional<double> min_r2;
  std::optional<double> max_error_pct;
  std::optional<double> max_error_pct_lowest;
  std::optional<double> min_levels_within;
  std::optional<double> max_rf_rsd_pct;
  Duration valid_for;
  bool review_required = true;
  /// Which definition of LOD and LOQ the method reports with and judges blanks by.
  fitting::LimitDefinition limits = fitting::LimitDefinition::IchQ2;
  ReportLimit report_limit = ReportLimit::LowestCalibrator;

  fitting::AcceptanceCriteria acceptance_criteria() const;
};

/// [check] of a method file.
struct CheckRules {
  double tolerance_pct = 10.0;           ///< recovery must lie within 100 ± this
  std::optional<int> samples_per_check;  ///< samples allowed after a passing check (runs)
  std::optional<Duration> check_every;   ///< a passing check is due this often
  std::vector<std::string> trend_rules;  ///< Westgard rules that make the curve stale
  std::optional<double> blank_limit;     ///< blank passes below this (else below the LOD)
  /// Established control limits of the check standard's recovery (percent), for trending;
  /// both or neither. Without them the limits come from the last 20 passing checks.
  std::optional<double> trend_mean;
  std::optional<double> trend_sd;
};

/// [uncertainty] of a method file: components of a result's budget the method declares.
struct UncertaintyRules {
  /// Relative standard uncertainty of a dilution factor, in percent (applied when the dilution
  /// factor is not 1).
  std::optional<double> dilution_pct;
};

/// The content of one method file.
struct MethodDefinition {
  std::string code;
  std::string title;
  std::string unit;
  std::vector<std::string> analytes;
  std::optional<std::string> internal_standard;
  CalibrationRules calibration;
  CheckRules check;
  UncertaintyRules uncertainty;

  bool has_analyte(const std::string& name) const;
  /// The response on the fitted scale: `response`, or `response / is_response` when the method
  /// uses an internal standard. Throws ValidationError (naming the labels) when the
  /// internal-standard response is missing, given without an internal standard, not above 0, or
  /// when the ratio overflows.
  double fitted_response(double response, const std::optional<double>& is_response,
                         const std::string& response_label,
                         const std::string& is_response_label) const;
};

struct MethodVersion {
  MethodVersionId id;
  MethodId method_id;
  int version = 1;
  Instant effective_at;
  MethodDefinition definition;
  std::string source_name;
  std::string source_text;
  std::string source_sha256;
  std::optional<std::string> reason;
};

struct Method {
  MethodId id;
  std::string code;
  Instant registered_at;
  std::vector<MethodVersion> versions;  ///< in version order

  /// The version in force at `t` (the latest whose effective_at <= t), or nullptr.
  const MethodVersion* version_at(Instant t) const;
  const MethodVersion* version_number(int n) const;
  const MethodVersion& latest() const { return versions.back(); }
};

}  // namespace cw
