// SPDX-License-Identifier: Apache-2.0
// Scenarios of the lots and the instrument named at `curve log`: a withdrawn, expired or
// unknown lot and an instrument out of service are refused with exit 2 and write nothing.
#include <catch2/catch.hpp>

#include "scenario_support.h"

using namespace cw::scenario;

namespace {

constexpr const char* kAt = "2026-03-02T09:00:00Z";

/// Lab in Europe/Berlin with a good lot, a withdrawn one, one expiring 2026-03-01, a working
/// instrument IC-01 and IC-02 out of service since 2026-02-20.
void set_up(const Lab& lab) {
  lab.add_instrument("IC-01");
  lab.add_instrument("IC-02");
  lab.add_lot("CRM-OK", "2026-12-31");
  lab.add_lot("CRM-W", "2026-12-31");
  lab.add_lot("CRM-X", "2026-03-01");
  MethodSpec spec;
  spec.analytes = {"nitrate"};
  lab.add_method(spec);
  lab.json_at("2026-02-15T10:00:00Z",
              {"lot", "withdraw", "CRM-W", "--reason", "supplier recall: nitrate value wrong"});
  lab.json_at("2026-02-20T07:30:00Z",
              {"instrument", "service", "IC-02", "--out", "--reason", "suppressor replaced"});
}

/// Runs `curve log` with the M1 points; REQUIREs exit 2, an unchanged store and `names` (and
/// `why`) in the error message.
void expect_refused(const Lab& lab, const std::string& instrument, const std::string& lots,
                    const std::string& at, const std::string& names, const std::string& why) {
  const auto file = lab.box.write_file("m1.csv", std::string(kPointsHeader) + m1_rows());
  const auto before = lab.counts();
  const auto r = lab.run_at(at, {"curve", "log", "--method", "ANION-IC", "--instrument", instrument,
                                 "--lot", lots, "--points", file.string()});
  INFO(r.describe());
  CHECK(r.exit_code == 2);
  CHECK_THAT(r.err, Catch::Contains("curvewarden: error: "));
  CHECK_THAT(r.err, Catch::Contains("'" + names + "'"));
  CHECK_THAT(r.err, Catch::Contains(why));
  CHECK(r.json().at("error").at("message").get<std::string>().find(names) != std::string::npos);
  CHECK(lab.counts() == before);
}

}  // namespace

TEST_CASE("curve log: refuses a withdrawn, expired or unknown lot and an instrument out of service",
          "[scenario]") {
  Lab lab("Europe/Berlin");
  set_up(lab);

  SECTION("a withdrawn lot, also when given with a good one") {
    expect_refused(lab, "IC-01", "CRM-OK,CRM-W", kAt, "CRM-W", "withdrawn");
  }
  SECTION("an unknown lot") {
    expect_refused(lab, "IC-01", "CRM-NONE", kAt, "CRM-NONE", "lot");
  }
  SECTION("an instrument out of service") {
    expect_refused(lab, "IC-02", "CRM-OK", kAt, "IC-02", "out of service");
  }
  SECTION("an unknown instrument") {
    expect_refused(lab, "IC-09", "CRM-OK", kAt, "IC-09", "instrument");
  }
  SECTION("a lot whose expiry day has ended in the lab's zone") {
    // 2026-03-01 ends at 2026-03-02 00:00 CET = 2026-03-01T23:00:00Z (Europe/Berlin is on
    // +01:00 until 2026-03-29; checked with Python's zoneinfo). A UTC day would end an hour
    // later, so the first refusal below separates the two.
    expect_refused(lab, "IC-01", "CRM-X", "2026-03-01T23:00:00Z", "CRM-X", "expired");
    expect_refused(lab, "IC-01", "CRM-OK,CRM-X", "2026-03-01T23:30:00Z", "CRM-X", "expired");

    // One second earlier the lot is still usable: the curve is stored and expires with it.
    const Json log =
        lab.log_curve("ANION-IC", "IC-01", "CRM-X", std::string(kPointsHeader) + m1_rows(),
                      "2026-03-01T22:59:59Z", 0);
    CHECK(log.at("curves")[0].at("state") == "active");
    CHECK(log.at("curves")[0].at("expires_at") == "2026-03-01T23:00:00Z");
  }
  SECTION("an instrument returned to service can be calibrated again") {
    lab.json_at("2026-03-01T12:00:00Z",
                {"instrument", "service", "IC-02", "--back", "--reason", "passed OQ"});
    const Json log =
        lab.log_curve("ANION-IC", "IC-02", "CRM-OK", std::string(kPointsHeader) + m1_rows(), kAt);
    CHECK(log.at("curves")[0].at("instrument") == "IC-02");
    CHECK(log.at("curves")[0].at("state") == "active");
  }
}
