// SPDX-License-Identifier: Apache-2.0
// Check standards and blanks measured against a curve, quantified results, and the status
// events that later change what a result may be used for (a result row is never edited).
#pragma once

#include <optional>
#include <string>
#include <vector>

#include "core/time.h"
#include "domain/curve_state.h"
#include "domain/ids.h"

namespace cw {

enum class CheckKind { Check, Blank };
std::string_view to_string(CheckKind k);  // "check" | "blank"
std::optional<CheckKind> parse_check_kind(std::string_view text);

struct Check {
  CheckId id;
  CurveId curve_id;
  CheckKind kind = CheckKind::Check;
  double nominal = 0;
  double response = 0;
  std::optional<double> is_response;
  std::optional<double> measured;      ///< nullopt when the response has no solution
  std::optional<double> recovery_pct;  ///< checks only
  std::optional<double> limit_low;     ///< recovery limits (check)
  std::optional<double> limit_high;    ///< recovery high limit (check) or blank limit (blank)
  bool passed = false;
  std::string analyst;
  Instant occurred_at;
  std::optional<RunId> run_id;  ///< the run it was measured in (read back; not a column)
};

/// The status of a result. A result row is stored reported or refused; a later status event
/// can make it rerun-required (the stored row stays as it was).
enum class ResultStatus { Reported, Refused, RerunRequired };
std::string_view to_string(ResultStatus s);  // "reported" | "refused" | "rerun-required"
std::optional<ResultStatus> parse_result_status(std::string_view text);
std::vector<ResultStatus> all_result_statuses();

/// Remarks attached to a reported result.
enum class ResultFlag {
  BelowRange,  ///< below the lowest calibrator: released as "< limit"
};
std::string_view to_string(ResultFlag f);  // "below-range"
std::optional<ResultFlag> parse_result_flag(std::string_view text);
std::vector<ResultFlag> all_result_flags();

/// The uncertainty budget of a reported value (Eurachem/CITAC QUAM 3rd ed. 2012): relative
/// standard uncertainties combined as the root sum of squares and expanded with k.
struct ResultUncertainty {
  struct Component {
    std::string source;  ///< "calibration", "lot CRM-1", "dilution"
    double relative_u = 0;
  };
  std::vector<Component> components;
  double combined = 0;  ///< u_c, in the unit of the result
  double expanded = 0;  ///< U = k·u_c
  double k = 2;
};

/// Why a reported result must be measured again (calibration-practice.md §5.4).
enum class RerunReason {
  CheckFailed,      ///< a later check or blank of its bracket failed
  SamplesPerCheck,  ///< more samples followed the last passing check than the method allows
  NoClosingCheck,   ///< its run ended without a passing check after it
};
/// "check-failed" | "samples-per-check" | "no-closing-check".
std::string_view to_string(RerunReason r);
std::optional<RerunReason> parse_rerun_reason(std::string_view text);
std::vector<RerunReason> all_rerun_reasons();

/// A change of a result's status, recorded as a new fact.
struct ResultStatusEvent {
  StatusEventId id;
  ResultId result_id;
  ResultStatus status = ResultStatus::RerunRequired;
  RerunReason reason = RerunReason::CheckFailed;
  std::string detail;               ///< the facts in plain words
  std::optional<CheckId> check_id;  ///< the check that caused it (or the last passing check)
  std::optional<RunId> run_id;      ///< the run that decided it
  Instant occurred_at;
};

struct Result {
  ResultId id;
  std::string sample;
  std::string analyte;
  ResultStatus status = ResultStatus::Refused;  ///< as recorded: reported or refused
  std::optional<CurveId> curve_id;
  std::optional<MethodId> method_id;
  std::optional<InstrumentId> instrument_id;
  double response = 0;
  std::optional<double> is_response;
  int replicates = 1;
  double dilution = 1;
  std::optional<double> x0;
  std::optional<double> sd_x0;
  std::optional<double> concentration;
  std::optional<double> ci_low;
  std::optional<double> ci_high;
  std::vector<ResultFlag> flags;
  std::vector<Finding> reasons;  ///< why it was refused, each with its facts
  /// Released as "< reporting_limit" (concentration and interval absent); the computed value is
  /// kept in computed_concentration for the record.
  bool censored = false;
  std::optional<double> reporting_limit;         ///< the limit times the dilution factor
  std::optional<double> computed_concentration;  ///< censored: what was computed, not released
  std::optional<ResultUncertainty> uncertainty;  ///< reported values
  std::string analyst;
  Instant occurred_at;
  std::optional<RunId> run_id;                    ///< read back: the run it came from
  std::optional<long> run_position;               ///< read back: its position in that run
  std::optional<ResultStatusEvent> latest_event;  ///< read back: the latest status event

  bool has_flag(ResultFlag f) const;
  /// The recorded status, overridden by the latest status event.
  ResultStatus current_status() const;
};

}  // namespace cw
