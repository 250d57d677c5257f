-- SPDX-License-Identifier: Apache-2.0
-- Created together with the first migration, in the same transaction: the record of which
-- migrations have been applied to this store.
CREATE TABLE schema_migrations (
  version    INTEGER PRIMARY KEY,
  name       TEXT    NOT NULL,
  sha256     TEXT    NOT NULL CHECK (length(sha256) = 64),
  applied_at TEXT    NOT NULL
) STRICT;
