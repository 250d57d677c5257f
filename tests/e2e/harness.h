// SPDX-License-Identifier: Apache-2.0
// End-to-end test harness: runs the built curvewarden binary in a fresh temporary directory
// with a pinned environment and captures its exit code, stdout and stderr.
//
// Overview. A `Sandbox` is one test's world: a new directory under $TMPDIR (removed when the
// sandbox goes out of scope), a store path inside it, and the environment every run gets:
//   TZ=UTC, CURVEWARDEN_NOW=<sandbox.now>, CURVEWARDEN_USER=<sandbox.user>,
//   CURVEWARDEN_DB=<sandbox.location()>, and no other CURVEWARDEN_* variable from the caller.
// With CURVEWARDEN_TEST_BACKEND=postgresql (test_backend.h) the store is a fresh database on the
// server of CURVEWARDEN_TEST_PG, created with the sandbox and dropped with it; location() is its
// URI and CURVEWARDEN_KEY names <dir>/store.db.key (the file SQLite's default would name).
// `run()` executes the binary (CW_BINARY, set by tests/e2e/CMakeLists.txt) with the sandbox
// as its working directory. Per-run overrides can set or remove variables:
//
//   cw::test::Sandbox box;
//   auto r = box.run({"init", "--tz", "Europe/Berlin", "--json"});
//   REQUIRE(r.exit_code == 0);
//   CHECK(r.json()["time_zone"] == "Europe/Berlin");
//   auto counts = cw::test::table_row_counts(box);   // {"audit_log": 1, ...} on either backend
//   box.run({"audit", "verify"}, {{"CURVEWARDEN_NOW", "2026-04-01T00:00:00Z"}});
//
// Nothing here depends on the wall clock: every run has CURVEWARDEN_NOW set unless a test
// removes it on purpose. Helpers that touch the store use the SQLite C API or libpq directly (an
// independent path from the tool's own store layer), so tests can count rows, tamper with
// rows, or compare file bytes. The overloads taking a Sandbox work on either backend; those
// taking a path are for SQLite files (tests about the file itself are tagged [sqlite-only]).
#pragma once

#include <chrono>
#include <cstdint>
#include <filesystem>
#include <map>
#include <nlohmann/json.hpp>
#include <optional>
#include <string>
#include <utility>
#include <vector>

#include "test_backend.h"

namespace cw::test {

/// Environment overrides for one run: a value sets the variable, nullopt removes it.
using EnvOverrides = std::map<std::string, std::optional<std::string>>;

/// How long one run may take before the harness kills it (a hang fails the test, it does not
/// stall the suite). The longest legitimate run is the 100 000-row import on PostgreSQL (one
/// round trip per statement: about 100 s on a loaded 2-core machine), hence the margin.
inline constexpr std::chrono::seconds kRunTimeout{300};

/// What one run of the binary produced.
struct RunResult {
  int exit_code = -1;             ///< the process exit status; 128 + N when killed by signal N
  bool timed_out = false;         ///< killed after kRunTimeout
  double seconds = 0;             ///< wall-clock duration of the run
  std::string out;                ///< everything written to stdout
  std::string err;                ///< everything written to stderr
  std::vector<std::string> args;  ///< the arguments (for failure messages)

  /// stdout parsed as one JSON document; throws std::runtime_error naming the run otherwise.
  nlohmann::json json() const;
  /// A one-paragraph description (args, exit code, stdout, stderr) for INFO/CAPTURE.
  std::string describe() const;
};

/// Path of the binary under test (the CW_BINARY compile definition).
std::filesystem::path binary_path();

/// Runs `binary` with `args` in `cwd` with exactly the environment `env` (no inheritance);
/// waits for it and captures both output streams. With `fd3`, the child's descriptor 3 reads
/// that text (a pipe filled before the child starts).
RunResult run_process(const std::filesystem::path& binary, const std::vector<std::string>& args,
                      const std::map<std::string, std::string>& env,
                      const std::filesystem::path& cwd,
                      const std::filesystem::path& stdin_path = "/dev/null",
                      const std::optional<std::string>& fd3 = std::nullopt);

/// The passphrase every test user has: "passphrase of " + its code in lower case (users are
/// registered with it by init and Sandbox::add_user).
std::string test_passphrase(const std::string& code);

/// `args` made ready for a signed command: when it is one (init, curve review/retire, lot
/// withdraw, method revise, instrument service, user add/disable/enable/unlock/passphrase) and
/// gives no --passphrase-fd, "--passphrase-fd 3" is appended and the lines descriptor 3 must
/// hold are returned: the acting user's test passphrase (from --as, else init's --admin, else
/// `user`), then for `user add CODE` and an admin's `user passphrase CODE` the passphrase of
/// CODE, for one's own `user passphrase` the same passphrase again. This is the one place the
/// tests give passphrases; the product has no way around them.
std::pair<std::vector<std::string>, std::optional<std::string>> with_test_passphrases(
    const std::vector<std::string>& args, const std::string& user);

/// One test's temporary directory, store path and pinned environment.
class Sandbox {
 public:
  /// Creates a fresh directory (mkdtemp under $TMPDIR or /tmp).
  Sandbox();
  Sandbox(const Sandbox&) = delete;
  Sandbox& operator=(const Sandbox&) = delete;
  /// Removes the directory and everything in it.
  ~Sandbox();

  /// CURVEWARDEN_NOW for every run (ISO-8601 with zone). Change it between runs to move time.
  std::string now = "2026-03-02T09:00:00Z";
  /// CURVEWARDEN_USER for every run. The first `init` of a sandbox's store registers this user
  /// as the store's first admin (init's default), so it may do everything; other users acting in
  /// a test are registered with add_user().
  std::string user = "alice";

  const std::filesystem::path& dir() const { return dir_; }
  /// The backend of this sandbox's store (CURVEWARDEN_TEST_BACKEND when it was made).
  Backend backend() const { return backend_; }
  /// The SQLite store file <dir>/store.db (what CURVEWARDEN_DB points at on SQLite).
  std::filesystem::path db() const { return dir_ / "store.db"; }
  /// The store's location as the tool is given it (CURVEWARDEN_DB): db() on SQLite, the URI of
  /// the sandbox's database on PostgreSQL.
  const std::string& location() const { return location_; }
  /// The lab key file: <dir>/store.db.key (on SQLite the default next to the store; on
  /// PostgreSQL named by CURVEWARDEN_KEY).
  std::filesystem::path key() const { return dir_ / "store.db.key"; }
  /// <dir>/<name>.
  std::filesystem::path path(const std::string& name) const { return dir_ / name; }

  /// Makes this sandbox a copy of `source`: every file of its directory (the SQLite store with
  /// its -wal file, the key, input files), and on PostgreSQL its database (CREATE DATABASE ...
  /// TEMPLATE, a byte copy made by the server; no one may be connected to `source`'s database).
  void copy_from(const Sandbox& source);

  /// Writes `content` byte for byte to <dir>/<name> (creating parent folders); returns the path.
  std::filesystem::path write_file(const std::string& name, const std::string& content) const;

  /// The environment a run gets, after applying `overrides`.
  std::map<std::string, std::string> environment(const EnvOverrides& overrides = {}) const;

  /// Runs the binary with `args` in the sandbox directory.
  RunResult run(const std::vector<std::string>& args, const EnvOverrides& overrides = {}) const;
  /// Registers `code` with `user add CODE --name NAME --role ROLE`, run as the store's admin
  /// (`admin`, default this sandbox's first user "alice"); the store must be initialised. Returns
  /// the run (callers REQUIRE its exit code).
  RunResult add_user(const std::string& code, const std::string& role = "reviewer",
                     const std::string& admin = "alice") const;

  /// Runs the binary with `input` on its standard input.
  RunResult run_with_input(const std::vector<std::string>& args, const std::string& input,
                           const EnvOverrides& overrides = {}) const;

 private:
  std::filesystem::path dir_;
  Backend backend_ = Backend::Sqlite;
  std::string pg_server_;    ///< PostgreSQL: the server's URI
  std::string pg_database_;  ///< PostgreSQL: the sandbox's database
  std::string location_;
};

/// Row count of every table (type 'table' in sqlite_master, internal ones included) of the
/// SQLite file at `db`, read with the SQLite C API. Throws when the file cannot be read as a
/// database.
std::map<std::string, std::int64_t> table_row_counts(const std::filesystem::path& db);

/// Runs `sql` (one or more statements) on the SQLite file at `db` through the C API. Returns
/// the SQLite result code; `error`, when given, receives SQLite's message ("" on success).
int exec_sql(const std::filesystem::path& db, const std::string& sql, std::string* error = nullptr);

/// The single value of a one-row, one-column query (as text; "" for NULL).
std::string query_text(const std::filesystem::path& db, const std::string& sql);

/// Row count of every table of the sandbox's store, on its backend (SQLite: as above;
/// PostgreSQL: every table outside the system schemas, by table name).
std::map<std::string, std::int64_t> table_row_counts(const Sandbox& box);
/// Runs `sql` on the sandbox's store; 0 on success (SQLite: its result code; PostgreSQL: 1 on
/// any error), `error` receives the message.
int exec_sql(const Sandbox& box, const std::string& sql, std::string* error = nullptr);
/// The single value of a one-row, one-column query on the sandbox's store ("" for NULL).
std::string query_text(const Sandbox& box, const std::string& sql);
/// The schema version `init --json` reports for a current store of the sandbox's backend: each
/// backend numbers its own migrations (SQLite 8, PostgreSQL 2).
int latest_schema_version(const Sandbox& box);

/// The aggregate that joins texts with a separator, `NAME(value, separator)`, in the SQL of the
/// sandbox's backend: group_concat on SQLite, string_agg on PostgreSQL.
std::string text_join(const Sandbox& box);

/// The bytes of a file ("" when it does not exist).
std::string read_file(const std::filesystem::path& path);

/// A method file (TOML, product.md §6) that validates, with the given code and min_r2;
/// analytes nitrate and sulfate, linear 1/x, 5 levels, valid for 7 days.
std::string method_toml(const std::string& code = "ANION-IC", const std::string& min_r2 = "0.995");

}  // namespace cw::test
