// SPDX-License-Identifier: Apache-2.0
// Scenarios of the lab manager's questions: `expiring` (this lab-local week across a week
// boundary and a DST change, or a duration from now; the index the query uses) and `status`
// (curves by state per instrument, blocked method/analyte pairs, recent failed checks).
#include <algorithm>
#include <catch2/catch.hpp>

#include "scenario_support.h"
#include "store/sqlite/diagnostics.h"
#include "store/sqlite/sql.h"
#include "store/store.h"

using namespace cw::scenario;

namespace {

// America/New_York facts used below, checked with Python's zoneinfo
// (datetime(..., tzinfo=timezone.utc).astimezone(ZoneInfo("America/New_York"))):
//   2026-03-02T05:00:00Z = Monday 2026-03-02 00:00 -05:00 (EST): the ISO week starts;
//   DST begins Sunday 2026-03-08 at 02:00 local (07:00Z);
//   2026-03-09T03:30:00Z = Sunday 2026-03-08 23:30 -04:00 (still this week);
//   2026-03-09T04:00:00Z = Monday 2026-03-09 00:00 -04:00 (EDT): the next week starts;
//   2026-03-09T04:30:00Z = Monday 2026-03-09 00:30 -04:00 (next week).
// A fixed -05:00 offset would end the week at 05:00Z and wrongly include the 04:30Z curve.
const std::string kNow = "2026-03-08T17:00:00Z";  // Sunday 13:00 EDT

std::int64_t log_m1(const Lab& lab, const std::string& method, const std::string& instrument,
                    const std::string& at, const std::string& analyte = "nitrate",
                    const std::string& lot = "CRM-A") {
  const Json j =
      lab.log_curve(method, instrument, lot, std::string(kPointsHeader) + m1_rows(analyte), at, 0);
  return j.at("curves")[0].at("id").get<std::int64_t>();
}

std::int64_t log_rejected(const Lab& lab, const std::string& instrument, const std::string& at) {
  // Four levels where the method asks for five: stored as rejected (too-few-levels).
  const Json j = lab.log_curve("ANION-IC", instrument, "CRM-A",
                               std::string(kPointsHeader) +
                                   "nitrate,C1,2,19.8,1,\nnitrate,C2,4,40.5,1,\n"
                                   "nitrate,C3,6,60.3,1,\nnitrate,C4,8,79.6,1,\n",
                               at, 3);
  return j.at("curves")[0].at("id").get<std::int64_t>();
}

}  // namespace

TEST_CASE("expiring: this lab-local week and a duration from now, active curves soonest first",
          "[scenario]") {
  Lab lab("America/New_York");
  for (const char* code : {"IC-01", "IC-02", "IC-03", "IC-04", "IC-05"}) lab.add_instrument(code);
  lab.add_lot("CRM-A", "2026-12-31");
  MethodSpec spec;
  spec.analytes = {"nitrate"};
  spec.valid_for = "12 hours";
  lab.add_method(spec);

  // One curve per instrument, so that none supersedes another.
  const std::int64_t sunday_late = log_m1(lab, "ANION-IC", "IC-01", "2026-03-08T15:30:00Z");
  const std::int64_t monday_early = log_m1(lab, "ANION-IC", "IC-02", "2026-03-08T16:30:00Z");
  const std::int64_t sunday_evening = log_m1(lab, "ANION-IC", "IC-03", "2026-03-08T10:00:00Z");
  // Expires 2026-03-09T00:00Z (this week) but is stale: its instrument was serviced.
  const std::int64_t stale = log_m1(lab, "ANION-IC", "IC-04", "2026-03-08T12:00:00Z");
  lab.json_at("2026-03-08T13:00:00Z",
              {"instrument", "service", "IC-04", "--out", "--reason", "leak"});
  // Rejected, expires 2026-03-09T00:30Z.
  const std::int64_t rejected = log_rejected(lab, "IC-05", "2026-03-08T12:30:00Z");
  // Expired on Monday 2026-03-02 18:00Z, before now: not listed although in this week.
  const std::int64_t expired = log_m1(lab, "ANION-IC", "IC-05", "2026-03-02T06:00:00Z");
  (void)stale;
  (void)rejected;
  (void)expired;

  CHECK(lab.show_curve(sunday_late, kNow).at("expires_at") == "2026-03-09T03:30:00Z");
  CHECK(lab.show_curve(monday_early, kNow).at("expires_at") == "2026-03-09T04:30:00Z");

  SECTION("--this-week") {
    const Json e = lab.json_at(kNow, {"expiring", "--this-week"});
    CHECK(e.at("window").at("from") == "2026-03-02T05:00:00Z");
    CHECK(e.at("window").at("to") == "2026-03-09T04:00:00Z");
    CHECK(ids(e.at("curves")) == std::vector<std::int64_t>{sunday_evening, sunday_late});
    REQUIRE(e.at("curves").size() == 2);
    const Json& c = e.at("curves")[1];
    CHECK(c.at("analyte") == "nitrate");
    CHECK(c.at("method") == "ANION-IC");
    CHECK(c.at("instrument") == "IC-01");
    CHECK(c.at("expires_at") == "2026-03-09T03:30:00Z");
  }
  SECTION("--this-week asked on Monday is the next week") {
    const Json e = lab.json_at("2026-03-09T04:00:00Z", {"expiring", "--this-week"});
    CHECK(e.at("window").at("from") == "2026-03-09T04:00:00Z");
    CHECK(e.at("window").at("to") == "2026-03-16T04:00:00Z");
    CHECK(ids(e.at("curves")) == std::vector<std::int64_t>{monday_early});
  }
  SECTION("--within a duration from now") {
    const Json ten = lab.json_at(kNow, {"expiring", "--within", "10 hours"});
    CHECK(ten.at("window").at("from") == kNow);
    CHECK(ten.at("window").at("to") == "2026-03-09T03:00:00Z");
    CHECK(ids(ten.at("curves")) == std::vector<std::int64_t>{sunday_evening});
    const Json twelve = lab.json_at(kNow, {"expiring", "--within", "12 hours"});
    CHECK(twelve.at("window").at("to") == "2026-03-09T05:00:00Z");
    CHECK(ids(twelve.at("curves")) ==
          std::vector<std::int64_t>{sunday_evening, sunday_late, monday_early});
  }
}

// SQLite's query plan of the SQLite backend's statement: [sqlite-only] (PostgreSQL's planner
// chooses by table statistics, and its statements are another backend's).
TEST_CASE("expiring: the window query uses the index curves_by_expiry", "[scenario][sqlite-only]") {
  Lab lab;
  lab.add_instrument("IC-01");
  lab.add_lot("CRM-A", "2026-12-31");
  lab.add_method(MethodSpec{});
  log_m1(lab, "ANION-IC", "IC-01", "2026-03-02T09:00:00Z");
  cw::store::OpenOptions options;
  options.location = lab.box.location();
  auto store = cw::store::Store::open(options);
  // The very statement the repository executes for 'expiring'.
  const std::string plan =
      cw::store::sqlite::query_plan(*store, cw::store::sqlite::sql::kGroupsExpiringBetween);
  INFO("plan:\n" << plan);
  CHECK_THAT(plan, Catch::Contains("curves_by_expiry"));
  CHECK_THAT(plan, !Catch::Contains("SCAN curves\n"));  // no full table scan
}

TEST_CASE("status: curves by state per instrument, blocked pairs, recent failed checks",
          "[scenario]") {
  Lab lab;
  lab.add_instrument("IC-01");
  lab.add_instrument("IC-02");
  lab.add_lot("CRM-A", "2026-12-31");
  lab.add_lot("CRM-C", "2026-12-31", {"sodium=1000", "potassium=1000"});
  lab.add_method(MethodSpec{});  // ANION-IC: nitrate, sulfate; no review; 7 days
  MethodSpec cation;
  cation.code = "CATION-IC";
  cation.title = "Sodium and potassium by ion chromatography";
  cation.analytes = {"sodium", "potassium"};
  cation.review_required = true;
  lab.add_method(cation);

  // IC-01: an old nitrate curve (expired), today's nitrate and sulfate (active), a rejected
  // nitrate attempt, sodium awaiting review, potassium retired.
  const std::int64_t old_nitrate = log_m1(lab, "ANION-IC", "IC-01", "2026-02-10T09:00:00Z");
  const Json today =
      lab.log_curve("ANION-IC", "IC-01", "CRM-A",
                    std::string(kPointsHeader) + m1_rows("nitrate") + duplicate_sulfate_rows(),
                    "2026-03-02T09:00:00Z");
  const std::int64_t rejected = log_rejected(lab, "IC-01", "2026-03-02T10:00:00Z");
  const std::int64_t sodium =
      log_m1(lab, "CATION-IC", "IC-01", "2026-03-02T09:30:00Z", "sodium", "CRM-C");
  const std::int64_t potassium =
      log_m1(lab, "CATION-IC", "IC-01", "2026-03-02T09:45:00Z", "potassium", "CRM-C");
  lab.json_at("2026-03-02T10:30:00Z", {"curve", "retire", std::to_string(potassium), "--reason",
                                       "wrong eluent concentration"});
  // IC-02: nitrate made stale by a failing check (17.3 reads 136 % of 6 on the M1 line).
  const std::int64_t ic2 = log_m1(lab, "ANION-IC", "IC-02", "2026-03-02T09:00:00Z");
  const Json failed = lab.json_at(
      "2026-03-02T11:00:00Z",
      {"check", "log", "--curve", std::to_string(ic2), "--nominal", "6", "--response", "17.3"}, 3);
  (void)old_nitrate;
  (void)rejected;
  (void)sodium;

  const Json status = lab.json_at("2026-03-02T12:00:00Z", {"status"});
  REQUIRE(status.at("instruments").size() == 2);
  const Json* ic01 = nullptr;
  const Json* ic02 = nullptr;
  for (const auto& i : status.at("instruments")) {
    if (i.at("instrument") == "IC-01") ic01 = &i;
    if (i.at("instrument") == "IC-02") ic02 = &i;
  }
  REQUIRE(ic01 != nullptr);
  REQUIRE(ic02 != nullptr);

  SECTION("IC-01") {
    const Json& counts = ic01->at("counts");
    CHECK(counts.at("active") == 2);
    CHECK(counts.at("awaiting-review") == 1);
    CHECK(counts.at("stale") == 1);
    CHECK(counts.at("rejected") == 1);
    CHECK(counts.at("retired") == 1);
    std::vector<std::string> blocked;
    for (const auto& b : ic01->at("blocked"))
      blocked.push_back(b.at("method").get<std::string>() + "/" +
                        b.at("analyte").get<std::string>());
    std::sort(blocked.begin(), blocked.end());
    CHECK(blocked == std::vector<std::string>{"CATION-IC/potassium", "CATION-IC/sodium"});
    CHECK(ic01->at("recent_failed_checks") == Json::array());
    std::vector<std::int64_t> expiring = ids(ic01->at("expiring_7_days"));
    std::sort(expiring.begin(), expiring.end());
    std::vector<std::int64_t> active_today = ids(today.at("curves"));
    std::sort(active_today.begin(), active_today.end());
    CHECK(expiring == active_today);
  }
  SECTION("IC-02") {
    const Json& counts = ic02->at("counts");
    CHECK(counts.at("stale") == 1);
    CHECK(counts.at("active") == 0);
    CHECK(counts.at("awaiting-review") == 0);
    CHECK(counts.at("rejected") == 0);
    CHECK(counts.at("retired") == 0);
    REQUIRE(ic02->at("blocked").size() == 1);
    CHECK(ic02->at("blocked")[0].at("method") == "ANION-IC");
    CHECK(ic02->at("blocked")[0].at("analyte") == "nitrate");
    REQUIRE(ic02->at("recent_failed_checks").size() == 1);
    const Json& k = ic02->at("recent_failed_checks")[0];
    CHECK(k.at("check_id") == failed.at("check_id"));
    CHECK(k.at("curve_id") == ic2);
    CHECK(k.at("passed") == false);
    CHECK(k.at("recovery_pct").get<double>() == Approx(136.2627197).epsilon(1e-9));
  }
  SECTION("before the failing check IC-02 was not blocked") {
    const Json earlier = lab.json_at("2026-03-02T10:59:59Z", {"status"});
    for (const auto& i : earlier.at("instruments")) {
      if (i.at("instrument") != "IC-02") continue;
      CHECK(i.at("counts").at("active") == 1);
      CHECK(i.at("blocked") == Json::array());
      CHECK(i.at("recent_failed_checks") == Json::array());
    }
  }
}

namespace {

/// One instrument's counts in `status` at `at`.
Json counts_at(const Lab& lab, const std::string& at, const std::string& instrument) {
  const Json status = lab.json_at(at, {"status"});
  for (const auto& i : status.at("instruments")) {
    if (i.at("instrument") == instrument) return i.at("counts");
  }
  FAIL("no instrument " << instrument << " in status: " << status.dump());
  return Json();
}

}  // namespace

TEST_CASE(
    "status: an expired curve's count follows a late approval and a retirement, and "
    "audit verify finds counts that do not follow the facts",
    "[scenario]") {
  Lab lab;
  lab.add_instrument("IC-01");
  lab.add_lot("CRM-A", "2026-12-31");
  MethodSpec spec;
  spec.analytes = {"nitrate"};
  spec.review_required = true;  // valid for 7 days
  lab.add_method(spec);
  const Json log = lab.log_curve("ANION-IC", "IC-01", "CRM-A",
                                 std::string(kPointsHeader) + m1_rows(), "2026-03-02T09:00:00Z");
  const std::string id = std::to_string(log.at("curves")[0].at("id").get<std::int64_t>());

  // Expired (2026-03-09 09:00) while still awaiting review.
  CHECK(counts_at(lab, "2026-03-05T00:00:00Z", "IC-01").at("awaiting-review") == 1);
  CHECK(counts_at(lab, "2026-03-10T00:00:00Z", "IC-01").at("awaiting-review") == 1);
  // Approved after its expiry: stale from the approval on, awaiting review before it.
  lab.json_at("2026-03-11T10:00:00Z",
              {"--as", "bob", "curve", "review", id, "--approve", "--reason", "checked late"});
  // Retired two days later.
  lab.json_at("2026-03-13T10:00:00Z", {"curve", "retire", id, "--reason", "column replaced"});
  const std::vector<std::pair<const char*, const char*>> expected = {
      {"2026-03-10T00:00:00Z", "awaiting-review"}, {"2026-03-11T09:59:59Z", "awaiting-review"},
      {"2026-03-11T10:00:00Z", "stale"},           {"2026-03-13T09:59:59Z", "stale"},
      {"2026-03-13T10:00:00Z", "retired"},         {"2026-06-01T00:00:00Z", "retired"}};
  for (const auto& [at, state] : expected) {
    INFO("at " << at);
    const Json counts = counts_at(lab, at, "IC-01");
    for (const auto& [name, n] : counts.items()) CHECK(n == (name == state ? 1 : 0));
  }
  const RunResult verified = lab.run({"audit", "verify", "--json"});
  REQUIRE(verified.exit_code == 0);
  CHECK(verified.json().at("derived_intact") == true);

  // A running total forged with plain SQL (the rows are derived: no entry's hash covers them)
  // is found by audit verify (exit 4), and status shows it until the store is replaced.
  REQUIRE(cw::test::exec_sql(lab.box,
                             "INSERT INTO settled_totals (instrument_id, state, n, total, "
                             "audit_seq) VALUES (1, 'rejected', 1, 1, 1)") == 0);
  CHECK(counts_at(lab, "2026-06-01T00:00:00Z", "IC-01").at("rejected") == 1);
  const RunResult forged_total = lab.run({"audit", "verify", "--json"});
  INFO(forged_total.describe());
  CHECK(forged_total.exit_code == 4);
  CHECK(forged_total.json().at("chain_intact") == true);
  CHECK(forged_total.json().at("derived_intact") == false);
  CHECK_THAT(forged_total.json().at("derived_problem").get<std::string>(),
             Catch::Contains("settled totals of instrument id 1, rejected") &&
                 Catch::Contains("running total is 1 where its tally steps add up to 0"));
  // So is a forged step, named by its curve.
  REQUIRE(cw::test::exec_sql(lab.box,
                             "INSERT INTO settled_tallies (instrument_id, effective_at, state, "
                             "delta, curve_id, audit_seq) VALUES (1, '2026-03-12T00:00:00Z', "
                             "'rejected', 1, " +
                                 id + ", 1)") == 0);
  const RunResult forged = lab.run({"audit", "verify", "--json"});
  INFO(forged.describe());
  CHECK(forged.exit_code == 4);
  const Json doc = forged.json();
  CHECK(doc.at("ok") == false);
  CHECK(doc.at("chain_intact") == true);
  CHECK(doc.at("derived_intact") == false);
  CHECK_THAT(doc.at("derived_problem").get<std::string>(), Catch::Contains("curve " + id));
  CHECK_THAT(forged.err, Catch::Contains("store copy"));

  // A copy builds the counts again from the facts.
  const std::string copy = (lab.box.dir() / "copy.db").string();
  const RunResult copied = lab.run({"store", "copy", "--from", lab.box.location(), "--to", copy});
  INFO(copied.describe());
  REQUIRE(copied.exit_code == 0);
  const RunResult copy_verified = lab.run({"--db", copy, "audit", "verify", "--json"});
  CHECK(copy_verified.exit_code == 0);
  CHECK(copy_verified.json().at("derived_intact") == true);
  const RunResult on_copy =
      lab.run({"--db", copy, "--at", "2026-06-01T00:00:00Z", "--json", "status"});
  REQUIRE(on_copy.exit_code == 0);
  CHECK(on_copy.json().at("instruments")[0].at("counts").at("retired") == 1);
  CHECK(on_copy.json().at("instruments")[0].at("counts").at("rejected") == 0);
}
