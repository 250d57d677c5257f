// SPDX-License-Identifier: Apache-2.0
// Units of work on a PostgreSQL store.
#include "store/postgresql/pg_store.h"

#include <stdexcept>

#include "core/error.h"
#include "store/fact_table.h"
#include "store/postgresql/audit_repository.h"
#include "store/postgresql/copy.h"
#include "store/postgresql/curve_repository.h"
#include "store/postgresql/open.h"
#include "store/postgresql/registry_repository.h"
#include "store/postgresql/run_repository.h"
#include "store/postgresql/sql_text.h"

namespace cw::store::postgresql {
namespace {

class PgReadUnit final : public ReadUnit {
 public:
  explicit PgReadUnit(Database& db)
      : db_(db),
        registry_(db, nullptr),
        curves_(db, nullptr, nullptr),
        runs_(db, nullptr),
        audit_(db),
        rows_(db) {
    guarded(db_, [&] { db_.begin_read(); });
  }
  ~PgReadUnit() override {
    try {
      db_.run("COMMIT");
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
  PgRegistry registry_;
  PgCurves curves_;
  PgRuns runs_;
  PgAudit audit_;
  PgTableRows rows_;
};

class PgWriteUnit final : public WriteUnit {
 public:
  PgWriteUnit(Database& db, const Actor& actor)
      : db_(db),
        actor_(actor),
        registry_(db, &state_),
        curves_(db, &state_, &actor_),
        runs_(db, &state_),
        audit_(db),
        rows_(db) {
    if (actor_.clock == nullptr) throw std::logic_error("a write unit needs a clock");
    guarded(db_, [&] { db_.begin_write(); });
    try {
      guarded(db_, [&] { audit_.start(state_); });
    } catch (...) {
      // The destructor of an object whose constructor throws never runs: release the lock here.
      try {
        db_.run("ROLLBACK");
      } catch (...) {
        // The server rolls back when the connection closes.
      }
      throw;
    }
    open_ = true;
  }
  ~PgWriteUnit() override {
    if (open_) {
      try {
        db_.run("ROLLBACK");
      } catch (...) {
        // A destructor must not throw; the server rolls back when the connection closes.
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
    audit_.flush();
    open_ = false;
    try {
      db_.run("COMMIT");
    } catch (const pqxx::broken_connection& e) {
      // The server may have committed before the connection went: say so, never "nothing".
      std::string what = db_.scrubbed(e.what());
      what = what.substr(0, what.find('\n'));
      if (db_.watch->gave_up()) {
        throw StoreError(db_.no_answer() + " while committing",
                         "run 'curvewarden audit log' to see whether the command was recorded");
      }
      throw StoreError("the connection to the PostgreSQL store '" + db_.path +
                           "' was lost while committing: " + what,
                       "run 'curvewarden audit log' to see whether the command was recorded");
    } catch (const pqxx::failure& e) {
      rethrow(e, db_);
    }
  }
  Instant now() const override { return actor_.clock->now(); }

 private:
  Database& db_;
  Actor actor_;
  WriteState state_;
  PgRegistry registry_;
  PgCurves curves_;
  PgRuns runs_;
  PgAudit audit_;
  PgTableRows rows_;
  bool open_ = false;
};

}  // namespace

std::unique_ptr<ReadUnit> PgStore::read() {
  return std::make_unique<PgReadUnit>(*db_);
}

void PgStore::require_guards() {
  if (const auto missing = missing_guards(); !missing.empty()) {
    std::string list;
    for (const auto& m : missing) list += (list.empty() ? "" : ", ") + m;
    throw StoreError("store '" + db_->path + "' has lost its append-only guards (" + list +
                         "); nothing was written",
                     "the store may have been edited behind the tool's back: run 'curvewarden "
                     "audit verify' and restore the store from a backup");
  }
}

std::unique_ptr<WriteUnit> PgStore::write(const Actor& actor) {
  require_guards();
  return std::make_unique<PgWriteUnit>(*db_, actor);
}

std::unique_ptr<StoreLoader> PgStore::load() {
  require_guards();
  return std::make_unique<PgLoader>(*db_);
}

int PgStore::schema_version() {
  return guarded(*db_, [&] { return db_->schema_version(); });
}

int PgStore::latest_schema_version() const {
  const auto& migrations = sql::migrations();
  return migrations.empty() ? 0 : migrations.back().version;
}

std::vector<std::string> PgStore::missing_guards() {
  return guarded(*db_, [&] { return postgresql::missing_guards(*db_); });
}

std::string PgStore::privilege_statements() {
  return grants_for(kWorkstationRole, db_->schema);
}

namespace {
/// An identifier quoted as PostgreSQL quotes them.
std::string quoted(const std::string& name) {
  std::string out = "\"";
  for (const char c : name) {
    if (c == '"') out += '"';
    out += c;
  }
  return out + '"';
}
}  // namespace

std::string grants_for(const std::string& role, const std::string& schema) {
  // The store's mark and the migration record are only read; entries and facts are appended.
  const std::string read_only =
      quoted(schema) + ".curvewarden_store, " + quoted(schema) + ".schema_migrations";
  std::string appended = quoted(schema) + ".audit_log, " + quoted(schema) + ".settled_tallies, " +
                         quoted(schema) + ".settled_totals";
  for (FactTable t : kAllFactTables)
    appended += ", " + quoted(schema) + "." + std::string(table_name(t));
  const std::string r = quoted(role);
  return "GRANT USAGE ON SCHEMA " + quoted(schema) + " TO " + r + ";\n" + "REVOKE ALL ON TABLE " +
         read_only + ", " + appended + " FROM " + r + ";\n" + "GRANT SELECT ON TABLE " + read_only +
         " TO " + r + ";\n" + "GRANT SELECT, INSERT ON TABLE " + appended + " TO " + r + ";\n";
}

}  // namespace cw::store::postgresql
