// SPDX-License-Identifier: Apache-2.0
// End-to-end tests of the registries through the built binary: init, instrument add, method
// add and revise, lot add and withdraw, with the JSON of each step (product.md §4), the rows
// each step writes, and an idempotent init.
#include <catch2/catch.hpp>
#include <string>

#include "harness.h"

namespace {

using cw::test::RunResult;
using cw::test::Sandbox;
using Json = nlohmann::json;
using Counts = std::map<std::string, std::int64_t>;

// SHA-256 of cw::test::method_toml() and method_toml("ANION-IC", "0.998"), computed
// independently with Python's hashlib over the same text.
const char* const kV1Sha = "40228e9b2fcf63b45bc68083d5d144fc2ad9a13a2ea8affcfc7a7dcabb7ce7c5";
const char* const kV2Sha = "e6ebe7dd0d10475c3f9765ae08fb91361b8676f7a1ac4b85a2735c0dc2f42fee";

/// after − before per table, leaving out SQLite's own sqlite_sequence.
Counts changes(const Counts& before, const Counts& after) {
  Counts diff;
  for (const auto& [table, n] : after) {
    if (table == "sqlite_sequence") continue;
    const auto it = before.find(table);
    const std::int64_t d = n - (it == before.end() ? 0 : it->second);
    if (d != 0) diff[table] = d;
  }
  return diff;
}

/// Runs `args` expecting exit 0 and one JSON document on stdout.
Json ok_json(const Sandbox& box, const std::vector<std::string>& args) {
  const RunResult r = box.run(args);
  INFO(r.describe());
  REQUIRE(r.exit_code == 0);
  CHECK(r.err.empty());
  return r.json();
}

}  // namespace

TEST_CASE("e2e registry: init, instrument, method, revision, lot and withdrawal", "[e2e]") {
  Sandbox box;
  box.write_file("anion.toml", cw::test::method_toml());
  box.write_file("anion-v2.toml", cw::test::method_toml("ANION-IC", "0.998"));

  // 1. init
  box.now = "2026-03-02T08:00:00Z";
  Json j = ok_json(box, {"init", "--lab", "Water lab", "--tz", "Europe/Berlin", "--json"});
  CHECK(j["store"] == box.location());
  CHECK(j["created"] == true);
  CHECK(j["changed"] == true);
  CHECK(j["lab"] == "Water lab");
  CHECK(j["time_zone"] == "Europe/Berlin");
  CHECK(j["schema_version"] == cw::test::latest_schema_version(box));
  CHECK(j["admin_registered"]["code"] == "alice");
  Counts counts = cw::test::table_row_counts(box);
  Counts initialised = changes({}, counts);
  if (box.backend() == cw::test::Backend::Sqlite) {
    // CURVEWARDEN_NOW is "now" for the migration record too.
    CHECK(cw::test::query_text(box.db(),
                               "SELECT group_concat(DISTINCT applied_at) FROM "
                               "schema_migrations") == "2026-03-02T08:00:00Z");
    CHECK(initialised["schema_migrations"] == cw::test::latest_schema_version(box));
  }
  // The migrations are the backend's own (migrations/ and migrations/postgresql/), and so is
  // PostgreSQL's mark (SQLite keeps it in the file header).
  initialised.erase("schema_migrations");
  initialised.erase("curvewarden_store");
  CHECK(initialised == Counts{{"audit_log", 1},
                              {"lab_settings", 1},
                              {"user_events", 1},
                              {"user_passphrases", 1},
                              {"users", 1}});

  // 2. instrument add
  box.now = "2026-03-02T09:00:00Z";
  j = ok_json(box, {"instrument", "add", "IC-02", "--name", "Ion chromatograph, bay 2", "--json"});
  CHECK(j == Json::parse(R"({"code": "IC-02", "name": "Ion chromatograph, bay 2",
                              "registered_at": "2026-03-02T09:00:00Z", "in_service": true,
                              "service": [], "columns": null, "column_history": []})"));
  Counts next = cw::test::table_row_counts(box);
  CHECK(changes(counts, next) == Counts{{"audit_log", 1}, {"instruments", 1}});
  counts = next;

  // 3. method add
  box.now = "2026-03-02T10:00:00Z";
  j = ok_json(box, {"method", "add", "anion.toml", "--json"});
  CHECK(j["code"] == "ANION-IC");
  CHECK(j["version"] == 1);
  CHECK(j["effective_at"] == "2026-03-02T10:00:00Z");
  CHECK(j["title"] == "Nitrate and sulfate in drinking water by ion chromatography");
  CHECK(j["unit"] == "mg/L");
  CHECK(j["analytes"] == Json::array({"nitrate", "sulfate"}));
  CHECK(j["internal_standard"].is_null());
  CHECK(j["calibration"]["model"] == "linear");
  CHECK(j["calibration"]["weighting"] == "1/x");
  CHECK(j["calibration"]["min_levels"] == 5);
  CHECK(j["calibration"]["min_r2"].get<double>() == Approx(0.995).epsilon(1e-12));
  CHECK(j["calibration"]["max_error_pct"].get<double>() == Approx(15.0).epsilon(1e-12));
  CHECK(j["calibration"]["valid_for"] == "7 days");
  CHECK(j["calibration"]["review_required"] == true);
  CHECK(j["check"]["tolerance_pct"].get<double>() == Approx(10.0).epsilon(1e-12));
  CHECK(j["check"]["samples_per_check"] == 10);
  CHECK(j["check"]["check_every"] == "12 hours");
  CHECK(j["check"]["trend_rules"] == Json::array({"1-3s", "2-2s", "R-4s"}));
  CHECK(j["source_name"] == "anion.toml");
  CHECK(j["source_sha256"] == kV1Sha);
  CHECK(j["reason"].is_null());
  next = cw::test::table_row_counts(box);
  CHECK(changes(counts, next) == Counts{{"audit_log", 1}, {"method_versions", 1}, {"methods", 1}});
  counts = next;

  // 4. method revise: version 2 in force from now on
  box.now = "2026-03-03T10:00:00Z";
  j = ok_json(box, {"method", "revise", "anion-v2.toml", "--reason", "tighter r2 after validation",
                    "--json"});
  CHECK(j["code"] == "ANION-IC");
  CHECK(j["version"] == 2);
  CHECK(j["effective_at"] == "2026-03-03T10:00:00Z");
  CHECK(j["calibration"]["min_r2"].get<double>() == Approx(0.998).epsilon(1e-12));
  CHECK(j["reason"] == "tighter r2 after validation");
  CHECK(j["source_name"] == "anion-v2.toml");
  CHECK(j["source_sha256"] == kV2Sha);
  next = cw::test::table_row_counts(box);
  CHECK(changes(counts, next) ==
        Counts{{"audit_log", 1}, {"method_versions", 1}, {"signatures", 1}});
  counts = next;
  // As of an hour before the revision, version 1 is the one in force.
  j = ok_json(box, {"method", "show", "ANION-IC", "--at", "2026-03-03T09:00:00Z", "--json"});
  CHECK(j["version"] == 1);
  CHECK(j["versions"].size() == 2);
  CHECK(j["source_text"] == cw::test::method_toml());
  j = ok_json(box, {"method", "list", "--json"});
  CHECK(j["methods"][0]["latest_version"] == 2);
  CHECK(j["methods"][0]["version_in_force"] == 2);

  // 5. lot add: opened 2026-03-01 with 30 days in use, so usable through 2026-03-31 (before
  // the certificate's 2027-03-31), i.e. until 2026-04-01 00:00 CEST = 2026-03-31T22:00:00Z.
  box.now = "2026-03-04T09:00:00Z";
  j = ok_json(
      box, {"lot", "add", "CRM-NO3-0042", "--material", "Nitrate in water, 1000 mg/L", "--expires",
            "2027-03-31", "--opened", "2026-03-01", "--in-use-days", "30", "--certificate",
            "CERT-123", "--value", "nitrate=1000±5", "--value", "sulfate=500+/-2.5", "--json"});
  CHECK(j == Json::parse(R"({
      "code": "CRM-NO3-0042", "material": "Nitrate in water, 1000 mg/L",
      "certificate": "CERT-123", "coverage_factor": 2.0, "expires_on": "2027-03-31",
      "opened_on": "2026-03-01",
      "in_use_days": 30, "in_use_expires_on": "2026-03-31", "effective_expires_on": "2026-03-31",
      "usable_until": "2026-03-31T22:00:00Z", "status": "usable", "withdrawn_at": null,
      "withdrawal_reason": null, "registered_at": "2026-03-04T09:00:00Z",
      "values": [{"analyte": "nitrate", "value": 1000.0, "uncertainty": 5.0},
                 {"analyte": "sulfate", "value": 500.0, "uncertainty": 2.5}]})"));
  next = cw::test::table_row_counts(box);
  CHECK(changes(counts, next) == Counts{{"audit_log", 1}, {"lot_values", 2}, {"lots", 1}});
  counts = next;

  // 6. lot withdraw, back-dated with --at in another offset (08:30 +01:00 = 07:30 UTC)
  box.now = "2026-03-05T09:00:00Z";
  j = ok_json(box, {"lot", "withdraw", "CRM-NO3-0042", "--reason", "seal broken on arrival", "--at",
                    "2026-03-05T08:30:00+01:00", "--json"});
  CHECK(j["status"] == "withdrawn");
  CHECK(j["withdrawn_at"] == "2026-03-05T07:30:00Z");
  CHECK(j["withdrawal_reason"] == "seal broken on arrival");
  next = cw::test::table_row_counts(box);
  CHECK(changes(counts, next) ==
        Counts{{"audit_log", 1}, {"lot_withdrawals", 1}, {"signatures", 1}});

  // The trail: one entry per step, in order, by the acting person, with CURVEWARDEN_NOW noted.
  const Json entries = ok_json(box, {"audit", "log", "--json"})["entries"];
  REQUIRE(entries.size() == 6);
  const char* actions[] = {"lab.init",      "instrument.add", "method.add",
                           "method.revise", "lot.add",        "lot.withdraw"};
  for (size_t i = 0; i < 6; ++i) {
    INFO("entry " << i + 1);
    CHECK(entries[i]["seq"] == i + 1);
    CHECK(entries[i]["action"] == actions[i]);
    CHECK(entries[i]["actor"] == "alice");
    CHECK(entries[i]["clock_overridden"] == true);
  }
  CHECK(entries[0]["prev_hash"] == std::string(64, '0'));
  CHECK(entries[3]["reason"] == "tighter r2 after validation");
  CHECK(entries[5]["recorded_at"] == "2026-03-05T09:00:00Z");
  CHECK(entries[5]["occurred_at"] == "2026-03-05T07:30:00Z");
  CHECK(entries[5]["back_dated"] == true);
  CHECK(entries[4]["back_dated"] == false);
  CHECK(entries[5]["values"]["lot_withdrawals"][0]["reason"] == "seal broken on arrival");

  j = ok_json(box, {"audit", "verify", "--json"});
  CHECK(j["entries"] == 6);
  CHECK(j["ok"] == true);
  CHECK(j["first_broken"].is_null());
  CHECK(j["head_hash"] == entries[5]["hash"]);
  const RunResult text = box.run({"audit", "verify"});
  CHECK(text.exit_code == 0);
  CHECK_THAT(text.out, Catch::Contains("Audit trail intact: 6 entries"));
}

TEST_CASE("e2e registry: shown as of a moment, nothing recorded after it appears", "[e2e]") {
  Sandbox box;
  box.now = "2026-03-04T09:00:00Z";
  REQUIRE(box.run({"init", "--tz", "UTC"}).exit_code == 0);
  REQUIRE(box.run({"instrument", "add", "IC-02"}).exit_code == 0);
  REQUIRE(box.run({"lot", "add", "CRM-1", "--material", "m", "--expires", "2027-03-31", "--value",
                   "nitrate=1000"})
              .exit_code == 0);
  box.now = "2026-03-05T10:00:00Z";
  REQUIRE(box.run({"instrument", "service", "IC-02", "--out", "--reason", "pump seal"}).exit_code ==
          0);
  REQUIRE(box.run({"lot", "withdraw", "CRM-1", "--reason", "seal broken"}).exit_code == 0);
  for (const char* at : {"2026-03-05T09:00:00Z", "2026-03-05T11:00:00Z"}) {
    INFO(at);
    const bool after = std::string(at) > "2026-03-05T10:00:00Z";
    const Json i = ok_json(box, {"instrument", "show", "IC-02", "--at", at, "--json"});
    CHECK(i["service"].size() == (after ? 1u : 0u));
    CHECK(i["in_service"] == !after);
    const Json lot = ok_json(box, {"lot", "show", "CRM-1", "--at", at, "--json"});
    CHECK(lot["status"] == (after ? "withdrawn" : "usable"));
    CHECK(lot["withdrawn_at"].is_null() == !after);
    CHECK(lot["withdrawal_reason"].is_null() == !after);
    const Json lots = ok_json(box, {"lot", "list", "--at", at, "--json"});
    CHECK(lots["lots"][0]["withdrawn_at"].is_null() == !after);
    const RunResult text = box.run({"lot", "show", "CRM-1", "--at", at});
    CHECK((text.out.find("seal broken") == std::string::npos) == !after);
  }
}

TEST_CASE("e2e registry: the text output of the registry commands", "[e2e]") {
  Sandbox box;
  box.write_file("anion.toml", cw::test::method_toml());
  REQUIRE(box.run({"init", "--lab", "Water lab", "--tz", "Europe/Berlin"}).exit_code == 0);
  RunResult r = box.run({"instrument", "add", "IC-02", "--name", "Ion chromatograph"});
  CHECK(r.exit_code == 0);
  CHECK(r.out == "Registered instrument IC-02 (Ion chromatograph).\n");
  r = box.run({"method", "add", "anion.toml"});
  CHECK(r.out ==
        "Registered method ANION-IC version 1 (Nitrate and sulfate in drinking water by ion "
        "chromatography).\n");
  // Shown in the lab's zone: 2026-03-31 ends at 2026-04-01 00:00 +02:00 in Berlin.
  r = box.run({"lot", "add", "CRM-1", "--material", "Nitrate CRM", "--expires", "2026-03-31",
               "--value", "nitrate=1000"});
  CHECK(r.out ==
        "Registered lot CRM-1 (Nitrate CRM), usable through 2026-03-31 (until 2026-04-01 00:00 "
        "+02:00).\n");
  r = box.run({"instrument", "service", "IC-02", "--out", "--reason", "pump seal"});
  CHECK(r.exit_code == 0);
  CHECK_THAT(r.out, Catch::Contains("Instrument IC-02 is out of service from 2026-03-02 10:00 "
                                    "+01:00"));
}

TEST_CASE("e2e registry: init is idempotent", "[e2e]") {
  Sandbox box;
  RunResult r = box.run({"init", "--lab", "Water lab", "--tz", "America/New_York", "--json"});
  REQUIRE(r.exit_code == 0);
  const Counts counts = cw::test::table_row_counts(box);
  const std::string bytes = cw::test::read_file(box.db());  // "" on PostgreSQL
  REQUIRE(counts.at("audit_log") == 1);

  // Again, later, without options and with the same options: nothing is written.
  box.now = "2026-03-09T09:00:00Z";
  for (const auto& args : std::vector<std::vector<std::string>>{
           {"init", "--json"},
           {"init", "--lab", "Water lab", "--tz", "America/New_York", "--json"}}) {
    r = box.run(args);
    INFO(r.describe());
    REQUIRE(r.exit_code == 0);
    const Json j = r.json();
    CHECK(j["created"] == false);
    CHECK(j["changed"] == false);
    CHECK(j["lab"] == "Water lab");
    CHECK(j["time_zone"] == "America/New_York");
    CHECK(j["schema_version"] == cw::test::latest_schema_version(box));
    CHECK(j["admin_registered"].is_null());  // the store has its admin already
    CHECK(cw::test::table_row_counts(box) == counts);
    CHECK(cw::test::read_file(box.db()) == bytes);  // not even a page of the file rewritten
  }
  r = box.run({"init"});
  const std::string up_to_date = "Store " + box.location() + " is up to date (schema " +
                                 std::to_string(cw::test::latest_schema_version(box)) +
                                 "): Water lab, time zone America/New_York.\n";
  if (box.backend() == cw::test::Backend::Sqlite) {
    CHECK(r.out == up_to_date);
  } else {
    // A server store: the grants for the database administrator follow (README, "Choosing a
    // backend").
    CHECK(r.out.rfind(up_to_date, 0) == 0);
    CHECK_THAT(r.out, Catch::Contains("GRANT SELECT, INSERT ON TABLE"));
  }

  // A new lab name is a change that needs a reason, recorded as a rename with it.
  r = box.run({"init", "--lab", "Water and soil lab", "--json"});
  CHECK(r.exit_code == 2);
  CHECK_THAT(r.json()["error"]["message"].get<std::string>(), Catch::Contains("needs --reason"));
  CHECK(cw::test::table_row_counts(box) == counts);
  r = box.run({"init", "--lab", "Water and soil lab", "--reason", "soil section joined", "--json"});
  REQUIRE(r.exit_code == 0);
  CHECK(r.json()["changed"] == true);
  CHECK(cw::test::table_row_counts(box).at("audit_log") == 2);
  const Json log = box.run({"audit", "log", "--json"}).json();
  CHECK(log["entries"][1]["action"] == "lab.rename");
  CHECK(log["entries"][1]["reason"] == "soil section joined");
  CHECK(log["entries"][1]["values"]["lab_settings"][0]["time_zone"] == "America/New_York");
}

TEST_CASE("e2e registry: codes that differ only in case are one object to people, refused twice",
          "[e2e]") {
  Sandbox box;
  REQUIRE(box.run({"init", "--tz", "UTC"}).exit_code == 0);
  box.write_file("anion.toml", cw::test::method_toml());
  box.write_file("anion-lower.toml", cw::test::method_toml("anion-ic", "0.995"));
  for (const auto& args : std::vector<std::vector<std::string>>{
           {"instrument", "add", "IC-02"},
           {"method", "add", "anion.toml"},
           {"lot", "add", "CRM-A1", "--material", "anion standard", "--expires", "2027-03-31",
            "--value", "nitrate=1000"}}) {
    const RunResult r = box.run(args);
    INFO(r.describe());
    REQUIRE(r.exit_code == 0);
  }
  const Counts before = cw::test::table_row_counts(box);
  struct Twin {
    std::vector<std::string> args;
    std::string registered;
  };
  for (const auto& twin :
       std::vector<Twin>{{{"instrument", "add", "ic-02", "--json"}, "instrument 'IC-02'"},
                         {{"method", "add", "anion-lower.toml", "--json"}, "method 'ANION-IC'"},
                         {{"lot", "add", "crm-a1", "--material", "m", "--expires", "2027-03-31",
                           "--value", "nitrate=1000", "--json"},
                          "lot 'CRM-A1'"}}) {
    const RunResult r = box.run(twin.args);
    INFO(r.describe());
    CHECK(r.exit_code == 2);
    const Json e = r.json()["error"];
    CHECK_THAT(e["message"].get<std::string>(),
               Catch::Contains(twin.registered + " is already registered") &&
                   Catch::Contains("differs from it only in case"));
  }
  CHECK(box.run({"method", "add", "anion-lower.toml", "--json"}).json()["error"]["file"] ==
        "anion-lower.toml");
  const RunResult revise =
      box.run({"method", "revise", "anion-lower.toml", "--reason", "tighter r2"});
  CHECK(revise.exit_code == 2);
  CHECK_THAT(revise.err, Catch::Contains("did you mean 'ANION-IC'?"));
  CHECK(cw::test::table_row_counts(box) == before);
  CHECK(box.run({"audit", "verify"}).exit_code == 0);
  // Looking one up in the wrong case names the registered code.
  for (const auto& [args, registered] :
       std::vector<std::pair<std::vector<std::string>, std::string>>{
           {{"instrument", "show", "ic-02"}, "'IC-02'"},
           {{"method", "show", "Anion-IC"}, "'ANION-IC'"},
           {{"lot", "show", "crm-a1"}, "'CRM-A1'"}}) {
    const RunResult r = box.run(args);
    INFO(r.describe());
    CHECK(r.exit_code == 2);
    CHECK_THAT(r.err, Catch::Contains("did you mean " + registered));
  }
}

TEST_CASE("e2e registry: a lot that never expires ends with the last moment the store holds",
          "[e2e]") {
  // The end of 9999-12-31 is 10000-01-01 00:00 in the lab's zone, which no four-digit ISO-8601
  // time can write: shown as the end of that day. In JSON it is the instant itself where the
  // store holds it (Kiritimati, UTC+14: 9999-12-31T10:00:00Z), else the last moment it holds
  // (New York: 10000-01-01T05:00:00Z would be past it).
  for (const auto& [zone, until] : std::vector<std::pair<std::string, std::string>>{
           {"America/New_York", "9999-12-31T23:59:59Z"},
           {"Pacific/Kiritimati", "9999-12-31T10:00:00Z"}}) {
    INFO(zone);
    Sandbox box;
    REQUIRE(box.run({"init", "--tz", zone}).exit_code == 0);
    const RunResult added = box.run({"lot", "add", "CRM-NX", "--material", "m", "--expires",
                                     "9999-12-31", "--value", "nitrate=1000"});
    INFO(added.describe());
    REQUIRE(added.exit_code == 0);
    CHECK_THAT(added.out, Catch::Contains("(until the end of 9999-12-31)"));
    CHECK_THAT(added.out, !Catch::Contains("10000"));
    const RunResult shown = box.run({"lot", "show", "CRM-NX"});
    CHECK_THAT(shown.out, Catch::Contains("usable until the end of 9999-12-31\n"));
    CHECK(box.run({"lot", "show", "CRM-NX", "--json"}).json()["usable_until"] == until);
    const RunResult listed = box.run({"lot", "list", "--csv"});
    INFO(listed.describe());
    CHECK_THAT(listed.out, !Catch::Contains("10000"));
  }
}
