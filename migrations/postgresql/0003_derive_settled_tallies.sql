-- SPDX-License-Identifier: Apache-2.0
-- Derived steps of each instrument's count of settled curves per state: SQLite's 0009
-- (migrations/0009_derive_settled_tallies.sql says why). The rows are derived, not facts: no
-- entry's hash covers them; the migration's own step builds them from the stored facts.
CREATE TABLE settled_tallies (
  instrument_id BIGINT NOT NULL REFERENCES instruments (id),
  effective_at  TEXT COLLATE "C" NOT NULL,
  state         TEXT COLLATE "C" NOT NULL
                CHECK (state IN ('rejected', 'awaiting-review', 'stale', 'retired')),
  delta         BIGINT NOT NULL CHECK (delta <> 0),
  curve_id      BIGINT NOT NULL REFERENCES curves (id),
  audit_seq     BIGINT NOT NULL REFERENCES audit_log (seq) DEFERRABLE INITIALLY DEFERRED
);
CREATE INDEX settled_tallies_by_instrument
  ON settled_tallies (instrument_id, effective_at, state, delta);
CREATE INDEX settled_tallies_by_audit_seq ON settled_tallies (audit_seq);

CREATE TRIGGER settled_tallies_no_update BEFORE UPDATE ON settled_tallies
  FOR EACH ROW EXECUTE FUNCTION curvewarden_refuse_change();
CREATE TRIGGER settled_tallies_no_delete BEFORE DELETE ON settled_tallies
  FOR EACH ROW EXECUTE FUNCTION curvewarden_refuse_change();
CREATE TRIGGER settled_tallies_no_truncate BEFORE TRUNCATE ON settled_tallies
  FOR EACH STATEMENT EXECUTE FUNCTION curvewarden_refuse_change();
