// SPDX-License-Identifier: Apache-2.0
// Westgard through `trend` (product.md §5.5): a check standard that drifts is flagged by 4-1s
// while every check still passes, the curve goes stale with trend-violation when the method
// lists the rule (and stays active when it does not), then the check fails; the chart's limits
// and violations in JSON and as text; and R-4s, which looks within one run only. Recoveries are
// constructed here on the method's targets mean 100 %, s 2 % (z = (recovery − 100)/2), and the
// responses that give them on the M1 line (calibration-practice.md §9 M1).
#include <catch2/catch.hpp>

#include <cstdio>

#include "run_support.h"

using namespace cw::scenario;

namespace {

/// The response of a check of nominal 6 that reads `recovery` percent on the M1 line.
std::string response_for(double recovery) {
  const double x = 6.0 * recovery / 100.0;
  char buffer[32];
  std::snprintf(buffer, sizeof buffer, "%.12g", m1::kIntercept + m1::kSlope * x);
  return buffer;
}

MethodSpec trending(std::vector<std::string> rules) {
  MethodSpec spec;
  spec.trend_rules = std::move(rules);
  spec.trend_mean = "100";
  spec.trend_sd = "2";
  return spec;
}

int check(const Lab& lab, std::int64_t curve, const std::string& at, double recovery) {
  const RunResult r = lab.run_at(at, {"check", "log", "--curve", std::to_string(curve), "--nominal",
                                      "6", "--response", response_for(recovery)});
  INFO(r.describe());
  REQUIRE((r.exit_code == 0 || r.exit_code == 3));
  return r.exit_code;
}

// z: 0, +0.5, +1.25, +1.5, +1.4, +1.2 (the fourth in a row beyond +1s: 4-1s), then +5.5 (fails).
const double kDrift[] = {100.0, 101.0, 102.5, 103.0, 102.8, 102.4};

std::string at_hour(int h) {
  return "2026-03-02T" + std::string(h < 10 ? "0" : "") + std::to_string(h) + ":00:00Z";
}

}  // namespace

TEST_CASE("trend: a drift flagged by 4-1s makes the curve stale before a check fails",
          "[scenario][trend]") {
  RunLab listed(trending({"4-1s", "1-3s"}));
  RunLab unlisted(trending({"1-3s"}));
  for (int i = 0; i < 6; ++i) {
    CHECK(check(listed.lab, listed.nitrate, at_hour(9 + i), kDrift[i]) == 0);
    CHECK(check(unlisted.lab, unlisted.nitrate, at_hour(9 + i), kDrift[i]) == 0);
  }
  CHECK(listed.lab.show_curve(listed.nitrate, at_hour(13)).at("state") == "active");
  const Json stale = listed.lab.show_curve(listed.nitrate, at_hour(15));
  CHECK(stale.at("state") == "stale");
  CHECK(sorted_reasons(stale.at("reasons")) == std::vector<std::string>{"trend-violation"});
  CHECK(unlisted.lab.show_curve(unlisted.nitrate, at_hour(15)).at("state") == "active");
  // Quantitation stops with the reason named.
  const Json refused = listed.lab.json_at(at_hour(15),
                                          {"quantify", "--curve", std::to_string(listed.nitrate),
                                           "--response", kNitrateLow, "--sample", "W-1"},
                                          3);
  CHECK(refused.at("reasons") == Json::array({"trend-violation"}));
  // Then the check fails outright.
  CHECK(check(listed.lab, listed.nitrate, at_hour(16), 111.0) == 3);
  CHECK(check(unlisted.lab, unlisted.nitrate, at_hour(16), 111.0) == 3);
  CHECK(sorted_reasons(listed.lab.show_curve(listed.nitrate, at_hour(17)).at("reasons")) ==
        std::vector<std::string>{"check-failed", "trend-violation"});

  const Json t = listed.lab.json_at(at_hour(17), {"trend", "--method", "ANION-IC", "--instrument",
                                                  "IC-01", "--analyte", "nitrate"});
  CHECK(t.at("mean") == 100.0);
  CHECK(t.at("sd") == 2.0);
  CHECK(t.at("limits").at("warn_low") == 96.0);
  CHECK(t.at("limits").at("warn_high") == 104.0);
  CHECK(t.at("limits").at("low") == 94.0);
  CHECK(t.at("limits").at("high") == 106.0);
  CHECK(t.at("limits").at("basis") == "method-targets");
  REQUIRE(t.at("points").size() == 7);
  CHECK(t.at("points")[2].at("recovery_pct").get<double>() == Approx(102.5).epsilon(1e-8));
  CHECK(t.at("points")[2].at("z").get<double>() == Approx(1.25).epsilon(1e-7));
  std::vector<std::string> found;
  for (const auto& v : t.at("violations")) {
    std::string token = v.at("rule").get<std::string>();
    for (std::size_t i = 0; i < t.at("points").size(); ++i) {
      if (t.at("points")[i].at("check_id") == v.at("check_id"))
        token += "@" + std::to_string(i + 1);
    }
    if (v.at("makes_stale") == true) token += "*";
    found.push_back(token);
  }
  // 4-1s at the 6th check, and at the 7th (again four beyond +1s); the 7th is also beyond 2s
  // (1-2s, a warning) and 3s (1-3s).
  CHECK(found == std::vector<std::string>{"4-1s@6*", "1-2s@7", "1-3s@7*", "4-1s@7*"});

  const RunResult text =
      listed.lab.run({"--at", at_hour(17), "trend", "--method", "ANION-IC", "--instrument", "IC-01",
                      "--analyte", "nitrate", "--last", "3"});
  INFO(text.describe());
  CHECK(text.exit_code == 0);
  CHECK_THAT(text.out, Catch::Contains("limits set by the method: mean 100.00 %, s 2.00 %"));
  CHECK_THAT(text.out, Catch::Contains("the last 3 of 7 checks"));
  CHECK_THAT(text.out, Catch::Contains("1-2s 1-3s* 4-1s*"));
  CHECK_THAT(text.out, Catch::Contains("X"));
}

TEST_CASE("trend: R-4s looks within one run: a wide pair in a run, not across runs",
          "[scenario][trend]") {
  // Two passing checks, z = +2.5 and −2.5, then a sample.
  const auto rows = [](long first, bool both) {
    std::string csv = kRunHeader;
    csv += row(first, "check", "CCV", "nitrate", response_for(105.0), "6");
    if (both) csv += row(first + 1, "check", "CCV", "nitrate", response_for(95.0), "6");
    csv += row(first + 2, "sample", "W-" + std::to_string(first), "nitrate", kNitrateLow);
    csv += row(first + 3, "check", "CCV", "nitrate", response_for(100.0), "6");
    return csv;
  };
  SECTION("within one run: the sample after the pair is refused") {
    RunLab rl(trending({"R-4s"}));
    const Json run = rl.import_json("wide.csv", rows(1, true), 3);
    const Json& sample = run.at("results")[0];
    CHECK(sample.at("status") == "refused");
    CHECK(sample.at("reasons") == Json::array({"trend-violation"}));
    CHECK_THAT(sample.at("reason_details")[0].at("message").get<std::string>(),
               Catch::Contains("Westgard R-4s"));
  }
  SECTION("the same extremes in two runs: no R-4s") {
    RunLab rl(trending({"R-4s"}));
    std::string first = kRunHeader;
    first += row(1, "check", "CCV", "nitrate", response_for(105.0), "6");
    first += row(2, "sample", "W-1", "nitrate", kNitrateLow);
    first += row(3, "check", "CCV", "nitrate", response_for(100.0), "6");
    rl.import_json("one.csv", first, 0);
    std::string second = kRunHeader;
    second += row(1, "check", "CCV", "nitrate", response_for(95.0), "6");
    second += row(2, "sample", "W-2", "nitrate", kNitrateLow);
    second += row(3, "check", "CCV", "nitrate", response_for(100.0), "6");
    const Json run = rl.import_json("two.csv", second, 0, {}, "2026-03-02T13:00:00Z");
    CHECK(run.at("results")[0].at("status") == "reported");
    CHECK(rl.lab.show_curve(rl.nitrate, "2026-03-02T14:00:00Z").at("state") == "active");
  }
}
