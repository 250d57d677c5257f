// SPDX-License-Identifier: Apache-2.0
// Calibrations, curves, points, reviews, retirements, checks, results and refusals.
#pragma once

#include <optional>
#include <string>
#include <vector>

#include "domain/check.h"
#include "domain/curve.h"
#include "store/connection.h"

namespace cw::store {

// ---- writes (each row is added to the transaction's current audit entry)
CalibrationId insert_calibration(WriteTransaction& tx, const Calibration& c);
CurveId insert_curve(WriteTransaction& tx, const Curve& c);
void insert_review(WriteTransaction& tx, CurveId id, const CurveReview& r);
void insert_retirement(WriteTransaction& tx, CurveId id, const CurveRetirement& r);
CheckId insert_check(WriteTransaction& tx, const Check& k);
ResultId insert_result(WriteTransaction& tx, const Result& r);

struct Refusal {
  std::string action;
  std::string entity_kind;
  std::string entity_id;
  std::vector<std::string> reasons;
  std::string message;
  Instant occurred_at;
};
void insert_refusal(WriteTransaction& tx, const Refusal& r);

// ---- reads
std::optional<Calibration> find_calibration(Connection& c, CalibrationId id);
/// The curve with points, reviews and retirements, and its calibration's analyst.
std::optional<Curve> find_curve(Connection& c, CurveId id);
std::vector<CurveId> curves_of_calibration(Connection& c, CalibrationId id);

struct CurveFilter {
  std::optional<MethodId> method;
  std::optional<InstrumentId> instrument;
  std::optional<std::string> analyte;
  std::optional<Instant> acquired_by;  ///< acquired at or before
};
std::vector<CurveId> list_curve_ids(Connection& c, const CurveFilter& f);

/// Curves of a method, instrument and analyte acquired in (after, by] that have not expired
/// at `by` (expires_at > by): the only ones that can be active at `by`.
std::vector<CurveId> live_curves_in_group(Connection& c, MethodId method, InstrumentId instrument,
                                          const std::string& analyte, std::optional<Instant> after,
                                          Instant by);
/// The most recently acquired curve of a group acquired at or before `by`, if any; with
/// `accepted_only`, the most recent one that passed acceptance.
std::optional<CurveId> latest_curve_in_group(Connection& c, MethodId method,
                                             InstrumentId instrument, const std::string& analyte,
                                             Instant by, bool accepted_only = false);
/// Reported results of a curve in (after, until].
std::vector<Result> reported_results_between(Connection& c, CurveId id,
                                             std::optional<Instant> after, Instant until);
/// Results of several curves.
std::vector<Result> results_of_curves(Connection& c, const std::vector<CurveId>& ids);
/// Pairs (method, analyte) that have had curves on an instrument.
std::vector<std::pair<MethodId, std::string>> method_analytes_of_instrument(
    Connection& c, InstrumentId instrument);
/// Curves whose expiry moment lies in [from, to), soonest first (index on expires_at).
std::vector<CurveId> curves_expiring_between(Connection& c, Instant from, Instant to);
/// Curves not yet expired at `t` and acquired by `t` (expires_at > t), of one instrument.
std::vector<CurveId> live_curves_of_instrument(Connection& c, InstrumentId instrument, Instant t);
/// Curves made with a lot.
std::vector<CurveId> curves_of_lot(Connection& c, LotId lot);

std::vector<Check> checks_of_curve(Connection& c, CurveId id);
std::optional<Check> find_check(Connection& c, CheckId id);
/// The most recent failed checks (at or before `by`) of curves on an instrument, newest first.
std::vector<Check> recent_failed_checks(Connection& c, InstrumentId instrument, Instant by,
                                        std::size_t limit);
std::optional<Result> find_result(Connection& c, ResultId id);
std::vector<Result> results_of_curve(Connection& c, CurveId id);

/// Counts by instrument of curves whose expiry is at or before `t` (settled: their state can
/// no longer be active), split into rejected-by-acceptance, rejected-by-review, retired,
/// never-reviewed (review required) and the rest (stale).
struct SettledCounts {
  long rejected = 0, retired = 0, awaiting_review = 0, stale = 0;
};
SettledCounts settled_curve_counts(Connection& c, InstrumentId instrument, Instant t);

/// The query plan of the expiring-window query (for the index test).
std::string explain_expiring_query(Connection& c);

}  // namespace cw::store
