// SPDX-License-Identifier: Apache-2.0
// Scenarios of `quantify`: the reported value and its 95 % interval against the textbook
// inverse prediction, dilution, the working-range rules, refusals with every reason, and the
// choice of the active curve by method, instrument and analyte.
#include <catch2/catch.hpp>

#include "scenario_support.h"

using namespace cw::scenario;

namespace {

const std::string kAcquired = "2026-03-02T09:00:00Z";
const std::string kLater = "2026-03-02T10:30:00Z";

// calibration-practice.md §9 M1 (Miller & Miller ch. 5), inverse prediction §3.1 with
// t(0.975; 5) = 2.570581836: at y0 = 13.5, x0 = 6.207215541; 95 % half-width 0.6163078499
// for m = 1 and 0.3614581537 for y0 the mean of m = 4 readings.
constexpr double kX0 = 6.207215541;
constexpr double kHalf1 = 0.6163078499;
constexpr double kHalf4 = 0.3614581537;

/// IC-01 and IC-02, lot CRM-A; method ANION-IC (unweighted linear, no review). Logs the
/// nitrate M1 data and the duplicate sulfate series on IC-01; returns {nitrate, sulfate} ids.
std::pair<std::int64_t, std::int64_t> set_up(const Lab& lab) {
  lab.add_instrument("IC-01");
  lab.add_instrument("IC-02");
  lab.add_lot("CRM-A", "2026-12-31");
  lab.add_method(MethodSpec{});
  const Json j =
      lab.log_curve("ANION-IC", "IC-01", "CRM-A",
                    std::string(kPointsHeader) + m1_rows() + duplicate_sulfate_rows(), kAcquired);
  return {j.at("curves")[0].at("id").get<std::int64_t>(),
          j.at("curves")[1].at("id").get<std::int64_t>()};
}

Json quantify(const Lab& lab, std::vector<std::string> args, int exit = 0,
              const std::string& at = kLater) {
  args.insert(args.begin(), "quantify");
  return lab.json_at(at, args, exit);
}

}  // namespace

TEST_CASE("quantify: value and 95 % interval follow the inverse prediction of the M1 example",
          "[scenario]") {
  Lab lab;
  const auto [nitrate, sulfate] = set_up(lab);
  (void)sulfate;
  const std::string curve = std::to_string(nitrate);

  SECTION("one reading") {
    const auto before = lab.counts();
    const Json q = quantify(lab, {"--curve", curve, "--response", "13.5", "--sample", "W-101"});
    CHECK(q.at("result_id").is_number_integer());
    CHECK(q.at("status") == "reported");
    CHECK(q.at("sample") == "W-101");
    CHECK(q.at("analyte") == "nitrate");
    CHECK(q.at("curve_id") == nitrate);
    CHECK(q.at("response").get<double>() == 13.5);
    CHECK(q.at("dilution").get<double>() == 1.0);
    CHECK(q.at("concentration").get<double>() == Approx(kX0).epsilon(1e-9));
    CHECK(q.at("ci_low").get<double>() == Approx(kX0 - kHalf1).epsilon(1e-9));
    CHECK(q.at("ci_high").get<double>() == Approx(kX0 + kHalf1).epsilon(1e-9));
    CHECK(q.at("flags") == Json::array());
    CHECK(q.at("reasons") == Json::array());
    const auto after = lab.counts();
    CHECK(after.at("results") == before.at("results") + 1);
    CHECK(after.at("audit_log") == before.at("audit_log") + 1);
    const std::string id = std::to_string(q.at("result_id").get<std::int64_t>());
    CHECK(lab.sql("SELECT status || '|' || curve_id FROM results WHERE id = " + id) ==
          "reported|" + curve);
    CHECK(lab.sql("SELECT action FROM audit_log ORDER BY seq DESC LIMIT 1") == "result.report");
  }
  SECTION("the mean of four readings, via --replicates") {
    const Json q = quantify(
        lab, {"--curve", curve, "--response", "13.5", "--replicates", "4", "--sample", "W-102"});
    CHECK(q.at("concentration").get<double>() == Approx(kX0).epsilon(1e-9));
    CHECK(q.at("ci_high").get<double>() - q.at("concentration").get<double>() ==
          Approx(kHalf4).epsilon(1e-8));
    CHECK(q.at("concentration").get<double>() - q.at("ci_low").get<double>() ==
          Approx(kHalf4).epsilon(1e-8));
  }
  SECTION("four readings given one by one: their mean 13.5 and m = 4") {
    const Json q = quantify(lab, {"--curve", curve, "--response", "13.3", "--response", "13.7",
                                  "--response", "13.4", "--response", "13.6", "--sample", "W-103"});
    CHECK(q.at("response").get<double>() == Approx(13.5).epsilon(1e-12));
    CHECK(q.at("concentration").get<double>() == Approx(kX0).epsilon(1e-9));
    CHECK(q.at("ci_high").get<double>() == Approx(kX0 + kHalf4).epsilon(1e-9));
  }
  SECTION("the dilution factor multiplies the concentration and the interval") {
    const Json q = quantify(
        lab, {"--curve", curve, "--response", "13.5", "--dilution", "10", "--sample", "W-104"});
    CHECK(q.at("dilution").get<double>() == 10.0);
    CHECK(q.at("concentration").get<double>() == Approx(10 * kX0).epsilon(1e-9));
    CHECK(q.at("ci_low").get<double>() == Approx(10 * (kX0 - kHalf1)).epsilon(1e-9));
    CHECK(q.at("ci_high").get<double>() == Approx(10 * (kX0 + kHalf1)).epsilon(1e-9));
  }
}

TEST_CASE("quantify: below the range is flagged, above the range is refused and recorded",
          "[scenario]") {
  Lab lab;
  const auto [nitrate, sulfate] = set_up(lab);

  SECTION("below the lowest sulfate level (2 mg/L): released as '< 2', the estimate kept") {
    // 4.0 reads (4.0 - 0.9033333333)/3.09 = 1.002157497 mg/L (exact fit, scenario_support.h).
    const Json q = quantify(
        lab, {"--curve", std::to_string(sulfate), "--response", "4.0", "--sample", "W-201"});
    CHECK(q.at("status") == "reported");
    CHECK(strings(q.at("flags")) == std::vector<std::string>{"below-range"});
    CHECK(q.at("censored") == "<");
    CHECK(q.at("concentration").is_null());
    CHECK(q.at("reporting_limit").get<double>() == 2.0);
    CHECK(q.at("computed_concentration").get<double>() == Approx(1.002157497).epsilon(1e-8));
    CHECK(q.at("report_as") == "< 2 mg/L");
    CHECK(q.at("uncertainty").is_null());
  }
  SECTION("above the highest nitrate level (12): refused, dilute and re-run") {
    const auto before = lab.counts();
    const auto r = lab.run_at(kLater, {"quantify", "--curve", std::to_string(nitrate), "--response",
                                       "30", "--sample", "W-202"});
    INFO(r.describe());
    CHECK(r.exit_code == 3);
    const Json q = r.json();
    CHECK(q.at("status") == "refused");
    CHECK(strings(q.at("reasons")) == std::vector<std::string>{"above-range"});
    CHECK(q.at("concentration").is_null());
    CHECK_THAT(r.err, Catch::Contains("above-range"));
    const auto after = lab.counts();
    CHECK(after.at("results") == before.at("results") + 1);
    CHECK(after.at("audit_log") == before.at("audit_log") + 1);
    const std::string id = std::to_string(q.at("result_id").get<std::int64_t>());
    CHECK(lab.sql("SELECT status || '|' || reasons FROM results WHERE id = " + id) ==
          "refused|[\"above-range\"]");
    CHECK(lab.sql("SELECT action || '|' || entity_id FROM audit_log ORDER BY seq DESC LIMIT 1") ==
          "result.refuse|" + id);
  }
}

TEST_CASE("quantify: --curve of a stale curve is refused with every reason", "[scenario]") {
  Lab lab;
  const auto [nitrate, sulfate] = set_up(lab);
  (void)sulfate;
  lab.json_at("2026-03-02T10:00:00Z", {"lot", "withdraw", "CRM-A", "--reason", "recall"});
  lab.json_at("2026-03-02T10:10:00Z",
              {"instrument", "service", "IC-01", "--out", "--reason", "detector cell cleaned"});
  const Json q = quantify(
      lab, {"--curve", std::to_string(nitrate), "--response", "13.5", "--sample", "W-301"}, 3);
  CHECK(q.at("status") == "refused");
  CHECK(sorted_reasons(q.at("reasons")) ==
        std::vector<std::string>{"instrument-serviced", "lot-withdrawn"});
  CHECK(q.at("concentration").is_null());
  CHECK(lab.sql("SELECT status FROM results WHERE id = " +
                std::to_string(q.at("result_id").get<std::int64_t>())) == "refused");
}

TEST_CASE("quantify: --method --instrument --analyte picks the active curve or refuses",
          "[scenario]") {
  Lab lab;
  const auto [first, sulfate] = set_up(lab);
  (void)sulfate;
  const Json newer = lab.log_curve("ANION-IC", "IC-01", "CRM-A",
                                   std::string(kPointsHeader) + m1_rows(), "2026-03-02T10:00:00Z");
  const std::int64_t second = newer.at("curves")[0].at("id").get<std::int64_t>();
  const std::vector<std::string> by_group{"--method",  "ANION-IC", "--instrument", "IC-01",
                                          "--analyte", "nitrate",  "--response",   "13.5",
                                          "--sample",  "W-401"};

  SECTION("the newer curve once it exists, the older one before") {
    const Json now = quantify(lab, by_group, 0, kLater);
    CHECK(now.at("curve_id") == second);
    CHECK(now.at("concentration").get<double>() == Approx(kX0).epsilon(1e-9));
    const Json earlier = quantify(lab, by_group, 0, "2026-03-02T09:30:00Z");
    CHECK(earlier.at("curve_id") == first);
  }
  SECTION("no curve at all on the instrument: no-active-curve") {
    const Json q = quantify(lab,
                            {"--method", "ANION-IC", "--instrument", "IC-02", "--analyte",
                             "nitrate", "--response", "13.5", "--sample", "W-402"},
                            3);
    CHECK(q.at("status") == "refused");
    CHECK(strings(q.at("reasons")) == std::vector<std::string>{"no-active-curve"});
    CHECK(q.at("curve_id").is_null());
  }
  SECTION("only stale curves: no-active-curve and the latest curve's reasons") {
    lab.json_at("2026-03-02T10:15:00Z", {"lot", "withdraw", "CRM-A", "--reason", "recall"});
    const Json q = quantify(lab, by_group, 3, kLater);
    CHECK(q.at("status") == "refused");
    CHECK(sorted_reasons(q.at("reasons")) ==
          std::vector<std::string>{"lot-withdrawn", "no-active-curve"});
  }
}
