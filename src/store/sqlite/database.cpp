// SPDX-License-Identifier: Apache-2.0
// Opening the SQLite store, migrations and error translation.
#include "store/sqlite/database.h"

#include <sqlite3.h>
#include <sys/stat.h>
#include <unistd.h>

#include <filesystem>

#include "audit/sha256.h"
#include "core/error.h"
#include "store/sqlite/settled_tallies.h"
#include "store/sqlite/sql_text.h"

namespace cw::store::sqlite {
namespace {

std::string describe_sqlite(const SQLite::Exception& e) {
  return std::string(e.what()) + " (SQLite code " + std::to_string(e.getExtendedErrorCode()) + ")";
}

int read_int_pragma(SQLite::Database& db, const char* pragma) {
  SQLite::Statement s(db, pragma);
  s.executeStep();
  return s.getColumn(0).getInt();
}

[[noreturn]] void too_new(const std::string& path, int current, int latest) {
  throw StoreError("store '" + path + "' was written by a newer version of curvewarden (schema " +
                       std::to_string(current) + ", this program knows up to " +
                       std::to_string(latest) + ")",
                   "use a newer curvewarden; the store has not been changed");
}

/// Applies every migration newer than the store's user_version, each in its own transaction
/// together with its schema_migrations row and the new user_version.
void migrate(Database& d, const std::vector<MigrationSpec>& migrations, const Clock& clock) {
  SQLite::Database& db = *d.db;
  const int latest = migrations.empty() ? 0 : migrations.back().version;
  for (const auto& m : migrations) {
    // Re-read inside the write lock: another process may have migrated meanwhile.
    SQLite::Transaction tx(db, SQLite::TransactionBehavior::IMMEDIATE);
    const int current = read_int_pragma(db, "PRAGMA user_version");
    if (current > latest) too_new(d.path, current, latest);
    if (m.version <= current) continue;
    if (current == 0) {
      db.exec(sql::kBootstrap);
      db.exec("PRAGMA application_id = " + std::to_string(kApplicationId));
    }
    db.exec(m.sql);
    if (m.after != nullptr) m.after(d, clock);
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
    d.created = d.created || current == 0;
  }
}

bool exists(const std::string& path) {
  struct stat st {};
  return ::stat(path.c_str(), &st) == 0;
}

/// True when this process cannot change the store at `path` (an existing file): the file is not
/// writable for it (permissions, a read-only file system), or the folder cannot take the -wal
/// and -shm files SQLite writes beside it and they are not there.
bool cannot_write(const std::string& path) {
  if (::access(path.c_str(), W_OK) != 0) return true;
  if (exists(path + "-wal") && exists(path + "-shm")) return false;
  const std::filesystem::path folder = std::filesystem::path(path).parent_path();
  return ::access(folder.empty() ? "." : folder.c_str(), W_OK) != 0;
}

/// An SQLite URI naming the file at `path` read-only and immutable (no locks, no side files).
std::string immutable_uri(const std::string& path) {
  std::string uri = "file:";
  for (const char c : path) {
    if (c == '%' || c == '?' || c == '#') {
      static constexpr char kHex[] = "0123456789ABCDEF";
      const auto byte = static_cast<unsigned char>(c);
      uri += '%';
      uri += kHex[byte >> 4];
      uri += kHex[byte & 0xF];
    } else {
      uri += c;
    }
  }
  return uri + "?immutable=1";
}

/// Refuses a store that needs migrating when it was opened only to be read.
[[noreturn]] void needs_migration_to_read(const std::string& path, int version, int latest) {
  throw StoreError("store '" + path + "' is at schema version " + std::to_string(version) +
                       ", older than " + std::to_string(latest) +
                       ", the latest this program knows, and is opened here only to be read: "
                       "nothing was written",
                   "run any command on it once with this version of curvewarden (it upgrades "
                   "the store, e.g. 'curvewarden audit verify'), then try again");
}

}  // namespace

std::vector<MigrationSpec> embedded_migrations() {
  std::vector<MigrationSpec> out;
  for (const auto& m : sql::migrations()) {
    out.push_back({m.version, m.name, m.text});
    if (m.version == 7) out.back().after = register_legacy_actors;
    if (m.version == 9) out.back().after = build_settled_tallies_step;
  }
  return out;
}

void rethrow(const SQLite::Exception& e, const std::string& path) {
  const int code = e.getErrorCode();
  if (code == SQLITE_BUSY || code == SQLITE_LOCKED) {
    throw StoreError("store '" + path + "' is locked by another writer past the busy timeout",
                     "try again when the other command has finished");
  }
  if (code == SQLITE_NOTADB || code == SQLITE_CORRUPT) {
    throw StoreError(
        "'" + path + "' is not a Curvewarden store or is damaged: " + describe_sqlite(e),
        "check --db / CURVEWARDEN_DB; if it is the lab's store, restore it from a backup");
  }
  if (code == SQLITE_READONLY || code == SQLITE_CANTOPEN || code == SQLITE_PERM) {
    throw StoreError("store '" + path + "' cannot be written: " + describe_sqlite(e),
                     "check the file's and its folder's permissions");
  }
  if (code == SQLITE_FULL) {
    throw StoreError("store '" + path + "': the disk is full (" + describe_sqlite(e) + ")",
                     "free some space; nothing of this command was written");
  }
  throw StoreError("store error on '" + path + "': " + describe_sqlite(e));
}

void damaged(const std::string& path, const std::string& what) {
  throw StoreError("store '" + path + "' is damaged: " + what,
                   "run 'curvewarden audit verify' and restore the store from a backup; "
                   "nothing was written");
}

std::unique_ptr<Database> Database::open(const std::string& path, bool create, int busy_timeout_ms,
                                         const std::vector<MigrationSpec>& migrations,
                                         const std::string& os_login, bool may_migrate) {
  auto d = std::make_unique<Database>();
  d->path = path;
  d->os_login = os_login;
  const bool memory = path == ":memory:";
  if (!memory) {
    struct stat st {};
    if (::stat(path.c_str(), &st) != 0) {
      if (!create) {
        throw StoreError("no store at '" + path + "'",
                         "run 'curvewarden init' first, or point --db / CURVEWARDEN_DB at the "
                         "store");
      }
    } else if (!S_ISREG(st.st_mode)) {
      throw StoreError("'" + path + "' is not a regular file, so it cannot be a store",
                       "point --db / CURVEWARDEN_DB at the store file");
    }
  }
  d->read_only = !memory && exists(path) && cannot_write(path);
  // No allocation statistics (nothing reads them): SQLite otherwise takes a global mutex around
  // every allocation. Only possible before SQLite's first use in the process; later it is a
  // no-op.
  static const int configured = sqlite3_config(SQLITE_CONFIG_MEMSTATUS, 0);
  static_cast<void>(configured);
  try {
    // A connection serves one thread only: no per-call locking of the connection (every column
    // read takes a mutex otherwise, a tenth of a full scan such as `audit verify`).
    if (!d->read_only) {
      const int flags =
          SQLite::OPEN_READWRITE | SQLite::OPEN_NOMUTEX | (create ? SQLite::OPEN_CREATE : 0);
      d->db = std::make_unique<SQLite::Database>(path, flags, busy_timeout_ms);
    } else if (exists(path + "-wal")) {
      d->db = std::make_unique<SQLite::Database>(path, SQLite::OPEN_READONLY | SQLite::OPEN_NOMUTEX,
                                                 busy_timeout_ms);
    } else {
      d->db = std::make_unique<SQLite::Database>(
          immutable_uri(path), SQLite::OPEN_READONLY | SQLite::OPEN_URI | SQLite::OPEN_NOMUTEX,
          busy_timeout_ms);
    }
    SQLite::Database& db = *d->db;
    // Identify the file before changing anything in it.
    const int app_id = read_int_pragma(db, "PRAGMA application_id");
    const int user_version = read_int_pragma(db, "PRAGMA user_version");
    const int objects = read_int_pragma(db, "SELECT count(*) FROM sqlite_master");
    const bool empty = app_id == 0 && user_version == 0 && objects == 0;
    if (app_id != kApplicationId && !empty) {
      throw StoreError("'" + path + "' is not a Curvewarden store",
                       "check --db / CURVEWARDEN_DB; the file has not been changed");
    }
    if (empty && !create) {
      throw StoreError("'" + path + "' is an empty file, not an initialised store",
                       "run 'curvewarden init' to create the store");
    }
    const int latest = migrations.empty() ? 0 : migrations.back().version;
    if (user_version > latest) too_new(path, user_version, latest);
    if (!may_migrate && !empty && user_version < latest) {
      needs_migration_to_read(path, user_version, latest);
    }
    if (d->read_only && user_version < latest) {
      throw StoreError("store '" + path + "' was written by an older curvewarden and needs " +
                           "its schema upgraded, which this user cannot do: the store is " +
                           "read-only here",
                       "run any command once as a user who may write the store (its folder "
                       "too), then read it again");
    }
    if (!memory && !d->read_only) {
      SQLite::Statement wal(db, "PRAGMA journal_mode = WAL");
      wal.executeStep();
    }
    db.exec("PRAGMA foreign_keys = ON");
    if (!d->read_only) db.exec("PRAGMA synchronous = NORMAL");
    // With recursive triggers, INSERT OR REPLACE fires the delete guards too.
    db.exec("PRAGMA recursive_triggers = ON");
    if (user_version < latest) {
      // CURVEWARDEN_NOW replaces "now" everywhere (product.md §3), applied_at included.
      const auto clock = clock_from_environment();
      migrate(*d, migrations, *clock);
    }
  } catch (const SQLite::Exception& e) {
    rethrow(e, path);
  }
  return d;
}

SQLite::Statement& Database::statement(const char* sql) {
  if (auto found = statements.find(sql); found != statements.end()) {
    found->second->reset();
    found->second->clearBindings();
    return *found->second;
  }
  // Prepared before it is cached: a statement that fails to prepare (a damaged schema) leaves
  // no empty slot behind for release_statements() to trip over.
  auto prepared = std::make_unique<SQLite::Statement>(*db, sql);
  return *statements.emplace(sql, std::move(prepared)).first->second;
}

void Database::release_statements() {
  for (auto& [sql, statement] : statements) statement->reset();
}

int Database::user_version() {
  return read_int_pragma(*db, "PRAGMA user_version");
}

}  // namespace cw::store::sqlite
