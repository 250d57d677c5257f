// SPDX-License-Identifier: Apache-2.0
// store copy --from SRC --to DST: a whole store copied verbatim into an empty one; both ends
// verify with the same head hash. The round trip runs on the sandbox's backend (SQLite, or
// PostgreSQL in the pg: run); the refusals that tamper with a file are about SQLite files.
#include <catch2/catch.hpp>
#include <filesystem>
#include <map>
#include <string>

#include "harness.h"

namespace {

using cw::test::RunResult;
using cw::test::Sandbox;

/// A store with a bit of everything: users, passphrases and signatures, an instrument taken out
/// of service, a method, a lot with values, withdrawn.
void fill(const Sandbox& box) {
  REQUIRE(box.run({"init", "--tz", "Europe/Berlin", "--lab", "Copy test lab"}).exit_code == 0);
  REQUIRE(box.add_user("bob").exit_code == 0);
  REQUIRE(box.run({"instrument", "add", "IC-01", "--name", "Ion chromatograph"}).exit_code == 0);
  REQUIRE(box.run({"instrument", "service", "IC-01", "--out", "--reason", "pump seal"}).exit_code ==
          0);
  box.write_file("method.toml", cw::test::method_toml());
  REQUIRE(box.run({"method", "add", "method.toml"}).exit_code == 0);
  REQUIRE(box.run({"lot", "add", "CRM-1", "--material", "Anion standard", "--expires", "2027-06-30",
                   "--value", "nitrate=1000±4", "--value", "sulfate=1000"})
              .exit_code == 0);
  REQUIRE(box.run({"lot", "withdraw", "CRM-1", "--reason", "cap found open"}).exit_code == 0);
}

std::string head_of(const Sandbox& box, const std::string& location) {
  const RunResult v = box.run({"--db", location, "audit", "verify", "--json"});
  INFO(v.describe());
  REQUIRE(v.exit_code == 0);
  REQUIRE(v.json().at("ok") == true);
  return v.json().at("head_hash").get<std::string>();
}

/// The counts of the audit trail and the fact tables (what a copy carries): not each backend's
/// own bookkeeping (SQLite's internal tables, PostgreSQL's mark curvewarden_store, the record of
/// migrations) nor the derived settled_tallies and settled_totals (built on the copy from the
/// facts, so its rows may be fewer than the source's incremental ones).
std::map<std::string, std::int64_t> carried(std::map<std::string, std::int64_t> counts) {
  std::erase_if(counts, [](const auto& entry) {
    return entry.first.rfind("sqlite_", 0) == 0 || entry.first == "schema_migrations" ||
           entry.first == "curvewarden_store" || entry.first == "settled_tallies" ||
           entry.first == "settled_totals";
  });
  return counts;
}

}  // namespace

TEST_CASE("e2e store copy: a round trip through another store verifies with the same head hash",
          "[e2e][store-copy]") {
  Sandbox box;
  fill(box);
  REQUIRE(box.run({"audit", "anchor", "--out", "source.anchor"}).exit_code == 0);
  const std::string head = head_of(box, box.location());
  // The middle store: a new file on SQLite, a fresh empty database on PostgreSQL.
  Sandbox middle;

  const RunResult out =
      box.run({"store", "copy", "--from", box.location(), "--to", "out.db", "--json"});
  INFO(out.describe());
  REQUIRE(out.exit_code == 0);
  const auto doc = out.json();
  CHECK(doc.at("source_head_hash") == head);
  CHECK(doc.at("destination_head_hash") == head);
  CHECK(doc.at("entries") ==
        std::stoll(cw::test::query_text(box, "SELECT count(*) FROM audit_log")));
  CHECK(doc.at("tables").at("signatures").get<int>() > 0);
  CHECK(doc.at("tables").at("lot_withdrawals") == 1);
  CHECK((std::filesystem::status(box.path("out.db")).permissions() & std::filesystem::perms::all) ==
        (std::filesystem::perms::owner_read | std::filesystem::perms::owner_write));
  CHECK(head_of(box, "out.db") == head);
  const auto counts = carried(cw::test::table_row_counts(box.path("out.db")));
  CHECK(counts.size() == 28);  // the audit trail and every fact table
  CHECK(carried(cw::test::table_row_counts(box)) == counts);

  const RunResult there = box.run({"store", "copy", "--from", "out.db", "--to", middle.location()});
  INFO(there.describe());
  REQUIRE(there.exit_code == 0);
  CHECK_THAT(there.out, Catch::Contains("head hash of the copy   " + head));
  CHECK(head_of(box, middle.location()) == head);
  CHECK(carried(cw::test::table_row_counts(middle)) == counts);

  const RunResult back = box.run({"store", "copy", "--from", middle.location(), "--to", "back.db"});
  INFO(back.describe());
  REQUIRE(back.exit_code == 0);
  CHECK(head_of(box, "back.db") == head);
  CHECK(carried(cw::test::table_row_counts(box.path("back.db"))) == counts);

  // The copy is a working store: the lab's users sign in it, and its ids continue after the
  // copied ones.
  REQUIRE(box.run({"--db", "back.db", "lot", "add", "CRM-2", "--material", "Anion standard",
                   "--expires", "2027-06-30", "--value", "nitrate=1000"})
              .exit_code == 0);
  // A signed act: alice's passphrase hash came along.
  const RunResult signed_act = box.run(
      {"--db", "back.db", "instrument", "service", "IC-01", "--back", "--reason", "seal replaced"});
  INFO(signed_act.describe());
  CHECK(signed_act.exit_code == 0);
  CHECK(cw::test::query_text(box.path("back.db"), "SELECT max(id) FROM lots") == "2");
  // A checkpoint signed on the source holds in the copy (with the lab key, which is a file of its
  // own and not part of the store).
  const RunResult v = box.run({"--db", "back.db", "audit", "verify", "--anchor", "source.anchor",
                               "--key", box.key().string(), "--json"});
  INFO(v.describe());
  CHECK(v.exit_code == 0);
  CHECK(v.json().at("anchors").at(0).at("contained") == true);
  // Nothing was added to the source's trail.
  CHECK(head_of(box, box.location()) == head);
}

TEST_CASE("e2e store copy: a destination that holds anything is refused and left as it was",
          "[e2e][store-copy]") {
  Sandbox box;
  fill(box);
  Sandbox other;
  REQUIRE(other.run({"init", "--tz", "UTC"}).exit_code == 0);
  const auto before = cw::test::table_row_counts(other);
  const RunResult r =
      box.run({"store", "copy", "--from", box.location(), "--to", other.location()});
  CHECK(r.exit_code == 2);
  CHECK_THAT(r.err, Catch::Contains("writes only into an empty store"));
  CHECK(cw::test::table_row_counts(other) == before);
  CHECK(other.run({"audit", "verify"}).exit_code == 0);

  const RunResult same =
      box.run({"store", "copy", "--from", box.location(), "--to", box.location()});
  CHECK(same.exit_code == 2);
  CHECK_THAT(same.err, Catch::Contains("the same store"));
}

TEST_CASE("e2e store copy: bad --from and --to are refused naming the option",
          "[e2e][store-copy]") {
  Sandbox box;
  fill(box);
  RunResult r = box.run({"store", "copy", "--from", "missing.db", "--to", "new.db", "--json"});
  CHECK(r.exit_code == 2);
  CHECK(r.json().at("error").at("option") == "--from");
  CHECK_FALSE(std::filesystem::exists(box.path("new.db")));
  r = box.run(
      {"store", "copy", "--from", box.location(), "--to", "no/such/folder/new.db", "--json"});
  CHECK(r.exit_code == 2);
  CHECK(r.json().at("error").at("option") == "--to");
  r = box.run({"store", "copy", "--from", box.location()});
  CHECK(r.exit_code == 2);
  // A malformed PostgreSQL URI is named by the option that gave it (as --db and CURVEWARDEN_DB
  // are for the other commands).
  const std::string bad_uri = "postgresql://cw@127.0.0.1:notaport/x";
  r = box.run({"store", "copy", "--from", box.location(), "--to", bad_uri, "--json"});
  CHECK(r.exit_code == 2);
  CHECK(r.json().at("error").at("option") == "--to");
  CHECK_THAT(r.json().at("error").at("message").get<std::string>(),
             Catch::StartsWith("--to: '" + bad_uri + "' is not a usable PostgreSQL"));
  r = box.run({"store", "copy", "--from", bad_uri, "--to", "new.db", "--json"});
  CHECK(r.exit_code == 2);
  CHECK(r.json().at("error").at("option") == "--from");
  CHECK_FALSE(std::filesystem::exists(box.path("new.db")));
  r = box.run({"--db", bad_uri, "status", "--json"});
  CHECK(r.exit_code == 2);
  CHECK(r.json().at("error").at("option") == "--db");
  r = box.run({"status", "--json"}, {{"CURVEWARDEN_DB", bad_uri}});
  CHECK(r.exit_code == 2);
  CHECK(r.json().at("error").at("option") == "CURVEWARDEN_DB");
  box.write_file("notes.txt", "not a store, and precious");
  r = box.run({"store", "copy", "--from", box.location(), "--to", "notes.txt"});
  CHECK(r.exit_code == 4);
  CHECK(cw::test::read_file(box.path("notes.txt")) == "not a store, and precious");
}

TEST_CASE("e2e store copy: a tampered source is refused before anything is written",
          "[e2e][store-copy][sqlite-only]") {
  Sandbox box;
  fill(box);
  // An edit behind the tool's back: the guard dropped, a row changed, the guard put back.
  const std::string trigger =
      cw::test::query_text(box.db(), "SELECT sql FROM sqlite_master WHERE name = 'lots_no_update'");
  REQUIRE(cw::test::exec_sql(box.db(),
                             "DROP TRIGGER lots_no_update; UPDATE lots SET material = "
                             "'something else'; " +
                                 trigger) == 0);
  RunResult r = box.run({"store", "copy", "--from", box.location(), "--to", "copy.db"});
  INFO(r.describe());
  CHECK(r.exit_code == 5);
  CHECK_THAT(r.err, Catch::Contains("nothing was copied"));
  CHECK_FALSE(std::filesystem::exists(box.path("copy.db")));
  CHECK_FALSE(std::filesystem::exists(box.path("copy.db-wal")));

  // Without its guard the source is refused too (exit 4), before a new file is made.
  REQUIRE(cw::test::exec_sql(box.db(), "DROP TRIGGER lots_no_update") == 0);
  REQUIRE(box.run({"store", "copy", "--from", box.location(), "--to", "fresh.db"}).exit_code == 4);
  CHECK_FALSE(std::filesystem::exists(box.path("fresh.db")));
}

TEST_CASE("e2e store copy: a source below the latest schema is refused, not upgraded",
          "[e2e][store-copy][sqlite-only]") {
  // A store written by the version before runs existed (schema 4): copying must not change it.
  Sandbox box;
  box.write_file("old.db", "");  // an empty file is an empty SQLite database
  const auto old = box.path("old.db");
  std::string error;
  REQUIRE(cw::test::exec_sql(
              old, cw::test::read_file(std::string(CW_TEST_DATA_DIR) + "/stores/schema4-demo.sql"),
              &error) == 0);
  INFO(error);
  const std::string before = cw::test::read_file(old);
  RunResult r = box.run({"store", "copy", "--from", old.string(), "--to", "copy.db", "--json"});
  INFO(r.describe());
  CHECK(r.exit_code == 4);
  CHECK_THAT(r.json().at("error").at("message").get<std::string>(),
             Catch::Contains("schema version 4") && Catch::Contains("nothing was written"));
  CHECK(cw::test::read_file(old) == before);
  CHECK(cw::test::query_text(old, "PRAGMA user_version") == "4");
  CHECK_FALSE(std::filesystem::exists(box.path("copy.db")));
  // Upgraded by an ordinary command, it copies.
  REQUIRE(box.run({"--db", old.string(), "audit", "verify"}).exit_code == 0);
  r = box.run({"store", "copy", "--from", old.string(), "--to", "copy.db"});
  INFO(r.describe());
  CHECK(r.exit_code == 0);
}
