// SPDX-License-Identifier: Apache-2.0
// A store written before runs existed (schema 4, tests/data/stores/schema4-demo.sql: the demo
// lab's first day, 26 audit entries) opens with this build: migrations 0006 and later are
// applied, every fact row and entry still verifies, and the head hash is the one the old store
// had, so a head hash recorded outside the store before the upgrade still matches. Migration
// 0007 registers the names of the old trail as disabled users, with entries appended after the
// old head; the old entries keep their hashes.
#include <catch2/catch.hpp>

#include <nlohmann/json.hpp>
#include <string>

#include "store/sqlite/open.h"
#include "store/store.h"
#include "store_test_support.h"

#ifndef CW_TEST_DATA_DIR
#error "CW_TEST_DATA_DIR must name tests/data (see tests/unit/store/CMakeLists.txt)"
#endif

namespace {

using cw::store_test::RawDb;

const std::string kFixture = std::string(CW_TEST_DATA_DIR) + "/stores/schema4-demo.sql";

/// Row counts of the tables a schema-4 store has.
std::vector<std::vector<std::string>> old_counts(RawDb& raw) {
  std::vector<std::vector<std::string>> out;
  for (const char* table :
       {"audit_log", "lab_settings", "instruments", "instrument_service_events", "methods",
        "method_versions", "lots", "lot_values", "lot_withdrawals", "calibrations",
        "calibration_lots", "curves", "curve_points", "curve_reviews", "curve_retirements",
        "refusals", "checks", "results"}) {
    out.push_back({table, raw.text(std::string("SELECT count(*) FROM ") + table)});
  }
  return out;
}

}  // namespace

TEST_CASE("store: a schema-4 store migrates and still verifies with the same head hash",
          "[store][upgrade]") {
  cw::store_test::TempDir tmp;
  const auto path = tmp / "demo.db";
  std::string head_before;
  std::vector<std::vector<std::string>> counts_before;
  {
    RawDb raw(path, /*create=*/true);
    std::string error;
    REQUIRE(raw.exec(cw::store_test::read_bytes(kFixture), &error) == 0);
    INFO(error);
    REQUIRE(raw.integer("PRAGMA user_version") == 4);
    REQUIRE(raw.integer("SELECT count(*) FROM audit_log") == 26);
    head_before = raw.text("SELECT hash FROM audit_log ORDER BY seq DESC LIMIT 1");
    counts_before = old_counts(raw);
  }

  cw::store::OpenOptions o;
  o.location = path.string();
  auto store = cw::store::Store::open(o);
  CHECK(store->schema_version() == cw::store::sqlite::embedded_migrations().back().version);
  CHECK(store->missing_guards().empty());
  const auto report = store->read()->audit().verify();
  INFO(report.problem);
  CHECK(report.ok);
  // Two names in the old trail (r.okafor, j.lindqvist): two entries registering them.
  CHECK(report.entries == 26 + 2);
  // Migration 0009 built the tally steps of the three old curves from their facts.
  CHECK_FALSE(store->read()->curves().settled_tallies_disagreement().has_value());

  RawDb raw(path);
  CHECK(raw.text("SELECT hash FROM audit_log WHERE seq = 26") == head_before);
  CHECK(raw.text("SELECT group_concat(action || ':' || entity_id || ':' || actor, ',') FROM "
                 "(SELECT * FROM audit_log WHERE seq > 26 ORDER BY seq)") ==
        "user.register-legacy:r.okafor:curvewarden,user.register-legacy:j.lindqvist:curvewarden");
  CHECK(
      raw.text("SELECT group_concat(u.code || ':' || e.status || ':' || e.role, ',') FROM users u "
               "JOIN user_events e ON e.user_id = u.id") ==
      "r.okafor:disabled:analyst,j.lindqvist:disabled:analyst");
  // The old entries have no operating-system login; the new ones do.
  CHECK(raw.integer("SELECT count(*) FROM audit_log WHERE os_login IS NULL") == 26);
  auto old_now = old_counts(raw);
  old_now.erase(old_now.begin());  // audit_log: compared above
  counts_before.erase(counts_before.begin());
  CHECK(old_now == counts_before);  // the migration added tables and entries, not old rows
  CHECK(raw.integer("SELECT count(DISTINCT curve_id) FROM settled_tallies") == 3);
  CHECK(raw.integer("SELECT count(*) FROM runs") == 0);
  CHECK(raw.integer("SELECT count(*) FROM result_status_events") == 0);
  CHECK(raw.integer("SELECT max(version) FROM schema_migrations") ==
        cw::store::sqlite::embedded_migrations().back().version);
}

TEST_CASE("store: names of an old trail become disabled users, one per name whatever its case",
          "[store][upgrade]") {
  cw::store_test::TempDir tmp;
  const auto path = tmp / "old.db";
  auto migrations = cw::store::sqlite::embedded_migrations();
  migrations.resize(6);  // a store as schema 6 made it
  {
    cw::store::OpenOptions o;
    o.location = path.string();
    o.create = true;
    cw::store::sqlite::open_sqlite(o, migrations);
  }
  // Three entries with free-text actors, hashed by hand in the canonical form of schema 6
  // (DEVELOPERS.md: ten-element header, empty payload "{}").
  std::vector<std::string> hashes;
  {
    RawDb raw(path);
    std::string prev(64, '0');
    std::int64_t seq = 1;
    for (const char* actor : {"Ana Ruiz", "ana ruiz", "Bo"}) {
      const nlohmann::json header = {seq,
                                     "2026-01-05T08:00:00Z",
                                     "2026-01-05T08:00:00Z",
                                     actor,
                                     "note.add",
                                     "note",
                                     "1",
                                     nullptr,
                                     false,
                                     "old 0.1"};
      const std::string hash =
          cw::store_test::evp_sha256_hex(prev + "\n" + header.dump() + "\n" + "{}");
      REQUIRE(raw.exec("INSERT INTO audit_log (seq, recorded_at, occurred_at, actor, action, "
                       "entity_kind, entity_id, reason, clock_overridden, tool_version, payload, "
                       "prev_hash, hash) VALUES (" +
                       std::to_string(seq) + ", '2026-01-05T08:00:00Z', '2026-01-05T08:00:00Z', '" +
                       actor + "', 'note.add', 'note', '1', NULL, 0, 'old 0.1', '{}', '" + prev +
                       "', '" + hash + "')") == SQLITE_OK);
      hashes.push_back(hash);
      prev = hash;
      ++seq;
    }
  }
  cw::store::OpenOptions o;
  o.location = path.string();
  o.os_login = "labtech";
  auto store = cw::store::Store::open(o);
  auto unit = store->read();
  const auto report = unit->audit().verify();
  INFO(report.problem);
  CHECK(report.ok);
  CHECK(report.entries == 3 + 2);
  const auto users = unit->registry().users();
  REQUIRE(users.size() == 2);
  CHECK(users[0].code == "ana ruiz");
  CHECK(users[0].name == "Ana Ruiz");  // the first spelling
  CHECK_FALSE(users[0].enabled());
  CHECK(users[1].code == "bo");
  CHECK_FALSE(users[1].enabled());
  RawDb raw(path);
  CHECK(raw.text("SELECT group_concat(hash, ',') FROM (SELECT hash FROM audit_log WHERE seq <= 3 "
                 "ORDER BY seq)") == hashes[0] + "," + hashes[1] + "," + hashes[2]);
  CHECK(raw.text("SELECT group_concat(os_login, ',') FROM audit_log WHERE seq > 3") ==
        "labtech,labtech");
  // Opening again registers nothing more.
  unit.reset();
  store.reset();
  CHECK(cw::store::Store::open(o)->read()->audit().verify().entries == 5);
}
