-- SPDX-License-Identifier: Apache-2.0
-- Created together with the first migration, in the same transaction: the mark that makes the
-- database's current schema a Curvewarden store (SQLite's application_id), and the record of
-- which migrations have been applied to it.
CREATE TABLE curvewarden_store (
  application_id BIGINT PRIMARY KEY CHECK (application_id = 1129796164)  -- 'CWRD'
);
INSERT INTO curvewarden_store (application_id) VALUES (1129796164);
COMMENT ON TABLE curvewarden_store IS 'This schema holds a Curvewarden store.';

CREATE TABLE schema_migrations (
  version    BIGINT PRIMARY KEY,
  name       TEXT COLLATE "C" NOT NULL,
  sha256     TEXT COLLATE "C" NOT NULL CHECK (length(sha256) = 64),
  applied_at TEXT COLLATE "C" NOT NULL
);
