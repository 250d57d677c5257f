-- SPDX-License-Identifier: Apache-2.0
-- Calibrations (one acquisition), their curves (one per analyte) and points, reviews,
-- retirements, and the generic record of refused actions.

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

CREATE TABLE calibration_lots (
  id             INTEGER PRIMARY KEY AUTOINCREMENT,
  calibration_id INTEGER NOT NULL REFERENCES calibrations (id),
  lot_id         INTEGER NOT NULL REFERENCES lots (id),
  audit_seq      INTEGER NOT NULL REFERENCES audit_log (seq) DEFERRABLE INITIALLY DEFERRED,
  UNIQUE (calibration_id, lot_id)
) STRICT;
CREATE INDEX calibration_lots_by_lot ON calibration_lots (lot_id);

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
CREATE INDEX curves_by_expiry ON curves (expires_at);
CREATE INDEX curves_by_group ON curves (method_id, instrument_id, analyte, acquired_at);
CREATE INDEX curves_by_instrument ON curves (instrument_id, expires_at);
CREATE INDEX curves_by_calibration ON curves (calibration_id);

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

CREATE TABLE curve_reviews (
  id          INTEGER PRIMARY KEY AUTOINCREMENT,
  curve_id    INTEGER NOT NULL REFERENCES curves (id),
  decision    TEXT    NOT NULL CHECK (decision IN ('approve', 'reject')),
  reviewer    TEXT    NOT NULL,
  reason      TEXT    NOT NULL,
  occurred_at TEXT    NOT NULL,
  audit_seq   INTEGER NOT NULL REFERENCES audit_log (seq) DEFERRABLE INITIALLY DEFERRED
) STRICT;
CREATE INDEX curve_reviews_by_curve ON curve_reviews (curve_id, occurred_at);

CREATE TABLE curve_retirements (
  id          INTEGER PRIMARY KEY AUTOINCREMENT,
  curve_id    INTEGER NOT NULL REFERENCES curves (id),
  retired_by  TEXT    NOT NULL,
  reason      TEXT    NOT NULL,
  occurred_at TEXT    NOT NULL,
  audit_seq   INTEGER NOT NULL REFERENCES audit_log (seq) DEFERRABLE INITIALLY DEFERRED
) STRICT;
CREATE INDEX curve_retirements_by_curve ON curve_retirements (curve_id, occurred_at);

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
