-- SPDX-License-Identifier: Apache-2.0
-- Runs (imported instrument sequences) and which result or check came from which position of
-- which run; the status events that make a reported result rerun-required (a result row is
-- never edited); and the column mappings saved for instruments' exports. Membership lives in
-- tables of its own so that the rows of results and checks, and the form their audit entries
-- hashed, stay as they were. Every table is append-only (triggers below).

CREATE TABLE instrument_column_maps (
  id            INTEGER PRIMARY KEY AUTOINCREMENT,
  instrument_id INTEGER NOT NULL REFERENCES instruments (id),
  columns       TEXT    NOT NULL,               -- JSON object: logical column -> header ({} clears)
  reason        TEXT,
  saved_by      TEXT    NOT NULL,
  occurred_at   TEXT    NOT NULL,
  audit_seq     INTEGER NOT NULL REFERENCES audit_log (seq) DEFERRABLE INITIALLY DEFERRED
) STRICT;
CREATE INDEX instrument_column_maps_by_instrument
  ON instrument_column_maps (instrument_id, occurred_at);

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
CREATE INDEX runs_by_sha256 ON runs (file_sha256);
CREATE INDEX runs_by_acquired ON runs (acquired_at);

CREATE TABLE run_results (
  id        INTEGER PRIMARY KEY AUTOINCREMENT,
  run_id    INTEGER NOT NULL REFERENCES runs (id),
  position  INTEGER NOT NULL CHECK (position >= 1),
  result_id INTEGER NOT NULL UNIQUE REFERENCES results (id),
  audit_seq INTEGER NOT NULL REFERENCES audit_log (seq) DEFERRABLE INITIALLY DEFERRED,
  UNIQUE (run_id, position)
) STRICT;

CREATE TABLE run_checks (
  id        INTEGER PRIMARY KEY AUTOINCREMENT,
  run_id    INTEGER NOT NULL REFERENCES runs (id),
  position  INTEGER NOT NULL CHECK (position >= 1),
  check_id  INTEGER NOT NULL UNIQUE REFERENCES checks (id),
  label     TEXT,                               -- the row's sample column, when it named the check
  audit_seq INTEGER NOT NULL REFERENCES audit_log (seq) DEFERRABLE INITIALLY DEFERRED,
  UNIQUE (run_id, position)
) STRICT;

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

CREATE TRIGGER instrument_column_maps_no_update BEFORE UPDATE ON instrument_column_maps
BEGIN SELECT RAISE(ABORT, 'instrument_column_maps is append-only: rows cannot be changed'); END;
CREATE TRIGGER instrument_column_maps_no_delete BEFORE DELETE ON instrument_column_maps
BEGIN SELECT RAISE(ABORT, 'instrument_column_maps is append-only: rows cannot be deleted'); END;

CREATE TRIGGER runs_no_update BEFORE UPDATE ON runs
BEGIN SELECT RAISE(ABORT, 'runs is append-only: rows cannot be changed'); END;
CREATE TRIGGER runs_no_delete BEFORE DELETE ON runs
BEGIN SELECT RAISE(ABORT, 'runs is append-only: rows cannot be deleted'); END;

CREATE TRIGGER run_results_no_update BEFORE UPDATE ON run_results
BEGIN SELECT RAISE(ABORT, 'run_results is append-only: rows cannot be changed'); END;
CREATE TRIGGER run_results_no_delete BEFORE DELETE ON run_results
BEGIN SELECT RAISE(ABORT, 'run_results is append-only: rows cannot be deleted'); END;

CREATE TRIGGER run_checks_no_update BEFORE UPDATE ON run_checks
BEGIN SELECT RAISE(ABORT, 'run_checks is append-only: rows cannot be changed'); END;
CREATE TRIGGER run_checks_no_delete BEFORE DELETE ON run_checks
BEGIN SELECT RAISE(ABORT, 'run_checks is append-only: rows cannot be deleted'); END;

CREATE TRIGGER result_status_events_no_update BEFORE UPDATE ON result_status_events
BEGIN SELECT RAISE(ABORT, 'result_status_events is append-only: rows cannot be changed'); END;
CREATE TRIGGER result_status_events_no_delete BEFORE DELETE ON result_status_events
BEGIN SELECT RAISE(ABORT, 'result_status_events is append-only: rows cannot be deleted'); END;
