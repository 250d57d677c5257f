-- SPDX-License-Identifier: Apache-2.0
-- The whole schema of a Curvewarden store on PostgreSQL: the tables, columns, constraints and
-- indexes of the SQLite migrations 0001-0008 (sections below name the file each mirrors), with
-- the same logical types: BIGINT for integers and 0/1 flags (the canonical row form hashes
-- booleans as integers), DOUBLE PRECISION for reals, TEXT for text, instants (YYYY-MM-DDTHH:MM:SSZ),
-- dates and JSON documents (kept byte for byte: the audit payload hashes them as written).
-- Every TEXT column compares bytewise (COLLATE "C"), as SQLite does: codes sort the same on both
-- backends and instants compare as text in time order whatever the database's locale.
-- Ids are plain BIGINT keys, not identity columns: the write unit gives each new row
-- max(id) + 1 while it holds the store's write lock (src/store/postgresql/sql.h). A sequence
-- would leave gaps after a rolled-back command, and ids are part of the hashed rows, so the
-- same commands would no longer give the same trail as on SQLite.
-- The append-only guards are in 0002.

-- ---- as migrations/0001_create_audit_and_registries.sql
-- The audit trail, lab settings, instruments, methods and reference-material lots.
-- Every fact table carries audit_seq: the audit entry whose payload holds the row.
-- Rows are never updated or deleted (see the triggers in 0004).

CREATE TABLE audit_log (
  seq              BIGINT PRIMARY KEY,           -- 1, 2, 3, ... without gaps
  recorded_at      TEXT COLLATE "C"    NOT NULL,              -- when the entry was written (UTC)
  occurred_at      TEXT COLLATE "C"    NOT NULL,              -- when the recorded event happened (--at)
  actor            TEXT COLLATE "C"    NOT NULL,
  action           TEXT COLLATE "C"    NOT NULL,              -- e.g. 'lot.withdraw'
  entity_kind      TEXT COLLATE "C"    NOT NULL,              -- e.g. 'lot'
  entity_id        TEXT COLLATE "C"    NOT NULL,              -- the id people use: a code or a number
  reason           TEXT COLLATE "C",
  clock_overridden BIGINT NOT NULL CHECK (clock_overridden IN (0, 1)),
  tool_version     TEXT COLLATE "C"    NOT NULL,
  payload          TEXT COLLATE "C"    NOT NULL,              -- canonical JSON of the rows written
  prev_hash        TEXT COLLATE "C"    NOT NULL CHECK (length(prev_hash) = 64),
  hash             TEXT COLLATE "C"    NOT NULL CHECK (length(hash) = 64)
);
CREATE INDEX audit_log_by_entity ON audit_log (entity_kind, entity_id, seq);
CREATE INDEX audit_log_by_recorded ON audit_log (recorded_at);

CREATE TABLE lab_settings (
  id          BIGINT PRIMARY KEY,
  lab_name    TEXT COLLATE "C"    NOT NULL,
  time_zone   TEXT COLLATE "C"    NOT NULL,
  audit_seq   BIGINT NOT NULL REFERENCES audit_log (seq) DEFERRABLE INITIALLY DEFERRED
);

CREATE TABLE instruments (
  id            BIGINT PRIMARY KEY,
  code          TEXT COLLATE "C"    NOT NULL UNIQUE,
  name          TEXT COLLATE "C",
  registered_at TEXT COLLATE "C"    NOT NULL,
  audit_seq     BIGINT NOT NULL REFERENCES audit_log (seq) DEFERRABLE INITIALLY DEFERRED
);

CREATE TABLE instrument_service_events (
  id            BIGINT PRIMARY KEY,
  instrument_id BIGINT NOT NULL REFERENCES instruments (id),
  direction     TEXT COLLATE "C"    NOT NULL CHECK (direction IN ('out', 'back')),
  reason        TEXT COLLATE "C"    NOT NULL,
  occurred_at   TEXT COLLATE "C"    NOT NULL,
  audit_seq     BIGINT NOT NULL REFERENCES audit_log (seq) DEFERRABLE INITIALLY DEFERRED
);
CREATE INDEX instrument_service_events_by_instrument
  ON instrument_service_events (instrument_id, occurred_at);

CREATE TABLE methods (
  id            BIGINT PRIMARY KEY,
  code          TEXT COLLATE "C"    NOT NULL UNIQUE,
  registered_at TEXT COLLATE "C"    NOT NULL,
  audit_seq     BIGINT NOT NULL REFERENCES audit_log (seq) DEFERRABLE INITIALLY DEFERRED
);

CREATE TABLE method_versions (
  id            BIGINT PRIMARY KEY,
  method_id     BIGINT NOT NULL REFERENCES methods (id),
  version       BIGINT NOT NULL CHECK (version >= 1),
  effective_at  TEXT COLLATE "C"    NOT NULL,               -- in force from this instant
  title         TEXT COLLATE "C"    NOT NULL,
  unit          TEXT COLLATE "C"    NOT NULL,
  definition    TEXT COLLATE "C"    NOT NULL,               -- canonical JSON of the parsed file
  source_name   TEXT COLLATE "C"    NOT NULL,               -- file name as given
  source_text   TEXT COLLATE "C"    NOT NULL,               -- the file, byte for byte
  source_sha256 TEXT COLLATE "C"    NOT NULL CHECK (length(source_sha256) = 64),
  reason        TEXT COLLATE "C",                           -- required from version 2 on
  audit_seq     BIGINT NOT NULL REFERENCES audit_log (seq) DEFERRABLE INITIALLY DEFERRED,
  UNIQUE (method_id, version)
);

CREATE TABLE lots (
  id            BIGINT PRIMARY KEY,
  code          TEXT COLLATE "C"    NOT NULL UNIQUE,
  material      TEXT COLLATE "C"    NOT NULL,
  expires_on    TEXT COLLATE "C"    NOT NULL,               -- certificate expiry, YYYY-MM-DD (lab-local day)
  opened_on     TEXT COLLATE "C",
  in_use_days   BIGINT CHECK (in_use_days IS NULL OR in_use_days > 0),
  certificate   TEXT COLLATE "C",
  registered_at TEXT COLLATE "C"    NOT NULL,
  audit_seq     BIGINT NOT NULL REFERENCES audit_log (seq) DEFERRABLE INITIALLY DEFERRED
);

CREATE TABLE lot_values (
  id          BIGINT PRIMARY KEY,
  lot_id      BIGINT NOT NULL REFERENCES lots (id),
  analyte     TEXT COLLATE "C"    NOT NULL,
  value       DOUBLE PRECISION    NOT NULL,
  uncertainty DOUBLE PRECISION    CHECK (uncertainty IS NULL OR uncertainty >= 0),
  audit_seq   BIGINT NOT NULL REFERENCES audit_log (seq) DEFERRABLE INITIALLY DEFERRED,
  UNIQUE (lot_id, analyte)
);

CREATE TABLE lot_withdrawals (
  id          BIGINT PRIMARY KEY,
  lot_id      BIGINT NOT NULL UNIQUE REFERENCES lots (id),
  reason      TEXT COLLATE "C"    NOT NULL,
  occurred_at TEXT COLLATE "C"    NOT NULL,
  audit_seq   BIGINT NOT NULL REFERENCES audit_log (seq) DEFERRABLE INITIALLY DEFERRED
);

-- ---- as migrations/0002_create_calibrations_and_curves.sql
-- Calibrations (one acquisition), their curves (one per analyte) and points, reviews,
-- retirements, and the generic record of refused actions.

CREATE TABLE calibrations (
  id                BIGINT PRIMARY KEY,
  method_version_id BIGINT NOT NULL REFERENCES method_versions (id),
  instrument_id     BIGINT NOT NULL REFERENCES instruments (id),
  acquired_at       TEXT COLLATE "C"    NOT NULL,
  analyst           TEXT COLLATE "C"    NOT NULL,
  note              TEXT COLLATE "C",
  points_file       TEXT COLLATE "C"    NOT NULL,
  points_sha256     TEXT COLLATE "C"    NOT NULL CHECK (length(points_sha256) = 64),
  audit_seq         BIGINT NOT NULL REFERENCES audit_log (seq) DEFERRABLE INITIALLY DEFERRED
);

CREATE TABLE calibration_lots (
  id             BIGINT PRIMARY KEY,
  calibration_id BIGINT NOT NULL REFERENCES calibrations (id),
  lot_id         BIGINT NOT NULL REFERENCES lots (id),
  audit_seq      BIGINT NOT NULL REFERENCES audit_log (seq) DEFERRABLE INITIALLY DEFERRED,
  UNIQUE (calibration_id, lot_id)
);
CREATE INDEX calibration_lots_by_lot ON calibration_lots (lot_id);

CREATE TABLE curves (
  id              BIGINT PRIMARY KEY,
  calibration_id  BIGINT NOT NULL REFERENCES calibrations (id),
  -- copies of the calibration's keys, so that lookups by group and by expiry need no join
  method_id       BIGINT NOT NULL REFERENCES methods (id),
  instrument_id   BIGINT NOT NULL REFERENCES instruments (id),
  acquired_at     TEXT COLLATE "C"    NOT NULL,
  analyte         TEXT COLLATE "C"    NOT NULL,
  model           TEXT COLLATE "C"    NOT NULL CHECK (model IN ('linear', 'linear-through-origin',
                                                     'quadratic', 'mean-response-factor')),
  weighting       TEXT COLLATE "C"    NOT NULL CHECK (weighting IN ('none', '1/x', '1/x^2', '1/y', '1/y^2')),
  intercept       DOUBLE PRECISION    NOT NULL,
  slope           DOUBLE PRECISION    NOT NULL,
  quadratic       DOUBLE PRECISION    NOT NULL,
  se_intercept    DOUBLE PRECISION    NOT NULL,
  se_slope        DOUBLE PRECISION    NOT NULL,
  se_quadratic    DOUBLE PRECISION    NOT NULL,
  r2              DOUBLE PRECISION    NOT NULL,
  residual_sd     DOUBLE PRECISION    NOT NULL,
  dof             BIGINT NOT NULL,
  n_points        BIGINT NOT NULL,
  n_levels        BIGINT NOT NULL,
  range_low       DOUBLE PRECISION    NOT NULL,
  range_high      DOUBLE PRECISION    NOT NULL,
  lod             DOUBLE PRECISION    NOT NULL,
  loq             DOUBLE PRECISION    NOT NULL,
  rf_rsd_pct      DOUBLE PRECISION    NOT NULL,
  verdict         TEXT COLLATE "C"    NOT NULL CHECK (verdict IN ('accepted', 'rejected')),
  failed_criteria TEXT COLLATE "C"    NOT NULL,             -- JSON array of criterion tokens
  statistics      TEXT COLLATE "C"    NOT NULL,             -- JSON: the full fit (covariance, weights, Mandel, ...)
  acceptance      TEXT COLLATE "C"    NOT NULL,             -- JSON: every criterion with value and limit
  expires_at      TEXT COLLATE "C"    NOT NULL,             -- earliest of acquired + valid_for and lot expiries
  audit_seq       BIGINT NOT NULL REFERENCES audit_log (seq) DEFERRABLE INITIALLY DEFERRED
);
CREATE INDEX curves_by_expiry ON curves (expires_at);
CREATE INDEX curves_by_group ON curves (method_id, instrument_id, analyte, acquired_at);
CREATE INDEX curves_by_instrument ON curves (instrument_id, expires_at);
CREATE INDEX curves_by_calibration ON curves (calibration_id);

CREATE TABLE curve_points (
  id              BIGINT PRIMARY KEY,
  curve_id        BIGINT NOT NULL REFERENCES curves (id),
  source_line     BIGINT NOT NULL,
  level           TEXT COLLATE "C"    NOT NULL,
  replicate       BIGINT NOT NULL,
  nominal         DOUBLE PRECISION    NOT NULL,
  response        DOUBLE PRECISION    NOT NULL,
  is_response     DOUBLE PRECISION,
  y               DOUBLE PRECISION    NOT NULL,             -- the fitted response (ratio with an internal standard)
  back_calculated DOUBLE PRECISION,
  error_pct       DOUBLE PRECISION,
  within_limits   BIGINT NOT NULL CHECK (within_limits IN (0, 1)),
  excluded        BIGINT NOT NULL CHECK (excluded IN (0, 1)),
  exclude_reason  TEXT COLLATE "C",
  audit_seq       BIGINT NOT NULL REFERENCES audit_log (seq) DEFERRABLE INITIALLY DEFERRED,
  UNIQUE (curve_id, level, replicate)
);

CREATE TABLE curve_reviews (
  id          BIGINT PRIMARY KEY,
  curve_id    BIGINT NOT NULL REFERENCES curves (id),
  decision    TEXT COLLATE "C"    NOT NULL CHECK (decision IN ('approve', 'reject')),
  reviewer    TEXT COLLATE "C"    NOT NULL,
  reason      TEXT COLLATE "C"    NOT NULL,
  occurred_at TEXT COLLATE "C"    NOT NULL,
  audit_seq   BIGINT NOT NULL REFERENCES audit_log (seq) DEFERRABLE INITIALLY DEFERRED
);
CREATE INDEX curve_reviews_by_curve ON curve_reviews (curve_id, occurred_at);

CREATE TABLE curve_retirements (
  id          BIGINT PRIMARY KEY,
  curve_id    BIGINT NOT NULL REFERENCES curves (id),
  retired_by  TEXT COLLATE "C"    NOT NULL,
  reason      TEXT COLLATE "C"    NOT NULL,
  occurred_at TEXT COLLATE "C"    NOT NULL,
  audit_seq   BIGINT NOT NULL REFERENCES audit_log (seq) DEFERRABLE INITIALLY DEFERRED
);
CREATE INDEX curve_retirements_by_curve ON curve_retirements (curve_id, occurred_at);

CREATE TABLE refusals (
  id          BIGINT PRIMARY KEY,
  action      TEXT COLLATE "C"    NOT NULL,                 -- what was attempted, e.g. 'curve.review'
  entity_kind TEXT COLLATE "C"    NOT NULL,
  entity_id   TEXT COLLATE "C"    NOT NULL,
  actor       TEXT COLLATE "C"    NOT NULL,
  reasons     TEXT COLLATE "C"    NOT NULL,                 -- JSON array of reason tokens
  message     TEXT COLLATE "C"    NOT NULL,
  occurred_at TEXT COLLATE "C"    NOT NULL,
  audit_seq   BIGINT NOT NULL REFERENCES audit_log (seq) DEFERRABLE INITIALLY DEFERRED
);

-- ---- as migrations/0003_create_checks_and_results.sql
-- Check standards and blanks measured against curves, and quantified results (reported or
-- refused).

CREATE TABLE checks (
  id            BIGINT PRIMARY KEY,
  curve_id      BIGINT NOT NULL REFERENCES curves (id),
  kind          TEXT COLLATE "C"    NOT NULL CHECK (kind IN ('check', 'blank')),
  nominal       DOUBLE PRECISION    NOT NULL,
  response      DOUBLE PRECISION    NOT NULL,
  is_response   DOUBLE PRECISION,
  measured      DOUBLE PRECISION,                           -- NULL when the response has no solution
  recovery_pct  DOUBLE PRECISION,                           -- NULL for blanks
  limit_low     DOUBLE PRECISION,                           -- recovery limits (check) ...
  limit_high    DOUBLE PRECISION,                           -- ... or the blank limit (blank, in limit_high)
  passed        BIGINT NOT NULL CHECK (passed IN (0, 1)),
  analyst       TEXT COLLATE "C"    NOT NULL,
  occurred_at   TEXT COLLATE "C"    NOT NULL,
  audit_seq     BIGINT NOT NULL REFERENCES audit_log (seq) DEFERRABLE INITIALLY DEFERRED
);
CREATE INDEX checks_by_curve ON checks (curve_id, occurred_at);

CREATE TABLE results (
  id                BIGINT PRIMARY KEY,
  sample            TEXT COLLATE "C"    NOT NULL,
  analyte           TEXT COLLATE "C"    NOT NULL,
  status            TEXT COLLATE "C"    NOT NULL CHECK (status IN ('reported', 'refused')),
  curve_id          BIGINT REFERENCES curves (id),
  method_id         BIGINT REFERENCES methods (id),
  instrument_id     BIGINT REFERENCES instruments (id),
  response          DOUBLE PRECISION    NOT NULL,
  is_response       DOUBLE PRECISION,
  replicates        BIGINT NOT NULL CHECK (replicates >= 1),
  dilution          DOUBLE PRECISION    NOT NULL CHECK (dilution > 0),
  x0                DOUBLE PRECISION,                       -- instrument-level concentration
  sd_x0             DOUBLE PRECISION,
  concentration     DOUBLE PRECISION,                       -- x0 times the dilution factor
  ci_low            DOUBLE PRECISION,
  ci_high           DOUBLE PRECISION,
  flags             TEXT COLLATE "C"    NOT NULL,           -- JSON array
  reasons           TEXT COLLATE "C"    NOT NULL,           -- JSON array of reason tokens
  reason_details    TEXT COLLATE "C"    NOT NULL,           -- JSON array of {reason, since, message}
  analyst           TEXT COLLATE "C"    NOT NULL,
  occurred_at       TEXT COLLATE "C"    NOT NULL,
  audit_seq         BIGINT NOT NULL REFERENCES audit_log (seq) DEFERRABLE INITIALLY DEFERRED
);
CREATE INDEX results_by_curve ON results (curve_id, occurred_at);

-- ---- as migrations/0005_add_censoring_and_uncertainty.sql
-- Censored results and uncertainty budgets (a result below the reporting limit is released as
-- "< limit", its computed value kept for the record; every reported value carries its budget),
-- and the coverage factor of a lot's certified uncertainties. Columns added to existing tables
-- are nullable and, in the hashed row form, appear only when they hold a value, so rows written
-- before this migration keep their hashes (src/store/row_form.h).

ALTER TABLE results ADD COLUMN censored TEXT COLLATE "C" CHECK (censored IS NULL OR censored = '<');
ALTER TABLE results ADD COLUMN reporting_limit DOUBLE PRECISION;         -- the limit times the dilution
ALTER TABLE results ADD COLUMN computed_concentration DOUBLE PRECISION;  -- kept for the record, not released
ALTER TABLE results ADD COLUMN uncertainty TEXT COLLATE "C";             -- JSON: components, combined, expanded, k

ALTER TABLE lots ADD COLUMN coverage_factor DOUBLE PRECISION CHECK (coverage_factor IS NULL OR coverage_factor > 0);

-- ---- as migrations/0006_record_runs_and_status_events.sql
-- Runs (imported instrument sequences) and which result or check came from which position of
-- which run; the status events that make a reported result rerun-required (a result row is
-- never edited); and the column mappings saved for instruments' exports. Membership lives in
-- tables of its own so that the rows of results and checks, and the form their audit entries
-- hashed, stay as they were. Every table is append-only (triggers below).

CREATE TABLE instrument_column_maps (
  id            BIGINT PRIMARY KEY,
  instrument_id BIGINT NOT NULL REFERENCES instruments (id),
  columns       TEXT COLLATE "C"    NOT NULL,               -- JSON object: logical column -> header ({} clears)
  reason        TEXT COLLATE "C",
  saved_by      TEXT COLLATE "C"    NOT NULL,
  occurred_at   TEXT COLLATE "C"    NOT NULL,
  audit_seq     BIGINT NOT NULL REFERENCES audit_log (seq) DEFERRABLE INITIALLY DEFERRED
);
CREATE INDEX instrument_column_maps_by_instrument
  ON instrument_column_maps (instrument_id, occurred_at);

CREATE TABLE runs (
  id                BIGINT PRIMARY KEY,
  method_version_id BIGINT NOT NULL REFERENCES method_versions (id),
  instrument_id     BIGINT NOT NULL REFERENCES instruments (id),
  acquired_at       TEXT COLLATE "C"    NOT NULL,
  analyst           TEXT COLLATE "C"    NOT NULL,
  file_name         TEXT COLLATE "C"    NOT NULL,
  file_sha256       TEXT COLLATE "C"    NOT NULL CHECK (length(file_sha256) = 64),
  row_count         BIGINT NOT NULL CHECK (row_count >= 1),
  columns           TEXT COLLATE "C"    NOT NULL,           -- JSON object: the header mapping used ({} none)
  again_reason      TEXT COLLATE "C",                       -- why the same file was imported again
  audit_seq         BIGINT NOT NULL REFERENCES audit_log (seq) DEFERRABLE INITIALLY DEFERRED
);
CREATE INDEX runs_by_sha256 ON runs (file_sha256);
CREATE INDEX runs_by_acquired ON runs (acquired_at);

CREATE TABLE run_results (
  id        BIGINT PRIMARY KEY,
  run_id    BIGINT NOT NULL REFERENCES runs (id),
  position  BIGINT NOT NULL CHECK (position >= 1),
  result_id BIGINT NOT NULL UNIQUE REFERENCES results (id),
  audit_seq BIGINT NOT NULL REFERENCES audit_log (seq) DEFERRABLE INITIALLY DEFERRED,
  UNIQUE (run_id, position)
);

CREATE TABLE run_checks (
  id        BIGINT PRIMARY KEY,
  run_id    BIGINT NOT NULL REFERENCES runs (id),
  position  BIGINT NOT NULL CHECK (position >= 1),
  check_id  BIGINT NOT NULL UNIQUE REFERENCES checks (id),
  label     TEXT COLLATE "C",                               -- the row's sample column, when it named the check
  audit_seq BIGINT NOT NULL REFERENCES audit_log (seq) DEFERRABLE INITIALLY DEFERRED,
  UNIQUE (run_id, position)
);

CREATE TABLE result_status_events (
  id          BIGINT PRIMARY KEY,
  result_id   BIGINT NOT NULL REFERENCES results (id),
  status      TEXT COLLATE "C"    NOT NULL CHECK (status IN ('rerun-required')),
  reason      TEXT COLLATE "C"    NOT NULL CHECK (reason IN ('check-failed', 'samples-per-check',
                                                 'no-closing-check')),
  detail      TEXT COLLATE "C"    NOT NULL,                 -- the facts in plain words
  check_id    BIGINT REFERENCES checks (id),   -- the failing check, or the last passing one
  run_id      BIGINT REFERENCES runs (id),     -- the run that decided it
  occurred_at TEXT COLLATE "C"    NOT NULL,
  audit_seq   BIGINT NOT NULL REFERENCES audit_log (seq) DEFERRABLE INITIALLY DEFERRED
);
CREATE INDEX result_status_events_by_result ON result_status_events (result_id, id);

-- Every fact row names its audit entry (audit_seq, a deferred foreign key). A unit of work
-- writes its rows before the entry that holds them, so when the entry is inserted SQLite looks
-- in every fact table for rows naming it: with these indexes a lookup, without them a scan of
-- the whole table for every entry (a write whose cost grew with the store, and a run import
-- that grew with the square of its rows).
CREATE INDEX lab_settings_by_audit_seq ON lab_settings (audit_seq);
CREATE INDEX instruments_by_audit_seq ON instruments (audit_seq);
CREATE INDEX instrument_service_events_by_audit_seq ON instrument_service_events (audit_seq);
CREATE INDEX methods_by_audit_seq ON methods (audit_seq);
CREATE INDEX method_versions_by_audit_seq ON method_versions (audit_seq);
CREATE INDEX lots_by_audit_seq ON lots (audit_seq);
CREATE INDEX lot_values_by_audit_seq ON lot_values (audit_seq);
CREATE INDEX lot_withdrawals_by_audit_seq ON lot_withdrawals (audit_seq);
CREATE INDEX calibrations_by_audit_seq ON calibrations (audit_seq);
CREATE INDEX calibration_lots_by_audit_seq ON calibration_lots (audit_seq);
CREATE INDEX curves_by_audit_seq ON curves (audit_seq);
CREATE INDEX curve_points_by_audit_seq ON curve_points (audit_seq);
CREATE INDEX curve_reviews_by_audit_seq ON curve_reviews (audit_seq);
CREATE INDEX curve_retirements_by_audit_seq ON curve_retirements (audit_seq);
CREATE INDEX refusals_by_audit_seq ON refusals (audit_seq);
CREATE INDEX checks_by_audit_seq ON checks (audit_seq);
CREATE INDEX results_by_audit_seq ON results (audit_seq);
CREATE INDEX instrument_column_maps_by_audit_seq ON instrument_column_maps (audit_seq);
CREATE INDEX runs_by_audit_seq ON runs (audit_seq);
CREATE INDEX run_results_by_audit_seq ON run_results (audit_seq);
CREATE INDEX run_checks_by_audit_seq ON run_checks (audit_seq);
CREATE INDEX result_status_events_by_audit_seq ON result_status_events (audit_seq);

-- Listings of results by sample and by time, and of checks by time.
CREATE INDEX results_by_sample ON results (sample, occurred_at);
CREATE INDEX results_by_time ON results (occurred_at);
CREATE INDEX checks_by_time ON checks (occurred_at);

-- ---- as migrations/0007_register_users_and_signatures.sql
-- Registered users with roles, their passphrases (Argon2id hashes only) and electronic
-- signatures, and the operating-system login of the process in every audit entry. A user's
-- status and role are those of the latest user_events row. The names already in the trail of an
-- existing store become users, disabled until an admin enables them; that step is written by the
-- program in the same transaction as this file (it needs the hash chain), with its own entries.

-- NULL in entries written before this migration; their canonical header stays as it was.
ALTER TABLE audit_log ADD COLUMN os_login TEXT COLLATE "C";

CREATE TABLE users (
  id            BIGINT PRIMARY KEY,
  code          TEXT COLLATE "C"    NOT NULL UNIQUE,        -- canonical: ASCII letters in lower case
  name          TEXT COLLATE "C"    NOT NULL,               -- full name, shown with every signature
  registered_at TEXT COLLATE "C"    NOT NULL,
  audit_seq     BIGINT NOT NULL REFERENCES audit_log (seq) DEFERRABLE INITIALLY DEFERRED
);

CREATE TABLE user_events (
  id          BIGINT PRIMARY KEY,
  user_id     BIGINT NOT NULL REFERENCES users (id),
  status      TEXT COLLATE "C"    NOT NULL CHECK (status IN ('enabled', 'disabled')),
  role        TEXT COLLATE "C"    NOT NULL CHECK (role IN ('analyst', 'reviewer', 'quality', 'admin')),
  reason      TEXT COLLATE "C"    NOT NULL,
  by_user     TEXT COLLATE "C"    NOT NULL,                 -- the code of the user who made the change
  occurred_at TEXT COLLATE "C"    NOT NULL,
  audit_seq   BIGINT NOT NULL REFERENCES audit_log (seq) DEFERRABLE INITIALLY DEFERRED
);
CREATE INDEX user_events_by_user ON user_events (user_id, id);

CREATE TABLE user_passphrases (
  id          BIGINT PRIMARY KEY,
  user_id     BIGINT NOT NULL REFERENCES users (id),
  hash        TEXT COLLATE "C"    NOT NULL,                 -- Argon2id, libsodium's crypto_pwhash_str form
  occurred_at TEXT COLLATE "C"    NOT NULL,
  audit_seq   BIGINT NOT NULL REFERENCES audit_log (seq) DEFERRABLE INITIALLY DEFERRED
);
CREATE INDEX user_passphrases_by_user ON user_passphrases (user_id, id);

CREATE TABLE signatures (
  id          BIGINT PRIMARY KEY,
  user_id     BIGINT NOT NULL REFERENCES users (id),
  name        TEXT COLLATE "C"    NOT NULL,                 -- the signer's full name when signing
  meaning     TEXT COLLATE "C"    NOT NULL,                 -- 'approved', 'rejected', 'retired', ...
  entity_kind TEXT COLLATE "C"    NOT NULL,
  entity_id   TEXT COLLATE "C"    NOT NULL,
  signed_at   TEXT COLLATE "C"    NOT NULL,                 -- UTC; shown in the lab's zone
  audit_seq   BIGINT NOT NULL REFERENCES audit_log (seq) DEFERRABLE INITIALLY DEFERRED
);
CREATE INDEX signatures_by_entity ON signatures (entity_kind, entity_id, id);
CREATE INDEX signatures_by_user ON signatures (user_id, id);

CREATE TABLE signature_failures (
  id          BIGINT PRIMARY KEY,
  user_id     BIGINT NOT NULL REFERENCES users (id),
  action      TEXT COLLATE "C"    NOT NULL,
  occurred_at TEXT COLLATE "C"    NOT NULL,
  audit_seq   BIGINT NOT NULL REFERENCES audit_log (seq) DEFERRABLE INITIALLY DEFERRED
);
CREATE INDEX signature_failures_by_user ON signature_failures (user_id, id);

CREATE INDEX users_by_audit_seq ON users (audit_seq);
CREATE INDEX user_events_by_audit_seq ON user_events (audit_seq);
CREATE INDEX user_passphrases_by_audit_seq ON user_passphrases (audit_seq);
CREATE INDEX signatures_by_audit_seq ON signatures (audit_seq);
CREATE INDEX signature_failures_by_audit_seq ON signature_failures (audit_seq);

-- ---- as migrations/0008_index_curves_for_status.sql
-- Indexes for the questions status asks of a large store.
--
-- The curves of a group (method, instrument, analyte) that can still be active at a moment are
-- those whose expiry moment lies after it. With the expiry in the group's index, that question
-- reads only the group's live curves instead of walking its whole history (which grows with
-- every calibration: status, quantify by method and run import ask it for every group).
CREATE INDEX curves_by_group_expiry ON curves (method_id, instrument_id, analyte, expires_at);

-- The (method, analyte) pairs an instrument has had curves for, read from the index alone
-- instead of a table lookup per curve of its history (status).
CREATE INDEX curves_by_instrument_group ON curves (instrument_id, method_id, analyte);

-- Failed checks by time: an instrument's recent failures are found among the failures, not by
-- walking back through every check of the lab (status).
CREATE INDEX checks_failed_by_time ON checks (occurred_at) WHERE passed = 0;

-- The settled curves of an instrument counted from the index alone: no read of the wide curve
-- rows (fit statistics) for every curve of its history (status).
CREATE INDEX curves_by_instrument_settled
  ON curves (instrument_id, expires_at, verdict, calibration_id);
