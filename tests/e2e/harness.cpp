// SPDX-License-Identifier: Apache-2.0
// End-to-end test harness: process spawning with captured output, sandboxes, and SQLite
// helpers that bypass the tool's store layer.
#include "harness.h"

#include <algorithm>

#include <fcntl.h>
#include <poll.h>
#include <signal.h>
#include <sqlite3.h>
#include <sys/wait.h>
#include <unistd.h>

#include <cerrno>
#include <chrono>
#include <cstdlib>
#include <cstring>
#include <fstream>
#include <sstream>
#include <stdexcept>

#ifndef CW_BINARY
#error "CW_BINARY must name the curvewarden binary (see tests/e2e/CMakeLists.txt)"
#endif

extern char** environ;

namespace cw::test {
namespace {

[[noreturn]] void fail_errno(const std::string& what) {
  throw std::runtime_error(what + ": " + std::strerror(errno));
}

/// Reads both pipes until the child closes them (poll, so neither pipe can fill up and block).
/// A child still running at `deadline` is killed (a hung tool fails its test instead of
/// hanging the suite); `timed_out` tells.
void drain(int out_fd, int err_fd, std::string& out, std::string& err, pid_t pid,
           std::chrono::steady_clock::time_point deadline, bool& timed_out) {
  pollfd fds[2] = {{out_fd, POLLIN, 0}, {err_fd, POLLIN, 0}};
  int open_fds = 2;
  char buffer[4096];
  while (open_fds > 0) {
    const auto left = std::chrono::duration_cast<std::chrono::milliseconds>(
        deadline - std::chrono::steady_clock::now());
    if (left.count() <= 0 && !timed_out) {
      kill(pid, SIGKILL);
      timed_out = true;
    }
    const int ready = poll(fds, 2, timed_out ? -1 : static_cast<int>(left.count()) + 1);
    if (ready < 0) {
      if (errno == EINTR) continue;
      fail_errno("poll");
    }
    if (ready == 0) continue;
    for (int i = 0; i < 2; ++i) {
      if (fds[i].fd < 0 || (fds[i].revents & (POLLIN | POLLHUP | POLLERR)) == 0) continue;
      const ssize_t n = read(fds[i].fd, buffer, sizeof buffer);
      if (n > 0) {
        (i == 0 ? out : err).append(buffer, static_cast<size_t>(n));
      } else if (n == 0 || (n < 0 && errno != EINTR)) {
        close(fds[i].fd);
        fds[i].fd = -1;
        --open_fds;
      }
    }
  }
}

/// Closes a sqlite3 handle on scope exit.
struct Db {
  sqlite3* handle = nullptr;
  explicit Db(const std::filesystem::path& path) {
    if (!std::filesystem::exists(path)) {
      throw std::runtime_error("no database file at " + path.string());
    }
    // Read-write without CREATE: a WAL-mode store may need its -shm file; nothing is written
    // unless the caller runs a statement that writes.
    if (sqlite3_open_v2(path.c_str(), &handle, SQLITE_OPEN_READWRITE, nullptr) != SQLITE_OK) {
      const std::string message = handle ? sqlite3_errmsg(handle) : "out of memory";
      sqlite3_close(handle);
      throw std::runtime_error("cannot open " + path.string() + ": " + message);
    }
  }
  ~Db() { sqlite3_close(handle); }
  Db(const Db&) = delete;
  Db& operator=(const Db&) = delete;
};

/// Runs a query and returns every row as text (NULL → "").
std::vector<std::vector<std::string>> query_rows(sqlite3* db, const std::string& sql) {
  sqlite3_stmt* stmt = nullptr;
  if (sqlite3_prepare_v2(db, sql.c_str(), -1, &stmt, nullptr) != SQLITE_OK) {
    throw std::runtime_error("cannot prepare '" + sql + "': " + sqlite3_errmsg(db));
  }
  std::vector<std::vector<std::string>> rows;
  int rc = 0;
  while ((rc = sqlite3_step(stmt)) == SQLITE_ROW) {
    std::vector<std::string> row;
    for (int i = 0; i < sqlite3_column_count(stmt); ++i) {
      const auto* text = sqlite3_column_text(stmt, i);
      row.emplace_back(text ? reinterpret_cast<const char*>(text) : "");
    }
    rows.push_back(std::move(row));
  }
  sqlite3_finalize(stmt);
  if (rc != SQLITE_DONE) {
    throw std::runtime_error("query '" + sql + "' failed: " + sqlite3_errmsg(db));
  }
  return rows;
}

}  // namespace

nlohmann::json RunResult::json() const {
  try {
    return nlohmann::json::parse(out);
  } catch (const nlohmann::json::exception& e) {
    throw std::runtime_error("stdout is not one JSON document (" + std::string(e.what()) + ")\n" +
                             describe());
  }
}

std::string RunResult::describe() const {
  std::string text = "curvewarden";
  for (const auto& a : args) text += " '" + a + "'";
  text += "\nexit code: " + std::to_string(exit_code) + "\n--- stdout ---\n" + out +
          "--- stderr ---\n" + err;
  return text;
}

std::filesystem::path binary_path() {
  return CW_BINARY;
}

RunResult run_process(const std::filesystem::path& binary, const std::vector<std::string>& args,
                      const std::map<std::string, std::string>& env,
                      const std::filesystem::path& cwd, const std::filesystem::path& stdin_path,
                      const std::optional<std::string>& fd3) {
  int out_pipe[2], err_pipe[2];
  if (pipe2(out_pipe, O_CLOEXEC) != 0) fail_errno("pipe");
  if (pipe2(err_pipe, O_CLOEXEC) != 0) fail_errno("pipe");
  int in3[2] = {-1, -1};
  if (fd3) {
    // A few short lines: they fit in the pipe's buffer, so the pipe is filled and closed now.
    if (pipe2(in3, O_CLOEXEC) != 0) fail_errno("pipe");
    std::size_t done = 0;
    while (done < fd3->size()) {
      const ssize_t n = write(in3[1], fd3->data() + done, fd3->size() - done);
      if (n < 0) fail_errno("write");
      done += static_cast<std::size_t>(n);
    }
    close(in3[1]);
  }

  // Everything the child needs is prepared before fork(): after it, only async-signal-safe
  // calls are allowed.
  std::vector<std::string> argv_text{binary.string()};
  argv_text.insert(argv_text.end(), args.begin(), args.end());
  std::vector<char*> argv;
  for (auto& a : argv_text) argv.push_back(a.data());
  argv.push_back(nullptr);
  std::vector<std::string> env_text;
  for (const auto& [k, v] : env) env_text.push_back(k + "=" + v);
  std::vector<char*> envp;
  for (auto& e : env_text) envp.push_back(e.data());
  envp.push_back(nullptr);
  const std::string dir = cwd.string();
  const std::string input = stdin_path.string();

  const pid_t pid = fork();
  if (pid < 0) fail_errno("fork");
  if (pid == 0) {
    // A session of its own: no controlling terminal, so a command that would ask on the terminal
    // fails at once instead of waiting for a person (the same as in CI).
    setsid();
    dup2(out_pipe[1], STDOUT_FILENO);
    dup2(err_pipe[1], STDERR_FILENO);
    const int null_in = open(input.c_str(), O_RDONLY);
    if (null_in >= 0) dup2(null_in, STDIN_FILENO);
    if (in3[0] >= 0) dup2(in3[0], 3);
    if (chdir(dir.c_str()) != 0) _exit(126);
    execve(argv[0], argv.data(), envp.data());
    _exit(127);
  }
  close(out_pipe[1]);
  close(err_pipe[1]);
  if (in3[0] >= 0) close(in3[0]);

  RunResult result;
  result.args = args;
  const auto started = std::chrono::steady_clock::now();
  drain(out_pipe[0], err_pipe[0], result.out, result.err, pid, started + kRunTimeout,
        result.timed_out);
  int status = 0;
  while (waitpid(pid, &status, 0) < 0) {
    if (errno != EINTR) fail_errno("waitpid");
  }
  result.seconds =
      std::chrono::duration<double>(std::chrono::steady_clock::now() - started).count();
  if (WIFEXITED(status)) {
    result.exit_code = WEXITSTATUS(status);
  } else if (WIFSIGNALED(status)) {
    result.exit_code = 128 + WTERMSIG(status);
  }
  return result;
}

Sandbox::Sandbox() : backend_(test_backend()) {
  const char* tmp = std::getenv("TMPDIR");
  std::string pattern = std::string(tmp && *tmp ? tmp : "/tmp") + "/curvewarden-e2e-XXXXXX";
  if (mkdtemp(pattern.data()) == nullptr) fail_errno("mkdtemp");
  dir_ = pattern;
  if (backend_ == Backend::Sqlite) {
    location_ = db().string();
    return;
  }
  try {
    pg_server_ = pg::server_uri();
    pg_database_ = pg::create_database(pg_server_);
    location_ = pg::with_database(pg_server_, pg_database_);
  } catch (...) {
    std::error_code ec;
    std::filesystem::remove_all(dir_, ec);
    throw;
  }
}

Sandbox::~Sandbox() {
  std::error_code ec;
  std::filesystem::remove_all(dir_, ec);
  if (!pg_database_.empty()) {
    try {
      pg::drop_database(pg_server_, pg_database_);
    } catch (const std::exception&) {
      // The server is gone or refused: the database dies with the throwaway cluster.
    }
  }
}

void Sandbox::copy_from(const Sandbox& source) {
  for (const auto& entry : std::filesystem::directory_iterator(source.dir())) {
    std::filesystem::copy(entry.path(), dir_ / entry.path().filename(),
                          std::filesystem::copy_options::recursive);
  }
  if (backend_ == Backend::Postgresql) {
    pg::drop_database(pg_server_, pg_database_);
    std::string error;
    if (pg::exec(pg_server_, "CREATE DATABASE " + pg_database_ + " TEMPLATE " + source.pg_database_,
                 &error) != 0) {
      throw std::runtime_error("cannot copy database " + source.pg_database_ + ": " + error);
    }
  }
}

std::filesystem::path Sandbox::write_file(const std::string& name,
                                          const std::string& content) const {
  const auto target = dir_ / name;
  std::filesystem::create_directories(target.parent_path());
  std::ofstream out(target, std::ios::binary | std::ios::trunc);
  out << content;
  if (!out) throw std::runtime_error("cannot write " + target.string());
  return target;
}

std::map<std::string, std::string> Sandbox::environment(const EnvOverrides& overrides) const {
  std::map<std::string, std::string> env;
  // Keep what a process needs to run (PATH, HOME, sanitizer options); drop every
  // CURVEWARDEN_* setting of the caller and the caller's TZ.
  for (char** e = environ; e != nullptr && *e != nullptr; ++e) {
    const std::string entry = *e;
    const auto eq = entry.find('=');
    if (eq == std::string::npos) continue;
    const std::string key = entry.substr(0, eq);
    if (key.rfind("CURVEWARDEN_", 0) == 0 || key == "TZ") continue;
    env[key] = entry.substr(eq + 1);
  }
  env["TZ"] = "UTC";
  env["CURVEWARDEN_NOW"] = now;
  env["CURVEWARDEN_USER"] = user;
  env["CURVEWARDEN_DB"] = location_;
  // No store file to put the key next to: name the file SQLite's default would.
  if (backend_ == Backend::Postgresql) env["CURVEWARDEN_KEY"] = key().string();
  for (const auto& [key, value] : overrides) {
    if (value) {
      env[key] = *value;
    } else {
      env.erase(key);
    }
  }
  return env;
}

std::string test_passphrase(const std::string& code) {
  std::string c;
  for (char ch : code) {
    if (ch == ' ') continue;
    c.push_back(ch >= 'A' && ch <= 'Z' ? static_cast<char>(ch - 'A' + 'a') : ch);
  }
  return "passphrase of " + c;
}

std::pair<std::vector<std::string>, std::optional<std::string>> with_test_passphrases(
    const std::vector<std::string>& args, const std::string& user) {
  const auto has = [&](const std::string& a) {
    return std::find(args.begin(), args.end(), a) != args.end();
  };
  if (has("--passphrase-fd") || has("--help") || has("-h")) return {args, std::nullopt};
  const auto value_of = [&](const std::string& option) -> std::optional<std::string> {
    for (std::size_t i = 0; i + 1 < args.size(); ++i) {
      if (args[i] == option) return args[i + 1];
    }
    return std::nullopt;
  };
  // The command's words: what is left once the global options and their values are skipped.
  std::vector<std::string> words;
  for (std::size_t i = 0; i < args.size(); ++i) {
    const std::string& a = args[i];
    if (a == "--db" || a == "--as" || a == "--at") {
      ++i;
    } else if (a == "--json" || a == "--csv" || a == "--follow-symlink") {
      continue;
    } else if (a.rfind("--", 0) != 0) {
      words.push_back(a);
    } else {
      break;  // the command's own options start
    }
  }
  const std::string first = words.empty() ? "" : words[0];
  const std::string second = words.size() > 1 ? words[1] : "";
  const std::string third = words.size() > 2 ? words[2] : "";
  const bool signs =
      first == "init" || (first == "curve" && (second == "review" || second == "retire")) ||
      (first == "lot" && second == "withdraw") || (first == "method" && second == "revise") ||
      (first == "instrument" && second == "service") ||
      (first == "user" && (second == "add" || second == "disable" || second == "enable" ||
                           second == "unlock" || second == "passphrase"));
  if (!signs) return {args, std::nullopt};
  std::string actor = user;
  if (auto as = value_of("--as")) {
    actor = *as;
  } else if (auto admin = value_of("--admin"); admin && first == "init") {
    actor = *admin;
  }
  std::string lines = test_passphrase(actor) + "\n";
  if (first == "user" && (second == "add" || second == "passphrase")) {
    lines += test_passphrase(third.empty() ? actor : third) + "\n";
  }
  std::vector<std::string> out = args;
  out.push_back("--passphrase-fd");
  out.push_back("3");
  return {out, lines};
}

RunResult Sandbox::run(const std::vector<std::string>& args, const EnvOverrides& overrides) const {
  const auto env = environment(overrides);
  const auto user = env.count("CURVEWARDEN_USER") ? env.at("CURVEWARDEN_USER") : std::string();
  auto [full, lines] = with_test_passphrases(args, user);
  RunResult r = run_process(binary_path(), full, env, dir_, "/dev/null", lines);
  r.args = args;
  return r;
}

RunResult Sandbox::add_user(const std::string& code, const std::string& role,
                            const std::string& admin) const {
  return run({"user", "add", code, "--name", "Test user " + code, "--role", role},
             {{"CURVEWARDEN_USER", admin}});
}

RunResult Sandbox::run_with_input(const std::vector<std::string>& args, const std::string& input,
                                  const EnvOverrides& overrides) const {
  const auto file = write_file(".stdin", input);
  const auto env = environment(overrides);
  const auto user = env.count("CURVEWARDEN_USER") ? env.at("CURVEWARDEN_USER") : std::string();
  auto [full, lines] = with_test_passphrases(args, user);
  RunResult r = run_process(binary_path(), full, env, dir_, file, lines);
  r.args = args;
  return r;
}

std::map<std::string, std::int64_t> table_row_counts(const std::filesystem::path& db) {
  Db handle(db);
  std::map<std::string, std::int64_t> counts;
  for (const auto& row :
       query_rows(handle.handle, "SELECT name FROM sqlite_master WHERE type = 'table'")) {
    const std::string& table = row.at(0);
    // Table names come from sqlite_master; quote them as identifiers all the same.
    const auto n = query_rows(handle.handle, "SELECT count(*) FROM \"" + table + "\"");
    counts[table] = std::stoll(n.at(0).at(0));
  }
  return counts;
}

int exec_sql(const std::filesystem::path& db, const std::string& sql, std::string* error) {
  Db handle(db);
  char* message = nullptr;
  const int rc = sqlite3_exec(handle.handle, sql.c_str(), nullptr, nullptr, &message);
  if (error) *error = message ? message : "";
  sqlite3_free(message);
  return rc;
}

std::string query_text(const std::filesystem::path& db, const std::string& sql) {
  Db handle(db);
  const auto rows = query_rows(handle.handle, sql);
  if (rows.size() != 1 || rows.front().size() != 1) {
    throw std::runtime_error("query '" + sql + "' did not return exactly one value");
  }
  return rows.front().front();
}

std::map<std::string, std::int64_t> table_row_counts(const Sandbox& box) {
  if (box.backend() == Backend::Sqlite) return table_row_counts(box.db());
  std::map<std::string, std::int64_t> counts;
  for (const auto& row :
       pg::query(box.location(),
                 "SELECT quote_ident(schemaname) || '.' || quote_ident(tablename), "
                 "tablename FROM pg_catalog.pg_tables WHERE schemaname NOT IN "
                 "('pg_catalog', 'information_schema')")) {
    const auto n = pg::query(box.location(), "SELECT count(*) FROM " + row.at(0).value());
    counts[row.at(1).value()] = std::stoll(n.at(0).at(0).value());
  }
  return counts;
}

int exec_sql(const Sandbox& box, const std::string& sql, std::string* error) {
  if (box.backend() == Backend::Sqlite) return exec_sql(box.db(), sql, error);
  return pg::exec(box.location(), sql, error);
}

int latest_schema_version(const Sandbox& box) {
  return box.backend() == Backend::Sqlite ? 10 : 5;
}

std::string text_join(const Sandbox& box) {
  return box.backend() == Backend::Sqlite ? "group_concat" : "string_agg";
}

std::string query_text(const Sandbox& box, const std::string& sql) {
  if (box.backend() == Backend::Sqlite) return query_text(box.db(), sql);
  const auto rows = pg::query(box.location(), sql);
  if (rows.size() != 1 || rows.front().size() != 1) {
    throw std::runtime_error("query '" + sql + "' did not return exactly one value");
  }
  return rows.front().front().value_or("");
}

std::string read_file(const std::filesystem::path& path) {
  std::ifstream in(path, std::ios::binary);
  if (!in) return {};
  std::ostringstream buffer;
  buffer << in.rdbuf();
  return buffer.str();
}

std::string method_toml(const std::string& code, const std::string& min_r2) {
  return "code = \"" + code +
         "\"\n"
         "title = \"Nitrate and sulfate in drinking water by ion chromatography\"\n"
         "unit = \"mg/L\"\n"
         "analytes = [\"nitrate\", \"sulfate\"]\n"
         "\n"
         "[calibration]\n"
         "model = \"linear\"\n"
         "weighting = \"1/x\"\n"
         "min_levels = 5\n"
         "min_r2 = " +
         min_r2 +
         "\n"
         "max_error_pct = 15.0\n"
         "max_error_pct_lowest = 20.0\n"
         "min_levels_within = 0.75\n"
         "valid_for = \"7 days\"\n"
         "review_required = true\n"
         "\n"
         "[check]\n"
         "tolerance_pct = 10.0\n"
         "samples_per_check = 10\n"
         "check_every = \"12 hours\"\n"
         "trend_rules = [\"1-3s\", \"2-2s\", \"R-4s\"]\n";
}

}  // namespace cw::test
