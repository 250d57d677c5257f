-- SPDX-License-Identifier: Apache-2.0
-- The store's schema after every migration in migrations/, for readers and reviewers.
-- GENERATED: the normalised dump of sqlite_master (type, name, sql; ordered by type, then
-- name; SQLite's internal objects left out; trailing spaces removed), followed by the
-- schema version. Do not edit: tests/unit/store/schema_snapshot_test.cpp compares this
-- file with what the migrations build and fails when they differ. To regenerate after
-- adding a migration, run from the repository root
--   CURVEWARDEN_UPDATE_SCHEMA_SNAPSHOT=1 build-tests/tests/unit/store/store_tests '[schema]'
-- (with your build directory) and review the diff together with the migration.

-- index audit_log_by_entity
CREATE INDEX audit_log_by_entity ON audit_log (entity_kind, entity_id, seq);

-- index audit_log_by_recorded
CREATE INDEX audit_log_by_recorded ON audit_log (recorded_at);

-- index calibration_lots_by_audit_seq
CREATE INDEX calibration_lots_by_audit_seq ON calibration_lots (audit_seq);

-- index calibration_lots_by_lot
CREATE INDEX calibration_lots_by_lot ON calibration_lots (lot_id);

-- index calibrations_by_audit_seq
CREATE INDEX calibrations_by_audit_seq ON calibrations (audit_seq);

-- index checks_by_audit_seq
CREATE INDEX checks_by_audit_seq ON checks (audit_seq);

-- index checks_by_curve
CREATE INDEX checks_by_curve ON checks (curve_id, occurred_at);

-- index checks_by_time
CREATE INDEX checks_by_time ON checks (occurred_at);

-- index checks_failed_by_time
CREATE INDEX checks_failed_by_time ON checks (occurred_at) WHERE passed = 0;

-- index curve_points_by_audit_seq
CREATE INDEX curve_points_by_audit_seq ON curve_points (audit_seq);

-- index curve_retirements_by_audit_seq
CREATE INDEX curve_retirements_by_audit_seq ON curve_retirements (audit_seq);

-- index curve_retirements_by_curve
CREATE INDEX curve_retirements_by_curve ON curve_retirements (curve_id, occurred_at);

-- index curve_reviews_by_audit_seq
CREATE INDEX curve_reviews_by_audit_seq ON curve_reviews (audit_seq);

-- index curve_reviews_by_curve
CREATE INDEX curve_reviews_by_curve ON curve_reviews (curve_id, occurred_at);

-- index curves_by_audit_seq
CREATE INDEX curves_by_audit_seq ON curves (audit_seq);

-- index curves_by_calibration
CREATE INDEX curves_by_calibration ON curves (calibration_id);

-- index curves_by_expiry
CREATE INDEX curves_by_expiry ON curves (expires_at);

-- index curves_by_group
CREATE INDEX curves_by_group ON curves (method_id, instrument_id, analyte, acquired_at);

-- index curves_by_group_expiry
CREATE INDEX curves_by_group_expiry ON curves (method_id, instrument_id, analyte, expires_at);

-- index curves_by_instrument
CREATE INDEX curves_by_instrument ON curves (instrument_id, expires_at);

-- index curves_by_instrument_group
CREATE INDEX curves_by_instrument_group ON curves (instrument_id, method_id, analyte);

-- index instrument_column_maps_by_audit_seq
CREATE INDEX instrument_column_maps_by_audit_seq ON instrument_column_maps (audit_seq);

-- index instrument_column_maps_by_instrument
CREATE INDEX instrument_column_maps_by_instrument
  ON instrument_column_maps (instrument_id, occurred_at);

-- index instrument_service_events_by_audit_seq
CREATE INDEX instrument_service_events_by_audit_seq ON instrument_service_events (audit_seq);

-- index instrument_service_events_by_instrument
CREATE INDEX instrument_service_events_by_instrument
  ON instrument_service_events (instrument_id, occurred_at);

-- index instruments_by_audit_seq
CREATE INDEX instruments_by_audit_seq ON instruments (audit_seq);

-- index lab_settings_by_audit_seq
CREATE INDEX lab_settings_by_audit_seq ON lab_settings (audit_seq);

-- index lot_values_by_audit_seq
CREATE INDEX lot_values_by_audit_seq ON lot_values (audit_seq);

-- index lot_withdrawals_by_audit_seq
CREATE INDEX lot_withdrawals_by_audit_seq ON lot_withdrawals (audit_seq);

-- index lots_by_audit_seq
CREATE INDEX lots_by_audit_seq ON lots (audit_seq);

-- index method_versions_by_audit_seq
CREATE INDEX method_versions_by_audit_seq ON method_versions (audit_seq);

-- index methods_by_audit_seq
CREATE INDEX methods_by_audit_seq ON methods (audit_seq);

-- index refusals_by_audit_seq
CREATE INDEX refusals_by_audit_seq ON refusals (audit_seq);

-- index result_status_events_by_audit_seq
CREATE INDEX result_status_events_by_audit_seq ON result_status_events (audit_seq);

-- index result_status_events_by_result
CREATE INDEX result_status_events_by_result ON result_status_events (result_id, id);

-- index results_by_audit_seq
CREATE INDEX results_by_audit_seq ON results (audit_seq);

-- index results_by_curve
CREATE INDEX results_by_curve ON results (curve_id, occurred_at);

-- index results_by_sample
CREATE INDEX results_by_sample ON results (sample, occurred_at);

-- index results_by_time
CREATE INDEX results_by_time ON results (occurred_at);

-- index run_checks_by_audit_seq
CREATE INDEX run_checks_by_audit_seq ON run_checks (audit_seq);

-- index run_results_by_audit_seq
CREATE INDEX run_results_by_audit_seq ON run_results (audit_seq);

-- index runs_by_acquired
CREATE INDEX runs_by_acquired ON runs (acquired_at);

-- index runs_by_audit_seq
CREATE INDEX runs_by_audit_seq ON runs (audit_seq);

-- index runs_by_sha256
CREATE INDEX runs_by_sha256 ON runs (file_sha256);

-- index settled_tallies_by_audit_seq
CREATE INDEX settled_tallies_by_audit_seq ON settled_tallies (audit_seq);

-- index settled_tallies_by_instrument
CREATE INDEX settled_tallies_by_instrument
  ON settled_tallies (instrument_id, effective_at, state, delta);

-- index settled_totals_by_audit_seq
CREATE INDEX settled_totals_by_audit_seq ON settled_totals (audit_seq);

-- index signature_failures_by_audit_seq
CREATE INDEX signature_failures_by_audit_seq ON signature_failures (audit_seq);

-- index signature_failures_by_user
CREATE INDEX signature_failures_by_user ON signature_failures (user_id, id);

-- index signatures_by_audit_seq
CREATE INDEX signatures_by_audit_seq ON signatures (audit_seq);

-- index signatures_by_entity
CREATE INDEX signatures_by_entity ON signatures (entity_kind, entity_id, id);

-- index signatures_by_user
CREATE INDEX signatures_by_user ON signatures (user_id, id);

-- index user_events_by_audit_seq
CREATE INDEX user_events_by_audit_seq ON user_events (audit_seq);

-- index user_events_by_user
CREATE INDEX user_events_by_user ON user_events (user_id, id);

-- index user_passphrases_by_audit_seq
CREATE INDEX user_passphrases_by_audit_seq ON user_passphrases (audit_seq);

-- index user_passphrases_by_user
CREATE INDEX user_passphrases_by_user ON user_passphrases (user_id, id);

-- index users_by_audit_seq
CREATE INDEX users_by_audit_seq ON users (audit_seq);

-- table audit_log
CREATE TABLE audit_log (
  seq              INTEGER PRIMARY KEY,           -- 1, 2, 3, ... without gaps
  recorded_at      TEXT    NOT NULL,              -- when the entry was written (UTC)
  occurred_at      TEXT    NOT NULL,              -- when the recorded event happened (--at)
  actor            TEXT    NOT NULL,
  action           TEXT    NOT NULL,              -- e.g. 'lot.withdraw'
  entity_kind      TEXT    NOT NULL,              -- e.g. 'lot'
  entity_id        TEXT    NOT NULL,              -- the id people use: a code or a number
  reason           TEXT,
  clock_overridden INTEGER NOT NULL CHECK (clock_overridden IN (0, 1)),
  tool_version     TEXT    NOT NULL,
  payload          TEXT    NOT NULL,              -- canonical JSON of the rows written
  prev_hash        TEXT    NOT NULL CHECK (length(prev_hash) = 64),
  hash             TEXT    NOT NULL CHECK (length(hash) = 64)
, os_login TEXT) STRICT;

-- table calibration_lots
CREATE TABLE calibration_lots (
  id             INTEGER PRIMARY KEY AUTOINCREMENT,
  calibration_id INTEGER NOT NULL REFERENCES calibrations (id),
  lot_id         INTEGER NOT NULL REFERENCES lots (id),
  audit_seq      INTEGER NOT NULL REFERENCES audit_log (seq) DEFERRABLE INITIALLY DEFERRED,
  UNIQUE (calibration_id, lot_id)
) STRICT;

-- table calibrations
CREATE TABLE calibrations (
  id                INTEGER PRIMARY KEY AUTOINCREMENT,
  method_version_id INTEGER NOT NULL REFERENCES method_versions (id),
  instrument_id     INTEGER NOT NULL REFERENCES instruments (id),
  acquired_at       TEXT    NOT NULL,
  analyst           TEXT    NOT NULL,
  note              TEXT,
  points_file       TEXT    NOT NULL,
  points_sha256     TEXT    NOT NULL CHECK (length(points_sha256) = 64),
  audit_seq         INTEGER NOT NULL REFERENCES audit_log (seq) DEFERRABLE INITIALLY DEFERRED
) STRICT;

-- table checks
CREATE TABLE checks (
  id            INTEGER PRIMARY KEY AUTOINCREMENT,
  curve_id      INTEGER NOT NULL REFERENCES curves (id),
  kind          TEXT    NOT NULL CHECK (kind IN ('check', 'blank')),
  nominal       REAL    NOT NULL,
  response      REAL    NOT NULL,
  is_response   REAL,
  measured      REAL,                           -- NULL when the response has no solution
  recovery_pct  REAL,                           -- NULL for blanks
  limit_low     REAL,                           -- recovery limits (check) ...
  limit_high    REAL,                           -- ... or the blank limit (blank, in limit_high)
  passed        INTEGER NOT NULL CHECK (passed IN (0, 1)),
  analyst       TEXT    NOT NULL,
  occurred_at   TEXT    NOT NULL,
  audit_seq     INTEGER NOT NULL REFERENCES audit_log (seq) DEFERRABLE INITIALLY DEFERRED
) STRICT;

-- table curve_points
CREATE TABLE curve_points (
  id              INTEGER PRIMARY KEY AUTOINCREMENT,
  curve_id        INTEGER NOT NULL REFERENCES curves (id),
  source_line     INTEGER NOT NULL,
  level           TEXT    NOT NULL,
  replicate       INTEGER NOT NULL,
  nominal         REAL    NOT NULL,
  response        REAL    NOT NULL,
  is_response     REAL,
  y               REAL    NOT NULL,             -- the fitted response (ratio with an internal standard)
  back_calculated REAL,
  error_pct       REAL,
  within_limits   INTEGER NOT NULL CHECK (within_limits IN (0, 1)),
  excluded        INTEGER NOT NULL CHECK (excluded IN (0, 1)),
  exclude_reason  TEXT,
  audit_seq       INTEGER NOT NULL REFERENCES audit_log (seq) DEFERRABLE INITIALLY DEFERRED,
  UNIQUE (curve_id, level, replicate)
) STRICT;

-- table curve_retirements
CREATE TABLE curve_retirements (
  id          INTEGER PRIMARY KEY AUTOINCREMENT,
  curve_id    INTEGER NOT NULL REFERENCES curves (id),
  retired_by  TEXT    NOT NULL,
  reason      TEXT    NOT NULL,
  occurred_at TEXT    NOT NULL,
  audit_seq   INTEGER NOT NULL REFERENCES audit_log (seq) DEFERRABLE INITIALLY DEFERRED
) STRICT;

-- table curve_reviews
CREATE TABLE curve_reviews (
  id          INTEGER PRIMARY KEY AUTOINCREMENT,
  curve_id    INTEGER NOT NULL REFERENCES curves (id),
  decision    TEXT    NOT NULL CHECK (decision IN ('approve', 'reject')),
  reviewer    TEXT    NOT NULL,
  reason      TEXT    NOT NULL,
  occurred_at TEXT    NOT NULL,
  audit_seq   INTEGER NOT NULL REFERENCES audit_log (seq) DEFERRABLE INITIALLY DEFERRED
) STRICT;

-- table curves
CREATE TABLE curves (
  id              INTEGER PRIMARY KEY AUTOINCREMENT,
  calibration_id  INTEGER NOT NULL REFERENCES calibrations (id),
  -- copies of the calibration's keys, so that lookups by group and by expiry need no join
  method_id       INTEGER NOT NULL REFERENCES methods (id),
  instrument_id   INTEGER NOT NULL REFERENCES instruments (id),
  acquired_at     TEXT    NOT NULL,
  analyte         TEXT    NOT NULL,
  model           TEXT    NOT NULL CHECK (model IN ('linear', 'linear-through-origin',
                                                     'quadratic', 'mean-response-factor')),
  weighting       TEXT    NOT NULL CHECK (weighting IN ('none', '1/x', '1/x^2', '1/y', '1/y^2')),
  intercept       REAL    NOT NULL,
  slope           REAL    NOT NULL,
  quadratic       REAL    NOT NULL,
  se_intercept    REAL    NOT NULL,
  se_slope        REAL    NOT NULL,
  se_quadratic    REAL    NOT NULL,
  r2              REAL    NOT NULL,
  residual_sd     REAL    NOT NULL,
  dof             INTEGER NOT NULL,
  n_points        INTEGER NOT NULL,
  n_levels        INTEGER NOT NULL,
  range_low       REAL    NOT NULL,
  range_high      REAL    NOT NULL,
  lod             REAL    NOT NULL,
  loq             REAL    NOT NULL,
  rf_rsd_pct      REAL    NOT NULL,
  verdict         TEXT    NOT NULL CHECK (verdict IN ('accepted', 'rejected')),
  failed_criteria TEXT    NOT NULL,             -- JSON array of criterion tokens
  statistics      TEXT    NOT NULL,             -- JSON: the full fit (covariance, weights, Mandel, ...)
  acceptance      TEXT    NOT NULL,             -- JSON: every criterion with value and limit
  expires_at      TEXT    NOT NULL,             -- earliest of acquired + valid_for and lot expiries
  audit_seq       INTEGER NOT NULL REFERENCES audit_log (seq) DEFERRABLE INITIALLY DEFERRED
) STRICT;

-- table instrument_column_maps
CREATE TABLE instrument_column_maps (
  id            INTEGER PRIMARY KEY AUTOINCREMENT,
  instrument_id INTEGER NOT NULL REFERENCES instruments (id),
  columns       TEXT    NOT NULL,               -- JSON object: logical column -> header ({} clears)
  reason        TEXT,
  saved_by      TEXT    NOT NULL,
  occurred_at   TEXT    NOT NULL,
  audit_seq     INTEGER NOT NULL REFERENCES audit_log (seq) DEFERRABLE INITIALLY DEFERRED
) STRICT;

-- table instrument_service_events
CREATE TABLE instrument_service_events (
  id            INTEGER PRIMARY KEY AUTOINCREMENT,
  instrument_id INTEGER NOT NULL REFERENCES instruments (id),
  direction     TEXT    NOT NULL CHECK (direction IN ('out', 'back')),
  reason        TEXT    NOT NULL,
  occurred_at   TEXT    NOT NULL,
  audit_seq     INTEGER NOT NULL REFERENCES audit_log (seq) DEFERRABLE INITIALLY DEFERRED
) STRICT;

-- table instruments
CREATE TABLE instruments (
  id            INTEGER PRIMARY KEY AUTOINCREMENT,
  code          TEXT    NOT NULL UNIQUE,
  name          TEXT,
  registered_at TEXT    NOT NULL,
  audit_seq     INTEGER NOT NULL REFERENCES audit_log (seq) DEFERRABLE INITIALLY DEFERRED
) STRICT;

-- table lab_settings
CREATE TABLE lab_settings (
  id          INTEGER PRIMARY KEY AUTOINCREMENT,
  lab_name    TEXT    NOT NULL,
  time_zone   TEXT    NOT NULL,
  audit_seq   INTEGER NOT NULL REFERENCES audit_log (seq) DEFERRABLE INITIALLY DEFERRED
) STRICT;

-- table lot_values
CREATE TABLE lot_values (
  id          INTEGER PRIMARY KEY AUTOINCREMENT,
  lot_id      INTEGER NOT NULL REFERENCES lots (id),
  analyte     TEXT    NOT NULL,
  value       REAL    NOT NULL,
  uncertainty REAL    CHECK (uncertainty IS NULL OR uncertainty >= 0),
  audit_seq   INTEGER NOT NULL REFERENCES audit_log (seq) DEFERRABLE INITIALLY DEFERRED,
  UNIQUE (lot_id, analyte)
) STRICT;

-- table lot_withdrawals
CREATE TABLE lot_withdrawals (
  id          INTEGER PRIMARY KEY AUTOINCREMENT,
  lot_id      INTEGER NOT NULL UNIQUE REFERENCES lots (id),
  reason      TEXT    NOT NULL,
  occurred_at TEXT    NOT NULL,
  audit_seq   INTEGER NOT NULL REFERENCES audit_log (seq) DEFERRABLE INITIALLY DEFERRED
) STRICT;

-- table lots
CREATE TABLE lots (
  id            INTEGER PRIMARY KEY AUTOINCREMENT,
  code          TEXT    NOT NULL UNIQUE,
  material      TEXT    NOT NULL,
  expires_on    TEXT    NOT NULL,               -- certificate expiry, YYYY-MM-DD (lab-local day)
  opened_on     TEXT,
  in_use_days   INTEGER CHECK (in_use_days IS NULL OR in_use_days > 0),
  certificate   TEXT,
  registered_at TEXT    NOT NULL,
  audit_seq     INTEGER NOT NULL REFERENCES audit_log (seq) DEFERRABLE INITIALLY DEFERRED
, coverage_factor REAL CHECK (coverage_factor IS NULL OR coverage_factor > 0)) STRICT;

-- table method_versions
CREATE TABLE method_versions (
  id            INTEGER PRIMARY KEY AUTOINCREMENT,
  method_id     INTEGER NOT NULL REFERENCES methods (id),
  version       INTEGER NOT NULL CHECK (version >= 1),
  effective_at  TEXT    NOT NULL,               -- in force from this instant
  title         TEXT    NOT NULL,
  unit          TEXT    NOT NULL,
  definition    TEXT    NOT NULL,               -- canonical JSON of the parsed file
  source_name   TEXT    NOT NULL,               -- file name as given
  source_text   TEXT    NOT NULL,               -- the file, byte for byte
  source_sha256 TEXT    NOT NULL CHECK (length(source_sha256) = 64),
  reason        TEXT,                           -- required from version 2 on
  audit_seq     INTEGER NOT NULL REFERENCES audit_log (seq) DEFERRABLE INITIALLY DEFERRED,
  UNIQUE (method_id, version)
) STRICT;

-- table methods
CREATE TABLE methods (
  id            INTEGER PRIMARY KEY AUTOINCREMENT,
  code          TEXT    NOT NULL UNIQUE,
  registered_at TEXT    NOT NULL,
  audit_seq     INTEGER NOT NULL REFERENCES audit_log (seq) DEFERRABLE INITIALLY DEFERRED
) STRICT;

-- table refusals
CREATE TABLE refusals (
  id          INTEGER PRIMARY KEY AUTOINCREMENT,
  action      TEXT    NOT NULL,                 -- what was attempted, e.g. 'curve.review'
  entity_kind TEXT    NOT NULL,
  entity_id   TEXT    NOT NULL,
  actor       TEXT    NOT NULL,
  reasons     TEXT    NOT NULL,                 -- JSON array of reason tokens
  message     TEXT    NOT NULL,
  occurred_at TEXT    NOT NULL,
  audit_seq   INTEGER NOT NULL REFERENCES audit_log (seq) DEFERRABLE INITIALLY DEFERRED
) STRICT;

-- table result_status_events
CREATE TABLE result_status_events (
  id          INTEGER PRIMARY KEY AUTOINCREMENT,
  result_id   INTEGER NOT NULL REFERENCES results (id),
  status      TEXT    NOT NULL CHECK (status IN ('rerun-required')),
  reason      TEXT    NOT NULL CHECK (reason IN ('check-failed', 'samples-per-check',
                                                 'no-closing-check')),
  detail      TEXT    NOT NULL,                 -- the facts in plain words
  check_id    INTEGER REFERENCES checks (id),   -- the failing check, or the last passing one
  run_id      INTEGER REFERENCES runs (id),     -- the run that decided it
  occurred_at TEXT    NOT NULL,
  audit_seq   INTEGER NOT NULL REFERENCES audit_log (seq) DEFERRABLE INITIALLY DEFERRED
) STRICT;

-- table results
CREATE TABLE results (
  id                INTEGER PRIMARY KEY AUTOINCREMENT,
  sample            TEXT    NOT NULL,
  analyte           TEXT    NOT NULL,
  status            TEXT    NOT NULL CHECK (status IN ('reported', 'refused')),
  curve_id          INTEGER REFERENCES curves (id),
  method_id         INTEGER REFERENCES methods (id),
  instrument_id     INTEGER REFERENCES instruments (id),
  response          REAL    NOT NULL,
  is_response       REAL,
  replicates        INTEGER NOT NULL CHECK (replicates >= 1),
  dilution          REAL    NOT NULL CHECK (dilution > 0),
  x0                REAL,                       -- instrument-level concentration
  sd_x0             REAL,
  concentration     REAL,                       -- x0 times the dilution factor
  ci_low            REAL,
  ci_high           REAL,
  flags             TEXT    NOT NULL,           -- JSON array
  reasons           TEXT    NOT NULL,           -- JSON array of reason tokens
  reason_details    TEXT    NOT NULL,           -- JSON array of {reason, since, message}
  analyst           TEXT    NOT NULL,
  occurred_at       TEXT    NOT NULL,
  audit_seq         INTEGER NOT NULL REFERENCES audit_log (seq) DEFERRABLE INITIALLY DEFERRED
, censored TEXT CHECK (censored IS NULL OR censored = '<'), reporting_limit REAL, computed_concentration REAL, uncertainty TEXT) STRICT;

-- table run_checks
CREATE TABLE run_checks (
  id        INTEGER PRIMARY KEY AUTOINCREMENT,
  run_id    INTEGER NOT NULL REFERENCES runs (id),
  position  INTEGER NOT NULL CHECK (position >= 1),
  check_id  INTEGER NOT NULL UNIQUE REFERENCES checks (id),
  label     TEXT,                               -- the row's sample column, when it named the check
  audit_seq INTEGER NOT NULL REFERENCES audit_log (seq) DEFERRABLE INITIALLY DEFERRED,
  UNIQUE (run_id, position)
) STRICT;

-- table run_results
CREATE TABLE run_results (
  id        INTEGER PRIMARY KEY AUTOINCREMENT,
  run_id    INTEGER NOT NULL REFERENCES runs (id),
  position  INTEGER NOT NULL CHECK (position >= 1),
  result_id INTEGER NOT NULL UNIQUE REFERENCES results (id),
  audit_seq INTEGER NOT NULL REFERENCES audit_log (seq) DEFERRABLE INITIALLY DEFERRED,
  UNIQUE (run_id, position)
) STRICT;

-- table runs
CREATE TABLE runs (
  id                INTEGER PRIMARY KEY AUTOINCREMENT,
  method_version_id INTEGER NOT NULL REFERENCES method_versions (id),
  instrument_id     INTEGER NOT NULL REFERENCES instruments (id),
  acquired_at       TEXT    NOT NULL,
  analyst           TEXT    NOT NULL,
  file_name         TEXT    NOT NULL,
  file_sha256       TEXT    NOT NULL CHECK (length(file_sha256) = 64),
  row_count         INTEGER NOT NULL CHECK (row_count >= 1),
  columns           TEXT    NOT NULL,           -- JSON object: the header mapping used ({} none)
  again_reason      TEXT,                       -- why the same file was imported again
  audit_seq         INTEGER NOT NULL REFERENCES audit_log (seq) DEFERRABLE INITIALLY DEFERRED
) STRICT;

-- table schema_migrations
CREATE TABLE schema_migrations (
  version    INTEGER PRIMARY KEY,
  name       TEXT    NOT NULL,
  sha256     TEXT    NOT NULL CHECK (length(sha256) = 64),
  applied_at TEXT    NOT NULL
) STRICT;

-- table settled_tallies
CREATE TABLE settled_tallies (
  instrument_id INTEGER NOT NULL REFERENCES instruments (id),
  effective_at  TEXT    NOT NULL,
  state         TEXT    NOT NULL
                CHECK (state IN ('rejected', 'awaiting-review', 'stale', 'retired')),
  delta         INTEGER NOT NULL CHECK (delta <> 0),
  curve_id      INTEGER NOT NULL REFERENCES curves (id),
  audit_seq     INTEGER NOT NULL REFERENCES audit_log (seq) DEFERRABLE INITIALLY DEFERRED
) STRICT;

-- table settled_totals
CREATE TABLE settled_totals (
  instrument_id INTEGER NOT NULL REFERENCES instruments (id),
  state         TEXT    NOT NULL
                CHECK (state IN ('rejected', 'awaiting-review', 'stale', 'retired')),
  n             INTEGER NOT NULL CHECK (n >= 1),
  total         INTEGER NOT NULL CHECK (total >= 0),
  audit_seq     INTEGER NOT NULL REFERENCES audit_log (seq) DEFERRABLE INITIALLY DEFERRED,
  PRIMARY KEY (instrument_id, state, n)
) STRICT, WITHOUT ROWID;

-- table signature_failures
CREATE TABLE signature_failures (
  id          INTEGER PRIMARY KEY AUTOINCREMENT,
  user_id     INTEGER NOT NULL REFERENCES users (id),
  action      TEXT    NOT NULL,
  occurred_at TEXT    NOT NULL,
  audit_seq   INTEGER NOT NULL REFERENCES audit_log (seq) DEFERRABLE INITIALLY DEFERRED
) STRICT;

-- table signatures
CREATE TABLE signatures (
  id          INTEGER PRIMARY KEY AUTOINCREMENT,
  user_id     INTEGER NOT NULL REFERENCES users (id),
  name        TEXT    NOT NULL,                 -- the signer's full name when signing
  meaning     TEXT    NOT NULL,                 -- 'approved', 'rejected', 'retired', ...
  entity_kind TEXT    NOT NULL,
  entity_id   TEXT    NOT NULL,
  signed_at   TEXT    NOT NULL,                 -- UTC; shown in the lab's zone
  audit_seq   INTEGER NOT NULL REFERENCES audit_log (seq) DEFERRABLE INITIALLY DEFERRED
) STRICT;

-- table user_events
CREATE TABLE user_events (
  id          INTEGER PRIMARY KEY AUTOINCREMENT,
  user_id     INTEGER NOT NULL REFERENCES users (id),
  status      TEXT    NOT NULL CHECK (status IN ('enabled', 'disabled')),
  role        TEXT    NOT NULL CHECK (role IN ('analyst', 'reviewer', 'quality', 'admin')),
  reason      TEXT    NOT NULL,
  by_user     TEXT    NOT NULL,                 -- the code of the user who made the change
  occurred_at TEXT    NOT NULL,
  audit_seq   INTEGER NOT NULL REFERENCES audit_log (seq) DEFERRABLE INITIALLY DEFERRED
) STRICT;

-- table user_passphrases
CREATE TABLE user_passphrases (
  id          INTEGER PRIMARY KEY AUTOINCREMENT,
  user_id     INTEGER NOT NULL REFERENCES users (id),
  hash        TEXT    NOT NULL,                 -- Argon2id, libsodium's crypto_pwhash_str form
  occurred_at TEXT    NOT NULL,
  audit_seq   INTEGER NOT NULL REFERENCES audit_log (seq) DEFERRABLE INITIALLY DEFERRED
) STRICT;

-- table users
CREATE TABLE users (
  id            INTEGER PRIMARY KEY AUTOINCREMENT,
  code          TEXT    NOT NULL UNIQUE,        -- canonical: ASCII letters in lower case
  name          TEXT    NOT NULL,               -- full name, shown with every signature
  registered_at TEXT    NOT NULL,
  audit_seq     INTEGER NOT NULL REFERENCES audit_log (seq) DEFERRABLE INITIALLY DEFERRED
) STRICT;

-- trigger audit_log_no_delete
CREATE TRIGGER audit_log_no_delete BEFORE DELETE ON audit_log
BEGIN SELECT RAISE(ABORT, 'audit_log is append-only: rows cannot be deleted'); END;

-- trigger audit_log_no_update
CREATE TRIGGER audit_log_no_update BEFORE UPDATE ON audit_log
BEGIN SELECT RAISE(ABORT, 'audit_log is append-only: rows cannot be changed'); END;

-- trigger calibration_lots_no_delete
CREATE TRIGGER calibration_lots_no_delete BEFORE DELETE ON calibration_lots
BEGIN SELECT RAISE(ABORT, 'calibration_lots is append-only: rows cannot be deleted'); END;

-- trigger calibration_lots_no_update
CREATE TRIGGER calibration_lots_no_update BEFORE UPDATE ON calibration_lots
BEGIN SELECT RAISE(ABORT, 'calibration_lots is append-only: rows cannot be changed'); END;

-- trigger calibrations_no_delete
CREATE TRIGGER calibrations_no_delete BEFORE DELETE ON calibrations
BEGIN SELECT RAISE(ABORT, 'calibrations is append-only: rows cannot be deleted'); END;

-- trigger calibrations_no_update
CREATE TRIGGER calibrations_no_update BEFORE UPDATE ON calibrations
BEGIN SELECT RAISE(ABORT, 'calibrations is append-only: rows cannot be changed'); END;

-- trigger checks_no_delete
CREATE TRIGGER checks_no_delete BEFORE DELETE ON checks
BEGIN SELECT RAISE(ABORT, 'checks is append-only: rows cannot be deleted'); END;

-- trigger checks_no_update
CREATE TRIGGER checks_no_update BEFORE UPDATE ON checks
BEGIN SELECT RAISE(ABORT, 'checks is append-only: rows cannot be changed'); END;

-- trigger curve_points_no_delete
CREATE TRIGGER curve_points_no_delete BEFORE DELETE ON curve_points
BEGIN SELECT RAISE(ABORT, 'curve_points is append-only: rows cannot be deleted'); END;

-- trigger curve_points_no_update
CREATE TRIGGER curve_points_no_update BEFORE UPDATE ON curve_points
BEGIN SELECT RAISE(ABORT, 'curve_points is append-only: rows cannot be changed'); END;

-- trigger curve_retirements_no_delete
CREATE TRIGGER curve_retirements_no_delete BEFORE DELETE ON curve_retirements
BEGIN SELECT RAISE(ABORT, 'curve_retirements is append-only: rows cannot be deleted'); END;

-- trigger curve_retirements_no_update
CREATE TRIGGER curve_retirements_no_update BEFORE UPDATE ON curve_retirements
BEGIN SELECT RAISE(ABORT, 'curve_retirements is append-only: rows cannot be changed'); END;

-- trigger curve_reviews_no_delete
CREATE TRIGGER curve_reviews_no_delete BEFORE DELETE ON curve_reviews
BEGIN SELECT RAISE(ABORT, 'curve_reviews is append-only: rows cannot be deleted'); END;

-- trigger curve_reviews_no_update
CREATE TRIGGER curve_reviews_no_update BEFORE UPDATE ON curve_reviews
BEGIN SELECT RAISE(ABORT, 'curve_reviews is append-only: rows cannot be changed'); END;

-- trigger curves_no_delete
CREATE TRIGGER curves_no_delete BEFORE DELETE ON curves
BEGIN SELECT RAISE(ABORT, 'curves is append-only: rows cannot be deleted'); END;

-- trigger curves_no_update
CREATE TRIGGER curves_no_update BEFORE UPDATE ON curves
BEGIN SELECT RAISE(ABORT, 'curves is append-only: rows cannot be changed'); END;

-- trigger instrument_column_maps_no_delete
CREATE TRIGGER instrument_column_maps_no_delete BEFORE DELETE ON instrument_column_maps
BEGIN SELECT RAISE(ABORT, 'instrument_column_maps is append-only: rows cannot be deleted'); END;

-- trigger instrument_column_maps_no_update
CREATE TRIGGER instrument_column_maps_no_update BEFORE UPDATE ON instrument_column_maps
BEGIN SELECT RAISE(ABORT, 'instrument_column_maps is append-only: rows cannot be changed'); END;

-- trigger instrument_service_events_no_delete
CREATE TRIGGER instrument_service_events_no_delete BEFORE DELETE ON instrument_service_events
BEGIN SELECT RAISE(ABORT, 'instrument_service_events is append-only: rows cannot be deleted'); END;

-- trigger instrument_service_events_no_update
CREATE TRIGGER instrument_service_events_no_update BEFORE UPDATE ON instrument_service_events
BEGIN SELECT RAISE(ABORT, 'instrument_service_events is append-only: rows cannot be changed'); END;

-- trigger instruments_no_delete
CREATE TRIGGER instruments_no_delete BEFORE DELETE ON instruments
BEGIN SELECT RAISE(ABORT, 'instruments is append-only: rows cannot be deleted'); END;

-- trigger instruments_no_update
CREATE TRIGGER instruments_no_update BEFORE UPDATE ON instruments
BEGIN SELECT RAISE(ABORT, 'instruments is append-only: rows cannot be changed'); END;

-- trigger lab_settings_no_delete
CREATE TRIGGER lab_settings_no_delete BEFORE DELETE ON lab_settings
BEGIN SELECT RAISE(ABORT, 'lab_settings is append-only: rows cannot be deleted'); END;

-- trigger lab_settings_no_update
CREATE TRIGGER lab_settings_no_update BEFORE UPDATE ON lab_settings
BEGIN SELECT RAISE(ABORT, 'lab_settings is append-only: rows cannot be changed'); END;

-- trigger lot_values_no_delete
CREATE TRIGGER lot_values_no_delete BEFORE DELETE ON lot_values
BEGIN SELECT RAISE(ABORT, 'lot_values is append-only: rows cannot be deleted'); END;

-- trigger lot_values_no_update
CREATE TRIGGER lot_values_no_update BEFORE UPDATE ON lot_values
BEGIN SELECT RAISE(ABORT, 'lot_values is append-only: rows cannot be changed'); END;

-- trigger lot_withdrawals_no_delete
CREATE TRIGGER lot_withdrawals_no_delete BEFORE DELETE ON lot_withdrawals
BEGIN SELECT RAISE(ABORT, 'lot_withdrawals is append-only: rows cannot be deleted'); END;

-- trigger lot_withdrawals_no_update
CREATE TRIGGER lot_withdrawals_no_update BEFORE UPDATE ON lot_withdrawals
BEGIN SELECT RAISE(ABORT, 'lot_withdrawals is append-only: rows cannot be changed'); END;

-- trigger lots_no_delete
CREATE TRIGGER lots_no_delete BEFORE DELETE ON lots
BEGIN SELECT RAISE(ABORT, 'lots is append-only: rows cannot be deleted'); END;

-- trigger lots_no_update
CREATE TRIGGER lots_no_update BEFORE UPDATE ON lots
BEGIN SELECT RAISE(ABORT, 'lots is append-only: rows cannot be changed'); END;

-- trigger method_versions_no_delete
CREATE TRIGGER method_versions_no_delete BEFORE DELETE ON method_versions
BEGIN SELECT RAISE(ABORT, 'method_versions is append-only: rows cannot be deleted'); END;

-- trigger method_versions_no_update
CREATE TRIGGER method_versions_no_update BEFORE UPDATE ON method_versions
BEGIN SELECT RAISE(ABORT, 'method_versions is append-only: rows cannot be changed'); END;

-- trigger methods_no_delete
CREATE TRIGGER methods_no_delete BEFORE DELETE ON methods
BEGIN SELECT RAISE(ABORT, 'methods is append-only: rows cannot be deleted'); END;

-- trigger methods_no_update
CREATE TRIGGER methods_no_update BEFORE UPDATE ON methods
BEGIN SELECT RAISE(ABORT, 'methods is append-only: rows cannot be changed'); END;

-- trigger refusals_no_delete
CREATE TRIGGER refusals_no_delete BEFORE DELETE ON refusals
BEGIN SELECT RAISE(ABORT, 'refusals is append-only: rows cannot be deleted'); END;

-- trigger refusals_no_update
CREATE TRIGGER refusals_no_update BEFORE UPDATE ON refusals
BEGIN SELECT RAISE(ABORT, 'refusals is append-only: rows cannot be changed'); END;

-- trigger result_status_events_no_delete
CREATE TRIGGER result_status_events_no_delete BEFORE DELETE ON result_status_events
BEGIN SELECT RAISE(ABORT, 'result_status_events is append-only: rows cannot be deleted'); END;

-- trigger result_status_events_no_update
CREATE TRIGGER result_status_events_no_update BEFORE UPDATE ON result_status_events
BEGIN SELECT RAISE(ABORT, 'result_status_events is append-only: rows cannot be changed'); END;

-- trigger results_no_delete
CREATE TRIGGER results_no_delete BEFORE DELETE ON results
BEGIN SELECT RAISE(ABORT, 'results is append-only: rows cannot be deleted'); END;

-- trigger results_no_update
CREATE TRIGGER results_no_update BEFORE UPDATE ON results
BEGIN SELECT RAISE(ABORT, 'results is append-only: rows cannot be changed'); END;

-- trigger run_checks_no_delete
CREATE TRIGGER run_checks_no_delete BEFORE DELETE ON run_checks
BEGIN SELECT RAISE(ABORT, 'run_checks is append-only: rows cannot be deleted'); END;

-- trigger run_checks_no_update
CREATE TRIGGER run_checks_no_update BEFORE UPDATE ON run_checks
BEGIN SELECT RAISE(ABORT, 'run_checks is append-only: rows cannot be changed'); END;

-- trigger run_results_no_delete
CREATE TRIGGER run_results_no_delete BEFORE DELETE ON run_results
BEGIN SELECT RAISE(ABORT, 'run_results is append-only: rows cannot be deleted'); END;

-- trigger run_results_no_update
CREATE TRIGGER run_results_no_update BEFORE UPDATE ON run_results
BEGIN SELECT RAISE(ABORT, 'run_results is append-only: rows cannot be changed'); END;

-- trigger runs_no_delete
CREATE TRIGGER runs_no_delete BEFORE DELETE ON runs
BEGIN SELECT RAISE(ABORT, 'runs is append-only: rows cannot be deleted'); END;

-- trigger runs_no_update
CREATE TRIGGER runs_no_update BEFORE UPDATE ON runs
BEGIN SELECT RAISE(ABORT, 'runs is append-only: rows cannot be changed'); END;

-- trigger schema_migrations_no_delete
CREATE TRIGGER schema_migrations_no_delete BEFORE DELETE ON schema_migrations
BEGIN SELECT RAISE(ABORT, 'schema_migrations is append-only: rows cannot be deleted'); END;

-- trigger schema_migrations_no_update
CREATE TRIGGER schema_migrations_no_update BEFORE UPDATE ON schema_migrations
BEGIN SELECT RAISE(ABORT, 'schema_migrations is append-only: rows cannot be changed'); END;

-- trigger settled_tallies_no_delete
CREATE TRIGGER settled_tallies_no_delete BEFORE DELETE ON settled_tallies
BEGIN SELECT RAISE(ABORT, 'settled_tallies is append-only: rows cannot be deleted'); END;

-- trigger settled_tallies_no_update
CREATE TRIGGER settled_tallies_no_update BEFORE UPDATE ON settled_tallies
BEGIN SELECT RAISE(ABORT, 'settled_tallies is append-only: rows cannot be changed'); END;

-- trigger settled_totals_no_delete
CREATE TRIGGER settled_totals_no_delete BEFORE DELETE ON settled_totals
BEGIN SELECT RAISE(ABORT, 'settled_totals is append-only: rows cannot be deleted'); END;

-- trigger settled_totals_no_update
CREATE TRIGGER settled_totals_no_update BEFORE UPDATE ON settled_totals
BEGIN SELECT RAISE(ABORT, 'settled_totals is append-only: rows cannot be changed'); END;

-- trigger signature_failures_no_delete
CREATE TRIGGER signature_failures_no_delete BEFORE DELETE ON signature_failures
BEGIN SELECT RAISE(ABORT, 'signature_failures is append-only: rows cannot be deleted'); END;

-- trigger signature_failures_no_update
CREATE TRIGGER signature_failures_no_update BEFORE UPDATE ON signature_failures
BEGIN SELECT RAISE(ABORT, 'signature_failures is append-only: rows cannot be changed'); END;

-- trigger signatures_no_delete
CREATE TRIGGER signatures_no_delete BEFORE DELETE ON signatures
BEGIN SELECT RAISE(ABORT, 'signatures is append-only: rows cannot be deleted'); END;

-- trigger signatures_no_update
CREATE TRIGGER signatures_no_update BEFORE UPDATE ON signatures
BEGIN SELECT RAISE(ABORT, 'signatures is append-only: rows cannot be changed'); END;

-- trigger user_events_no_delete
CREATE TRIGGER user_events_no_delete BEFORE DELETE ON user_events
BEGIN SELECT RAISE(ABORT, 'user_events is append-only: rows cannot be deleted'); END;

-- trigger user_events_no_update
CREATE TRIGGER user_events_no_update BEFORE UPDATE ON user_events
BEGIN SELECT RAISE(ABORT, 'user_events is append-only: rows cannot be changed'); END;

-- trigger user_passphrases_no_delete
CREATE TRIGGER user_passphrases_no_delete BEFORE DELETE ON user_passphrases
BEGIN SELECT RAISE(ABORT, 'user_passphrases is append-only: rows cannot be deleted'); END;

-- trigger user_passphrases_no_update
CREATE TRIGGER user_passphrases_no_update BEFORE UPDATE ON user_passphrases
BEGIN SELECT RAISE(ABORT, 'user_passphrases is append-only: rows cannot be changed'); END;

-- trigger users_no_delete
CREATE TRIGGER users_no_delete BEFORE DELETE ON users
BEGIN SELECT RAISE(ABORT, 'users is append-only: rows cannot be deleted'); END;

-- trigger users_no_update
CREATE TRIGGER users_no_update BEFORE UPDATE ON users
BEGIN SELECT RAISE(ABORT, 'users is append-only: rows cannot be changed'); END;

PRAGMA user_version = 10;
