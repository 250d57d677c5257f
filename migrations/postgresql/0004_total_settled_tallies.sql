-- SPDX-License-Identifier: Apache-2.0
-- Each instrument's running total of settled curves per state, beside the steps of 0003:
-- SQLite's 0010 (migrations/0010_total_settled_tallies.sql says why). Derived, not facts.
CREATE TABLE settled_totals (
  instrument_id BIGINT NOT NULL REFERENCES instruments (id),
  state         TEXT COLLATE "C" NOT NULL
                CHECK (state IN ('rejected', 'awaiting-review', 'stale', 'retired')),
  n             BIGINT NOT NULL CHECK (n >= 1),
  total         BIGINT NOT NULL CHECK (total >= 0),
  audit_seq     BIGINT NOT NULL REFERENCES audit_log (seq) DEFERRABLE INITIALLY DEFERRED,
  PRIMARY KEY (instrument_id, state, n)
);
CREATE INDEX settled_totals_by_audit_seq ON settled_totals (audit_seq);

CREATE TRIGGER settled_totals_no_update BEFORE UPDATE ON settled_totals
  FOR EACH ROW EXECUTE FUNCTION curvewarden_refuse_change();
CREATE TRIGGER settled_totals_no_delete BEFORE DELETE ON settled_totals
  FOR EACH ROW EXECUTE FUNCTION curvewarden_refuse_change();
CREATE TRIGGER settled_totals_no_truncate BEFORE TRUNCATE ON settled_totals
  FOR EACH STATEMENT EXECUTE FUNCTION curvewarden_refuse_change();

INSERT INTO settled_totals (instrument_id, state, n, total, audit_seq)
SELECT instrument_id, state, 1, sum(delta), max(audit_seq) FROM settled_tallies
GROUP BY instrument_id, state HAVING sum(delta) <> 0;
