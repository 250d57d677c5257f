// SPDX-License-Identifier: Apache-2.0
// Every SQL statement the PostgreSQL backend runs (besides migrations and the column lists built
// from row_form.h), by name: the SQLite backend's statements (store/sqlite/sql.h) in PostgreSQL's
// dialect. Named parameters only (database.h turns them into $1, $2, ...); values are never
// concatenated into SQL. Lists of ids are bound as one array: `= ANY(:ids::bigint[])`. A
// parameter that may be NULL is cast where it is first tested, so that its type is known.
// A new row's id is max(id) + 1, read while the write unit holds the store's lock (no other
// writer can insert meanwhile): the ids of the same commands are those SQLite gives, rolled-back
// commands leave no gaps, and the id is returned (RETURNING id).
#pragma once

namespace cw::store::postgresql::sql {

// ---- registry
inline constexpr const char* kSettingsLatest =
    "SELECT lab_name, time_zone FROM lab_settings ORDER BY id DESC LIMIT 1";
inline constexpr const char* kFactsBeyondSettings =
    "SELECT (SELECT count(*) FROM instruments) + (SELECT count(*) FROM methods) + "
    "(SELECT count(*) FROM lots) + (SELECT count(*) FROM refusals)";
inline constexpr const char* kInsertSettings =
    "INSERT INTO lab_settings (id, lab_name, time_zone, audit_seq) VALUES ((SELECT "
    "coalesce(max(id), 0) + 1 FROM lab_settings), :lab, :tz, :seq) RETURNING id";

inline constexpr const char* kInstrumentByCode =
    "SELECT id, code, name, registered_at FROM instruments WHERE code = :code";
// Codes are ASCII (check_code), so lower() folds them alike on both backends.
inline constexpr const char* kInstrumentCodeInOtherCase =
    "SELECT code FROM instruments WHERE lower(code) = lower(:code) AND code <> :code "
    "ORDER BY code LIMIT 1";
inline constexpr const char* kMethodCodeInOtherCase =
    "SELECT code FROM methods WHERE lower(code) = lower(:code) AND code <> :code "
    "ORDER BY code LIMIT 1";
inline constexpr const char* kLotCodeInOtherCase =
    "SELECT code FROM lots WHERE lower(code) = lower(:code) AND code <> :code ORDER BY code "
    "LIMIT 1";
inline constexpr const char* kInstrumentsAll =
    "SELECT id, code, name, registered_at FROM instruments ORDER BY code";
inline constexpr const char* kInstrumentsByIds =
    "SELECT id, code, name, registered_at FROM instruments "
    "WHERE id = ANY(:ids::bigint[]) ORDER BY code";
inline constexpr const char* kServiceEventsOf =
    "SELECT instrument_id, direction, reason, occurred_at FROM instrument_service_events "
    "WHERE instrument_id = ANY(:ids::bigint[]) "
    "ORDER BY instrument_id, occurred_at, id";
inline constexpr const char* kInsertInstrument =
    "INSERT INTO instruments (id, code, name, registered_at, audit_seq) "
    "VALUES ((SELECT coalesce(max(id), 0) + 1 FROM instruments), :code, :name, :at, :seq) "
    "RETURNING id";
inline constexpr const char* kInsertServiceEvent =
    "INSERT INTO instrument_service_events (id, instrument_id, direction, reason, occurred_at, "
    "audit_seq) VALUES ((SELECT coalesce(max(id), 0) + 1 FROM instrument_service_events), "
    ":instrument, :direction, :reason, :at, :seq) RETURNING id";

inline constexpr const char* kMethodByCode =
    "SELECT id, code, registered_at FROM methods WHERE code = :code";
inline constexpr const char* kMethodsAll =
    "SELECT id, code, registered_at FROM methods ORDER BY code";
inline constexpr const char* kMethodsByIds =
    "SELECT id, code, registered_at FROM methods "
    "WHERE id = ANY(:ids::bigint[]) ORDER BY code";
inline constexpr const char* kVersionsOf =
    "SELECT id, method_id, version, effective_at, definition, source_name, source_text, "
    "source_sha256, reason FROM method_versions "
    "WHERE method_id = ANY(:ids::bigint[]) ORDER BY method_id, version";
inline constexpr const char* kInsertMethod =
    "INSERT INTO methods (id, code, registered_at, audit_seq) VALUES ((SELECT coalesce(max(id), 0) "
    "+ 1 FROM methods), :code, :at, :seq) RETURNING id";
inline constexpr const char* kInsertMethodVersion =
    "INSERT INTO method_versions (id, method_id, version, effective_at, title, unit, definition, "
    "source_name, source_text, source_sha256, reason, audit_seq) VALUES ((SELECT coalesce(max(id), "
    "0) + 1 FROM method_versions), :method, :version, "
    ":at, :title, :unit, :definition, :source_name, :source_text, :sha, :reason, :seq) RETURNING "
    "id";

inline constexpr const char* kLotByCode =
    "SELECT id, code, material, expires_on, opened_on, in_use_days, certificate, registered_at, "
    "coverage_factor "
    "FROM lots WHERE code = :code";
inline constexpr const char* kLotsAll =
    "SELECT id, code, material, expires_on, opened_on, in_use_days, certificate, registered_at, "
    "coverage_factor "
    "FROM lots ORDER BY code";
inline constexpr const char* kLotsByIds =
    "SELECT id, code, material, expires_on, opened_on, in_use_days, certificate, registered_at, "
    "coverage_factor "
    "FROM lots WHERE id = ANY(:ids::bigint[]) ORDER BY code";
inline constexpr const char* kLotValuesOf =
    "SELECT lot_id, analyte, value, uncertainty FROM lot_values "
    "WHERE lot_id = ANY(:ids::bigint[]) ORDER BY lot_id, id";
inline constexpr const char* kLotWithdrawalsOf =
    "SELECT lot_id, reason, occurred_at FROM lot_withdrawals "
    "WHERE lot_id = ANY(:ids::bigint[]) ORDER BY lot_id, id";
inline constexpr const char* kInsertLot =
    "INSERT INTO lots (id, code, material, expires_on, opened_on, in_use_days, certificate, "
    "registered_at, audit_seq, coverage_factor) VALUES ((SELECT coalesce(max(id), 0) + 1 FROM "
    "lots), :code, :material, :expires, :opened, "
    ":days, :cert, :at, :seq, :k) RETURNING id";
inline constexpr const char* kInsertLotValue =
    "INSERT INTO lot_values (id, lot_id, analyte, value, uncertainty, audit_seq) "
    "VALUES ((SELECT coalesce(max(id), 0) + 1 FROM lot_values), :lot, :analyte, :value, :u, :seq) "
    "RETURNING id";
inline constexpr const char* kInsertLotWithdrawal =
    "INSERT INTO lot_withdrawals (id, lot_id, reason, occurred_at, audit_seq) "
    "VALUES ((SELECT coalesce(max(id), 0) + 1 FROM lot_withdrawals), :lot, :reason, :at, :seq) "
    "RETURNING id";

// ---- users
inline constexpr const char* kUserByCode =
    "SELECT id, code, name, registered_at FROM users WHERE code = :code";
inline constexpr const char* kUsersAll =
    "SELECT id, code, name, registered_at FROM users ORDER BY code";
inline constexpr const char* kUserEventsOf =
    "SELECT user_id, status, role, reason, by_user, occurred_at FROM user_events "
    "WHERE user_id = ANY(:ids::bigint[]) ORDER BY user_id, id";
inline constexpr const char* kInsertUser =
    "INSERT INTO users (id, code, name, registered_at, audit_seq) VALUES ((SELECT "
    "coalesce(max(id), 0) + 1 FROM users), :code, :name, :at, :seq) RETURNING id";
inline constexpr const char* kInsertUserEvent =
    "INSERT INTO user_events (id, user_id, status, role, reason, by_user, occurred_at, audit_seq) "
    "VALUES ((SELECT coalesce(max(id), 0) + 1 FROM user_events), :user, :status, :role, :reason, "
    ":by, :at, :seq) RETURNING id";
inline constexpr const char* kPassphraseOf =
    "SELECT hash FROM user_passphrases WHERE user_id = :user ORDER BY id DESC LIMIT 1";
inline constexpr const char* kInsertPassphrase =
    "INSERT INTO user_passphrases (id, user_id, hash, occurred_at, audit_seq) "
    "VALUES ((SELECT coalesce(max(id), 0) + 1 FROM user_passphrases), :user, :hash, :at, :seq) "
    "RETURNING id";
inline constexpr const char* kFailedSignaturesInARow =
    "SELECT count(*) FROM signature_failures WHERE user_id = :user AND audit_seq > greatest("
    "coalesce((SELECT max(audit_seq) FROM signatures WHERE user_id = :user), 0), "
    "coalesce((SELECT max(audit_seq) FROM user_passphrases WHERE user_id = :user), 0), "
    "coalesce((SELECT max(audit_seq) FROM user_events WHERE user_id = :user), 0))";
inline constexpr const char* kInsertSignatureFailure =
    "INSERT INTO signature_failures (id, user_id, action, occurred_at, audit_seq) "
    "VALUES ((SELECT coalesce(max(id), 0) + 1 FROM signature_failures), :user, :action, :at, :seq) "
    "RETURNING id";
inline constexpr const char* kSignaturesOf =
    "SELECT s.user_id, u.code, s.name, s.meaning, s.entity_kind, s.entity_id, s.signed_at "
    "FROM signatures s JOIN users u ON u.id = s.user_id WHERE s.entity_kind = :kind AND "
    "s.entity_id = ANY(:ids::text[]) ORDER BY s.id";
inline constexpr const char* kInsertSignature =
    "INSERT INTO signatures (id, user_id, name, meaning, entity_kind, entity_id, signed_at, "
    "audit_seq) VALUES ((SELECT coalesce(max(id), 0) + 1 FROM signatures), :user, :name, :meaning, "
    ":kind, :id, :at, :seq) RETURNING id";
/// The names in the trail that no user has (compared in canonical form), first spelling first.
inline constexpr const char* kUnregisteredActors =
    "SELECT actor FROM (SELECT DISTINCT ON (lower(a.actor)) a.actor, a.seq AS first "
    "FROM audit_log a WHERE NOT EXISTS (SELECT 1 FROM users u WHERE u.code = lower(a.actor)) "
    "ORDER BY lower(a.actor), a.seq) t ORDER BY first";

// ---- calibrations and curves
inline constexpr const char* kCalibrationsByIds =
    "SELECT id, method_version_id, instrument_id, acquired_at, analyst, note, points_file, "
    "points_sha256 FROM calibrations WHERE id = ANY(:ids::bigint[]) ORDER BY id";
inline constexpr const char* kCalibrationLotsOf =
    "SELECT calibration_id, lot_id FROM calibration_lots "
    "WHERE calibration_id = ANY(:ids::bigint[]) ORDER BY calibration_id, id";
inline constexpr const char* kCurvesByIds =
    "SELECT c.id, c.calibration_id, c.method_id, k.method_version_id, c.instrument_id, "
    "c.acquired_at, k.analyst, c.analyte, c.verdict, c.failed_criteria, c.statistics, "
    "c.acceptance, c.expires_at FROM curves c JOIN calibrations k ON k.id = c.calibration_id "
    "WHERE c.id = ANY(:ids::bigint[]) ORDER BY c.id";
inline constexpr const char* kPointsOf =
    "SELECT curve_id, source_line, level, replicate, nominal, response, is_response, y, "
    "back_calculated, error_pct, within_limits, excluded, exclude_reason FROM curve_points "
    "WHERE curve_id = ANY(:ids::bigint[]) ORDER BY curve_id, id";
/// The lowest fitted calibrator above zero of each curve (none: no row).
inline constexpr const char* kLowestLevelsOf =
    "SELECT curve_id, min(nominal) FROM curve_points WHERE curve_id = ANY(:ids::bigint[]) "
    "AND excluded = 0 AND nominal > 0 GROUP BY curve_id";
inline constexpr const char* kReviewsOf =
    "SELECT curve_id, decision, reviewer, reason, occurred_at FROM curve_reviews "
    "WHERE curve_id = ANY(:ids::bigint[]) ORDER BY curve_id, occurred_at, id";
inline constexpr const char* kRetirementsOf =
    "SELECT curve_id, retired_by, reason, occurred_at FROM curve_retirements "
    "WHERE curve_id = ANY(:ids::bigint[]) ORDER BY curve_id, occurred_at, id";
inline constexpr const char* kCurveIdsFiltered =
    "SELECT id FROM curves WHERE (CAST(:method AS bigint) IS NULL OR method_id = :method) AND "
    "(CAST(:instrument AS bigint) IS NULL OR instrument_id = :instrument) AND "
    "(CAST(:analyte AS text) IS NULL OR analyte = :analyte) AND acquired_at <= :by ORDER BY "
    "acquired_at, id";
inline constexpr const char* kCurvesOfCalibration =
    "SELECT id FROM curves WHERE calibration_id = :id ORDER BY id";
// The group's index by expiry: only its live curves are read, whatever its history.
inline constexpr const char* kLiveInGroup =
    "SELECT id FROM curves "
    "WHERE method_id = :method AND instrument_id = :instrument AND "
    "analyte = :analyte AND acquired_at >= :after AND acquired_at <= :by AND expires_at > :by "
    "ORDER BY acquired_at DESC, id DESC";
inline constexpr const char* kLatestInGroup =
    "SELECT id FROM curves WHERE method_id = :method AND instrument_id = :instrument AND "
    "analyte = :analyte AND acquired_at <= :by ORDER BY acquired_at DESC, id DESC LIMIT 1";
inline constexpr const char* kLatestAcceptedInGroup =
    "SELECT id FROM curves WHERE method_id = :method AND instrument_id = :instrument AND "
    "analyte = :analyte AND acquired_at <= :by AND verdict = 'accepted' "
    "ORDER BY acquired_at DESC, id DESC LIMIT 1";
inline constexpr const char* kGroupsExpiringBetween =
    "SELECT DISTINCT method_id, instrument_id, analyte FROM curves "
    "WHERE expires_at >= :from AND expires_at < :to ORDER BY method_id, instrument_id, analyte";
inline constexpr const char* kLiveOfInstrument =
    "SELECT id FROM curves WHERE instrument_id = :instrument AND expires_at > :t AND "
    "acquired_at <= :t ORDER BY acquired_at, id";
// An instrument's settled curves per state at a moment: its latest running total per state
// less its tally steps after the moment (migration 0004), each from an index: a seek per state,
// and the steps still ahead, few when the moment is about now.
inline constexpr const char* kSettledCounts =
    "WITH settled (state) AS (VALUES ('rejected' COLLATE \"C\"), ('awaiting-review'), "
    "  ('stale'), ('retired')), "
    "latest (state, total) AS (SELECT settled.state, (SELECT t.total FROM settled_totals t "
    "  WHERE t.instrument_id = :instrument AND t.state = settled.state "
    "  ORDER BY t.n DESC LIMIT 1) FROM settled), "
    "ahead (state, delta) AS (SELECT state, sum(delta)::bigint FROM settled_tallies "
    "  WHERE instrument_id = :instrument AND effective_at > :t GROUP BY state) "
    "SELECT l.state, coalesce(l.total, 0) - coalesce(a.delta, 0) FROM latest l "
    "LEFT JOIN ahead a ON a.state = l.state";
// The (method, analyte) pairs an instrument has curves for, one index seek per pair (a skip
// scan by recursion), so their number, not the instrument's history, sets the cost.
inline constexpr const char* kMethodAnalytes =
    "WITH RECURSIVE pair (method_id, analyte) AS ("
    " (SELECT method_id, analyte FROM curves WHERE instrument_id = :instrument"
    "  ORDER BY method_id, analyte LIMIT 1)"
    " UNION ALL"
    " SELECT n.method_id, n.analyte FROM pair p CROSS JOIN LATERAL"
    " (SELECT c.method_id, c.analyte FROM curves c WHERE c.instrument_id = :instrument"
    "  AND (c.method_id, c.analyte) > (p.method_id, p.analyte)"
    "  ORDER BY c.method_id, c.analyte LIMIT 1) n)"
    " SELECT method_id, analyte FROM pair ORDER BY method_id, analyte";
inline constexpr const char* kCurvesOfLot =
    "SELECT c.id FROM calibration_lots l JOIN curves c ON c.calibration_id = l.calibration_id "
    "WHERE l.lot_id = :lot ORDER BY c.acquired_at, c.id";
inline constexpr const char* kInsertCalibration =
    "INSERT INTO calibrations (id, method_version_id, instrument_id, acquired_at, analyst, note, "
    "points_file, points_sha256, audit_seq) VALUES ((SELECT coalesce(max(id), 0) + 1 FROM "
    "calibrations), :mv, :instrument, :at, :analyst, :note, "
    ":file, :sha, :seq) RETURNING id";
inline constexpr const char* kInsertCalibrationLot =
    "INSERT INTO calibration_lots (id, calibration_id, lot_id, audit_seq) "
    "VALUES ((SELECT coalesce(max(id), 0) + 1 FROM calibration_lots), :calibration, :lot, :seq) "
    "RETURNING id";
inline constexpr const char* kInsertCurve =
    "INSERT INTO curves (id, calibration_id, method_id, instrument_id, acquired_at, analyte, "
    "model, "
    "weighting, intercept, slope, quadratic, se_intercept, se_slope, se_quadratic, r2, "
    "residual_sd, dof, n_points, n_levels, range_low, range_high, lod, loq, rf_rsd_pct, verdict, "
    "failed_criteria, statistics, acceptance, expires_at, audit_seq) VALUES ((SELECT "
    "coalesce(max(id), 0) + 1 FROM curves), :calibration, "
    ":method, :instrument, :at, :analyte, :model, :weighting, :a, :b, :c, :sa, :sb, :sc, :r2, "
    ":sd, :dof, :n, :levels, :low, :high, :lod, :loq, :rsd, :verdict, :failed, :statistics, "
    ":acceptance, :expires, :seq) RETURNING id";
// Every point of a curve in one statement: one array per column, unnested in the points'
// order; ids follow the table's largest, in that order.
inline constexpr const char* kInsertPoints =
    "INSERT INTO curve_points (id, curve_id, source_line, level, replicate, nominal, response, "
    "is_response, y, back_calculated, error_pct, within_limits, excluded, exclude_reason, "
    "audit_seq) SELECT (SELECT coalesce(max(id), 0) FROM curve_points) + p.n, :curve, p.line, "
    "p.level, p.rep, p.nominal, p.response, p.is_response, p.y, p.back, p.re, p.within, "
    "p.excluded, p.why, :seq FROM unnest(:lines::bigint[], :levels::text[], :reps::bigint[], "
    ":nominals::float8[], :responses::float8[], :is_responses::float8[], :ys::float8[], "
    ":backs::float8[], :res::float8[], :withins::bigint[], :excludeds::bigint[], :whys::text[]) "
    "WITH ORDINALITY AS p(line, level, rep, nominal, response, is_response, y, back, re, within, "
    "excluded, why, n) ORDER BY p.n RETURNING id";
inline constexpr const char* kInsertReview =
    "INSERT INTO curve_reviews (id, curve_id, decision, reviewer, reason, occurred_at, audit_seq) "
    "VALUES ((SELECT coalesce(max(id), 0) + 1 FROM curve_reviews), :curve, :decision, :reviewer, "
    ":reason, :at, :seq) RETURNING id";
// ---- derived tally steps of settled curves (store/postgresql/settled_tallies.h)
inline constexpr const char* kInsertTallyStep =
    "INSERT INTO settled_tallies (instrument_id, effective_at, state, delta, curve_id, audit_seq) "
    "VALUES (:instrument, :at, :state, :delta, :curve, :seq)";
inline constexpr const char* kLatestSettledTotal =
    "SELECT n, total FROM settled_totals WHERE instrument_id = :instrument AND state = :state "
    "ORDER BY n DESC LIMIT 1";
inline constexpr const char* kInsertSettledTotal =
    "INSERT INTO settled_totals (instrument_id, state, n, total, audit_seq) "
    "VALUES (:instrument, :state, :n, :total, :seq)";
// The totals of a store whose steps are all built (`store copy`; the migration does the same).
inline constexpr const char* kBuildSettledTotals =
    "INSERT INTO settled_totals (instrument_id, state, n, total, audit_seq) "
    "SELECT instrument_id, state, 1, sum(delta), max(audit_seq) FROM settled_tallies "
    "GROUP BY instrument_id, state HAVING sum(delta) <> 0";
// The first (instrument, state) whose latest total is not the sum of its steps.
inline constexpr const char* kSettledTotalsDisagreement =
    "WITH summed (instrument_id, state, total) AS (SELECT instrument_id, state, sum(delta)::bigint "
    "  FROM settled_tallies GROUP BY instrument_id, state), "
    "latest (instrument_id, state, total) AS (SELECT t.instrument_id, t.state, t.total "
    "  FROM (SELECT instrument_id, state, max(n) AS n FROM settled_totals "
    "        GROUP BY instrument_id, state) m "
    "  JOIN settled_totals t ON t.instrument_id = m.instrument_id AND t.state = m.state "
    "  AND t.n = m.n) "
    "SELECT l.instrument_id, l.state, l.total, coalesce(s.total, 0) FROM latest l "
    "LEFT JOIN summed s ON s.instrument_id = l.instrument_id AND s.state = l.state "
    "WHERE l.total <> coalesce(s.total, 0) "
    "UNION ALL "
    "SELECT s.instrument_id, s.state, 0, s.total FROM summed s WHERE s.total <> 0 AND NOT EXISTS "
    "  (SELECT 1 FROM latest l WHERE l.instrument_id = s.instrument_id AND l.state = s.state) "
    "ORDER BY 1, 2 LIMIT 1";
inline constexpr const char* kReviewRequiredOfCalibration =
    "SELECT coalesce((v.definition::jsonb #>> '{calibration,review_required}')::boolean::int, 1) "
    "FROM calibrations k JOIN method_versions v ON v.id = k.method_version_id "
    "WHERE k.id = :calibration";
inline constexpr const char* kSettledCurve =
    "SELECT c.instrument_id, c.expires_at, c.verdict, "
    "  coalesce((v.definition::jsonb #>> '{calibration,review_required}')::boolean::int, 1) "
    "FROM curves c JOIN calibrations k ON k.id = c.calibration_id "
    "JOIN method_versions v ON v.id = k.method_version_id WHERE c.id = :curve";
inline constexpr const char* kSettledReviewsOf =
    "SELECT occurred_at, decision FROM curve_reviews WHERE curve_id = :curve "
    "ORDER BY occurred_at, id";
inline constexpr const char* kSettledRetirementsOf =
    "SELECT occurred_at FROM curve_retirements WHERE curve_id = :curve ORDER BY occurred_at, id";
// Every curve's settled history, read in curve order in three merged scans.
inline constexpr const char* kReviewRequiredByVersion =
    "SELECT id, coalesce((definition::jsonb #>> '{calibration,review_required}')::boolean::int, 1) "
    "FROM method_versions";
inline constexpr const char* kAllSettledCurves =
    "SELECT c.id, c.instrument_id, c.expires_at, c.verdict, k.method_version_id, c.audit_seq "
    "FROM curves c JOIN calibrations k ON k.id = c.calibration_id ORDER BY c.id";
inline constexpr const char* kAllSettledReviews =
    "SELECT curve_id, occurred_at, decision, audit_seq FROM curve_reviews "
    "ORDER BY curve_id, occurred_at, id";
inline constexpr const char* kAllSettledRetirements =
    "SELECT curve_id, occurred_at, audit_seq FROM curve_retirements "
    "ORDER BY curve_id, occurred_at, id";
// The stored steps, net per curve, moment and state, in curve order (`audit verify`).
inline constexpr const char* kStoredTallySteps =
    "SELECT curve_id, instrument_id, effective_at, state, sum(delta)::bigint FROM settled_tallies "
    "GROUP BY curve_id, instrument_id, effective_at, state HAVING sum(delta) <> 0 "
    "ORDER BY curve_id, effective_at, state";
inline constexpr const char* kInsertRetirement =
    "INSERT INTO curve_retirements (id, curve_id, retired_by, reason, occurred_at, audit_seq) "
    "VALUES ((SELECT coalesce(max(id), 0) + 1 FROM curve_retirements), :curve, :by, :reason, :at, "
    ":seq) RETURNING id";

// ---- checks, results, refusals
inline constexpr const char* kChecksOf =
    "SELECT k.id, k.curve_id, k.kind, k.nominal, k.response, k.is_response, k.measured, "
    "k.recovery_pct, k.limit_low, k.limit_high, k.passed, k.analyst, k.occurred_at, m.run_id "
    "FROM checks k LEFT JOIN run_checks m ON m.check_id = k.id "
    "WHERE k.curve_id = ANY(:ids::bigint[]) "
    "ORDER BY k.curve_id, k.occurred_at, k.id";
// The checks on a result's curve given the result's own second but recorded after it.
inline constexpr const char* kChecksRecordedAfterResult =
    "SELECT k.id FROM results r JOIN checks k ON k.curve_id = r.curve_id AND "
    "k.occurred_at = r.occurred_at AND k.audit_seq > r.audit_seq WHERE r.id = :id ORDER BY k.id";
inline constexpr const char* kCheckById =
    "SELECT k.id, k.curve_id, k.kind, k.nominal, k.response, k.is_response, k.measured, "
    "k.recovery_pct, k.limit_low, k.limit_high, k.passed, k.analyst, k.occurred_at, m.run_id "
    "FROM checks k LEFT JOIN run_checks m ON m.check_id = k.id WHERE k.id = :id";
inline constexpr const char* kChecksOfGroup =
    "SELECT k.id, k.curve_id, k.kind, k.nominal, k.response, k.is_response, k.measured, "
    "k.recovery_pct, k.limit_low, k.limit_high, k.passed, k.analyst, k.occurred_at, m.run_id "
    "FROM curves c JOIN checks k ON k.curve_id = c.id "
    "LEFT JOIN run_checks m ON m.check_id = k.id "
    "WHERE c.method_id = :method AND c.instrument_id = :instrument AND c.analyte = :analyte "
    "ORDER BY k.occurred_at, k.id";
inline constexpr const char* kChecksFiltered =
    "SELECT k.id, k.curve_id, k.kind, k.nominal, k.response, k.is_response, k.measured, "
    "k.recovery_pct, k.limit_low, k.limit_high, k.passed, k.analyst, k.occurred_at, m.run_id "
    "FROM checks k LEFT JOIN run_checks m ON m.check_id = k.id "
    "WHERE (CAST(:curve AS bigint) IS NULL OR k.curve_id = :curve) AND "
    "(CAST(:since AS text) IS NULL OR k.occurred_at >= :since) "
    "AND k.occurred_at <= :until ORDER BY k.occurred_at, k.id";
// The lab's failed checks before (:t, :id) in (time, id) order, newest first, a page at a time,
// with their curve's instrument (column 14): read until each instrument asked about has its few.
inline constexpr const char* kFailedChecksBack =
    "SELECT k.id, k.curve_id, k.kind, k.nominal, k.response, k.is_response, k.measured, "
    "k.recovery_pct, k.limit_low, k.limit_high, k.passed, k.analyst, k.occurred_at, m.run_id, "
    "c.instrument_id FROM checks k JOIN curves c ON c.id = k.curve_id "
    "LEFT JOIN run_checks m ON m.check_id = k.id WHERE k.passed = 0 "
    "AND k.occurred_at <= :t AND (k.occurred_at < :t OR k.id < :id) "
    "ORDER BY k.occurred_at DESC, k.id DESC LIMIT :page";
inline constexpr const char* kInsertCheck =
    "INSERT INTO checks (id, curve_id, kind, nominal, response, is_response, measured, "
    "recovery_pct, "
    "limit_low, limit_high, passed, analyst, occurred_at, audit_seq) VALUES ((SELECT "
    "coalesce(max(id), 0) + 1 FROM checks), :curve, :kind, "
    ":nominal, :response, :is, :measured, :recovery, :low, :high, :passed, :analyst, :at, :seq) "
    "RETURNING id";

// Results carry their run membership (m) and their latest status event (e); columns 21 on.
inline constexpr const char* kResultById =
    "SELECT r.id, r.sample, r.analyte, r.status, r.curve_id, r.method_id, r.instrument_id, "
    "r.response, r.is_response, r.replicates, r.dilution, r.x0, r.sd_x0, r.concentration, "
    "r.ci_low, r.ci_high, r.flags, r.reasons, r.reason_details, r.analyst, r.occurred_at, "
    "r.censored, r.reporting_limit, r.computed_concentration, r.uncertainty, m.run_id, m.position, "
    "e.id, e.status, e.reason, e.detail, e.check_id, e.run_id, "
    "e.occurred_at FROM results r LEFT JOIN run_results m ON m.result_id = r.id "
    "LEFT JOIN result_status_events e ON e.id = "
    "(SELECT max(x.id) FROM result_status_events x WHERE x.result_id = r.id) "
    "WHERE r.id = :id";
inline constexpr const char* kResultsOf =
    "SELECT r.id, r.sample, r.analyte, r.status, r.curve_id, r.method_id, r.instrument_id, "
    "r.response, r.is_response, r.replicates, r.dilution, r.x0, r.sd_x0, r.concentration, "
    "r.ci_low, r.ci_high, r.flags, r.reasons, r.reason_details, r.analyst, r.occurred_at, "
    "r.censored, r.reporting_limit, r.computed_concentration, r.uncertainty, m.run_id, m.position, "
    "e.id, e.status, e.reason, e.detail, e.check_id, e.run_id, "
    "e.occurred_at FROM results r LEFT JOIN run_results m ON m.result_id = r.id "
    "LEFT JOIN result_status_events e ON e.id = "
    "(SELECT max(x.id) FROM result_status_events x WHERE x.result_id = r.id) "
    "WHERE r.curve_id = ANY(:ids::bigint[]) ORDER BY r.occurred_at, r.id";
inline constexpr const char* kReportedBetween =
    "SELECT r.id, r.sample, r.analyte, r.status, r.curve_id, r.method_id, r.instrument_id, "
    "r.response, r.is_response, r.replicates, r.dilution, r.x0, r.sd_x0, r.concentration, "
    "r.ci_low, r.ci_high, r.flags, r.reasons, r.reason_details, r.analyst, r.occurred_at, "
    "r.censored, r.reporting_limit, r.computed_concentration, r.uncertainty, m.run_id, m.position, "
    "e.id, e.status, e.reason, e.detail, e.check_id, e.run_id, "
    "e.occurred_at FROM results r LEFT JOIN run_results m ON m.result_id = r.id "
    "LEFT JOIN result_status_events e ON e.id = "
    "(SELECT max(x.id) FROM result_status_events x WHERE x.result_id = r.id) "
    "WHERE r.curve_id = :id AND r.status = 'reported' AND r.occurred_at >= :after "
    "AND r.occurred_at <= :until AND (r.occurred_at > :after OR r.audit_seq > "
    "coalesce((SELECT k.audit_seq FROM checks k WHERE k.id = CAST(:check AS bigint)), 0)) ORDER BY "
    "r.occurred_at, r.id";
inline constexpr const char* kCountReportedBetween =
    "SELECT count(*) FROM results r WHERE r.curve_id = :id AND r.status = 'reported' AND "
    "r.occurred_at >= :after AND r.occurred_at <= :until AND (r.occurred_at > :after OR "
    "r.audit_seq > coalesce((SELECT k.audit_seq FROM checks k WHERE k.id = CAST(:check AS "
    "bigint)), 0))";
inline constexpr const char* kResultsFiltered =
    "SELECT r.id, r.sample, r.analyte, r.status, r.curve_id, r.method_id, r.instrument_id, "
    "r.response, r.is_response, r.replicates, r.dilution, r.x0, r.sd_x0, r.concentration, "
    "r.ci_low, r.ci_high, r.flags, r.reasons, r.reason_details, r.analyst, r.occurred_at, "
    "r.censored, r.reporting_limit, r.computed_concentration, r.uncertainty, m.run_id, m.position, "
    "e.id, e.status, e.reason, e.detail, e.check_id, e.run_id, "
    "e.occurred_at FROM results r LEFT JOIN run_results m ON m.result_id = r.id "
    "LEFT JOIN result_status_events e ON e.id = "
    "(SELECT max(x.id) FROM result_status_events x WHERE x.result_id = r.id) "
    "WHERE (CAST(:sample AS text) IS NULL OR r.sample = :sample) AND "
    "(CAST(:since AS text) IS NULL OR r.occurred_at >= :since) AND r.occurred_at <= :until AND "
    "(CAST(:run AS bigint) IS NULL OR m.run_id = :run) AND "
    "(CAST(:status AS text) IS NULL OR coalesce(e.status, r.status) = :status) ORDER BY "
    "r.occurred_at, r.id";
inline constexpr const char* kResultsOfRun =
    "SELECT r.id, r.sample, r.analyte, r.status, r.curve_id, r.method_id, r.instrument_id, "
    "r.response, r.is_response, r.replicates, r.dilution, r.x0, r.sd_x0, r.concentration, "
    "r.ci_low, r.ci_high, r.flags, r.reasons, r.reason_details, r.analyst, r.occurred_at, "
    "r.censored, r.reporting_limit, r.computed_concentration, r.uncertainty, m.run_id, m.position, "
    "e.id, e.status, e.reason, e.detail, e.check_id, e.run_id, "
    "e.occurred_at FROM results r JOIN run_results m ON m.result_id = r.id "
    "LEFT JOIN result_status_events e ON e.id = "
    "(SELECT max(x.id) FROM result_status_events x WHERE x.result_id = r.id) "
    "WHERE m.run_id = :run ORDER BY m.position";
inline constexpr const char* kInsertResult =
    "INSERT INTO results (id, sample, analyte, status, curve_id, method_id, instrument_id, "
    "response, "
    "is_response, replicates, dilution, x0, sd_x0, concentration, ci_low, ci_high, flags, "
    "reasons, reason_details, analyst, occurred_at, audit_seq, censored, reporting_limit, "
    "computed_concentration, uncertainty) VALUES ((SELECT coalesce(max(id), 0) + 1 FROM results), "
    ":sample, :analyte, :status, :curve, :method, "
    ":instrument, :response, :is, :m, :dilution, :x0, :sd, :conc, :low, :high, :flags, "
    ":reasons, :details, :analyst, :at, :seq, :censored, :limit, :computed, :uncertainty) "
    "RETURNING id";
inline constexpr const char* kInsertRefusal =
    "INSERT INTO refusals (id, action, entity_kind, entity_id, actor, reasons, message, "
    "occurred_at, "
    "audit_seq) VALUES ((SELECT coalesce(max(id), 0) + 1 FROM refusals), :action, :kind, :id, "
    ":actor, :reasons, :message, :at, :seq) RETURNING id";

// ---- runs, status events, saved column mappings
inline constexpr const char* kRunById =
    "SELECT r.id, v.method_id, r.method_version_id, r.instrument_id, r.acquired_at, r.analyst, "
    "r.file_name, r.file_sha256, r.row_count, r.columns, r.again_reason FROM runs r "
    "JOIN method_versions v ON v.id = r.method_version_id WHERE r.id = :id";
inline constexpr const char* kRunsUntil =
    "SELECT r.id, v.method_id, r.method_version_id, r.instrument_id, r.acquired_at, r.analyst, "
    "r.file_name, r.file_sha256, r.row_count, r.columns, r.again_reason FROM runs r "
    "JOIN method_versions v ON v.id = r.method_version_id WHERE r.acquired_at <= :until "
    "ORDER BY r.acquired_at, r.id";
inline constexpr const char* kRunsWithSha256 =
    "SELECT r.id, v.method_id, r.method_version_id, r.instrument_id, r.acquired_at, r.analyst, "
    "r.file_name, r.file_sha256, r.row_count, r.columns, r.again_reason FROM runs r "
    "JOIN method_versions v ON v.id = r.method_version_id WHERE r.file_sha256 = :sha "
    "ORDER BY r.id";
inline constexpr const char* kChecksOfRun =
    "SELECT m.position, m.label, c.analyte, k.id, k.curve_id, k.kind, k.nominal, k.response, "
    "k.is_response, k.measured, k.recovery_pct, k.limit_low, k.limit_high, k.passed, k.analyst, "
    "k.occurred_at FROM run_checks m JOIN checks k ON k.id = m.check_id "
    "JOIN curves c ON c.id = k.curve_id WHERE m.run_id = :run ORDER BY m.position";
inline constexpr const char* kRunResultCounts =
    "SELECT analyte, count(*), count(*) FILTER (WHERE current = 'reported'), "
    "count(*) FILTER (WHERE current = 'reported' AND below), "
    "count(*) FILTER (WHERE current = 'refused'), "
    "count(*) FILTER (WHERE current = 'rerun-required') FROM ("
    "  SELECT r.analyte AS analyte, coalesce((SELECT x.status FROM result_status_events x "
    "    WHERE x.result_id = r.id ORDER BY x.id DESC LIMIT 1), r.status) AS current, "
    "    jsonb_exists(r.flags::jsonb, 'below-range') AS below "
    "  FROM run_results m JOIN results r ON r.id = m.result_id WHERE m.run_id = :run) t "
    "GROUP BY analyte ORDER BY analyte";
inline constexpr const char* kRunCheckCounts =
    "SELECT c.analyte, k.kind, k.passed, count(*) FROM run_checks m "
    "JOIN checks k ON k.id = m.check_id JOIN curves c ON c.id = k.curve_id "
    "WHERE m.run_id = :run GROUP BY 1, 2, 3 ORDER BY 1, 2, 3";
inline constexpr const char* kStatusEventsOf =
    "SELECT id, result_id, status, reason, detail, check_id, run_id, occurred_at "
    "FROM result_status_events WHERE result_id = :id ORDER BY id";
inline constexpr const char* kInsertRun =
    "INSERT INTO runs (id, method_version_id, instrument_id, acquired_at, analyst, file_name, "
    "file_sha256, row_count, columns, again_reason, audit_seq) VALUES ((SELECT coalesce(max(id), "
    "0) + 1 FROM runs), :mv, :instrument, :at, "
    ":analyst, :file, :sha, :rows, :columns, :again, :seq) RETURNING id";
inline constexpr const char* kInsertRunResult =
    "INSERT INTO run_results (id, run_id, position, result_id, audit_seq) "
    "VALUES ((SELECT coalesce(max(id), 0) + 1 FROM run_results), :run, :position, :result, :seq) "
    "RETURNING id";
inline constexpr const char* kInsertRunCheck =
    "INSERT INTO run_checks (id, run_id, position, check_id, label, audit_seq) "
    "VALUES ((SELECT coalesce(max(id), 0) + 1 FROM run_checks), :run, :position, :check, :label, "
    ":seq) RETURNING id";
inline constexpr const char* kInsertStatusEvent =
    "INSERT INTO result_status_events (id, result_id, status, reason, detail, check_id, run_id, "
    "occurred_at, audit_seq) VALUES ((SELECT coalesce(max(id), 0) + 1 FROM result_status_events), "
    ":result, :status, :reason, :detail, :check, :run, :at, "
    ":seq) RETURNING id";
inline constexpr const char* kColumnMapsOf =
    "SELECT instrument_id, columns, reason, saved_by, occurred_at FROM instrument_column_maps "
    "WHERE instrument_id = ANY(:ids::bigint[]) "
    "ORDER BY instrument_id, occurred_at, id";
inline constexpr const char* kInsertColumnMap =
    "INSERT INTO instrument_column_maps (id, instrument_id, columns, reason, saved_by, "
    "occurred_at, "
    "audit_seq) VALUES ((SELECT coalesce(max(id), 0) + 1 FROM instrument_column_maps), "
    ":instrument, :columns, :reason, :by, :at, :seq) RETURNING id";

// ---- audit trail
inline constexpr const char* kAuditHead =
    "SELECT seq, hash FROM audit_log ORDER BY seq DESC LIMIT 1";
inline constexpr const char* kAuditCount = "SELECT count(*) FROM audit_log";
inline constexpr const char* kAuditHashAt = "SELECT hash FROM audit_log WHERE seq = :seq";
inline constexpr const char* kAuditColumns =
    "seq, recorded_at, occurred_at, actor, action, entity_kind, entity_id, reason, "
    "clock_overridden, tool_version, payload, prev_hash, hash, os_login";
inline constexpr const char* kAuditAll =
    "SELECT seq, recorded_at, occurred_at, actor, action, entity_kind, entity_id, reason, "
    "clock_overridden, tool_version, payload, prev_hash, hash, os_login FROM audit_log ORDER BY "
    "seq";
inline constexpr const char* kAuditFiltered =
    "SELECT seq, recorded_at, occurred_at, actor, action, entity_kind, entity_id, reason, "
    "clock_overridden, tool_version, payload, prev_hash, hash, os_login FROM audit_log "
    "WHERE (CAST(:since AS text) IS NULL OR recorded_at >= :since) AND "
    "(CAST(:kind AS text) IS NULL OR entity_kind = :kind) "
    "AND (CAST(:id AS text) IS NULL OR entity_id = :id) ORDER BY seq";
// Entries made by one write unit, many at a time (PgAudit::flush): one array per column.
inline constexpr const char* kInsertAudits =
    "INSERT INTO audit_log (seq, recorded_at, occurred_at, actor, action, entity_kind, "
    "entity_id, reason, clock_overridden, tool_version, payload, prev_hash, hash, os_login) "
    "SELECT * FROM unnest(:seqs::bigint[], :recorded_ats::text[], :occurred_ats::text[], "
    ":actors::text[], :actions::text[], :entity_kinds::text[], :entity_ids::text[], "
    ":reasons::text[], :clock_overriddens::bigint[], :tool_versions::text[], :payloads::text[], "
    ":prev_hashes::text[], :hashes::text[], :os_logins::text[])";
inline constexpr const char* kTriggerNames =
    "SELECT c.relname, t.tgname FROM pg_trigger t JOIN pg_class c ON c.oid = t.tgrelid "
    "JOIN pg_namespace n ON n.oid = c.relnamespace "
    "WHERE n.nspname = :schema AND NOT t.tgisinternal AND t.tgenabled IN ('O', 'A')";

}  // namespace cw::store::postgresql::sql
