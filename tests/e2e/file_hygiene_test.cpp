// SPDX-License-Identifier: Apache-2.0
// File hygiene: a new store and its -wal and -shm files are private (0600), or shared with one
// group (0660) with init --group; a store path that is a symbolic link is refused unless
// --follow-symlink. All of it is about the store file: [sqlite-only].
#include <grp.h>
#include <sys/stat.h>
#include <unistd.h>

#include <catch2/catch.hpp>
#include <filesystem>

#include "harness.h"

namespace {

using cw::test::RunResult;
using cw::test::Sandbox;
namespace fs = std::filesystem;

fs::perms mode_of(const fs::path& p) {
  return fs::status(p).permissions() & fs::perms::all;
}

}  // namespace

TEST_CASE("e2e files: a new store, its -wal and -shm are readable by the owner only",
          "[e2e][sqlite-only]") {
  Sandbox box;
  ::umask(022);  // a usual umask: it would leave new files world-readable
  REQUIRE(box.run({"init", "--tz", "UTC"}).exit_code == 0);
  REQUIRE(box.run({"instrument", "add", "IC-01"}).exit_code == 0);
  const auto owner = fs::perms::owner_read | fs::perms::owner_write;
  CHECK(mode_of(box.db()) == owner);
  for (const char* side : {"-wal", "-shm"}) {
    const fs::path p = box.db().string() + side;
    if (fs::exists(p)) CHECK(mode_of(p) == owner);
  }
}

TEST_CASE("e2e files: init --group shares the store with one group (0660)", "[e2e][sqlite-only]") {
  Sandbox box;
  const ::group* g = ::getgrgid(::getegid());
  REQUIRE(g != nullptr);
  const RunResult r = box.run({"init", "--tz", "UTC", "--group", g->gr_name});
  INFO(r.describe());
  REQUIRE(r.exit_code == 0);
  CHECK(mode_of(box.db()) == (fs::perms::owner_read | fs::perms::owner_write |
                              fs::perms::group_read | fs::perms::group_write));
  // An unknown group is bad input naming the option; nothing is created.
  Sandbox other;
  const RunResult bad = other.run({"init", "--group", "no-such-group-here"});
  CHECK(bad.exit_code == 2);
  CHECK_THAT(bad.err, Catch::Contains("--group 'no-such-group-here' is not a group"));
  CHECK_FALSE(fs::exists(other.db()));
}

TEST_CASE("e2e files: a store path that is a symbolic link is refused unless --follow-symlink",
          "[e2e][sqlite-only]") {
  Sandbox box;
  REQUIRE(box.run({"init", "--tz", "UTC"}).exit_code == 0);
  fs::create_symlink(box.db(), box.path("link.db"));
  const RunResult refused = box.run({"--db", "link.db", "instrument", "add", "IC-01"});
  CHECK(refused.exit_code == 2);
  CHECK_THAT(refused.err, Catch::Contains("'link.db' is a symbolic link"));
  CHECK(cw::test::query_text(box.db(), "SELECT count(*) FROM instruments") == "0");
  const RunResult followed =
      box.run({"--db", "link.db", "--follow-symlink", "instrument", "add", "IC-01"});
  INFO(followed.describe());
  CHECK(followed.exit_code == 0);
  CHECK(cw::test::query_text(box.db(), "SELECT count(*) FROM instruments") == "1");
}

TEST_CASE("e2e files: an init that fails on a new store leaves no file behind",
          "[e2e][sqlite-only]") {
  Sandbox box;
  // A passphrase too short for the first admin: refused before anything is kept.
  RunResult r = box.run_with_input({"init", "--tz", "UTC", "--passphrase-fd", "0"}, "short\n");
  INFO(r.describe());
  CHECK(r.exit_code == 2);
  CHECK_FALSE(fs::exists(box.db()));
  CHECK_FALSE(fs::exists(box.db().string() + "-wal"));
  CHECK_FALSE(fs::exists(box.db().string() + "-shm"));
  CHECK_FALSE(fs::exists(box.db().string() + ".key"));
  // No passphrase at all (no terminal, no descriptor): the same.
  r = box.run_with_input({"init", "--tz", "UTC", "--passphrase-fd", "0"}, "");
  INFO(r.describe());
  CHECK(r.exit_code == 2);
  CHECK_FALSE(fs::exists(box.db()));
  // Then a good one creates the store.
  r = box.run({"init", "--tz", "UTC"});
  INFO(r.describe());
  CHECK(r.exit_code == 0);
  CHECK(fs::exists(box.db()));
}
