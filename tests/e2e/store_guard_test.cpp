// SPDX-License-Identifier: Apache-2.0
// Damage is exit 4 and the lab's zone holds: a store whose append-only guards were dropped
// refuses every write and `audit verify` names the missing triggers; a stored value that no
// longer reads back is reported as damage, never read as something else; `init --tz` on a store
// that holds records is refused and recorded; reading commands may look into the future.
#include <catch2/catch.hpp>
#include <string>
#include <vector>

#include "harness.h"

namespace {

using cw::test::RunResult;
using cw::test::Sandbox;
using Json = nlohmann::json;

const char* const kPoints =
    "analyte,level,nominal,response\n"
    "nitrate,1,1,0.101\nnitrate,2,2,0.199\nnitrate,3,5,0.502\nnitrate,4,10,1.001\n"
    "nitrate,5,20,1.998\n";

void run_ok(const Sandbox& box, const std::vector<std::string>& args) {
  const RunResult r = box.run(args);
  INFO(r.describe());
  REQUIRE(r.exit_code == 0);
}

/// Lab, instrument, method, lot and one calibration (curve 1, nitrate) approved by bob.
void populate(Sandbox& box) {
  box.write_file("anion.toml", cw::test::method_toml());
  box.write_file("points.csv", kPoints);
  run_ok(box, {"init", "--lab", "Water lab", "--tz", "Europe/Berlin"});
  run_ok(box, {"user", "add", "bob", "--name", "Test user bob", "--role", "reviewer"});
  run_ok(box, {"instrument", "add", "IC-02"});
  run_ok(box, {"method", "add", "anion.toml"});
  run_ok(box, {"lot", "add", "CRM-1", "--material", "Nitrate CRM", "--expires", "2027-03-31",
               "--value", "nitrate=1000±5"});
  box.run({"curve", "log", "--method", "ANION-IC", "--instrument", "IC-02", "--lot", "CRM-1",
           "--points", "points.csv"});
  run_ok(box, {"curve", "review", "1", "--approve", "--reason", "checked", "--as", "bob"});
}

}  // namespace

// The damage below is done with SQLite's SQL on the store file (triggers dropped by name).
TEST_CASE("e2e guards: a store without its append-only triggers refuses writes",
          "[e2e][sqlite-only]") {
  Sandbox box;
  populate(box);
  REQUIRE(cw::test::exec_sql(box.db(), "DROP TRIGGER lots_no_update") == 0);
  const auto counts = cw::test::table_row_counts(box.db());

  const RunResult write = box.run({"instrument", "add", "IC-03", "--json"});
  INFO(write.describe());
  CHECK(write.exit_code == 4);
  CHECK_THAT(write.err, Catch::Contains("has lost its append-only guards (lots_no_update)"));
  CHECK(write.json()["error"]["code"] == "store");
  CHECK(cw::test::table_row_counts(box.db()) == counts);
  // A refusal is a write too: it is not recorded on a store that cannot be trusted.
  CHECK(box.run({"curve", "review", "1", "--approve", "--reason", "x"}).exit_code == 4);
  CHECK(cw::test::table_row_counts(box.db()) == counts);

  // Reading still works, so the lab can see what it has.
  CHECK(box.run({"curve", "list"}).exit_code == 0);
  CHECK(box.run({"status"}).exit_code == 0);

  // The chain itself still holds; verify says so and names the missing guard (exit 4).
  const RunResult verify = box.run({"audit", "verify", "--json"});
  INFO(verify.describe());
  CHECK(verify.exit_code == 4);
  const Json j = verify.json();
  CHECK(j["chain_intact"] == true);
  CHECK(j["ok"] == false);
  CHECK(j["missing_guards"] == Json::array({"lots_no_update"}));
  CHECK(j["error"]["code"] == "store");
  const RunResult text = box.run({"audit", "verify"});
  CHECK_THAT(text.out, Catch::Contains("missing trigger lots_no_update"));
}

TEST_CASE("e2e guards: a stored value that does not read back is damage (exit 4)",
          "[e2e][sqlite-only]") {
  struct Damage {
    const char* name;
    const char* sql;
    std::vector<std::string> command;
    const char* says;
  };
  const std::vector<Damage> damages = {
      {"a time that does not parse",
       "DROP TRIGGER curves_no_update; UPDATE curves SET acquired_at = 'last Tuesday'",
       {"curve", "show", "1"},
       "curves.acquired_at holds the time 'last Tuesday'"},
      {"a model in a method version that names nothing",
       "DROP TRIGGER method_versions_no_update; UPDATE method_versions SET definition = "
       "json_set(definition, '$.calibration.model', 'cubic')",
       {"curve", "show", "1"},
       "method_versions.definition of version id 1 does not hold a method definition"},
      {"a failed criterion that names nothing",
       "DROP TRIGGER curves_no_update; UPDATE curves SET failed_criteria = '[\"too-wobbly\"]'",
       {"curve", "list"},
       "curves.failed_criteria holds the unknown value 'too-wobbly'"},
      {"a method definition that is not JSON",
       "DROP TRIGGER method_versions_no_update; UPDATE method_versions SET definition = '{'",
       {"method", "list"},
       "method_versions.definition holds text that is not JSON"},
      {"a date that does not parse",
       "DROP TRIGGER lots_no_update; UPDATE lots SET expires_on = '31/03/2027'",
       {"lot", "list"},
       "lots.expires_on holds the date '31/03/2027'"},
  };
  for (const auto& d : damages) {
    DYNAMIC_SECTION(d.name) {
      Sandbox box;
      populate(box);
      REQUIRE(cw::test::exec_sql(box.db(), d.sql) == 0);
      std::vector<std::string> args = d.command;
      args.push_back("--json");
      const RunResult r = box.run(args);
      INFO(r.describe());
      CHECK(r.exit_code == 4);
      CHECK_THAT(r.err, Catch::Contains("is damaged"));
      CHECK_THAT(r.err, Catch::Contains(d.says));
      CHECK_THAT(r.err, Catch::Contains("restore the store from a backup"));
      CHECK(r.json()["error"]["code"] == "store");
    }
  }
}

TEST_CASE("e2e guards: the lab's zone is fixed once the store holds records", "[e2e]") {
  Sandbox box;
  run_ok(box, {"init", "--lab", "Water lab", "--tz", "Europe/Berlin"});
  // Before any record, the zone may still be corrected (an audited change).
  run_ok(box, {"init", "--tz", "Europe/Vienna"});
  Json log = box.run({"audit", "log", "--json"}).json();
  CHECK(log["entries"][1]["action"] == "lab.change-zone");

  run_ok(box, {"instrument", "add", "IC-02"});
  const auto counts = cw::test::table_row_counts(box);
  const RunResult r = box.run({"init", "--tz", "America/Chicago", "--json"});
  INFO(r.describe());
  CHECK(r.exit_code == 3);
  CHECK(r.json()["error"]["code"] == "refused");
  CHECK_THAT(r.err,
             Catch::Contains("cannot change to America/Chicago once the store holds records"));
  // The refusal is recorded; the settings are not.
  auto after = cw::test::table_row_counts(box);
  CHECK(after.at("refusals") == counts.at("refusals") + 1);
  CHECK(after.at("lab_settings") == counts.at("lab_settings"));
  log = box.run({"audit", "log", "--json"}).json();
  CHECK(log["entries"].back()["action"] == "lab.change-zone-refused");
  CHECK(box.run({"init", "--json"}).json()["time_zone"] == "Europe/Vienna");
  // The same zone again is no change at all.
  run_ok(box, {"init", "--tz", "Europe/Vienna"});
  CHECK(cw::test::table_row_counts(box) == after);
}

TEST_CASE("e2e guards: reading commands may look into the future, events may not", "[e2e]") {
  Sandbox box;
  populate(box);
  for (const auto& args : std::vector<std::vector<std::string>>{
           {"curve", "list", "--at", "2030-01-01T00:00:00Z"},
           {"status", "--at", "2030-01-01T00:00:00Z"},
           {"expiring", "--within", "30 days", "--at", "2027-01-01T00:00:00Z"},
           {"curve", "show", "1", "--at", "2026-03-09T12:00:00Z"}}) {
    const RunResult r = box.run(args);
    INFO(r.describe());
    CHECK(r.exit_code == 0);
  }
  // Seen a week later, curve 1 has expired; the store was not touched by looking.
  const Json later =
      box.run({"curve", "show", "1", "--at", "2026-03-09T12:00:00Z", "--json"}).json();
  CHECK(later["state"] == "stale");
  // A few minutes of clock skew are tolerated for events; more is refused.
  CHECK(box.run({"instrument", "add", "IC-03", "--at", "2026-03-02T09:04:00Z"}).exit_code == 0);
  CHECK(box.run({"instrument", "add", "IC-04", "--at", "2026-03-02T09:06:00Z"}).exit_code == 2);
}
