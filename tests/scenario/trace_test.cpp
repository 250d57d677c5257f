// SPDX-License-Identifier: Apache-2.0
// Scenarios of `trace`: the impact of a withdrawn lot (curves and results, JSON and CSV), the
// provenance of one result as it stood when it was reported, and everything a curve produced.
#include <algorithm>
#include <catch2/catch.hpp>
#include <set>
#include <sstream>

#include "scenario_support.h"

using namespace cw::scenario;

namespace {

const std::string kNow = "2026-03-02T12:00:00Z";

/// Two lots (L-BAD withdrawn at 11:00), three curves on three instruments (C1 with L-GOOD,
/// C2 with L-BAD, C3 with both) and five reported results.
struct TraceLab {
  TraceLab() {
    for (const char* code : {"IC-01", "IC-02", "IC-03"}) lab.add_instrument(code);
    lab.add_lot("L-GOOD", "2026-12-31", {"nitrate=1000"});
    lab.add_lot("L-BAD", "2026-12-31", {"nitrate=1000"});
    MethodSpec spec;
    spec.analytes = {"nitrate"};
    lab.add_method(spec);
    c1 = log("IC-01", "L-GOOD", "2026-03-02T09:00:00Z");
    c2 = log("IC-02", "L-BAD", "2026-03-02T09:10:00Z");
    const Json j3 = lab.log_curve("ANION-IC", "IC-03", "L-GOOD,L-BAD",
                                  std::string(kPointsHeader) + m1_rows(), "2026-03-02T09:20:00Z");
    c3 = j3.at("curves")[0].at("id").get<std::int64_t>();
    calibration3 = j3.at("calibration_id").get<std::int64_t>();
    r1 = quantify(c1, "2026-03-02T10:00:00Z", "W-1");
    r2 = quantify(c1, "2026-03-02T10:05:00Z", "W-2");
    r3 = quantify(c2, "2026-03-02T10:10:00Z", "W-3");
    r4 = quantify(c3, "2026-03-02T10:15:00Z", "W-4");
    const Json k = lab.json_at(
        "2026-03-02T10:17:00Z",
        {"check", "log", "--curve", std::to_string(c3), "--nominal", "6", "--response", "13.5"});
    check3 = k.at("check_id").get<std::int64_t>();
    r5 = quantify(c3, "2026-03-02T10:20:00Z", "W-5");
    lab.json_at("2026-03-02T11:00:00Z",
                {"lot", "withdraw", "L-BAD", "--reason", "certificate value revised by supplier"});
  }

  std::int64_t log(const std::string& instrument, const std::string& lot, const std::string& at) {
    const Json j =
        lab.log_curve("ANION-IC", instrument, lot, std::string(kPointsHeader) + m1_rows(), at);
    return j.at("curves")[0].at("id").get<std::int64_t>();
  }
  std::int64_t quantify(std::int64_t curve, const std::string& at, const std::string& sample) {
    const Json q = lab.json_at(at, {"quantify", "--curve", std::to_string(curve), "--response",
                                    "13.5", "--sample", sample});
    return q.at("result_id").get<std::int64_t>();
  }

  Lab lab;
  std::int64_t c1 = 0, c2 = 0, c3 = 0, calibration3 = 0, check3 = 0;
  std::int64_t r1 = 0, r2 = 0, r3 = 0, r4 = 0, r5 = 0;
};

std::set<std::int64_t> id_set(const Json& array, const std::string& key) {
  const auto v = ids(array, key);
  return {v.begin(), v.end()};
}

}  // namespace

TEST_CASE("trace lot: a withdrawn lot reaches exactly its curves and their results", "[scenario]") {
  TraceLab t;

  SECTION("--json") {
    const Json j = t.lab.json_at(kNow, {"trace", "lot", "L-BAD"});
    CHECK(j.at("lot").at("code") == "L-BAD");
    CHECK(j.at("lot").at("withdrawn_at") == "2026-03-02T11:00:00Z");
    CHECK(id_set(j.at("curves"), "id") == std::set<std::int64_t>{t.c2, t.c3});
    CHECK(j.at("curves").size() == 2);
    for (const auto& c : j.at("curves")) {
      CHECK(c.at("state") == "stale");
      CHECK(strings(c.at("reasons")) == std::vector<std::string>{"lot-withdrawn"});
    }
    CHECK(id_set(j.at("results"), "result_id") == std::set<std::int64_t>{t.r3, t.r4, t.r5});
    CHECK(j.at("results").size() == 3);
  }
  SECTION("the good lot reaches its own curves, including the shared calibration") {
    const Json j = t.lab.json_at(kNow, {"trace", "lot", "L-GOOD"});
    CHECK(id_set(j.at("curves"), "id") == std::set<std::int64_t>{t.c1, t.c3});
    CHECK(id_set(j.at("results"), "result_id") == std::set<std::int64_t>{t.r1, t.r2, t.r4, t.r5});
  }
  SECTION("--csv: a header and one line per affected result") {
    const auto r = t.lab.box.run({"--at", kNow, "trace", "lot", "L-BAD", "--csv"},
                                 {{"CURVEWARDEN_NOW", kNow}});
    INFO(r.describe());
    REQUIRE(r.exit_code == 0);
    std::istringstream in(r.out);
    std::string line;
    std::vector<std::string> lines;
    while (std::getline(in, line)) {
      if (!line.empty()) lines.push_back(line);
    }
    REQUIRE(lines.size() == 4);
    CHECK(lines[0].rfind("lot,result_id,", 0) == 0);
    std::set<std::int64_t> seen;
    for (std::size_t i = 1; i < lines.size(); ++i) {
      CHECK(lines[i].rfind("L-BAD,", 0) == 0);
      const auto first = lines[i].find(',');
      const auto second = lines[i].find(',', first + 1);
      seen.insert(std::stoll(lines[i].substr(first + 1, second - first - 1)));
      CHECK_THAT(lines[i], Catch::Contains("reported"));
    }
    CHECK(seen == std::set<std::int64_t>{t.r3, t.r4, t.r5});
  }
}

TEST_CASE("trace result: the provenance of a result as it stood when it was reported",
          "[scenario]") {
  TraceLab t;
  const Json j = t.lab.json_at(kNow, {"trace", "result", std::to_string(t.r4)});
  for (const char* key : {"result", "curve", "calibration", "method_version", "instrument", "lots",
                          "checks", "state_at_result_time"}) {
    INFO("key " << key);
    CHECK(j.contains(key));
  }
  CHECK(j.at("result").at("result_id") == t.r4);
  CHECK(j.at("result").at("sample") == "W-4");
  CHECK(j.at("result").at("status") == "reported");
  // §9 M1: 13.5 reads 6.207215541 on the Miller & Miller line.
  CHECK(j.at("result").at("concentration").get<double>() == Approx(6.207215541).epsilon(1e-9));
  CHECK(j.at("curve").at("id") == t.c3);
  CHECK(j.at("calibration").at("id") == t.calibration3);
  CHECK(j.at("calibration").at("acquired_at") == "2026-03-02T09:20:00Z");
  CHECK(j.at("method_version").at("method") == "ANION-IC");
  CHECK(j.at("method_version").at("version") == 1);
  CHECK(j.at("instrument").at("code") == "IC-03");
  std::set<std::string> lots;
  for (const auto& l : j.at("lots")) lots.insert(l.at("code").get<std::string>());
  CHECK(lots == std::set<std::string>{"L-GOOD", "L-BAD"});
  // At 10:15 the bad lot was not yet withdrawn, and the curve was active.
  for (const auto& l : j.at("lots")) CHECK(l.at("status") == "usable");
  CHECK(j.at("state_at_result_time").at("state") == "active");
  CHECK(j.at("state_at_result_time").at("reasons") == Json::array());
  // The check logged after the result (10:17) brackets it.
  REQUIRE(j.at("checks").size() == 1);
  CHECK(j.at("checks")[0].at("check_id") == t.check3);
  CHECK(j.at("checks")[0].at("passed") == true);

  // The same question for the result after the check finds the check before it.
  const Json j5 = t.lab.json_at(kNow, {"trace", "result", std::to_string(t.r5)});
  REQUIRE(j5.at("checks").size() == 1);
  CHECK(j5.at("checks")[0].at("check_id") == t.check3);
  CHECK(j5.at("state_at_result_time").at("state") == "active");
}

TEST_CASE("trace result: a check of the result's own second recorded after it came after it",
          "[scenario]") {
  TraceLab t;
  const std::string at = "2026-03-02T10:30:00Z";
  const std::int64_t r = t.quantify(t.c1, at, "W-6");
  const Json failed = t.lab.json_at(
      at, {"check", "log", "--curve", std::to_string(t.c1), "--nominal", "6", "--response", "17.3"},
      3);
  const Json j = t.lab.json_at(kNow, {"trace", "result", std::to_string(r)});
  INFO(j.dump());
  CHECK(j.at("state_at_result_time").at("state") == "active");
  CHECK(j.at("state_at_result_time").at("reasons") == Json::array());
  // The failure is the check after it; the result itself became rerun-required by it.
  REQUIRE(j.at("checks").size() >= 1);
  CHECK(j.at("checks").back().at("check_id") == failed.at("check_id"));
  CHECK(j.at("checks").back().at("bracket") == "after");
  CHECK(j.at("result").at("status") == "rerun-required");
  // A result recorded after the failure at the same second is refused as stale.
  const Json late = t.lab.json_at(
      at, {"quantify", "--curve", std::to_string(t.c1), "--response", "13.5", "--sample", "W-7"},
      3);
  const Json jl = t.lab.json_at(
      kNow, {"trace", "result", std::to_string(late.at("result_id").get<std::int64_t>())});
  CHECK(jl.at("state_at_result_time").at("state") == "stale");
}

TEST_CASE("trace curve: every check and result a curve produced", "[scenario]") {
  TraceLab t;
  const Json j = t.lab.json_at(kNow, {"trace", "curve", std::to_string(t.c3)});
  CHECK(j.at("curve").at("id") == t.c3);
  CHECK(j.at("curve").at("state") == "stale");  // now: L-BAD is withdrawn
  CHECK(ids(j.at("checks"), "check_id") == std::vector<std::int64_t>{t.check3});
  CHECK(ids(j.at("results"), "result_id") == std::vector<std::int64_t>{t.r4, t.r5});
  const Json other = t.lab.json_at(kNow, {"trace", "curve", std::to_string(t.c1)});
  CHECK(other.at("curve").at("state") == "active");
  CHECK(other.at("checks") == Json::array());
  CHECK(ids(other.at("results"), "result_id") == std::vector<std::int64_t>{t.r1, t.r2});
}
