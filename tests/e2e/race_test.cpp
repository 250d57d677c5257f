// SPDX-License-Identifier: Apache-2.0
// The decision and its record are one transaction: while processes quantify against a curve and
// another logs a failing check on it, no result is reported from the curve after the failing
// check was committed. Commit order is the order of the audit trail, so the test compares the
// entry of the failing check with the entries of the reported results.
#include <atomic>
#include <catch2/catch.hpp>
#include <string>
#include <thread>
#include <vector>

#include "harness.h"

namespace {

using cw::test::RunResult;
using cw::test::Sandbox;

const char* const kPoints =
    "analyte,level,nominal,response\n"
    "nitrate,1,1,0.101\nnitrate,2,2,0.199\nnitrate,3,5,0.502\nnitrate,4,10,1.001\n"
    "nitrate,5,20,1.998\n";

/// The method of the harness without second-person review, so that a new curve is active at once.
std::string method_without_review() {
  std::string toml = cw::test::method_toml();
  const std::string from = "review_required = true";
  toml.replace(toml.find(from), from.size(), "review_required = false");
  return toml;
}

}  // namespace

TEST_CASE(
    "e2e race: no result is reported from a curve after a failing check on it is "
    "committed",
    "[e2e]") {
  Sandbox box;
  box.write_file("anion.toml", method_without_review());
  box.write_file("points.csv", kPoints);
  for (const auto& args :
       std::vector<std::vector<std::string>>{{"init", "--tz", "UTC"},
                                             {"method", "add", "anion.toml"},
                                             {"lot", "add", "CRM-1", "--material", "m", "--expires",
                                              "2027-03-31", "--value", "nitrate=1000"}}) {
    REQUIRE(box.run(args).exit_code == 0);
  }
  constexpr int kRounds = 4;
  constexpr int kQuantifiers = 3;
  for (int round = 1; round <= kRounds; ++round) {
    // A fresh instrument and curve each round; every process sees the same "now", so the
    // failing check holds for every quantitation decided after it.
    const std::string instrument = "IC-" + std::to_string(round);
    REQUIRE(box.run({"instrument", "add", instrument}).exit_code == 0);
    const RunResult logged =
        box.run({"curve", "log", "--method", "ANION-IC", "--instrument", instrument, "--lot",
                 "CRM-1", "--points", "points.csv", "--json"});
    INFO(logged.describe());
    REQUIRE(logged.exit_code == 0);
    const std::string curve = std::to_string(logged.json()["curves"][0]["id"].get<int>());

    // One result before the race starts: the curve is in use.
    REQUIRE(box.run({"quantify", "--curve", curve, "--response", "0.5", "--sample", "first"})
                .exit_code == 0);
    std::atomic<bool> stop{false};
    std::atomic<int> reported{0}, refused{0}, other{0};
    std::vector<std::thread> quantifiers;
    for (int q = 0; q < kQuantifiers; ++q) {
      quantifiers.emplace_back([&, q] {
        for (int i = 0; !stop.load() || i < 3; ++i) {
          const RunResult r = box.run(
              {"quantify", "--curve", curve, "--response", "0.5", "--sample",
               "S-" + std::to_string(round) + "-" + std::to_string(q) + "-" + std::to_string(i)});
          (r.exit_code == 0 ? reported : r.exit_code == 3 ? refused : other)++;
          if (i > 40) break;
        }
      });
    }
    std::this_thread::sleep_for(std::chrono::milliseconds(60 * round));
    const RunResult check =
        box.run({"check", "log", "--curve", curve, "--nominal", "10", "--response", "0.5"});
    CHECK(check.exit_code == 3);  // 50 % recovery: the check fails
    stop = true;
    for (auto& t : quantifiers) t.join();
    CHECK(other.load() == 0);
    CHECK(refused.load() > 0);

    // The failing check's entry, and every reported result of the curve after it.
    const std::string check_seq =
        cw::test::query_text(box,
                             "SELECT a.seq FROM audit_log a JOIN checks k ON k.audit_seq = a.seq "
                             "WHERE k.curve_id = " +
                                 curve + " AND k.passed = 0");
    REQUIRE_FALSE(check_seq.empty());
    const std::string late =
        cw::test::query_text(box, "SELECT count(*) FROM results r WHERE r.curve_id = " + curve +
                                      " AND r.status = 'reported' AND r.audit_seq > " + check_seq);
    INFO("round " << round << ": " << reported.load() << " reported, " << refused.load()
                  << " refused; check at entry " << check_seq);
    CHECK(late == "0");
  }
  const RunResult verify = box.run({"audit", "verify"});
  CHECK(verify.exit_code == 0);
}
