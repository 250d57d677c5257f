-- SPDX-License-Identifier: Apache-2.0
-- The audit trail, lab settings, instruments, methods and reference-material lots.
-- Every fact table carries audit_seq: the audit entry whose payload holds the row.
-- Rows are never updated or deleted (see the triggers in 0004).

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
) STRICT;
CREATE INDEX audit_log_by_entity ON audit_log (entity_kind, entity_id, seq);
CREATE INDEX audit_log_by_recorded ON audit_log (recorded_at);

CREATE TABLE lab_settings (
  id          INTEGER PRIMARY KEY AUTOINCREMENT,
  lab_name    TEXT    NOT NULL,
  time_zone   TEXT    NOT NULL,
  audit_seq   INTEGER NOT NULL REFERENCES audit_log (seq) DEFERRABLE INITIALLY DEFERRED
) STRICT;

CREATE TABLE instruments (
  id            INTEGER PRIMARY KEY AUTOINCREMENT,
  code          TEXT    NOT NULL UNIQUE,
  name          TEXT,
  registered_at TEXT    NOT NULL,
  audit_seq     INTEGER NOT NULL REFERENCES audit_log (seq) DEFERRABLE INITIALLY DEFERRED
) STRICT;

CREATE TABLE instrument_service_events (
  id            INTEGER PRIMARY KEY AUTOINCREMENT,
  instrument_id INTEGER NOT NULL REFERENCES instruments (id),
  direction     TEXT    NOT NULL CHECK (direction IN ('out', 'back')),
  reason        TEXT    NOT NULL,
  occurred_at   TEXT    NOT NULL,
  audit_seq     INTEGER NOT NULL REFERENCES audit_log (seq) DEFERRABLE INITIALLY DEFERRED
) STRICT;
CREATE INDEX instrument_service_events_by_instrument
  ON instrument_service_events (instrument_id, occurred_at);

CREATE TABLE methods (
  id            INTEGER PRIMARY KEY AUTOINCREMENT,
  code          TEXT    NOT NULL UNIQUE,
  registered_at TEXT    NOT NULL,
  audit_seq     INTEGER NOT NULL REFERENCES audit_log (seq) DEFERRABLE INITIALLY DEFERRED
) STRICT;

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
) STRICT;

CREATE TABLE lot_values (
  id          INTEGER PRIMARY KEY AUTOINCREMENT,
  lot_id      INTEGER NOT NULL REFERENCES lots (id),
  analyte     TEXT    NOT NULL,
  value       REAL    NOT NULL,
  uncertainty REAL    CHECK (uncertainty IS NULL OR uncertainty >= 0),
  audit_seq   INTEGER NOT NULL REFERENCES audit_log (seq) DEFERRABLE INITIALLY DEFERRED,
  UNIQUE (lot_id, analyte)
) STRICT;

CREATE TABLE lot_withdrawals (
  id          INTEGER PRIMARY KEY AUTOINCREMENT,
  lot_id      INTEGER NOT NULL UNIQUE REFERENCES lots (id),
  reason      TEXT    NOT NULL,
  occurred_at TEXT    NOT NULL,
  audit_seq   INTEGER NOT NULL REFERENCES audit_log (seq) DEFERRABLE INITIALLY DEFERRED
) STRICT;
