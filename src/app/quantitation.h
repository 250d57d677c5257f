// SPDX-License-Identifier: Apache-2.0
// Check standards and blanks against a curve, and quantitation of samples (product.md §5.3).
// Each is decided by a pure function (domain/) inside the one transaction that records it.
#pragma once

#include <optional>
#include <string>
#include <vector>

#include "app/curve_view.h"
#include "app/session.h"
#include "domain/bracketing.h"
#include "domain/check.h"
#include "domain/check_judgement.h"
#include "domain/quantitation.h"

namespace cw::app {

struct CheckRequest {
  CurveId curve;
  CheckReading reading;
};

struct CheckOutcome {
  Check check;
  CurveView curve;                       ///< the curve with its state after the check
  std::vector<Result> affected_results;  ///< results since the last passing check, to re-run
  std::string unit;
};

/// The last passing check standard among `checks` at or before `at` (except `except`).
struct SinceLastPass {
  std::optional<Instant> at;  ///< nullopt: none (count from the curve's acquisition)
  std::optional<CheckId> check;
};
SinceLastPass since_last_pass(const std::vector<Check>& checks, Instant at,
                              std::optional<CheckId> except = std::nullopt);

/// The first check among `checks` after `at` that closes or fails the bracket `at` lies in (a
/// passing check standard, or a failed check or blank); checks of one second in the order they
/// were recorded. Nullopt when none was logged for a later time.
std::optional<Check> next_bracket_check(const std::vector<Check>& checks, Instant at);

/// Records `decision` as a rerun-required status event with its own audit entry.
void record_rerun(store::WriteUnit& unit, const RerunDecision& decision, std::optional<RunId> run,
                  Instant at);

/// Records a check or blank; a failure makes the curve stale (check-failed), lists the results
/// reported from it since its last passing check standard and makes each of them
/// rerun-required (a status event; those already rerun-required are listed, not marked again).
/// A check against a rejected or retired curve is refused (recorded, RefusedError).
CheckOutcome log_check(Session& s, const CheckRequest& request);

/// Which curve to quantify against: one by id, or the one active curve of a group.
struct CurveChoice {
  std::optional<CurveId> curve;
  std::string method;
  std::string instrument;
  std::string analyte;
};

struct QuantifyRequest {
  CurveChoice target;
  QuantitationReading reading;
  std::string sample;
};

struct QuantifyOutcome {
  Result result;
  std::optional<CurveView> curve;
  std::string unit;
  std::optional<double> reporting_limit;  ///< below the working range: "< limit"
  std::optional<double> suggested_dilution;
  std::vector<Lot> lots;
  std::optional<int> method_version;
};

/// Quantifies one sample; refusals are recorded as results with status refused. Besides the
/// curve's state, the method's samples_per_check is enforced: when that many results have been
/// reported from the curve since its last passing check standard, the quantitation is refused
/// with check-due.
QuantifyOutcome quantify(Session& s, const QuantifyRequest& request);

}  // namespace cw::app
