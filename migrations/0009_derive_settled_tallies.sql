-- SPDX-License-Identifier: Apache-2.0
-- Derived steps of each instrument's count of settled curves per state (domain/settled_state.h).
--
-- A curve whose expiry moment has passed can no longer be active; its state (rejected, retired,
-- awaiting-review, stale) changes at most at a later review or retirement. Each row says: from
-- effective_at on, `delta` more (or fewer) curves of the instrument are settled in `state`.
-- Rows are appended in the same transaction as the curve, review or retirement that causes them
-- (audit_seq names that entry), so `status` sums one instrument's rows up to a moment instead of
-- deciding every curve of its history again. The rows are derived, not facts: they are not part
-- of any entry's hash; the migration's own step builds them from the facts already stored,
-- `store copy` builds them again on the copy, and `audit verify` compares them with the facts.
CREATE TABLE settled_tallies (
  instrument_id INTEGER NOT NULL REFERENCES instruments (id),
  effective_at  TEXT    NOT NULL,
  state         TEXT    NOT NULL
                CHECK (state IN ('rejected', 'awaiting-review', 'stale', 'retired')),
  delta         INTEGER NOT NULL CHECK (delta <> 0),
  curve_id      INTEGER NOT NULL REFERENCES curves (id),
  audit_seq     INTEGER NOT NULL REFERENCES audit_log (seq) DEFERRABLE INITIALLY DEFERRED
) STRICT;
-- One instrument's steps up to a moment, read from the index alone.
CREATE INDEX settled_tallies_by_instrument
  ON settled_tallies (instrument_id, effective_at, state, delta);
-- As every fact table (0006): when an entry is inserted SQLite settles the deferred keys naming
-- it, which without this index is a scan of every step per entry.
CREATE INDEX settled_tallies_by_audit_seq ON settled_tallies (audit_seq);

CREATE TRIGGER settled_tallies_no_update BEFORE UPDATE ON settled_tallies
BEGIN SELECT RAISE(ABORT, 'settled_tallies is append-only: rows cannot be changed'); END;
CREATE TRIGGER settled_tallies_no_delete BEFORE DELETE ON settled_tallies
BEGIN SELECT RAISE(ABORT, 'settled_tallies is append-only: rows cannot be deleted'); END;

-- Settled curves were counted from this index, one curve at a time; the steps replace it.
DROP INDEX curves_by_instrument_settled;
