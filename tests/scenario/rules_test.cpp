// SPDX-License-Identifier: Apache-2.0
// Scenarios of the rules engine through the CLI (product.md §5.2): each stale reason alone,
// one second either side of the moment it begins, and several reasons holding together.
#include <catch2/catch.hpp>

#include "scenario_support.h"

using namespace cw::scenario;

namespace {

const std::string kAcquired = "2026-03-02T09:00:00Z";

/// A nitrate-only lab: unweighted linear method (no review unless asked), IC-01, lots CRM-A
/// and CRM-B valid all year.
struct RulesLab {
  explicit RulesLab(MethodSpec spec = {}, const std::string& zone = "UTC") : lab(zone) {
    spec.analytes = {"nitrate"};
    lab.add_instrument("IC-01");
    lab.add_lot("CRM-A", "2026-12-31");
    lab.add_lot("CRM-B", "2026-12-31");
    lab.add_method(spec);
    method = spec;
  }

  /// Logs the M1 calibration (calibration-practice.md §9 M1) at `at`; returns the curve id.
  std::int64_t log(const std::string& at = kAcquired, const std::string& lots = "CRM-A") const {
    const Json j =
        lab.log_curve("ANION-IC", "IC-01", lots, std::string(kPointsHeader) + m1_rows(), at, 0);
    return j.at("curves")[0].at("id").get<std::int64_t>();
  }

  /// The curve's state and sorted reasons at `at`, as "state: r1, r2".
  std::string state(std::int64_t id, const std::string& at) const {
    const Json c = lab.show_curve(id, at);
    std::string s = c.at("state").get<std::string>() + ":";
    for (const auto& r : sorted_reasons(c.at("reasons"))) s += " " + r;
    return s;
  }

  Lab lab;
  MethodSpec method;
};

// On the M1 line (b = 1.930357143, a = 1.517857143) a response of 13.5 reads 6.207215541
// pg/mL: recovery 103.5 % of a nominal 6 (passes ±10 %); 17.3 reads 8.175763182: 136.3 %
// (fails).
const std::vector<std::string> kPassingCheck = {"--nominal", "6", "--response", "13.5"};
const std::vector<std::string> kFailingCheck = {"--nominal", "6", "--response", "17.3"};

std::vector<std::string> check_args(std::int64_t id, const std::vector<std::string>& values) {
  std::vector<std::string> args{"check", "log", "--curve", std::to_string(id)};
  args.insert(args.end(), values.begin(), values.end());
  return args;
}

}  // namespace

TEST_CASE("rules: expired exactly at acquisition + valid_for", "[scenario]") {
  MethodSpec spec;
  spec.valid_for = "24 hours";
  RulesLab r(spec);
  const std::int64_t id = r.log();
  CHECK(r.lab.show_curve(id, kAcquired).at("expires_at") == "2026-03-03T09:00:00Z");
  CHECK(r.state(id, kAcquired) == "active:");
  CHECK(r.state(id, "2026-03-03T08:59:59Z") == "active:");
  CHECK(r.state(id, "2026-03-03T09:00:00Z") == "stale: expired");
  CHECK(r.state(id, "2026-03-10T09:00:00Z") == "stale: expired");
}

TEST_CASE("rules: method-revised from the revision's time on, not before (time travel)",
          "[scenario]") {
  RulesLab r;
  const std::int64_t id = r.log();
  MethodSpec v2 = r.method;
  v2.min_r2 = "0.998";
  r.lab.revise_method(v2, "2026-03-02T12:00:00Z");
  // Asked after the revision was recorded, the answer for an earlier moment is unchanged.
  CHECK(r.state(id, "2026-03-02T11:59:59Z") == "active:");
  CHECK(r.state(id, "2026-03-02T12:00:00Z") == "stale: method-revised");
  const Json show = r.lab.show_curve(id, "2026-03-02T12:00:00Z");
  CHECK(show.at("method_version") == 1);
  const Json list = r.lab.json_at("2026-03-02T11:59:59Z", {"curve", "list"});
  REQUIRE(list.at("curves").size() == 1);
  CHECK(list.at("curves")[0].at("state") == "active");
}

TEST_CASE("rules: check-failed from the failing check on, and quantify before it is in its bracket",
          "[scenario]") {
  RulesLab r;
  const std::int64_t id = r.log();
  const Json check = r.lab.json_at("2026-03-02T12:00:00Z", check_args(id, kFailingCheck), 3);
  CHECK(check.at("passed") == false);
  CHECK(r.state(id, "2026-03-02T11:59:59Z") == "active:");
  CHECK(r.state(id, "2026-03-02T12:00:00Z") == "stale: check-failed");

  const std::vector<std::string> q{"quantify", "--curve", std::to_string(id), "--response", "13.5",
                                   "--sample", "W-17"};
  // The curve was active at 11:59, but no passing check stands between acquisition and the
  // failure: a result given that time lies in the failed bracket (calibration-practice.md §5.4).
  const Json before = r.lab.json_at("2026-03-02T11:59:00Z", q, 3);
  CHECK(before.at("status") == "refused");
  CHECK(strings(before.at("reasons")) == std::vector<std::string>{"check-failed"});
  const Json after = r.lab.json_at("2026-03-02T12:01:00Z", q, 3);
  CHECK(after.at("status") == "refused");
  CHECK(strings(after.at("reasons")) == std::vector<std::string>{"check-failed"});
  CHECK(after.at("concentration").is_null());
}

TEST_CASE("rules: check-overdue when check_every passes, and a passing check clears it",
          "[scenario]") {
  MethodSpec spec;
  spec.check_every = "12 hours";
  RulesLab r(spec);
  const std::int64_t id = r.log();  // 09:00Z: first check due 21:00Z
  CHECK(r.state(id, "2026-03-02T20:59:59Z") == "active:");
  CHECK(r.state(id, "2026-03-02T21:00:00Z") == "stale: check-overdue");
  const Json pass = r.lab.json_at("2026-03-02T22:00:00Z", check_args(id, kPassingCheck), 0);
  CHECK(pass.at("passed") == true);
  CHECK(pass.at("curve_state") == "active");
  CHECK(r.state(id, "2026-03-02T22:00:00Z") == "active:");
  CHECK(r.state(id, "2026-03-03T09:59:59Z") == "active:");  // next due 22:00 + 12 h
  CHECK(r.state(id, "2026-03-03T10:00:00Z") == "stale: check-overdue");
  // The overdue moment before the passing check still reads overdue.
  CHECK(r.state(id, "2026-03-02T21:30:00Z") == "stale: check-overdue");
}

TEST_CASE("rules: lot-expired at the end of the lab-local expiry day across a DST change",
          "[scenario]") {
  // Europe/Berlin switches to CEST on 2026-03-29 at 01:00 UTC, so the lot's last day
  // (2026-03-29) ends at 2026-03-30 00:00 +02:00 = 2026-03-29T22:00:00Z, not at 23:00Z (CET)
  // nor 2026-03-30T00:00Z (UTC). Checked with Python's zoneinfo:
  // datetime(2026,3,29,22,0,tzinfo=UTC).astimezone(ZoneInfo("Europe/Berlin")) is
  // 2026-03-30 00:00:00+02:00, and 21:59:59Z is 2026-03-29 23:59:59+02:00.
  RulesLab r(MethodSpec{}, "Europe/Berlin");
  r.lab.add_lot("CRM-D", "2026-03-29");
  const std::int64_t id = r.log("2026-03-27T09:00:00Z", "CRM-D");
  // valid for 7 days would end 2026-04-03; the lot ends first.
  CHECK(r.lab.show_curve(id, "2026-03-27T09:00:00Z").at("expires_at") == "2026-03-29T22:00:00Z");
  CHECK(r.state(id, "2026-03-29T21:59:59Z") == "active:");
  CHECK(r.state(id, "2026-03-29T22:00:00Z") == "stale: lot-expired");
}

TEST_CASE("rules: lot-withdrawn from the withdrawal on", "[scenario]") {
  RulesLab r;
  const std::int64_t id = r.log(kAcquired, "CRM-A,CRM-B");
  r.lab.json_at("2026-03-02T12:00:00Z",
                {"lot", "withdraw", "CRM-B", "--reason", "certificate revoked"});
  CHECK(r.state(id, "2026-03-02T11:59:59Z") == "active:");
  CHECK(r.state(id, "2026-03-02T12:00:00Z") == "stale: lot-withdrawn");
}

TEST_CASE("rules: instrument-serviced from the service on, and returning does not revive",
          "[scenario]") {
  RulesLab r;
  const std::int64_t id = r.log();
  r.lab.json_at("2026-03-02T12:00:00Z",
                {"instrument", "service", "IC-01", "--out", "--reason", "pump seal replaced"});
  r.lab.json_at("2026-03-02T13:00:00Z",
                {"instrument", "service", "IC-01", "--back", "--reason", "pressure test passed"});
  CHECK(r.state(id, "2026-03-02T11:59:59Z") == "active:");
  CHECK(r.state(id, "2026-03-02T12:00:00Z") == "stale: instrument-serviced");
  CHECK(r.state(id, "2026-03-02T13:30:00Z") == "stale: instrument-serviced");
}

TEST_CASE("rules: superseded by a newer active curve of the same method, instrument, analyte",
          "[scenario]") {
  SECTION("without review: from the newer curve's acquisition") {
    RulesLab r;
    const std::int64_t a = r.log(kAcquired);
    const std::int64_t b = r.log("2026-03-02T10:00:00Z");
    CHECK(r.state(a, "2026-03-02T09:59:59Z") == "active:");
    CHECK(r.state(a, "2026-03-02T10:00:00Z") == "stale: superseded");
    CHECK(r.state(b, "2026-03-02T10:00:00Z") == "active:");
  }
  SECTION("with review: only once the newer curve is approved") {
    MethodSpec spec;
    spec.review_required = true;
    RulesLab r(spec);
    const std::int64_t a = r.log(kAcquired);
    r.lab.json_at("2026-03-02T09:30:00Z", {"--as", "bob", "curve", "review", std::to_string(a),
                                           "--approve", "--reason", "ok"});
    const std::int64_t b = r.log("2026-03-02T10:00:00Z");
    CHECK(r.state(b, "2026-03-02T10:30:00Z") == "awaiting-review:");
    CHECK(r.state(a, "2026-03-02T10:30:00Z") == "active:");
    r.lab.json_at("2026-03-02T11:00:00Z", {"--as", "bob", "curve", "review", std::to_string(b),
                                           "--approve", "--reason", "ok"});
    CHECK(r.state(a, "2026-03-02T10:59:59Z") == "active:");
    CHECK(r.state(a, "2026-03-02T11:00:00Z") == "stale: superseded");
    CHECK(r.state(b, "2026-03-02T11:00:00Z") == "active:");
  }
  SECTION("a newer rejected curve does not supersede") {
    RulesLab r;
    const std::int64_t a = r.log(kAcquired);
    r.lab.log_curve("ANION-IC", "IC-01", "CRM-A",
                    std::string(kPointsHeader) +
                        "nitrate,C1,2,19.8,1,\nnitrate,C2,4,40.5,1,\n"
                        "nitrate,C3,6,60.3,1,\nnitrate,C4,8,79.6,1,\n",
                    "2026-03-02T10:00:00Z", 3);
    CHECK(r.state(a, "2026-03-02T10:30:00Z") == "active:");
  }
}

TEST_CASE("rules: several stale reasons hold together and are all reported", "[scenario]") {
  SECTION("expired and check-failed") {
    MethodSpec spec;
    spec.valid_for = "24 hours";
    RulesLab r(spec);
    const std::int64_t id = r.log();
    r.lab.json_at("2026-03-02T12:00:00Z", check_args(id, kFailingCheck), 3);
    CHECK(r.state(id, "2026-03-03T08:59:59Z") == "stale: check-failed");
    CHECK(r.state(id, "2026-03-03T09:00:00Z") == "stale: check-failed expired");
  }
  SECTION("lot-withdrawn, instrument-serviced and method-revised") {
    RulesLab r;
    const std::int64_t id = r.log();
    r.lab.json_at("2026-03-02T11:00:00Z", {"lot", "withdraw", "CRM-A", "--reason", "recall"});
    r.lab.json_at("2026-03-02T12:00:00Z",
                  {"instrument", "service", "IC-01", "--out", "--reason", "lamp"});
    MethodSpec v2 = r.method;
    v2.min_r2 = "0.998";
    r.lab.revise_method(v2, "2026-03-02T13:00:00Z");
    CHECK(r.state(id, "2026-03-02T11:30:00Z") == "stale: lot-withdrawn");
    CHECK(r.state(id, "2026-03-02T12:30:00Z") == "stale: instrument-serviced lot-withdrawn");
    CHECK(r.state(id, "2026-03-02T13:00:00Z") ==
          "stale: instrument-serviced lot-withdrawn method-revised");
    // Each reason carries the moment it began.
    const Json c = r.lab.show_curve(id, "2026-03-02T13:00:00Z");
    std::map<std::string, std::string> since;
    for (const auto& d : c.at("reason_details"))
      since[d.at("reason").get<std::string>()] = d.at("since").get<std::string>();
    CHECK(since["lot-withdrawn"] == "2026-03-02T11:00:00Z");
    CHECK(since["instrument-serviced"] == "2026-03-02T12:00:00Z");
    CHECK(since["method-revised"] == "2026-03-02T13:00:00Z");
  }
  SECTION("check-overdue and lot-withdrawn; a quantitation lists both") {
    MethodSpec spec;
    spec.check_every = "2 hours";
    RulesLab r(spec);
    const std::int64_t id = r.log();
    r.lab.json_at("2026-03-02T10:00:00Z", {"lot", "withdraw", "CRM-A", "--reason", "recall"});
    CHECK(r.state(id, "2026-03-02T11:00:00Z") == "stale: check-overdue lot-withdrawn");
    const Json q = r.lab.json_at(
        "2026-03-02T11:00:00Z",
        {"quantify", "--curve", std::to_string(id), "--response", "13.5", "--sample", "W-3"}, 3);
    CHECK(sorted_reasons(q.at("reasons")) ==
          std::vector<std::string>{"check-overdue", "lot-withdrawn"});
  }
}

TEST_CASE("rules: a validity in days keeps the lab-local wall-clock time across a DST change",
          "[scenario]") {
  // 2026-03-27T09:00Z is 10:00 CET in Europe/Berlin; 7 calendar days later 10:00 CEST is
  // 2026-04-03T08:00:00Z (Python's zoneinfo), one hour before 7 × 24 hours would end.
  RulesLab r(MethodSpec{}, "Europe/Berlin");
  const std::int64_t id = r.log("2026-03-27T09:00:00Z");
  CHECK(r.lab.show_curve(id, "2026-03-27T09:00:00Z").at("expires_at") == "2026-04-03T08:00:00Z");
  CHECK(r.state(id, "2026-04-03T07:59:59Z") == "active:");
  CHECK(r.state(id, "2026-04-03T08:00:00Z") == "stale: expired");
}
