// SPDX-License-Identifier: Apache-2.0
// A 100 000-row run imports in one command and one transaction with a small, constant memory
// footprint: the file is streamed, rows are decided and written one at a time, and nothing
// holds them all. Peak memory is the child's maximum resident set size from getrusage after it
// has exited, measured in a child of the test that runs only the import. (How long it takes is
// measured by the benchmarks, not here.)
#include <sys/resource.h>
#include <sys/wait.h>
#include <unistd.h>

#include <catch2/catch.hpp>

#include "run_support.h"

using namespace cw::scenario;

TEST_CASE("run import: 100 000 rows in one transaction with a small memory footprint",
          "[scenario][run][large]") {
  RunLab rl;
  // A check standard and ten samples, over and over; a closing check at the end.
  std::string csv = kRunHeader;
  csv.reserve(4u << 20);
  long position = 0;
  long samples = 0, checks = 0;
  const auto add = [&](bool check) {
    ++position;
    if (check) {
      csv += row(position, "check", "CCV", "nitrate", kNitratePass, "6");
      ++checks;
    } else {
      csv += row(position, "sample", "W" + std::to_string(position), "nitrate", kNitrateLow);
      ++samples;
    }
  };
  while (position < 99999) add(position % 11 == 0 || position == 99990);
  add(true);
  REQUIRE(position == 100000);
  const auto before = rl.lab.counts();

  // The import runs from a child of this test, so that the peak resident set measured is the
  // import's alone (the set-up runs hash passphrases with Argon2id, 64 MiB each).
  int pipe_fds[2];
  REQUIRE(pipe(pipe_fds) == 0);
  const pid_t child = fork();
  REQUIRE(child >= 0);
  if (child == 0) {
    const RunResult run = rl.import("large.csv", csv);
    rl.lab.box.write_file("import.json", run.out);
    rusage own{};
    getrusage(RUSAGE_CHILDREN, &own);
    const long report[3] = {run.exit_code, own.ru_maxrss, static_cast<long>(run.err.size())};
    const ssize_t ignored = write(pipe_fds[1], report, sizeof report);
    (void)ignored;
    _exit(0);
  }
  close(pipe_fds[1]);
  long report[3] = {-1, 0, 0};
  REQUIRE(read(pipe_fds[0], report, sizeof report) == static_cast<ssize_t>(sizeof report));
  close(pipe_fds[0]);
  int status = 0;
  waitpid(child, &status, 0);
  REQUIRE(report[0] == 0);
  CHECK(report[2] == 0);            // stderr is a pipe here, not a terminal: no progress line
  const long peak_kib = report[1];  // Linux: kibibytes
  INFO("peak resident set of the import: " << peak_kib << " KiB");
  CHECK(peak_kib < 64 * 1024);

  const auto after = rl.lab.counts();
  CHECK(after.at("runs") - before.at("runs") == 1);
  CHECK(after.at("results") - before.at("results") == samples);
  CHECK(after.at("run_results") - before.at("run_results") == samples);
  CHECK(after.at("checks") - before.at("checks") == checks);
  CHECK(after.at("run_checks") - before.at("run_checks") == checks);
  CHECK(after.at("result_status_events") == before.at("result_status_events"));
  // One entry for the run and one per row, all chained.
  CHECK(after.at("audit_log") - before.at("audit_log") == 1 + samples + checks);
  const Json run = Json::parse(cw::test::read_file(rl.lab.box.path("import.json")));
  CHECK(run.at("rows") == 100000);
  CHECK(run.at("summary").at("nitrate").at("reported") == samples);
  CHECK(run.at("summary").at("nitrate").at("checks_passed") == checks);
}
