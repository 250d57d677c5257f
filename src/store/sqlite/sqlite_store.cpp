// SPDX-License-Identifier: Apache-2.0
// Units of work on a SQLite store.
#include "store/sqlite/sqlite_store.h"

#include <sqlite3.h>

#include <stdexcept>

#include "core/error.h"
#include "store/postgresql/open.h"
#include "store/sqlite/audit_repository.h"
#include "store/sqlite/copy.h"
#include "store/sqlite/curve_repository.h"
#include "store/sqlite/registry_repository.h"
#include "store/sqlite/run_repository.h"

namespace cw::store::sqlite {
namespace {

class SqliteReadUnit final : public ReadUnit {
 public:
  explicit SqliteReadUnit(Database& db)
      : db_(db),
        registry_(db, nullptr),
        curves_(db, nullptr, nullptr),
        runs_(db, nullptr),
        audit_(db),
        rows_(db) {
    guarded(db_, [&] {
      db_.release_statements();
      db_.db->exec("BEGIN DEFERRED");
    });
  }
  ~SqliteReadUnit() override {
    try {
      db_.release_statements();
      db_.db->exec("COMMIT");
    } catch (...) {
      // Nothing was written; ending a read snapshot cannot lose data.
    }
  }
  RegistryReader& registry() override { return registry_; }
  CurveReader& curves() override { return curves_; }
  RunReader& runs() override { return runs_; }
  AuditReader& audit() override { return audit_; }
  TableRowReader& table_rows() override { return rows_; }

 private:
  Database& db_;
  SqliteRegistry registry_;
  SqliteCurves curves_;
  SqliteRuns runs_;
  SqliteAudit audit_;
  SqliteTableRows rows_;
};

class SqliteWriteUnit final : public WriteUnit {
 public:
  SqliteWriteUnit(Database& db, const Actor& actor)
      : db_(db),
        actor_(actor),
        registry_(db, &state_),
        curves_(db, &state_, &actor_),
        runs_(db, &state_),
        audit_(db),
        rows_(db) {
    if (actor_.clock == nullptr) throw std::logic_error("a write unit needs a clock");
    guarded(db_, [&] {
      db_.release_statements();
      db_.db->exec("BEGIN IMMEDIATE");
      open_ = true;
      audit_.start(state_);
    });
  }
  ~SqliteWriteUnit() override {
    if (open_) {
      try {
        db_.release_statements();
        db_.db->exec("ROLLBACK");
      } catch (...) {
        // A destructor must not throw; SQLite rolls back an unfinished transaction anyway.
      }
    }
  }
  RegistryReader& registry() override { return registry_; }
  CurveReader& curves() override { return curves_; }
  RunReader& runs() override { return runs_; }
  AuditReader& audit() override { return audit_; }
  TableRowReader& table_rows() override { return rows_; }
  RegistryWriter& registry_writer() override { return registry_; }
  CurveWriter& curve_writer() override { return curves_; }
  RunWriter& run_writer() override { return runs_; }
  void append_entry(const EntryHeader& header) override { audit_.append(state_, actor_, header); }
  void commit() override {
    if (!state_.rows.empty()) throw std::logic_error("rows written without an audit entry");
    guarded(db_, [&] {
      db_.release_statements();
      db_.db->exec("COMMIT");
      open_ = false;
    });
  }
  Instant now() const override { return actor_.clock->now(); }

 private:
  Database& db_;
  Actor actor_;
  WriteState state_;
  SqliteRegistry registry_;
  SqliteCurves curves_;
  SqliteRuns runs_;
  SqliteAudit audit_;
  SqliteTableRows rows_;
  bool open_ = false;
};

}  // namespace

std::unique_ptr<ReadUnit> SqliteStore::read() {
  return std::make_unique<SqliteReadUnit>(*db_);
}

void SqliteStore::require_guards() {
  if (db_->read_only) {
    throw StoreError("store '" + db_->path + "' is read-only for this user: nothing was written",
                     "writing needs write permission on the store file and on its folder (for "
                     "the -wal and -shm files beside it); ask whoever keeps the store, or run "
                     "this as a user who may write it");
  }
  if (const auto missing = missing_guards(); !missing.empty()) {
    std::string list;
    for (const auto& m : missing) list += (list.empty() ? "" : ", ") + m;
    throw StoreError("store '" + db_->path + "' has lost its append-only guards (" + list +
                         "); nothing was written",
                     "the store may have been edited behind the tool's back: run 'curvewarden "
                     "audit verify' and restore the store from a backup");
  }
}

std::unique_ptr<WriteUnit> SqliteStore::write(const Actor& actor) {
  require_guards();
  return std::make_unique<SqliteWriteUnit>(*db_, actor);
}

std::unique_ptr<StoreLoader> SqliteStore::load() {
  require_guards();
  return std::make_unique<SqliteLoader>(*db_);
}

int SqliteStore::schema_version() {
  return guarded(*db_, [&] { return db_->user_version(); });
}

int SqliteStore::latest_schema_version() const {
  const auto migrations = embedded_migrations();
  return migrations.empty() ? 0 : migrations.back().version;
}

std::vector<std::string> SqliteStore::missing_guards() {
  return guarded(*db_, [&] { return sqlite::missing_guards(*db_); });
}

std::unique_ptr<Store> open_sqlite(const OpenOptions& options,
                                   const std::vector<MigrationSpec>& migrations) {
  return std::make_unique<SqliteStore>(Database::open(options.location, options.create,
                                                      options.busy_timeout_ms, migrations,
                                                      options.os_login, options.migrate));
}

}  // namespace cw::store::sqlite

namespace cw::store {

bool is_server_location(const std::string& location) {
  return postgresql::is_uri(location);
}

std::string shown_location(const std::string& location) {
  return is_server_location(location) ? postgresql::masked(location) : location;
}

void require_backend(const std::string& location) {
  if (postgresql::is_uri(location)) postgresql::require_postgresql();
}

std::unique_ptr<Store> Store::open(const OpenOptions& options) {
  // A libpq connection URI selects the PostgreSQL backend; a path keeps the SQLite file.
  if (postgresql::is_uri(options.location)) return postgresql::open_postgresql(options);
  return sqlite::open_sqlite(options, sqlite::embedded_migrations());
}

}  // namespace cw::store
