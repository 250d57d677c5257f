// SPDX-License-Identifier: Apache-2.0
// Crash safety: a `curve log` of a large calibration and a `run import` of a long run are killed
// with SIGKILL at seeded random moments, 25 times each. After every kill the store passes
// SQLite's integrity check and `audit verify`, and the calibration or run is there whole or not
// at all. A power cut is simulated too: the store file and its -wal are copied while a write is
// under way (what a disk holds when the power goes), and the copy is opened and checked the same
// way. It is about the SQLite file and its WAL: [sqlite-only].
#include <fcntl.h>
#include <signal.h>
#include <sys/wait.h>
#include <unistd.h>

#include <algorithm>
#include <catch2/catch.hpp>
#include <chrono>
#include <filesystem>
#include <random>
#include <thread>

#include "run_support.h"

using namespace cw::scenario;

namespace {

constexpr int kTrials = 25;
constexpr std::uint32_t kSeed = 20261202;

/// A copy of the store at `db` with everything in it (the write-ahead log checkpointed first).
void copy_store(const std::filesystem::path& db, const std::filesystem::path& to) {
  REQUIRE(cw::test::exec_sql(db, "PRAGMA wal_checkpoint(TRUNCATE)") == 0);
  std::filesystem::copy_file(db, to);
}

/// Starts the binary with `args` in `dir` and exactly `env`; output is discarded.
pid_t spawn(const std::vector<std::string>& args, const std::map<std::string, std::string>& env,
            const std::filesystem::path& dir) {
  std::vector<std::string> argv_text{cw::test::binary_path().string()};
  argv_text.insert(argv_text.end(), args.begin(), args.end());
  std::vector<char*> argv;
  for (auto& a : argv_text) argv.push_back(a.data());
  argv.push_back(nullptr);
  std::vector<std::string> env_text;
  for (const auto& [k, v] : env) env_text.push_back(k + "=" + v);
  std::vector<char*> envp;
  for (auto& e : env_text) envp.push_back(e.data());
  envp.push_back(nullptr);
  const std::string where = dir.string();
  const pid_t pid = fork();
  REQUIRE(pid >= 0);
  if (pid == 0) {
    setsid();
    const int null = ::open("/dev/null", O_RDWR);
    dup2(null, STDIN_FILENO);
    dup2(null, STDOUT_FILENO);
    dup2(null, STDERR_FILENO);
    if (chdir(where.c_str()) != 0) _exit(126);
    execve(argv[0], argv.data(), envp.data());
    _exit(127);
  }
  return pid;
}

/// Waits for `pid`; its exit code, or 128 + the signal that ended it.
int reap(pid_t pid) {
  int status = 0;
  while (waitpid(pid, &status, 0) < 0) {
    if (errno != EINTR) return -1;
  }
  return WIFEXITED(status) ? WEXITSTATUS(status) : 128 + WTERMSIG(status);
}

/// How long `args` takes when nothing interrupts it (on a copy of the store).
double clean_seconds(const Lab& lab, const std::filesystem::path& base,
                     const std::vector<std::string>& args, const std::string& at) {
  // The fastest of three uninterrupted runs: a run timed while the machine is busier than
  // during the trials would put most kill moments after the command has finished.
  double fastest = 0;
  for (int run = 0; run < 3; ++run) {
    const auto db = lab.box.path("timing-" + std::to_string(run) + ".db");
    std::filesystem::copy_file(base, db);
    const auto start = std::chrono::steady_clock::now();
    const int code = reap(
        spawn(args, lab.box.environment({{"CURVEWARDEN_DB", db.string()}, {"CURVEWARDEN_NOW", at}}),
              lab.box.dir()));
    const double s =
        std::chrono::duration<double>(std::chrono::steady_clock::now() - start).count();
    REQUIRE(code == 0);
    fastest = run == 0 ? s : std::min(fastest, s);
  }
  return fastest;
}

/// The store at `db` is sound: integrity check, audit verify (the tool's own, on that file).
void require_sound(const Lab& lab, const std::filesystem::path& db) {
  CHECK(cw::test::query_text(db, "PRAGMA integrity_check") == "ok");
  const RunResult v = lab.box.run({"--db", db.string(), "audit", "verify"});
  INFO(v.describe());
  CHECK(v.exit_code == 0);
}

/// Kills `args` at seeded random moments on fresh copies of `base`; `whole_or_absent` checks
/// each store afterwards. Every fourth trial also copies the store and its WAL mid-write.
template <class Check>
void kill_trials(const Lab& lab, const std::filesystem::path& base, const std::string& at,
                 const std::vector<std::string>& args, Check whole_or_absent) {
  const double clean = clean_seconds(lab, base, args, at);
  INFO("uninterrupted: " << clean << " s");
  std::mt19937 random(kSeed);
  std::uniform_real_distribution<double> when(0.0, clean * 1.1);
  int killed = 0, finished = 0;
  for (int trial = 0; trial < kTrials; ++trial) {
    INFO("trial " << trial);
    const auto db = lab.box.path("trial-" + std::to_string(trial) + ".db");
    std::filesystem::copy_file(base, db);
    const pid_t pid =
        spawn(args, lab.box.environment({{"CURVEWARDEN_DB", db.string()}, {"CURVEWARDEN_NOW", at}}),
              lab.box.dir());
    const double delay = when(random);
    std::this_thread::sleep_for(std::chrono::duration<double>(delay));
    const auto cut = lab.box.path("cut-" + std::to_string(trial) + ".db");
    if (trial % 4 == 0) {
      // The power cut: what is on disk now, the store and its write-ahead log, without the
      // shared-memory index (it does not survive a reboot).
      std::error_code ec;
      std::filesystem::copy_file(db, cut, ec);
      std::filesystem::copy_file(db.string() + "-wal", cut.string() + "-wal", ec);
    }
    kill(pid, SIGKILL);
    const int code = reap(pid);
    (code == 128 + SIGKILL ? killed : finished) += 1;
    require_sound(lab, db);
    whole_or_absent(db);
    if (std::filesystem::exists(cut)) {
      require_sound(lab, cut);
      whole_or_absent(cut);
    }
    std::filesystem::remove(db);
    std::filesystem::remove(db.string() + "-wal");
    std::filesystem::remove(db.string() + "-shm");
  }
  INFO("killed " << killed << ", finished first " << finished);
  CHECK(killed >= kTrials / 2);  // most kills land while the command runs
}

}  // namespace

TEST_CASE("crash: curve log killed at random moments leaves the calibration whole or absent",
          "[scenario][crash][sqlite-only]") {
  Lab lab;
  lab.add_instrument("IC-01");
  lab.add_lot("CRM-A", "2026-12-31");
  lab.add_method(MethodSpec{});
  // A large calibration: 2 analytes x 5 levels x 400 replicates.
  std::string csv = "analyte,level,nominal,response,replicate\n";
  long points = 0;
  for (const std::string analyte : {"nitrate", "sulfate"}) {
    for (int level = 1; level <= 5; ++level) {
      for (int rep = 1; rep <= 400; ++rep) {
        const double x = level * 2.0;
        const double y = 0.1 * x * (1 + 0.001 * ((rep % 7) - 3));
        csv += analyte + ",L" + std::to_string(level) + "," + std::to_string(x) + "," +
               std::to_string(y) + "," + std::to_string(rep) + "\n";
        ++points;
      }
    }
  }
  lab.box.write_file("big.csv", csv);
  const auto base = lab.box.path("base.db");
  copy_store(lab.box.db(), base);
  kill_trials(lab, base, "2026-03-02T09:00:00Z",
              {"--at", "2026-03-02T09:00:00Z", "curve", "log", "--method", "ANION-IC",
               "--instrument", "IC-01", "--lot", "CRM-A", "--points", "big.csv"},
              [&](const std::filesystem::path& db) {
                const std::string calibrations =
                    cw::test::query_text(db, "SELECT count(*) FROM calibrations");
                const std::string stored =
                    cw::test::query_text(db, "SELECT count(*) FROM curve_points");
                CHECK((calibrations == "0" || calibrations == "1"));
                CHECK(stored == (calibrations == "1" ? std::to_string(points) : "0"));
                CHECK(cw::test::query_text(db, "SELECT count(*) FROM curves") ==
                      (calibrations == "1" ? "2" : "0"));
              });
}

TEST_CASE("crash: run import killed at random moments leaves the run whole or absent",
          "[scenario][crash][sqlite-only]") {
  RunLab rl;
  std::string csv = kRunHeader;
  long rows = 0;
  for (long position = 1; position <= 3000; ++position) {
    csv += position % 11 == 1
               ? row(position, "check", "CCV", "nitrate", kNitratePass, "6")
               : row(position, "sample", "W" + std::to_string(position), "nitrate", kNitrateLow);
    ++rows;
  }
  csv += row(3001, "check", "CCV", "nitrate", kNitratePass, "6");
  ++rows;
  rl.lab.box.write_file("long.csv", csv);
  const auto base = rl.lab.box.path("base.db");
  copy_store(rl.lab.box.db(), base);
  const std::string results_before = cw::test::query_text(base, "SELECT count(*) FROM results");
  const std::string checks_before = cw::test::query_text(base, "SELECT count(*) FROM checks");
  kill_trials(rl.lab, base, kRunAt,
              {"--at", kRunAt, "run", "import", "long.csv", "--method", "ANION-IC", "--instrument",
               "IC-01"},
              [&](const std::filesystem::path& db) {
                const std::string runs = cw::test::query_text(db, "SELECT count(*) FROM runs");
                CHECK((runs == "0" || runs == "1"));
                const long added =
                    std::stol(cw::test::query_text(db, "SELECT count(*) FROM results")) -
                    std::stol(results_before) +
                    std::stol(cw::test::query_text(db, "SELECT count(*) FROM checks")) -
                    std::stol(checks_before);
                CHECK(added == (runs == "1" ? rows : 0));
              });
}
