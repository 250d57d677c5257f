// SPDX-License-Identifier: Apache-2.0
// Internal to the SQLite backend: the connection, its prepared-statement cache, opening checks,
// migrations and error translation. Never included outside src/store/sqlite/.
#pragma once

#include <SQLiteCpp/SQLiteCpp.h>

#include <map>
#include <memory>
#include <optional>
#include <string>
#include <vector>

#include "core/clock.h"
#include "core/time.h"
#include "store/sqlite/open.h"

namespace cw::store::sqlite {

/// SQLite application_id of a Curvewarden store ('CWRD').
inline constexpr std::int32_t kApplicationId = 0x43575244;

struct Database {
  std::string path;
  std::unique_ptr<SQLite::Database> db;
  bool created = false;
  /// This process cannot change the store (see Database::open): reads only, and no side files.
  bool read_only = false;
  /// The operating-system login of the process (recorded by entries a migration writes).
  std::string os_login;
  std::map<const char*, std::unique_ptr<SQLite::Statement>> statements;

  /// Opens the file, checks that it is ours and not newer than `migrations`, sets the
  /// connection's pragmas and applies pending migrations (each in its own transaction).
  /// A store this process cannot write (the file is not writable for it, or its folder cannot
  /// take the -wal and -shm files and they do not exist) is opened read-only. When no -wal file
  /// exists it is read as it stands on disk (SQLite's immutable mode), so that reading creates no
  /// -wal or -shm file owned by this user that would then stand in the way of the store's owner;
  /// when a writer's -wal exists, it is read through the writer's files.
  static std::unique_ptr<Database> open(const std::string& path, bool create, int busy_timeout_ms,
                                        const std::vector<MigrationSpec>& migrations,
                                        const std::string& os_login = {}, bool may_migrate = true);

  /// A cached prepared statement for a static SQL text, reset and with bindings cleared.
  SQLite::Statement& statement(const char* sql);
  /// Resets every cached statement. A statement stepped to a row and left there keeps a read
  /// snapshot open; a writer holding one cannot wait for the write lock (SQLite reports busy at
  /// once instead of calling the busy handler), so every transaction starts from here.
  void release_statements();
  int user_version();
};

/// Migration 0007's step: every name in the trail that is not a user yet becomes one, disabled
/// until an admin enables it, each with an audit entry of its own.
void register_legacy_actors(Database& db, const Clock& clock);

/// Translates an SQLite error into StoreError (exit 4); the SQLite codes stay in the message.
[[noreturn]] void rethrow(const SQLite::Exception& e, const std::string& path);

/// A stored value that does not parse: the store is damaged (exit 4).
[[noreturn]] void damaged(const std::string& path, const std::string& what);

/// Runs `fn()` translating SQLite and JSON errors into StoreError.
template <class Fn>
auto guarded(Database& d, Fn&& fn) -> decltype(fn()) {
  try {
    return fn();
  } catch (const SQLite::Exception& e) {
    rethrow(e, d.path);
  }
}

}  // namespace cw::store::sqlite
