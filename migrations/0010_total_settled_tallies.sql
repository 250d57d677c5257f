-- SPDX-License-Identifier: Apache-2.0
-- Each instrument's running total of settled curves per state, beside the steps of 0009.
--
-- Summing an instrument's steps up to a moment reads its whole history. With the totals, its
-- count at T is the latest total less the steps after T (few when T is about now, however long
-- the history): `status` reads four totals and the steps still ahead. Each change of a total
-- appends a row numbered n = 1, 2, ... per instrument and state, in the same transaction as the
-- steps that cause it (audit_seq names their entry). Derived, not facts, as the steps: built
-- here from the steps, built again by `store copy`, compared with the steps by `audit verify`.
CREATE TABLE settled_totals (
  instrument_id INTEGER NOT NULL REFERENCES instruments (id),
  state         TEXT    NOT NULL
                CHECK (state IN ('rejected', 'awaiting-review', 'stale', 'retired')),
  n             INTEGER NOT NULL CHECK (n >= 1),
  total         INTEGER NOT NULL CHECK (total >= 0),
  audit_seq     INTEGER NOT NULL REFERENCES audit_log (seq) DEFERRABLE INITIALLY DEFERRED,
  PRIMARY KEY (instrument_id, state, n)
) STRICT, WITHOUT ROWID;
-- As every table naming an entry (0006, 0009): SQLite settles the deferred key with it.
CREATE INDEX settled_totals_by_audit_seq ON settled_totals (audit_seq);

CREATE TRIGGER settled_totals_no_update BEFORE UPDATE ON settled_totals
BEGIN SELECT RAISE(ABORT, 'settled_totals is append-only: rows cannot be changed'); END;
CREATE TRIGGER settled_totals_no_delete BEFORE DELETE ON settled_totals
BEGIN SELECT RAISE(ABORT, 'settled_totals is append-only: rows cannot be deleted'); END;

INSERT INTO settled_totals (instrument_id, state, n, total, audit_seq)
SELECT instrument_id, state, 1, sum(delta), max(audit_seq) FROM settled_tallies
GROUP BY instrument_id, state HAVING sum(delta) <> 0;
