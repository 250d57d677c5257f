-- SPDX-License-Identifier: Apache-2.0
-- Registered users with roles, their passphrases (Argon2id hashes only) and electronic
-- signatures, and the operating-system login of the process in every audit entry. A user's
-- status and role are those of the latest user_events row. The names already in the trail of an
-- existing store become users, disabled until an admin enables them; that step is written by the
-- program in the same transaction as this file (it needs the hash chain), with its own entries.

-- NULL in entries written before this migration; their canonical header stays as it was.
ALTER TABLE audit_log ADD COLUMN os_login TEXT;

CREATE TABLE users (
  id            INTEGER PRIMARY KEY AUTOINCREMENT,
  code          TEXT    NOT NULL UNIQUE,        -- canonical: ASCII letters in lower case
  name          TEXT    NOT NULL,               -- full name, shown with every signature
  registered_at TEXT    NOT NULL,
  audit_seq     INTEGER NOT NULL REFERENCES audit_log (seq) DEFERRABLE INITIALLY DEFERRED
) STRICT;

CREATE TABLE user_events (
  id          INTEGER PRIMARY KEY AUTOINCREMENT,
  user_id     INTEGER NOT NULL REFERENCES users (id),
  status      TEXT    NOT NULL CHECK (status IN ('enabled', 'disabled')),
  role        TEXT    NOT NULL CHECK (role IN ('analyst', 'reviewer', 'quality', 'admin')),
  reason      TEXT    NOT NULL,
  by_user     TEXT    NOT NULL,                 -- the code of the user who made the change
  occurred_at TEXT    NOT NULL,
  audit_seq   INTEGER NOT NULL REFERENCES audit_log (seq) DEFERRABLE INITIALLY DEFERRED
) STRICT;
CREATE INDEX user_events_by_user ON user_events (user_id, id);

CREATE TABLE user_passphrases (
  id          INTEGER PRIMARY KEY AUTOINCREMENT,
  user_id     INTEGER NOT NULL REFERENCES users (id),
  hash        TEXT    NOT NULL,                 -- Argon2id, libsodium's crypto_pwhash_str form
  occurred_at TEXT    NOT NULL,
  audit_seq   INTEGER NOT NULL REFERENCES audit_log (seq) DEFERRABLE INITIALLY DEFERRED
) STRICT;
CREATE INDEX user_passphrases_by_user ON user_passphrases (user_id, id);

CREATE TABLE signatures (
  id          INTEGER PRIMARY KEY AUTOINCREMENT,
  user_id     INTEGER NOT NULL REFERENCES users (id),
  name        TEXT    NOT NULL,                 -- the signer's full name when signing
  meaning     TEXT    NOT NULL,                 -- 'approved', 'rejected', 'retired', ...
  entity_kind TEXT    NOT NULL,
  entity_id   TEXT    NOT NULL,
  signed_at   TEXT    NOT NULL,                 -- UTC; shown in the lab's zone
  audit_seq   INTEGER NOT NULL REFERENCES audit_log (seq) DEFERRABLE INITIALLY DEFERRED
) STRICT;
CREATE INDEX signatures_by_entity ON signatures (entity_kind, entity_id, id);
CREATE INDEX signatures_by_user ON signatures (user_id, id);

CREATE TABLE signature_failures (
  id          INTEGER PRIMARY KEY AUTOINCREMENT,
  user_id     INTEGER NOT NULL REFERENCES users (id),
  action      TEXT    NOT NULL,
  occurred_at TEXT    NOT NULL,
  audit_seq   INTEGER NOT NULL REFERENCES audit_log (seq) DEFERRABLE INITIALLY DEFERRED
) STRICT;
CREATE INDEX signature_failures_by_user ON signature_failures (user_id, id);

CREATE INDEX users_by_audit_seq ON users (audit_seq);
CREATE INDEX user_events_by_audit_seq ON user_events (audit_seq);
CREATE INDEX user_passphrases_by_audit_seq ON user_passphrases (audit_seq);
CREATE INDEX signatures_by_audit_seq ON signatures (audit_seq);
CREATE INDEX signature_failures_by_audit_seq ON signature_failures (audit_seq);

CREATE TRIGGER users_no_update BEFORE UPDATE ON users
BEGIN SELECT RAISE(ABORT, 'users is append-only: rows cannot be changed'); END;
CREATE TRIGGER users_no_delete BEFORE DELETE ON users
BEGIN SELECT RAISE(ABORT, 'users is append-only: rows cannot be deleted'); END;
CREATE TRIGGER user_events_no_update BEFORE UPDATE ON user_events
BEGIN SELECT RAISE(ABORT, 'user_events is append-only: rows cannot be changed'); END;
CREATE TRIGGER user_events_no_delete BEFORE DELETE ON user_events
BEGIN SELECT RAISE(ABORT, 'user_events is append-only: rows cannot be deleted'); END;
CREATE TRIGGER user_passphrases_no_update BEFORE UPDATE ON user_passphrases
BEGIN SELECT RAISE(ABORT, 'user_passphrases is append-only: rows cannot be changed'); END;
CREATE TRIGGER user_passphrases_no_delete BEFORE DELETE ON user_passphrases
BEGIN SELECT RAISE(ABORT, 'user_passphrases is append-only: rows cannot be deleted'); END;
CREATE TRIGGER signatures_no_update BEFORE UPDATE ON signatures
BEGIN SELECT RAISE(ABORT, 'signatures is append-only: rows cannot be changed'); END;
CREATE TRIGGER signatures_no_delete BEFORE DELETE ON signatures
BEGIN SELECT RAISE(ABORT, 'signatures is append-only: rows cannot be deleted'); END;
CREATE TRIGGER signature_failures_no_update BEFORE UPDATE ON signature_failures
BEGIN SELECT RAISE(ABORT, 'signature_failures is append-only: rows cannot be changed'); END;
CREATE TRIGGER signature_failures_no_delete BEFORE DELETE ON signature_failures
BEGIN SELECT RAISE(ABORT, 'signature_failures is append-only: rows cannot be deleted'); END;
