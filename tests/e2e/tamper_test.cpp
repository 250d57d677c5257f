// SPDX-License-Identifier: Apache-2.0
// End-to-end tamper tests: the append-only triggers refuse changes made with plain SQL, and
// once they are dropped, 'curvewarden audit verify' finds every edited, deleted or forged row
// and names the first entry that no longer holds (exit 5). The edits are SQLite's SQL on the
// store file: [sqlite-only].
#include <catch2/catch.hpp>
#include <string>
#include <vector>

#include "harness.h"

namespace {

using cw::test::RunResult;
using cw::test::Sandbox;
using Json = nlohmann::json;

constexpr int kSqliteConstraint = 19;  // SQLITE_CONSTRAINT: what RAISE(ABORT, ...) returns

/// A store with six audit entries:
///   1 lab.init, 2 instrument.add IC-02, 3 method.add ANION-IC, 4 lot.add CRM-1 (two values),
///   5 instrument.service-out IC-02, 6 lot.withdraw CRM-1.
void populate(Sandbox& box) {
  box.write_file("anion.toml", cw::test::method_toml());
  for (const auto& args : std::vector<std::vector<std::string>>{
           {"init", "--lab", "Water lab", "--tz", "Europe/Berlin"},
           {"instrument", "add", "IC-02", "--name", "Ion chromatograph"},
           {"method", "add", "anion.toml"},
           {"lot", "add", "CRM-1", "--material", "Nitrate CRM", "--expires", "2027-03-31",
            "--value", "nitrate=1000±5", "--value", "sulfate=500"},
           {"instrument", "service", "IC-02", "--out", "--reason", "pump seal"},
           {"lot", "withdraw", "CRM-1", "--reason", "seal broken"}}) {
    const RunResult r = box.run(args);
    INFO(r.describe());
    REQUIRE(r.exit_code == 0);
  }
  REQUIRE(cw::test::query_text(box.db(), "SELECT count(*) FROM audit_log") == "6");
}

void drop_all_triggers(const Sandbox& box) {
  const std::string list =
      cw::test::query_text(box.db(),
                           "SELECT group_concat('DROP TRIGGER ' || name, '; ') FROM sqlite_master "
                           "WHERE type = 'trigger'");
  REQUIRE(cw::test::exec_sql(box.db(), list) == 0);
  REQUIRE(cw::test::query_text(box.db(),
                               "SELECT count(*) FROM sqlite_master WHERE type = 'trigger'") == "0");
}

}  // namespace

TEST_CASE("e2e tamper: the triggers refuse UPDATE and DELETE on facts and on the trail",
          "[e2e][sqlite-only]") {
  Sandbox box;
  populate(box);
  const auto counts = cw::test::table_row_counts(box.db());
  const std::string bytes = cw::test::read_file(box.db());

  struct Attempt {
    const char* sql;
    const char* message;
  };
  const Attempt attempts[] = {
      {"UPDATE instruments SET name = 'forged'",
       "instruments is append-only: rows cannot be changed"},
      {"DELETE FROM lots WHERE code = 'CRM-1'", "lots is append-only: rows cannot be deleted"},
      {"UPDATE lot_values SET value = 999 WHERE analyte = 'nitrate'",
       "lot_values is append-only: rows cannot be changed"},
      {"DELETE FROM lot_withdrawals", "lot_withdrawals is append-only: rows cannot be deleted"},
      {"DELETE FROM instrument_service_events",
       "instrument_service_events is append-only: rows cannot be deleted"},
      {"UPDATE method_versions SET source_text = ''",
       "method_versions is append-only: rows cannot be changed"},
      {"DELETE FROM lab_settings", "lab_settings is append-only: rows cannot be deleted"},
      {"UPDATE audit_log SET actor = 'mallory' WHERE seq = 2",
       "audit_log is append-only: rows cannot be changed"},
      {"DELETE FROM audit_log WHERE seq = 6", "audit_log is append-only: rows cannot be deleted"},
      {"UPDATE schema_migrations SET sha256 = hex(zeroblob(32))",
       "schema_migrations is append-only: rows cannot be changed"},
  };
  for (const auto& a : attempts) {
    INFO(a.sql);
    std::string error;
    CHECK(cw::test::exec_sql(box.db(), a.sql, &error) == kSqliteConstraint);
    CHECK(error == a.message);
  }
  CHECK(cw::test::table_row_counts(box.db()) == counts);
  CHECK(cw::test::read_file(box.db()) == bytes);
  const RunResult verify = box.run({"audit", "verify", "--json"});
  CHECK(verify.exit_code == 0);
  CHECK(verify.json()["ok"] == true);
}

TEST_CASE("e2e tamper: audit verify names the first entry that no longer holds",
          "[e2e][sqlite-only]") {
  struct Tamper {
    const char* name;
    std::string sql;
    bool drop_triggers;
    long entries;       // audit entries left
    long first_broken;  // the entry verify must name
    const char* problem;
  };
  const std::vector<Tamper> tampers = {
      {"an audit entry's actor is edited", "UPDATE audit_log SET actor = 'mallory' WHERE seq = 3",
       true, 6, 3,
       "entry 3 (method.add method/ANION-IC, recorded 2026-03-02T09:00:00Z) was "
       "changed after it was written"},
      {"an audit entry's payload is edited",
       "UPDATE audit_log SET payload = replace(payload, '1000.0', '100.0') WHERE seq = 4", true, 6,
       4, "its hash does not match"},
      {"a fact row is edited", "UPDATE lot_values SET value = 100.0 WHERE analyte = 'nitrate'",
       true, 6, 4, "row lot_values id 1 differs from what was recorded"},
      {"a fact row and its payload are edited together",
       "UPDATE lot_values SET value = 100.0 WHERE analyte = 'nitrate';"
       "UPDATE audit_log SET payload = replace(payload, '1000.0', '100.0') WHERE seq = 4",
       true, 6, 4, "its hash does not match"},
      {"a fact row is deleted", "DELETE FROM lot_withdrawals", true, 6, 6,
       "row lot_withdrawals id 1 is missing from the store"},
      {"a fact row in the middle is deleted", "DELETE FROM instrument_service_events", true, 6, 5,
       "row instrument_service_events id 1 is missing from the store"},
      {"an audit entry is deleted", "DELETE FROM audit_log WHERE seq = 2", true, 5, 2,
       "entry 2 is missing"},
      {"the last audit entry is deleted, its rows stay", "DELETE FROM audit_log WHERE seq = 6",
       true, 5, 6, "row lot_withdrawals id 1 has no audit entry"},
      {"a fact row is added behind the tool's back",
       "INSERT INTO instruments (code, registered_at, audit_seq) "
       "VALUES ('IC-66', '2026-03-02T09:00:00Z', 2)",
       false, 6, 2, "row instruments id 2 has no audit entry"},
      // REPLACE deletes the old row without firing delete triggers (SQLite runs them for
      // REPLACE only with recursive_triggers on, per its documentation of ON CONFLICT), so the
      // triggers do not stop this one; verify does.
      {"a fact row is replaced despite the triggers",
       "INSERT OR REPLACE INTO instruments (id, code, name, registered_at, audit_seq) "
       "VALUES (1, 'IC-02', 'forged', '2026-03-02T09:00:00Z', 2)",
       false, 6, 2, "row instruments id 1 differs from what was recorded"},
  };

  for (const auto& t : tampers) {
    DYNAMIC_SECTION(t.name) {
      Sandbox box;
      populate(box);
      if (t.drop_triggers) drop_all_triggers(box);
      std::string error;
      REQUIRE(cw::test::exec_sql(box.db(), t.sql, &error) == 0);
      INFO("sql error: " << error);

      const RunResult text = box.run({"audit", "verify"});
      INFO(text.describe());
      CHECK(text.exit_code == 5);
      CHECK_THAT(text.err, Catch::StartsWith("curvewarden: error: audit trail broken at entry " +
                                             std::to_string(t.first_broken) + ": "));
      CHECK_THAT(text.err, Catch::Contains(t.problem));
      CHECK_THAT(text.out, Catch::StartsWith("AUDIT TRAIL BROKEN at entry " +
                                             std::to_string(t.first_broken) + ": "));

      const RunResult json = box.run({"audit", "verify", "--json"});
      INFO(json.describe());
      CHECK(json.exit_code == 5);
      const Json j = json.json();
      CHECK(j["entries"] == t.entries);
      CHECK(j["ok"] == false);
      CHECK(j["first_broken"] == t.first_broken);
      CHECK_THAT(j["problem"].get<std::string>(), Catch::Contains(t.problem));
      CHECK(j["head_hash"].is_null());
    }
  }
}

TEST_CASE("e2e tamper: a trail cut short with its rows is found only by the head hash",
          "[e2e][sqlite-only]") {
  // Removing the last entry together with every row it wrote leaves a chain that holds: the
  // head hash recorded outside the store (as 'audit verify' advises) is what shows the cut.
  Sandbox box;
  populate(box);
  const Json before = box.run({"audit", "verify", "--json"}).json();
  REQUIRE(before["ok"] == true);
  drop_all_triggers(box);
  REQUIRE(
      cw::test::exec_sql(box.db(),
                         "DELETE FROM lot_withdrawals; DELETE FROM signatures WHERE audit_seq = 6; "
                         "DELETE FROM audit_log WHERE seq = 6") == 0);
  // The chain itself holds; the store is still reported damaged (exit 4) because its append-only
  // guards were dropped to make the cut.
  const RunResult after = box.run({"audit", "verify", "--json"});
  CHECK(after.exit_code == 4);
  const Json j = after.json();
  CHECK(j["entries"] == 5);
  CHECK(j["chain_intact"] == true);
  CHECK(j["ok"] == false);
  CHECK(j["missing_guards"].size() == 62);  // two per table: 27 fact tables, trail, migrations,
                                            // the derived settled_tallies and settled_totals
  CHECK(j["head_hash"] != before["head_hash"]);
  CHECK(j["head_hash"] ==
        cw::test::query_text(box.db(), "SELECT hash FROM audit_log WHERE seq = 5"));
}
