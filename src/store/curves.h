// SPDX-License-Identifier: Apache-2.0
// Calibrations, curves with their points, reviews and retirements, checks, results and refusals:
// reading (in batches where a command needs many) and appending facts.
#pragma once

#include <cstddef>
#include <cstdint>
#include <map>
#include <optional>
#include <string>
#include <vector>

#include "domain/check.h"
#include "domain/curve.h"
#include "domain/curve_state.h"

namespace cw::store {

/// A refused action, recorded with its typed reasons.
struct Refusal {
  std::string action;  ///< e.g. "curve.review"
  std::string entity_kind;
  std::string entity_id;
  std::vector<Reason> reasons;
  std::string message;
  Instant occurred_at;
};

/// How much of each curve `CurveReader::curves` reads; each level includes the one before.
enum class CurveDetail {
  State,       ///< what its state needs: the row, reviews, retirements (acceptance if rejected)
  Statistics,  ///< and its fit statistics and acceptance (parsed from JSON: most of the cost)
  Points,      ///< and its calibration points
};

struct CurveFilter {
  std::optional<MethodId> method;
  std::optional<InstrumentId> instrument;
  std::optional<std::string> analyte;
  Instant acquired_by;  ///< acquired at or before
};

class CurveReader {
 public:
  virtual ~CurveReader() = default;

  virtual std::optional<Calibration> calibration(CalibrationId id) = 0;
  virtual std::vector<Calibration> calibrations(const std::vector<CalibrationId>& ids) = 0;
  /// Curves with reviews and retirements and, as `detail` asks, their fit statistics (left
  /// default-constructed otherwise) and points; missing ids are left out. One query per kind of
  /// row, whatever the number of ids.
  virtual std::vector<Curve> curves(const std::vector<CurveId>& ids, CurveDetail detail) = 0;
  /// Checks of the curves, each curve's in time order.
  virtual std::vector<Check> checks_of(const std::vector<CurveId>& ids) = 0;
  /// Checks (and blanks) on result `id`'s curve given the result's own second but recorded
  /// after it (times are kept to the second: the recorded order says which came first).
  virtual std::vector<CheckId> checks_recorded_after(ResultId id) = 0;
  /// Checks (and blanks) of every curve of a method, instrument and analyte, in time order.
  virtual std::vector<Check> checks_of_group(MethodId method, InstrumentId instrument,
                                             const std::string& analyte) = 0;

  /// Ids of curves matching `f`, oldest first.
  virtual std::vector<CurveId> list(const CurveFilter& f) = 0;
  virtual std::vector<CurveId> of_calibration(CalibrationId id) = 0;
  /// Curves of a group acquired in [after, by] whose expiry is after `by`: the only ones that
  /// can be active at `by`. Newest first.
  virtual std::vector<CurveId> live_in_group(MethodId method, InstrumentId instrument,
                                             const std::string& analyte,
                                             std::optional<Instant> after, Instant by) = 0;
  /// The most recently acquired curve of a group at or before `by` (only accepted ones with
  /// `accepted_only`).
  virtual std::optional<CurveId> latest_in_group(MethodId method, InstrumentId instrument,
                                                 const std::string& analyte, Instant by,
                                                 bool accepted_only) = 0;
  /// The groups (method, instrument, analyte) with a curve whose expiry moment lies in
  /// [from, to), each once, in that order.
  virtual std::vector<CurveGroup> groups_expiring_between(Instant from, Instant to) = 0;
  /// Curves of an instrument acquired by `t` whose expiry is after `t`.
  virtual std::vector<CurveId> live_of_instrument(InstrumentId instrument, Instant t) = 0;
  /// How many curves of an instrument are settled (expiry at or before `t`) in each state at
  /// `t`, summed from the derived tally steps (domain/settled_state.h); states with none left
  /// out.
  virtual std::vector<std::pair<CurveState, std::int64_t>> settled_counts(InstrumentId instrument,
                                                                          Instant t) = 0;
  /// (method, analyte) pairs that have had curves on an instrument.
  virtual std::vector<std::pair<MethodId, std::string>> method_analytes(
      InstrumentId instrument) = 0;
  virtual std::vector<CurveId> of_lot(LotId lot) = 0;
  /// Compares the derived tally steps of settled curves (settled_counts) with the steps the
  /// stored facts give, curve by curve: the first disagreement in words, nullopt when none.
  virtual std::optional<std::string> settled_tallies_disagreement() = 0;

  virtual std::optional<Check> check(CheckId id) = 0;
  /// The most recent failed checks (at or before `by`) of each instrument's curves, at most
  /// `limit` each, newest first; every instrument asked for has an entry. One pass back through
  /// the lab's failed checks, which ends once every instrument has its `limit`.
  virtual std::map<InstrumentId, std::vector<Check>> recent_failed_checks(
      const std::vector<InstrumentId>& instruments, Instant by, std::size_t limit) = 0;

  virtual std::optional<Result> result(ResultId id) = 0;
  /// Results of the curves, in time order.
  virtual std::vector<Result> results_of(const std::vector<CurveId>& ids) = 0;
  /// Reported results of a curve after check `after_check`, which happened at `after` (from the
  /// curve's acquisition when both are nullopt), and at or before `until`, in time order (as
  /// recorded: results a status event later made rerun-required included). Times are kept to
  /// the second: a result of the check's second counts when it was recorded after the check.
  virtual std::vector<Result> reported_between(CurveId id, std::optional<Instant> after,
                                               std::optional<CheckId> after_check,
                                               Instant until) = 0;
  /// How many results of a curve were recorded as reported in the same span as
  /// reported_between().
  virtual std::int64_t count_reported_between(CurveId id, std::optional<Instant> after,
                                              std::optional<CheckId> after_check,
                                              Instant until) = 0;
};

/// Appends curve facts; every row joins the unit's current audit entry.
class CurveWriter {
 public:
  virtual ~CurveWriter() = default;
  virtual CalibrationId add_calibration(const Calibration& c) = 0;
  /// The curve with its points.
  virtual CurveId add_curve(const Curve& c) = 0;
  virtual void add_review(CurveId id, const CurveReview& r) = 0;
  virtual void add_retirement(CurveId id, const CurveRetirement& r) = 0;
  virtual CheckId add_check(const Check& k) = 0;
  virtual ResultId add_result(const Result& r) = 0;
  virtual void add_refusal(const Refusal& r) = 0;
};

}  // namespace cw::store
