-- SPDX-License-Identifier: Apache-2.0
-- Check standards and blanks measured against curves, and quantified results (reported or
-- refused).

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
CREATE INDEX checks_by_curve ON checks (curve_id, occurred_at);

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
) STRICT;
CREATE INDEX results_by_curve ON results (curve_id, occurred_at);
