// SPDX-License-Identifier: Apache-2.0
// Internal to the SQLite backend: calibrations, curves, points, reviews, retirements, checks,
// results and refusals.
#pragma once

#include <map>

#include "store/curves.h"
#include "store/sqlite/audit_repository.h"
#include "store/sqlite/database.h"
#include "store/store.h"

namespace cw::store::sqlite {

/// A check from the columns of `s` starting at `first`: id, curve_id, kind, nominal, response,
/// is_response, measured, recovery_pct, limit_low, limit_high, passed, analyst, occurred_at
/// (and run_id after them with `with_run`).
Check read_check(SQLite::Statement& s, int first, bool with_run, const std::string& path);
/// A result from the columns of the result statements of sql.h (membership and latest status
/// event included).
Result read_result(SQLite::Statement& s, const std::string& path);
/// A status event from id, result_id, status, reason, detail, check_id, run_id, occurred_at
/// starting at column `first`.
ResultStatusEvent read_status_event(SQLite::Statement& s, int first, const std::string& path);

class SqliteCurves final : public CurveReader, public CurveWriter {
 public:
  /// `w` and `actor` are those of a write unit, nullptr in a read unit.
  SqliteCurves(Database& db, WriteState* w, const Actor* actor) : db_(db), w_(w), actor_(actor) {}

  std::optional<Calibration> calibration(CalibrationId id) override;
  std::vector<Calibration> calibrations(const std::vector<CalibrationId>& ids) override;
  std::vector<Curve> curves(const std::vector<CurveId>& ids, CurveDetail detail) override;
  std::vector<Check> checks_of(const std::vector<CurveId>& ids) override;
  std::vector<CheckId> checks_recorded_after(ResultId id) override;
  std::vector<Check> checks_of_group(MethodId method, InstrumentId instrument,
                                     const std::string& analyte) override;
  std::vector<CurveId> list(const CurveFilter& f) override;
  std::vector<CurveId> of_calibration(CalibrationId id) override;
  std::vector<CurveId> live_in_group(MethodId method, InstrumentId instrument,
                                     const std::string& analyte, std::optional<Instant> after,
                                     Instant by) override;
  std::optional<CurveId> latest_in_group(MethodId method, InstrumentId instrument,
                                         const std::string& analyte, Instant by,
                                         bool accepted_only) override;
  std::vector<CurveGroup> groups_expiring_between(Instant from, Instant to) override;
  std::vector<CurveId> live_of_instrument(InstrumentId instrument, Instant t) override;
  std::vector<std::pair<CurveState, std::int64_t>> settled_counts(InstrumentId instrument,
                                                                  Instant t) override;
  std::vector<std::pair<MethodId, std::string>> method_analytes(InstrumentId instrument) override;
  std::vector<CurveId> of_lot(LotId lot) override;
  std::optional<std::string> settled_tallies_disagreement() override;
  std::optional<Check> check(CheckId id) override;
  std::map<InstrumentId, std::vector<Check>> recent_failed_checks(
      const std::vector<InstrumentId>& instruments, Instant by, std::size_t limit) override;
  std::optional<Result> result(ResultId id) override;
  std::vector<Result> results_of(const std::vector<CurveId>& ids) override;
  std::vector<Result> reported_between(CurveId id, std::optional<Instant> after,
                                       std::optional<CheckId> after_check, Instant until) override;
  std::int64_t count_reported_between(CurveId id, std::optional<Instant> after,
                                      std::optional<CheckId> after_check, Instant until) override;

  CalibrationId add_calibration(const Calibration& c) override;
  CurveId add_curve(const Curve& c) override;
  void add_review(CurveId id, const CurveReview& r) override;
  void add_retirement(CurveId id, const CurveRetirement& r) override;
  CheckId add_check(const Check& k) override;
  ResultId add_result(const Result& r) override;
  void add_refusal(const Refusal& r) override;

 private:
  WriteState& writing();
  Check check_of(SQLite::Statement& s) { return read_check(s, 0, true, db_.path); }
  Result result_of(SQLite::Statement& s) { return read_result(s, db_.path); }

  /// review_required of the method version a calibration was made under, read once per unit.
  bool review_required_of(CalibrationId calibration);

  Database& db_;
  WriteState* w_;
  const Actor* actor_;
  std::map<std::int64_t, bool> review_required_;  ///< by calibration id
};

}  // namespace cw::store::sqlite
