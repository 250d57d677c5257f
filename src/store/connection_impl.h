// SPDX-License-Identifier: Apache-2.0
// Internal to the store layer: the SQLite handle, a cache of prepared statements, and
// helpers to bind and read values. Never included outside src/store/.
#pragma once

#include <SQLiteCpp/SQLiteCpp.h>

#include <map>
#include <memory>
#include <optional>
#include <string>

#include "core/time.h"
#include "store/connection.h"

namespace cw::store {

struct Connection::Impl {
  std::string path;
  std::unique_ptr<SQLite::Database> db;
  bool created = false;
  std::map<const char*, std::unique_ptr<SQLite::Statement>> statements;

  /// A cached prepared statement for a static SQL text, reset and with bindings cleared.
  SQLite::Statement& statement(const char* sql) {
    auto& slot = statements[sql];
    if (!slot) {
      slot = std::make_unique<SQLite::Statement>(*db, sql);
    } else {
      slot->reset();
      slot->clearBindings();
    }
    return *slot;
  }

  /// Resets every cached statement. A statement stepped to a row and left there keeps a read
  /// snapshot open; a writer holding one cannot wait for the write lock (SQLite reports busy at
  /// once instead of calling the busy handler), so every transaction starts from here.
  void release_statements() {
    for (auto& [sql, statement] : statements) statement->reset();
  }
};

/// Translates an SQLite error into StoreError (exit 4), keeping both result codes.
[[noreturn]] void rethrow_sqlite(const SQLite::Exception& e, const std::string& path);

/// Runs `fn(impl)` translating SQLite errors into StoreError.
template <class Fn>
auto guarded(Connection& c, Fn&& fn) -> decltype(fn(c.impl())) {
  try {
    return fn(c.impl());
  } catch (const SQLite::Exception& e) {
    rethrow_sqlite(e, c.impl().path);
  }
}

// Binding helpers (SQLiteCpp 3.2 has no optional or string_view binds).
inline void bind_text(SQLite::Statement& s, const char* name, const std::string& v) {
  s.bind(name, v);
}
inline void bind_opt_text(SQLite::Statement& s, const char* name,
                          const std::optional<std::string>& v) {
  if (v) {
    s.bind(name, *v);
  } else {
    s.bind(name);
  }
}
inline void bind_int(SQLite::Statement& s, const char* name, std::int64_t v) {
  s.bind(name, v);
}
inline void bind_opt_int(SQLite::Statement& s, const char* name,
                         const std::optional<std::int64_t>& v) {
  if (v) {
    s.bind(name, *v);
  } else {
    s.bind(name);
  }
}
inline void bind_real(SQLite::Statement& s, const char* name, double v) {
  s.bind(name, v);
}
inline void bind_opt_real(SQLite::Statement& s, const char* name, const std::optional<double>& v) {
  if (v) {
    s.bind(name, *v);
  } else {
    s.bind(name);
  }
}
inline void bind_instant(SQLite::Statement& s, const char* name, Instant t) {
  s.bind(name, format_utc(t));
}

inline std::optional<std::string> opt_text(const SQLite::Column& c) {
  if (c.isNull()) return std::nullopt;
  return c.getString();
}
inline std::optional<double> opt_real(const SQLite::Column& c) {
  if (c.isNull()) return std::nullopt;
  return c.getDouble();
}
inline std::optional<std::int64_t> opt_int(const SQLite::Column& c) {
  if (c.isNull()) return std::nullopt;
  return c.getInt64();
}
inline Instant instant_of(const SQLite::Column& c) {
  return parse_instant(c.getString(), "stored time");
}

/// The id of the row just inserted.
inline std::int64_t last_id(Connection::Impl& impl) {
  return impl.db->getLastInsertRowid();
}

}  // namespace cw::store
