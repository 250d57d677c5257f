// SPDX-License-Identifier: Apache-2.0
// File hygiene: a new store and its -wal and -shm files are private (0600), or shared with one
// group (0660) with init --group; a store path that is a symbolic link is refused unless
// --follow-symlink; a store this user cannot write is read without leaving side files behind and
// refuses writes with one clear error. All of it is about the store file: [sqlite-only].
#include <grp.h>
#include <sys/stat.h>
#include <unistd.h>

#include <catch2/catch.hpp>
#include <filesystem>
#include <fstream>
#include <string>
#include <vector>

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

TEST_CASE("e2e files: an empty file made beforehand becomes private, or is refused if not ours",
          "[e2e][sqlite-only]") {
  Sandbox box;
  { std::ofstream(box.db()).flush(); }
  fs::permissions(box.db(), fs::perms::all & ~(fs::perms::owner_exec | fs::perms::group_exec |
                                               fs::perms::others_exec));  // 0666
  const RunResult r = box.run({"init", "--tz", "UTC"});
  INFO(r.describe());
  REQUIRE(r.exit_code == 0);
  CHECK(mode_of(box.db()) == (fs::perms::owner_read | fs::perms::owner_write));
  if (::geteuid() != 0) return;  // giving a file to another account needs root
  Sandbox other;
  { std::ofstream(other.db()).flush(); }
  fs::permissions(other.db(), fs::perms::all & ~(fs::perms::owner_exec | fs::perms::group_exec |
                                                 fs::perms::others_exec));
  REQUIRE(::chown(other.db().c_str(), 65534, 65534) == 0);
  const RunResult refused = other.run({"init", "--tz", "UTC"});
  INFO(refused.describe());
  CHECK(refused.exit_code == 4);
  CHECK_THAT(refused.err, Catch::Contains("is an empty file of another account (uid 65534)"));
  CHECK(fs::file_size(other.db()) == 0);  // nothing written
  const RunResult copy =
      other.run({"store", "copy", "--from", box.db().string(), "--to", other.db().string()});
  CHECK(copy.exit_code == 4);
  CHECK(fs::file_size(other.db()) == 0);
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

namespace {

/// Runs the binary as a user who does not own the sandbox's store: as root (whom file modes do
/// not stop) through `runuser -u nobody` with a copy of the binary the other user can execute;
/// otherwise as this user, whom the modes set by the caller do stop.
RunResult run_as_other_user(const Sandbox& box, const std::vector<std::string>& args) {
  if (::geteuid() != 0) return box.run(args);
  const fs::path binary = box.path("curvewarden-copy");
  if (!fs::exists(binary)) {
    fs::copy_file(cw::test::binary_path(), binary);
    fs::permissions(binary, fs::perms::owner_all | fs::perms::group_read | fs::perms::group_exec |
                                fs::perms::others_read | fs::perms::others_exec);
  }
  fs::path runuser;
  for (const char* p : {"/usr/sbin/runuser", "/sbin/runuser", "/usr/bin/runuser"}) {
    if (fs::exists(p)) runuser = p;
  }
  REQUIRE_FALSE(runuser.empty());  // util-linux, essential on Debian
  std::vector<std::string> full = {"-u", "nobody", "--", binary.string()};
  full.insert(full.end(), args.begin(), args.end());
  RunResult r = cw::test::run_process(runuser, full, box.environment(), box.dir());
  r.args = args;
  return r;
}

void expect_read_only_store_behaves(const Sandbox& box, const std::string& before) {
  // Reading works and leaves no side file behind.
  RunResult r = run_as_other_user(box, {"status"});
  INFO(r.describe());
  CHECK(r.exit_code == 0);
  CHECK_THAT(r.out, Catch::Contains("IC-01"));
  r = run_as_other_user(box, {"audit", "verify"});
  INFO(r.describe());
  CHECK(r.exit_code == 0);
  // A write is one clear refusal (exit 4) naming the cause; nothing is written.
  r = run_as_other_user(box, {"instrument", "add", "IC-02", "--name", "Second"});
  INFO(r.describe());
  CHECK(r.exit_code == 4);
  CHECK_THAT(r.err, Catch::Contains("is read-only for this user: nothing was written"));
  CHECK_THAT(r.err, !Catch::Contains("SQLite code"));
  CHECK_FALSE(fs::exists(box.db().string() + "-wal"));
  CHECK_FALSE(fs::exists(box.db().string() + "-shm"));
  CHECK(cw::test::read_file(box.db()) == before);
}

}  // namespace

TEST_CASE("e2e files: a store this user cannot write is read, refuses writes, leaves no files",
          "[e2e][sqlite-only]") {
  Sandbox box;
  REQUIRE(box.run({"init", "--tz", "UTC"}).exit_code == 0);
  REQUIRE(box.run({"instrument", "add", "IC-01", "--name", "First"}).exit_code == 0);
  // The owner's last command has checkpointed and removed the -wal and -shm files.
  REQUIRE_FALSE(fs::exists(box.db().string() + "-wal"));
  const std::string before = cw::test::read_file(box.db());
  const auto read_all = fs::perms::owner_read | fs::perms::group_read | fs::perms::others_read;
  const auto folder_open = fs::perms::owner_all | fs::perms::group_read | fs::perms::group_exec |
                           fs::perms::others_read | fs::perms::others_exec;

  SECTION("the file is read-only, its folder writable") {
    fs::permissions(box.db(), read_all);
    fs::permissions(box.dir(), folder_open | fs::perms::group_write | fs::perms::others_write);
    expect_read_only_store_behaves(box, before);
  }
  SECTION("the file and its folder are read-only") {
    fs::permissions(box.db(), read_all);
    fs::permissions(box.dir(), folder_open & ~fs::perms::owner_write);
    expect_read_only_store_behaves(box, before);
  }
  fs::permissions(box.dir(), fs::perms::owner_all);
  fs::permissions(box.db(), fs::perms::owner_read | fs::perms::owner_write);
  // The owner still writes it as before.
  const RunResult r = box.run({"instrument", "add", "IC-03", "--name", "Third"});
  INFO(r.describe());
  CHECK(r.exit_code == 0);
  CHECK(box.run({"audit", "verify"}).exit_code == 0);
}
