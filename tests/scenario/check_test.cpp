// SPDX-License-Identifier: Apache-2.0
// Scenarios of `check log`: the JSON of a passing and a failing check standard, the results
// a failure puts in doubt (exactly those reported since the last passing check), and blanks
// judged against the LOD or the method's blank limit.
#include <catch2/catch.hpp>

#include "scenario_support.h"

using namespace cw::scenario;

namespace {

const std::string kAcquired = "2026-03-02T09:00:00Z";

/// A lab with one active M1 nitrate curve (calibration-practice.md §9 M1, unweighted line
/// b = 1.930357143, a = 1.517857143, LOD 0.7399653784); returns the curve id.
std::int64_t set_up(const Lab& lab, const MethodSpec& base = {}) {
  MethodSpec spec = base;
  spec.analytes = {"nitrate"};
  lab.add_instrument("IC-01");
  lab.add_lot("CRM-A", "2026-12-31");
  lab.add_method(spec);
  const Json j = lab.log_curve("ANION-IC", "IC-01", "CRM-A", std::string(kPointsHeader) + m1_rows(),
                               kAcquired, 0);
  return j.at("curves")[0].at("id").get<std::int64_t>();
}

std::int64_t quantify(const Lab& lab, std::int64_t curve, const std::string& at,
                      const std::string& response, const std::string& sample, int exit = 0) {
  const Json q = lab.json_at(
      at,
      {"quantify", "--curve", std::to_string(curve), "--response", response, "--sample", sample},
      exit);
  return q.at("result_id").get<std::int64_t>();
}

Json check(const Lab& lab, std::int64_t curve, const std::string& at,
           const std::vector<std::string>& values, int exit) {
  std::vector<std::string> args{"check", "log", "--curve", std::to_string(curve)};
  args.insert(args.end(), values.begin(), values.end());
  return lab.json_at(at, args, exit);
}

}  // namespace

TEST_CASE("check log: a failing check lists exactly the results since the last passing check",
          "[scenario]") {
  Lab lab;
  const std::int64_t curve = set_up(lab);

  const std::int64_t r1 = quantify(lab, curve, "2026-03-02T10:00:00Z", "13.5", "W-01");

  // Passing check: 13.5 reads 6.207215541 (§9 M1 x0 at y0 = 13.5), recovery 103.4535924 % of 6.
  const Json pass =
      check(lab, curve, "2026-03-02T10:30:00Z", {"--nominal", "6", "--response", "13.5"}, 0);
  CHECK(pass.at("check_id").is_number_integer());
  CHECK(pass.at("curve_id") == curve);
  CHECK(pass.at("nominal").get<double>() == 6.0);
  CHECK(pass.at("measured").get<double>() == Approx(6.207215541).epsilon(1e-9));
  CHECK(pass.at("recovery_pct").get<double>() == Approx(103.4535924).epsilon(1e-9));
  CHECK(pass.at("passed") == true);
  CHECK(pass.at("curve_state") == "active");
  CHECK(pass.at("affected_results") == Json::array());

  const std::int64_t r2 = quantify(lab, curve, "2026-03-02T11:00:00Z", "13.5", "W-02");
  const std::int64_t r3 = quantify(lab, curve, "2026-03-02T11:30:00Z", "9.0", "W-03");
  // Above the top calibrator: refused, so not a reported result a failure could affect.
  const std::int64_t r4 = quantify(lab, curve, "2026-03-02T11:40:00Z", "30", "W-04", 3);
  (void)r4;

  // Failing check: 17.3 reads 8.175763182, recovery 136.2627197 % (exact fractions on M1).
  const auto before = lab.counts();
  const Json fail =
      check(lab, curve, "2026-03-02T12:00:00Z", {"--nominal", "6", "--response", "17.3"}, 3);
  CHECK(lab.counts().at("checks") == before.at("checks") + 1);  // recorded although failed
  CHECK(fail.at("measured").get<double>() == Approx(8.175763182).epsilon(1e-9));
  CHECK(fail.at("recovery_pct").get<double>() == Approx(136.2627197).epsilon(1e-9));
  CHECK(fail.at("passed") == false);
  CHECK(fail.at("curve_state") == "stale");
  std::vector<std::int64_t> affected;
  for (const auto& id : fail.at("affected_results")) affected.push_back(id.get<std::int64_t>());
  CHECK(affected == std::vector<std::int64_t>{r2, r3});
  CHECK(r1 < r2);
  CHECK(lab.sql("SELECT passed FROM checks WHERE id = " +
                std::to_string(fail.at("check_id").get<std::int64_t>())) == "0");

  // From now on the curve is stale: quantitation is refused.
  quantify(lab, curve, "2026-03-02T12:30:00Z", "13.5", "W-05", 3);

  // A second failure still reaches back to the last passing check, not to the first failure.
  const Json fail2 =
      check(lab, curve, "2026-03-02T13:00:00Z", {"--nominal", "6", "--response", "17.3"}, 3);
  affected.clear();
  for (const auto& id : fail2.at("affected_results")) affected.push_back(id.get<std::int64_t>());
  CHECK(affected == std::vector<std::int64_t>{r2, r3});
}

TEST_CASE("check log: with no passing check, a failure lists every result since acquisition",
          "[scenario]") {
  Lab lab;
  const std::int64_t curve = set_up(lab);
  const std::int64_t r1 = quantify(lab, curve, "2026-03-02T09:30:00Z", "13.5", "W-01");
  const std::int64_t r2 = quantify(lab, curve, "2026-03-02T10:00:00Z", "21.0", "W-02");
  const Json fail =
      check(lab, curve, "2026-03-02T11:00:00Z", {"--nominal", "6", "--response", "17.3"}, 3);
  std::vector<std::int64_t> affected;
  for (const auto& id : fail.at("affected_results")) affected.push_back(id.get<std::int64_t>());
  CHECK(affected == std::vector<std::int64_t>{r1, r2});
}

TEST_CASE("check log: a blank passes below the LOD and fails above it", "[scenario]") {
  SECTION("limit = the curve's LOD (no blank_limit in the method)") {
    Lab lab;
    const std::int64_t curve = set_up(lab);
    // 2.483035714 reads 0.5 pg/mL on M1, below the LOD 0.7399653784 (§9 M1 ICH value).
    const Json low = check(lab, curve, "2026-03-02T10:00:00Z",
                           {"--kind", "blank", "--response", "2.483035714"}, 0);
    CHECK(low.at("passed") == true);
    CHECK(low.at("nominal").get<double>() == 0.0);
    CHECK(low.at("measured").get<double>() == Approx(0.5).epsilon(1e-8));
    CHECK(low.at("recovery_pct").is_null());
    CHECK(low.at("curve_state") == "active");
    // 3.5 reads 1.026827012 pg/mL: above the LOD, so the blank fails and the curve goes stale.
    const Json high =
        check(lab, curve, "2026-03-02T11:00:00Z", {"--kind", "blank", "--response", "3.5"}, 3);
    CHECK(high.at("passed") == false);
    CHECK(high.at("measured").get<double>() == Approx(1.026827012).epsilon(1e-8));
    CHECK(high.at("curve_state") == "stale");
    CHECK(strings(lab.show_curve(curve, "2026-03-02T11:00:00Z").at("reasons")) ==
          std::vector<std::string>{"check-failed"});
  }
  SECTION("limit = the method's blank_limit") {
    Lab lab;
    MethodSpec spec;
    spec.blank_limit = "0.3";
    const std::int64_t curve = set_up(lab, spec);
    // 0.5 pg/mL is below the LOD but above the method's 0.3.
    const Json blank = check(lab, curve, "2026-03-02T10:00:00Z",
                             {"--kind", "blank", "--response", "2.483035714"}, 3);
    CHECK(blank.at("passed") == false);
  }
}

TEST_CASE("check log: a check against a rejected curve is refused and recorded", "[scenario]") {
  Lab lab;
  MethodSpec spec;
  spec.analytes = {"nitrate"};
  spec.min_r2 = "0.999";  // M1 has r² 0.9977603861: rejected (r2-below-min)
  lab.add_instrument("IC-01");
  lab.add_lot("CRM-A", "2026-12-31");
  lab.add_method(spec);
  const Json log = lab.log_curve("ANION-IC", "IC-01", "CRM-A",
                                 std::string(kPointsHeader) + m1_rows(), kAcquired, 3);
  const std::int64_t curve = log.at("curves")[0].at("id").get<std::int64_t>();
  const auto before = lab.counts();
  const auto r = lab.run_at(
      "2026-03-02T10:00:00Z",
      {"check", "log", "--curve", std::to_string(curve), "--nominal", "6", "--response", "13.5"});
  INFO(r.describe());
  CHECK(r.exit_code == 3);
  const auto after = lab.counts();
  CHECK(after.at("checks") == before.at("checks"));
  CHECK(after.at("refusals") == before.at("refusals") + 1);
  CHECK(lab.sql("SELECT action || '|' || reasons FROM refusals") == "check.log|[\"rejected\"]");
  CHECK(lab.sql("SELECT action FROM audit_log ORDER BY seq DESC LIMIT 1") == "check.log-refused");
}

namespace {

/// Runs `args` with --json at `at` while the clock reads `now` (a time given after the fact).
Json back_dated(const Lab& lab, const std::string& now, const std::string& at,
                const std::vector<std::string>& args, int exit) {
  std::vector<std::string> full{"--json", "--at", at};
  full.insert(full.end(), args.begin(), args.end());
  const auto r = lab.box.run(full, {{"CURVEWARDEN_NOW", now}});
  INFO(r.describe());
  REQUIRE(r.exit_code == exit);
  return r.json();
}

}  // namespace

TEST_CASE("check log, quantify: a time before checks already logged falls in their brackets",
          "[scenario]") {
  const std::string now = "2026-03-02T12:00:00Z";
  SECTION("a result given a time inside a bracket a later check failed is refused") {
    Lab lab;
    const std::int64_t curve = set_up(lab);
    const std::string id = std::to_string(curve);
    back_dated(lab, now, "2026-03-02T10:00:00Z",
               {"check", "log", "--curve", id, "--nominal", "6", "--response", "13.5"}, 0);
    const Json fail =
        back_dated(lab, now, "2026-03-02T11:00:00Z",
                   {"check", "log", "--curve", id, "--nominal", "6", "--response", "17.3"}, 3);
    const auto before = lab.counts();
    const Json q =
        back_dated(lab, now, "2026-03-02T10:30:00Z",
                   {"quantify", "--curve", id, "--response", "13.5", "--sample", "W-09"}, 3);
    CHECK(q.at("status") == "refused");
    CHECK(q.at("reasons") == Json::array({"check-failed"}));
    CHECK_THAT(q.at("reason_details")[0].at("message").get<std::string>(),
               Catch::Contains("check " + std::to_string(fail.at("check_id").get<std::int64_t>()) +
                               " failed") &&
                   Catch::Contains("every result of this bracket must be re-run"));
    CHECK(lab.counts().at("results") == before.at("results") + 1);  // the refusal is recorded
    // After the failure the curve is stale: check-failed once, not once more for the bracket
    // a second failure (11:45) ends.
    back_dated(lab, now, "2026-03-02T11:45:00Z",
               {"check", "log", "--curve", id, "--nominal", "6", "--response", "17.3"}, 3);
    const Json stale =
        back_dated(lab, now, "2026-03-02T11:30:00Z",
                   {"quantify", "--curve", id, "--response", "13.5", "--sample", "W-11"}, 3);
    CHECK(stale.at("reasons") == Json::array({"check-failed"}));
    // Closed by a passing check first, the bracket stands: a time before it is reported.
    back_dated(lab, now, "2026-03-02T09:40:00Z",
               {"quantify", "--curve", id, "--response", "13.5", "--sample", "W-10"}, 0);
  }
  SECTION("a failed check given an earlier time takes the results reported after it too") {
    Lab lab;
    const std::int64_t curve = set_up(lab);
    const std::string id = std::to_string(curve);
    const std::int64_t r0 = quantify(lab, curve, "2026-03-02T09:30:00Z", "13.5", "W-00");
    check(lab, curve, "2026-03-02T10:00:00Z", {"--nominal", "6", "--response", "13.5"}, 0);
    const std::int64_t r1 = quantify(lab, curve, "2026-03-02T10:10:00Z", "13.5", "W-01");
    const std::int64_t r2 = quantify(lab, curve, "2026-03-02T10:30:00Z", "9.0", "W-02");
    const Json fail =
        back_dated(lab, now, "2026-03-02T10:15:00Z",
                   {"check", "log", "--curve", id, "--nominal", "6", "--response", "17.3"}, 3);
    std::vector<std::int64_t> affected;
    for (const auto& r : fail.at("affected_results")) affected.push_back(r.get<std::int64_t>());
    CHECK(affected == std::vector<std::int64_t>{r1, r2});
    CHECK(r0 < r1);
    const Json listed = lab.json_at(now, {"result", "list"});
    std::map<std::int64_t, std::string> status;
    for (const auto& r : listed.at("results")) {
      status[r.at("result_id").get<std::int64_t>()] = r.at("status").get<std::string>();
    }
    CHECK(status.at(r0) == "reported");
    CHECK(status.at(r1) == "rerun-required");
    CHECK(status.at(r2) == "rerun-required");
    const auto v = lab.run({"audit", "verify", "--json"});
    CHECK(v.exit_code == 0);
  }
}
