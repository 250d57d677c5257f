-- SPDX-License-Identifier: Apache-2.0
-- Censored results and uncertainty budgets (a result below the reporting limit is released as
-- "< limit", its computed value kept for the record; every reported value carries its budget),
-- and the coverage factor of a lot's certified uncertainties. Columns added to existing tables
-- are nullable and, in the hashed row form, appear only when they hold a value, so rows written
-- before this migration keep their hashes (src/store/row_form.h).

ALTER TABLE results ADD COLUMN censored TEXT CHECK (censored IS NULL OR censored = '<');
ALTER TABLE results ADD COLUMN reporting_limit REAL;         -- the limit times the dilution
ALTER TABLE results ADD COLUMN computed_concentration REAL;  -- kept for the record, not released
ALTER TABLE results ADD COLUMN uncertainty TEXT;             -- JSON: components, combined, expanded, k

ALTER TABLE lots ADD COLUMN coverage_factor REAL CHECK (coverage_factor IS NULL OR coverage_factor > 0);
