// SPDX-License-Identifier: Apache-2.0
// backup FILE: a consistent copy made while others write, verified before success; the copy is
// private (0600) and never replaces a file.
#include <catch2/catch.hpp>
#include <filesystem>
#include <string>
#include <thread>
#include <vector>

#include "harness.h"

namespace {

using cw::test::query_text;
using cw::test::RunResult;
using cw::test::Sandbox;

}  // namespace

TEST_CASE("e2e backup: a verified, private copy, taken while another process writes",
          "[e2e][sqlite-only]") {
  Sandbox box;
  REQUIRE(box.run({"init", "--tz", "UTC"}).exit_code == 0);
  // A writer registers instruments while two backups are taken.
  std::vector<int> codes;
  std::thread writer([&] {
    for (int i = 0; i < 12; ++i)
      codes.push_back(box.run({"instrument", "add", "W-" + std::to_string(i)}).exit_code);
  });
  const RunResult first = box.run({"backup", "copy1.db", "--json"});
  const RunResult second = box.run({"backup", "copy2.db"});
  writer.join();
  INFO(first.describe());
  REQUIRE(first.exit_code == 0);
  REQUIRE(second.exit_code == 0);
  for (int c : codes) CHECK(c == 0);
  CHECK(first.json().at("ok") == true);
  CHECK_THAT(second.out, Catch::Contains("and verified the copy"));
  // Each copy holds whole transactions only: every instrument with its entry, the chain intact.
  for (const char* copy : {"copy1.db", "copy2.db"}) {
    const auto path = box.path(copy);
    CHECK((std::filesystem::status(path).permissions() & std::filesystem::perms::all) ==
          (std::filesystem::perms::owner_read | std::filesystem::perms::owner_write));
    CHECK(query_text(path, "SELECT count(*) FROM instruments") ==
          query_text(path, "SELECT count(*) FROM audit_log WHERE action = 'instrument.add'"));
    const RunResult v = box.run({"--db", copy, "audit", "verify"});
    INFO(v.describe());
    CHECK(v.exit_code == 0);
  }
  // The store itself is unchanged by a backup and still verifies with every write.
  CHECK(query_text(box.db(), "SELECT count(*) FROM instruments") == "12");
  CHECK(box.run({"audit", "verify"}).exit_code == 0);
}

TEST_CASE("e2e backup: an existing file is never replaced", "[e2e][sqlite-only]") {
  Sandbox box;
  REQUIRE(box.run({"init", "--tz", "UTC"}).exit_code == 0);
  box.write_file("taken.db", "precious");
  const RunResult r = box.run({"backup", "taken.db"});
  CHECK(r.exit_code == 2);
  CHECK_THAT(r.err, Catch::Contains("a backup never replaces a file"));
  CHECK(cw::test::read_file(box.path("taken.db")) == "precious");
  const RunResult no_folder = box.run({"backup", "no/such/folder/copy.db"});
  CHECK(no_folder.exit_code == 2);
  CHECK_FALSE(std::filesystem::exists(box.path("no")));
}
