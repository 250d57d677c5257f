// SPDX-License-Identifier: Apache-2.0
// Opening the store, migrations, write and read transactions, and the audit append.
#include "store/connection.h"

#include <sqlite3.h>

#include <filesystem>

#include "audit/audit_entry.h"
#include "audit/sha256.h"
#include "core/error.h"
#include "store/connection_impl.h"
#include "store/row_json.h"
#include "store/sql_text.h"

namespace cw::store {
namespace {

std::string describe_sqlite(const SQLite::Exception& e) {
  return std::string(e.what()) + " (SQLite code " + std::to_string(e.getExtendedErrorCode()) + ")";
}

int read_int_pragma(SQLite::Database& db, const char* pragma) {
  SQLite::Statement s(db, pragma);
  s.executeStep();
  return s.getColumn(0).getInt();
}

/// Applies every migration newer than the store's user_version, each in its own
/// transaction together with its schema_migrations row and the new user_version.
void migrate(Connection::Impl& impl, const std::vector<MigrationSpec>& migrations,
             const Clock& clock) {
  SQLite::Database& db = *impl.db;
  const int latest = migrations.empty() ? 0 : migrations.back().version;
  for (const auto& m : migrations) {
    // Re-read inside the write lock: another process may have migrated meanwhile.
    SQLite::Transaction tx(db, SQLite::TransactionBehavior::IMMEDIATE);
    const int current = read_int_pragma(db, "PRAGMA user_version");
    if (current > latest) {
      throw StoreError("store '" + impl.path +
                           "' was written by a newer version of curvewarden (schema " +
                           std::to_string(current) + ", this program knows up to " +
                           std::to_string(latest) + ")",
                       "use a newer curvewarden; the store has not been changed");
    }
    if (m.version <= current) continue;
    if (current == 0) {
      db.exec(sql::kBootstrap);
      db.exec("PRAGMA application_id = " + std::to_string(kApplicationId));
    }
    db.exec(m.sql);
    SQLite::Statement record(db,
                             "INSERT INTO schema_migrations (version, name, sha256, applied_at) "
                             "VALUES (:version, :name, :sha256, :applied_at)");
    record.bind(":version", m.version);
    record.bind(":name", m.name);
    record.bind(":sha256", audit::sha256_hex(m.sql));
    record.bind(":applied_at", format_utc(clock.now()));
    record.exec();
    db.exec("PRAGMA user_version = " + std::to_string(m.version));
    tx.commit();
    impl.created = impl.created || current == 0;
  }
}

}  // namespace

void rethrow_sqlite(const SQLite::Exception& e, const std::string& path) {
  const int code = e.getErrorCode();
  if (code == SQLITE_BUSY || code == SQLITE_LOCKED) {
    throw StoreError("store '" + path + "' is locked by another writer past the busy timeout",
                     "try again when the other command has finished", code,
                     e.getExtendedErrorCode());
  }
  if (code == SQLITE_NOTADB || code == SQLITE_CORRUPT) {
    throw StoreError(
        "'" + path + "' is not a Curvewarden store or is damaged: " + describe_sqlite(e),
        "check --db / CURVEWARDEN_DB", code, e.getExtendedErrorCode());
  }
  throw StoreError("store error on '" + path + "': " + describe_sqlite(e), {}, code,
                   e.getExtendedErrorCode());
}

std::vector<MigrationSpec> Connection::embedded_migrations() {
  std::vector<MigrationSpec> out;
  for (const auto& m : sql::migrations()) out.push_back({m.version, m.name, m.text});
  return out;
}

Connection Connection::open(const OpenOptions& options) {
  return open(options, embedded_migrations());
}

Connection Connection::open(const OpenOptions& options,
                            const std::vector<MigrationSpec>& migrations) {
  auto impl = std::make_unique<Impl>();
  impl->path = options.path;
  const bool memory = options.path == ":memory:";
  if (!memory && !options.create && !std::filesystem::exists(options.path)) {
    throw StoreError("no store at '" + options.path + "'",
                     "run 'curvewarden init' first, or point --db / CURVEWARDEN_DB at the store");
  }
  try {
    const int flags = SQLite::OPEN_READWRITE | (options.create ? SQLite::OPEN_CREATE : 0);
    impl->db = std::make_unique<SQLite::Database>(options.path, flags, options.busy_timeout_ms);
    SQLite::Database& db = *impl->db;
    // Identify the file before changing anything in it.
    const int app_id = read_int_pragma(db, "PRAGMA application_id");
    const int user_version = read_int_pragma(db, "PRAGMA user_version");
    const int objects = read_int_pragma(db, "SELECT count(*) FROM sqlite_master");
    const bool empty = app_id == 0 && user_version == 0 && objects == 0;
    if (app_id != kApplicationId && !empty) {
      throw StoreError("'" + options.path + "' is not a Curvewarden store",
                       "check --db / CURVEWARDEN_DB; the file has not been changed");
    }
    if (empty && !options.create) {
      throw StoreError("'" + options.path + "' is an empty file, not an initialised store",
                       "run 'curvewarden init' to create the store");
    }
    const int latest = migrations.empty() ? 0 : migrations.back().version;
    if (user_version > latest) {
      throw StoreError("store '" + options.path +
                           "' was written by a newer version of curvewarden (schema " +
                           std::to_string(user_version) + ", this program knows up to " +
                           std::to_string(latest) + ")",
                       "use a newer curvewarden; the store has not been changed");
    }
    if (!memory) {
      SQLite::Statement wal(db, "PRAGMA journal_mode = WAL");
      wal.executeStep();
    }
    db.exec("PRAGMA foreign_keys = ON");
    db.exec("PRAGMA synchronous = NORMAL");
    // With recursive triggers, INSERT OR REPLACE fires the delete guards too.
    db.exec("PRAGMA recursive_triggers = ON");
    if (user_version < latest) {
      // CURVEWARDEN_NOW replaces "now" everywhere (product.md §3), applied_at included.
      const auto clock = clock_from_environment();
      migrate(*impl, migrations, *clock);
    }
  } catch (const SQLite::Exception& e) {
    rethrow_sqlite(e, options.path);
  }
  return Connection(std::move(impl));
}

Connection::Connection(std::unique_ptr<Impl> impl) : impl_(std::move(impl)) {}
Connection::Connection(Connection&&) noexcept = default;
Connection& Connection::operator=(Connection&&) noexcept = default;
Connection::~Connection() = default;

const std::string& Connection::path() const {
  return impl_->path;
}
bool Connection::was_created() const {
  return impl_->created;
}

int Connection::schema_version() const {
  try {
    return read_int_pragma(*impl_->db, "PRAGMA user_version");
  } catch (const SQLite::Exception& e) {
    rethrow_sqlite(e, impl_->path);
  }
}

// ---------------------------------------------------------------------------------------
// WriteTransaction

WriteTransaction::WriteTransaction(Connection& connection, const Actor& actor)
    : connection_(connection), actor_(actor) {
  auto& impl = connection_.impl();
  try {
    impl.release_statements();
    impl.db->exec("BEGIN IMMEDIATE");
    open_ = true;
    auto& last = impl.statement("SELECT seq, hash FROM audit_log ORDER BY seq DESC LIMIT 1");
    if (last.executeStep()) {
      seq_ = last.getColumn(0).getInt64() + 1;
      prev_hash_ = last.getColumn(1).getString();
    } else {
      seq_ = 1;
      prev_hash_ = audit::kGenesisHash;
    }
    last.reset();
  } catch (const SQLite::Exception& e) {
    if (open_) {
      impl.db->exec("ROLLBACK");
      open_ = false;
    }
    rethrow_sqlite(e, impl.path);
  }
}

WriteTransaction::~WriteTransaction() {
  if (open_) {
    try {
      connection_.impl().db->exec("ROLLBACK");
    } catch (...) {
      // A destructor must not throw; SQLite rolls back an unfinished transaction anyway.
    }
  }
}

void WriteTransaction::add_row(FactTable table, std::int64_t id) {
  rows_.emplace_back(table, id);
}

void WriteTransaction::append_entry(const EntryHeader& header) {
  auto& impl = connection_.impl();
  try {
    audit::AuditEntry e;
    e.seq = seq_;
    e.recorded_at = format_utc(now());
    e.occurred_at = format_utc(header.occurred_at);
    e.actor = actor_.name;
    e.action = header.action;
    e.entity_kind = header.entity_kind;
    e.entity_id = header.entity_id;
    e.reason = header.reason;
    e.clock_overridden = actor_.clock->is_overridden();
    e.tool_version = actor_.tool_version;
    e.payload = payload_of_rows(impl, rows_);
    e.prev_hash = prev_hash_;
    e.hash = audit::compute_hash(e);

    auto& insert = impl.statement(
        "INSERT INTO audit_log (seq, recorded_at, occurred_at, actor, action, entity_kind, "
        "entity_id, reason, clock_overridden, tool_version, payload, prev_hash, hash) VALUES "
        "(:seq, :recorded_at, :occurred_at, :actor, :action, :entity_kind, :entity_id, :reason, "
        ":clock_overridden, :tool_version, :payload, :prev_hash, :hash)");
    bind_int(insert, ":seq", e.seq);
    bind_text(insert, ":recorded_at", e.recorded_at);
    bind_text(insert, ":occurred_at", e.occurred_at);
    bind_text(insert, ":actor", e.actor);
    bind_text(insert, ":action", e.action);
    bind_text(insert, ":entity_kind", e.entity_kind);
    bind_text(insert, ":entity_id", e.entity_id);
    bind_opt_text(insert, ":reason", e.reason);
    bind_int(insert, ":clock_overridden", e.clock_overridden ? 1 : 0);
    bind_text(insert, ":tool_version", e.tool_version);
    bind_text(insert, ":payload", e.payload);
    bind_text(insert, ":prev_hash", e.prev_hash);
    bind_text(insert, ":hash", e.hash);
    insert.exec();
    prev_hash_ = e.hash;
    ++seq_;
    rows_.clear();
  } catch (const SQLite::Exception& ex) {
    rethrow_sqlite(ex, impl.path);
  }
}

void WriteTransaction::commit() {
  if (!rows_.empty()) {
    throw std::logic_error("rows written without an audit entry");
  }
  auto& impl = connection_.impl();
  try {
    impl.db->exec("COMMIT");
    open_ = false;
  } catch (const SQLite::Exception& e) {
    rethrow_sqlite(e, impl.path);
  }
}

// ---------------------------------------------------------------------------------------
// ReadTransaction

ReadTransaction::ReadTransaction(Connection& connection) : connection_(connection) {
  auto& impl = connection_.impl();
  if (sqlite3_get_autocommit(impl.db->getHandle()) == 0) return;  // already inside one
  try {
    impl.release_statements();
    impl.db->exec("BEGIN DEFERRED");
    open_ = true;
  } catch (const SQLite::Exception& e) {
    rethrow_sqlite(e, impl.path);
  }
}

ReadTransaction::~ReadTransaction() {
  if (open_) {
    try {
      connection_.impl().release_statements();
      connection_.impl().db->exec("COMMIT");
    } catch (...) {
      // Nothing was written; ending a read snapshot cannot lose data.
    }
  }
}

}  // namespace cw::store
