// SPDX-License-Identifier: Apache-2.0
// Several writers on one store (product.md §10): concurrent commands wait for each other and
// never lose a write; a writer kept out past the busy timeout gets exit 4 and writes nothing.
// The lock is held with SQLite's own BEGIN IMMEDIATE on the file in the two tests tagged
// [sqlite-only]; the others run on either backend.
#include <sqlite3.h>

#include <catch2/catch.hpp>
#include <chrono>
#include <filesystem>
#include <mutex>
#include <string>
#include <thread>
#include <vector>

#include "harness.h"

namespace {

using cw::test::RunResult;
using cw::test::Sandbox;

}  // namespace

TEST_CASE("e2e concurrency: two writers at once lose no write and keep the chain intact", "[e2e]") {
  Sandbox box;
  REQUIRE(box.run({"init", "--tz", "UTC"}).exit_code == 0);
  constexpr int kPerWriter = 12;
  std::vector<int> failures(2, 0);
  auto writer = [&](int who) {
    for (int i = 0; i < kPerWriter; ++i) {
      const std::string code = "LOT-" + std::to_string(who) + "-" + std::to_string(i);
      const RunResult r = box.run({"lot", "add", code, "--material", "m", "--expires", "2027-01-01",
                                   "--value", "nitrate=1000"});
      if (r.exit_code != 0) ++failures[who];
    }
  };
  std::thread a(writer, 0), b(writer, 1);
  a.join();
  b.join();
  CHECK(failures[0] == 0);
  CHECK(failures[1] == 0);
  CHECK(cw::test::query_text(box, "SELECT count(*) FROM lots") == std::to_string(2 * kPerWriter));
  // One entry for init, one per lot, with no gap in the sequence.
  CHECK(cw::test::query_text(box, "SELECT count(*) FROM audit_log") ==
        std::to_string(1 + 2 * kPerWriter));
  CHECK(cw::test::query_text(box, "SELECT max(seq) FROM audit_log") ==
        std::to_string(1 + 2 * kPerWriter));
  const RunResult verify = box.run({"audit", "verify", "--json"});
  CHECK(verify.exit_code == 0);
  CHECK(verify.json()["ok"] == true);
}

TEST_CASE("e2e concurrency: a writer locked out past the busy timeout exits 4 and writes nothing",
          "[e2e][sqlite-only]") {
  Sandbox box;
  REQUIRE(box.run({"init", "--tz", "UTC"}).exit_code == 0);
  const auto before = cw::test::table_row_counts(box.db());
  sqlite3* holder = nullptr;
  REQUIRE(sqlite3_open(box.db().c_str(), &holder) == SQLITE_OK);
  REQUIRE(sqlite3_exec(holder, "BEGIN IMMEDIATE", nullptr, nullptr, nullptr) == SQLITE_OK);
  const auto start = std::chrono::steady_clock::now();
  const RunResult r = box.run({"instrument", "add", "IC-01", "--json"});
  const auto waited = std::chrono::steady_clock::now() - start;
  sqlite3_exec(holder, "ROLLBACK", nullptr, nullptr, nullptr);
  sqlite3_close(holder);
  INFO(r.describe());
  CHECK(r.exit_code == 4);
  CHECK(r.json()["error"]["code"] == "store");
  CHECK_THAT(r.err, Catch::Contains("locked by another writer"));
  // It waited for the busy timeout (5 s) instead of giving up at once.
  CHECK(waited >= std::chrono::seconds(4));
  CHECK(cw::test::table_row_counts(box.db()) == before);
}

TEST_CASE("e2e concurrency: a writer waits for a short lock and then succeeds",
          "[e2e][sqlite-only]") {
  Sandbox box;
  REQUIRE(box.run({"init", "--tz", "UTC"}).exit_code == 0);
  sqlite3* holder = nullptr;
  REQUIRE(sqlite3_open(box.db().c_str(), &holder) == SQLITE_OK);
  REQUIRE(sqlite3_exec(holder, "BEGIN IMMEDIATE", nullptr, nullptr, nullptr) == SQLITE_OK);
  std::thread release([holder] {
    std::this_thread::sleep_for(std::chrono::milliseconds(800));
    sqlite3_exec(holder, "COMMIT", nullptr, nullptr, nullptr);
  });
  const RunResult r = box.run({"instrument", "add", "IC-01"});
  release.join();
  sqlite3_close(holder);
  INFO(r.describe());
  CHECK(r.exit_code == 0);
  CHECK(cw::test::query_text(box, "SELECT count(*) FROM instruments") == "1");
}

TEST_CASE("e2e concurrency: 8 writers and 2 readers for a bounded time lose nothing", "[e2e]") {
  Sandbox box;
  REQUIRE(box.run({"init", "--tz", "UTC"}).exit_code == 0);
  const auto deadline = std::chrono::steady_clock::now() + std::chrono::seconds(8);
  std::mutex m;
  std::vector<std::string> acknowledged;
  std::vector<std::string> writer_errors, reader_errors;
  auto writer = [&](int who) {
    for (int i = 0; std::chrono::steady_clock::now() < deadline; ++i) {
      const std::string code = "W" + std::to_string(who) + "-" + std::to_string(i);
      const RunResult r = box.run({"lot", "add", code, "--material", "m", "--expires", "2027-01-01",
                                   "--value", "nitrate=1000"});
      std::lock_guard<std::mutex> lock(m);
      if (r.exit_code == 0) {
        acknowledged.push_back(code);
      } else {
        writer_errors.push_back(r.describe());
      }
    }
  };
  auto reader = [&](int who) {
    while (std::chrono::steady_clock::now() < deadline) {
      const RunResult r = box.run(who == 0 ? std::vector<std::string>{"lot", "list", "--json"}
                                           : std::vector<std::string>{"audit", "log", "--json"});
      if (r.exit_code != 0) {
        std::lock_guard<std::mutex> lock(m);
        reader_errors.push_back(r.describe());
      }
    }
  };
  std::vector<std::thread> threads;
  for (int w = 0; w < 8; ++w) threads.emplace_back(writer, w);
  for (int r = 0; r < 2; ++r) threads.emplace_back(reader, r);
  for (auto& t : threads) t.join();

  // No "locked" error reached anyone within the busy timeout; every reader read.
  for (const auto& e : writer_errors) FAIL_CHECK(e);
  for (const auto& e : reader_errors) FAIL_CHECK(e);
  INFO(acknowledged.size() << " writes acknowledged");
  CHECK(acknowledged.size() >= 16);
  // Every acknowledged write is there exactly once, and nothing else is.
  CHECK(cw::test::query_text(box, "SELECT count(*) FROM lots") ==
        std::to_string(acknowledged.size()));
  CHECK(cw::test::query_text(box, "SELECT count(DISTINCT code) FROM lots") ==
        std::to_string(acknowledged.size()));
  for (const auto& code : acknowledged) {
    if (cw::test::query_text(box, "SELECT count(*) FROM lots WHERE code = '" + code + "'") != "1") {
      FAIL_CHECK("lot " << code << " is not there exactly once");
    }
  }
  // The chain has no gap: one entry for init and one per lot, numbered 1..n.
  CHECK(cw::test::query_text(box, "SELECT count(*) FROM audit_log") ==
        std::to_string(1 + acknowledged.size()));
  CHECK(cw::test::query_text(box, "SELECT max(seq) FROM audit_log") ==
        std::to_string(1 + acknowledged.size()));
  const RunResult verify = box.run({"audit", "verify", "--json"});
  CHECK(verify.exit_code == 0);
}

TEST_CASE("e2e concurrency: two inits of one new store file never leave it removed",
          "[e2e][sqlite-only]") {
  // An init that fails removes the file it created; it must never remove one that the other
  // init has meanwhile written and reported.
  Sandbox box;
  for (int round = 0; round < 8; ++round) {
    const std::string file = "race-" + std::to_string(round) + ".db";
    std::vector<RunResult> results(2);
    auto init = [&](int who) {
      results[who] = box.run({"--db", file, "--as", who == 0 ? "ana" : "bob", "init", "--tz", "UTC",
                              "--lab", who == 0 ? "Lab A" : "Lab B"});
    };
    std::thread a(init, 0), b(init, 1);
    a.join();
    b.join();
    INFO("round " << round << "\n" << results[0].describe() << "\n" << results[1].describe());
    const bool reported = results[0].exit_code == 0 || results[1].exit_code == 0;
    CHECK(reported);
    if (!reported) continue;
    CHECK(std::filesystem::exists(box.path(file)));
    const RunResult verify = box.run({"--db", file, "audit", "verify", "--json"});
    CHECK(verify.exit_code == 0);
  }
}
