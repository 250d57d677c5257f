// SPDX-License-Identifier: Apache-2.0
// A 100 000-row run imports in one command and one transaction with a small, constant memory
// footprint: the file is streamed, rows are decided and written one at a time, and nothing
// holds them all. Peak memory is the child's maximum resident set size from getrusage after it
// has exited. (How long it takes is measured by the benchmarks, not here.)
#include <sys/resource.h>

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

  const RunResult r = rl.import("large.csv", csv);
  INFO(r.err);
  REQUIRE(r.exit_code == 0);
  CHECK(r.err.empty());  // stderr is a pipe here, not a terminal: no progress line
  rusage usage{};
  REQUIRE(getrusage(RUSAGE_CHILDREN, &usage) == 0);
  const long peak_kib = usage.ru_maxrss;  // Linux: kibibytes
  INFO("peak resident set of the import (and the set-up runs): " << peak_kib << " KiB");
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
  const Json run = r.json();
  CHECK(run.at("rows") == 100000);
  CHECK(run.at("summary").at("nitrate").at("reported") == samples);
  CHECK(run.at("summary").at("nitrate").at("checks_passed") == checks);
}
