// SPDX-License-Identifier: Apache-2.0
// Internal to the PostgreSQL backend: the connection, its prepared statements, opening checks,
// migrations and error translation. Never included outside src/store/postgresql/.
//
// Statements are written with named parameters (:name), as the SQLite backend's, and prepared
// once per connection with them turned into $1, $2, ...; values always travel as parameters,
// never inside the SQL text. A Statement runs when first stepped and keeps its rows, so that
// several may be read at once; a streamed one reads its rows through a cursor of the unit's
// transaction, a batch at a time, so that memory does not grow with them (audit verify walks every
// fact table side by side, a run's or a listing's rows are handed out one at a time).
#pragma once

#include <pqxx/pqxx>

#include <chrono>
#include <cstdint>
#include <map>
#include <memory>
#include <optional>
#include <string>
#include <vector>

#include "core/clock.h"
#include "core/time.h"
#include "store/postgresql/reply_watch.h"

namespace cw::store::postgresql {

/// The store's mark (curvewarden_store.application_id) and the key of the advisory lock every
/// write unit takes: 'CWRD', as SQLite's application_id.
inline constexpr std::int64_t kApplicationId = 0x43575244;

struct Database;

/// How the reply timeout is changed, for the hints of the messages that report it.
inline constexpr const char* kReplyTimeoutHint =
    "CURVEWARDEN_REPLY_TIMEOUT sets how many seconds a request may take, 30 by default";

/// One value of the current row; NULL reads as 0, 0.0 or "" (as SQLiteCpp's columns do).
class Column {
 public:
  explicit Column(pqxx::field f) : f_(std::move(f)) {}
  bool isNull() const { return f_.is_null(); }
  std::int64_t getInt64() const;
  int getInt() const { return static_cast<int>(getInt64()); }
  double getDouble() const;
  std::string getString() const { return f_.is_null() ? std::string() : f_.c_str(); }

 private:
  pqxx::field f_;
};

/// How a statement's rows are read: all at once, or streamed through a cursor.
enum class Rows { All, Streamed };

class Statement {
 public:
  Statement(Database& db, std::string sql, Rows rows = Rows::All);
  Statement(const Statement&) = delete;
  Statement& operator=(const Statement&) = delete;
  ~Statement();

  void bind(const char* name, const std::string& v);
  void bind(const char* name, std::int64_t v);
  void bind(const char* name, int v) { bind(name, static_cast<std::int64_t>(v)); }
  void bind(const char* name, long long v) { bind(name, static_cast<std::int64_t>(v)); }
  void bind(const char* name, double v);
  /// NULL.
  void bind(const char* name);

  /// Runs the statement on the first call; true while there is a current row.
  bool executeStep();
  Column getColumn(int i) const;
  /// Forgets the rows; the bindings stay.
  void reset();
  /// Every parameter NULL again.
  void clearBindings();
  /// Runs a statement that returns no rows or one id (INSERT ... RETURNING id); returns the
  /// number of rows affected.
  int exec();

 private:
  std::size_t slot(const char* name) const;
  void fetch();
  void close_cursor() noexcept;

  Database& db_;
  std::string sql_;  ///< with $1, $2, ... in place of the names
  std::vector<std::string> names_;
  std::vector<std::optional<std::string>> values_;
  std::optional<pqxx::result> result_;
  std::size_t row_ = 0;
  Rows rows_ = Rows::All;
  std::string cursor_;             ///< the open cursor's name, empty when none
  std::uint64_t transaction_ = 0;  ///< the transaction the cursor belongs to
  bool exhausted_ = false;
};

struct Database {
  std::string location;        ///< the URI as given (may hold a password; never shown)
  std::string path;            ///< the URI with its password masked: what messages show
  std::string schema;          ///< the store's schema (the search_path of every session)
  std::string conninfo;        ///< the URI's settings with the tool's defaults, as libpq reads them
  bool timeout_given = false;  ///< the URI sets connect_timeout
  std::vector<std::string> secrets;                ///< the password as written and as decoded
  std::chrono::steady_clock::time_point deadline;  ///< connecting gives up after it
  /// Gives up on a request the server has not answered within the reply timeout; every round
  /// trip below holds a ReplyWatch::Waiting.
  std::unique_ptr<ReplyWatch> watch;
  std::unique_ptr<pqxx::connection> conn;
  std::unique_ptr<pqxx::nontransaction> session;
  bool created = false;
  int busy_timeout_ms = 5000;
  std::string os_login;
  std::int64_t last_id = 0;
  std::uint64_t transaction = 0;                ///< counts the units begun on this connection
  std::uint64_t cursors = 0;                    ///< names the cursors
  std::map<std::string, std::string> prepared;  ///< SQL text -> statement name
  std::map<const char*, std::unique_ptr<Statement>> statements;

  /// Connects (retrying while the server cannot be reached, within the busy timeout), checks
  /// that the database is a Curvewarden store (or empty, with `create`), and applies pending
  /// migrations.
  static std::unique_ptr<Database> open(const std::string& location, bool create,
                                        int busy_timeout_ms, const std::string& os_login,
                                        bool may_migrate = true);

  /// `text` with the password, in any form the URI holds it, replaced by "***": every message
  /// that leaves the backend goes through it (libpq's own texts may echo the URI).
  std::string scrubbed(std::string text) const;
  /// "the PostgreSQL server of '...' did not answer within N s": a request given up on.
  std::string no_answer() const;

  /// Runs SQL without parameters (BEGIN, COMMIT, migrations).
  pqxx::result run(const std::string& sql);
  /// Runs a statement over the whole store (a migration, building derived rows), which may take
  /// longer than the reply timeout (ReplyWatch::Waiting::kBulkTimes as long).
  pqxx::result run_bulk(const std::string& sql);
  /// The name `sql` is prepared under on this connection, preparing it the first time.
  const std::string& prepare(const std::string& sql);
  /// A cached statement for a static SQL text, reset and with bindings cleared.
  Statement& statement(const char* sql);
  std::int64_t last_insert_id() const { return last_id; }
  int schema_version();

  /// Starts a write transaction: READ COMMITTED, then the store's advisory lock (see
  /// database.cpp). Starts a read snapshot: REPEATABLE READ READ ONLY.
  void begin_write();
  void begin_read();
};

/// Translates a libpqxx error into StoreError (exit 4), the server's SQLSTATE in the message.
[[noreturn]] void rethrow(const std::exception& e, const Database& d);

/// A stored value that does not parse: the store is damaged (exit 4).
[[noreturn]] void damaged(const std::string& path, const std::string& what);

/// Runs `fn()` translating libpqxx errors into StoreError.
template <class Fn>
auto guarded(Database& d, Fn&& fn) -> decltype(fn()) {
  try {
    return fn();
  } catch (const pqxx::failure& e) {
    rethrow(e, d);
  } catch (const pqxx::conversion_error& e) {
    rethrow(e, d);
  }
}

}  // namespace cw::store::postgresql
