// SPDX-License-Identifier: Apache-2.0
// Anchors: a checkpoint signed with the lab key, kept outside the store. Each rewrite below is
// made the way a careful forger would (append-only triggers dropped and put back, every hash
// recomputed with the tool's own canonical form), so that `audit verify` alone finds nothing;
// against the anchor each one is found (exit 5, naming the checkpoint).
// The rewrites use SQLite's SQL on the store file (triggers in sqlite_master): [sqlite-only].
#include <catch2/catch.hpp>
#include <string>
#include <vector>

#include "audit/audit_entry.h"
#include "harness.h"

namespace {

using cw::test::query_text;
using cw::test::RunResult;
using cw::test::Sandbox;
using Json = nlohmann::json;

/// Eight entries; the anchor is taken after the sixth.
void populate(Sandbox& box) {
  box.write_file("anion.toml", cw::test::method_toml());
  for (const auto& args : std::vector<std::vector<std::string>>{
           {"init", "--lab", "Water lab", "--tz", "Europe/Berlin"},
           {"instrument", "add", "IC-02", "--name", "Ion chromatograph"},
           {"instrument", "add", "IC-03", "--name", "Second chromatograph"},
           {"method", "add", "anion.toml"},
           {"lot", "add", "CRM-1", "--material", "Nitrate CRM", "--expires", "2027-03-31",
            "--value", "nitrate=1000"},
           {"instrument", "add", "GC-01"},
           {"audit", "anchor", "--out", "day1.anchor"},
           {"instrument", "add", "GC-02"},
           {"lot", "add", "CRM-2", "--material", "Sulfate CRM", "--expires", "2027-03-31",
            "--value", "sulfate=1000"}}) {
    const RunResult r = box.run(args);
    INFO(r.describe());
    REQUIRE(r.exit_code == 0);
  }
  REQUIRE(query_text(box, "SELECT count(*) FROM audit_log") == "8");
}

/// Runs `sql` with every trigger dropped, then puts the triggers back as they were (the guard
/// check of `audit verify` then finds nothing missing).
void without_guards(const Sandbox& box, const std::string& sql) {
  const std::string triggers = query_text(
      box.db(), "SELECT group_concat(sql, ';\n') || ';' FROM sqlite_master WHERE type = 'trigger'");
  const std::string names =
      query_text(box.db(),
                 "SELECT group_concat('DROP TRIGGER ' || name, ';') || ';' FROM sqlite_master "
                 "WHERE type = 'trigger'");
  std::string error;
  REQUIRE(cw::test::exec_sql(box.db(), names + sql + triggers, &error) == 0);
  INFO(error);
}

/// Recomputes the hash of every entry from `first` on, as the tool would have written them.
void rehash_from(const Sandbox& box, std::int64_t first) {
  const std::int64_t last = std::stoll(query_text(box.db(), "SELECT max(seq) FROM audit_log"));
  std::string prev = first == 1 ? cw::audit::kGenesisHash
                                : query_text(box.db(), "SELECT hash FROM audit_log WHERE seq = " +
                                                           std::to_string(first - 1));
  std::string updates;
  for (std::int64_t seq = first; seq <= last; ++seq) {
    const auto field = [&](const std::string& column) {
      return query_text(box.db(),
                        "SELECT " + column + " FROM audit_log WHERE seq = " + std::to_string(seq));
    };
    cw::audit::AuditEntry e;
    e.seq = seq;
    e.recorded_at = field("recorded_at");
    e.occurred_at = field("occurred_at");
    e.actor = field("actor");
    e.action = field("action");
    e.entity_kind = field("entity_kind");
    e.entity_id = field("entity_id");
    if (field("reason IS NULL") == "0") e.reason = field("reason");
    e.clock_overridden = field("clock_overridden") == "1";
    e.tool_version = field("tool_version");
    if (field("os_login IS NULL") == "0") e.os_login = field("os_login");
    e.payload = field("payload");
    e.prev_hash = prev;
    e.hash = cw::audit::compute_hash(e);
    updates += "UPDATE audit_log SET prev_hash = '" + prev + "', hash = '" + e.hash +
               "' WHERE seq = " + std::to_string(seq) + ";";
    prev = e.hash;
  }
  without_guards(box, updates);
}

/// `audit verify` (exit code), with the anchor or without.
RunResult verify(const Sandbox& box, bool with_anchor) {
  std::vector<std::string> args{"audit", "verify", "--json"};
  if (with_anchor) args.insert(args.end(), {"--anchor", "day1.anchor"});
  return box.run(args);
}

/// The fact tables (those with an audit_seq column).
std::vector<std::string> fact_tables(const Sandbox& box) {
  const std::string list =
      query_text(box.db(),
                 "SELECT group_concat(m.name, ',') FROM sqlite_master m WHERE m.type = 'table' AND "
                 "EXISTS (SELECT 1 FROM pragma_table_info(m.name) WHERE name = 'audit_seq')");
  std::vector<std::string> out;
  std::string part;
  for (char c : list + ",") {
    if (c == ',') {
      if (!part.empty()) out.push_back(part);
      part.clear();
    } else {
      part.push_back(c);
    }
  }
  return out;
}

}  // namespace

TEST_CASE("e2e anchor: the checkpoint file, signed, and an intact trail contains it", "[e2e]") {
  Sandbox box;
  populate(box);
  const std::string text = cw::test::read_file(box.path("day1.anchor"));
  CHECK(text.rfind("curvewarden anchor 1\nlab: Water lab\nentries: 6\nhead: ", 0) == 0);
  CHECK(text.find("\nhead: " + query_text(box, "SELECT hash FROM audit_log WHERE seq = 6")) !=
        std::string::npos);
  // The lab key lives in a file of its own (next to a store file), not in the store, readable by
  // its owner only.
  CHECK((std::filesystem::status(box.key()).permissions() & std::filesystem::perms::all) ==
        (std::filesystem::perms::owner_read | std::filesystem::perms::owner_write));
  const RunResult r = verify(box, true);
  INFO(r.describe());
  CHECK(r.exit_code == 0);
  CHECK(r.json().at("anchors")[0].at("contained") == true);
  CHECK(r.json().at("anchors")[0].at("signature_ok") == true);
}

TEST_CASE(
    "e2e anchor: a rewrite re-hashed from its first changed entry is found only with the "
    "anchor",
    "[e2e][sqlite-only]") {
  Sandbox box;
  populate(box);
  // Entry 2 registered IC-02 "Ion chromatograph": the forger renames it in the row and in the
  // entry's payload, then re-hashes the chain from entry 2 on.
  without_guards(box,
                 "UPDATE instruments SET name = 'Gas chromatograph' WHERE code = 'IC-02';"
                 "UPDATE audit_log SET payload = replace(payload, '\"Ion chromatograph\"', "
                 "'\"Gas chromatograph\"') WHERE seq = 2;");
  rehash_from(box, 2);
  const RunResult alone = verify(box, false);
  INFO(alone.describe());
  CHECK(alone.exit_code == 0);  // the chain alone cannot tell
  const RunResult anchored = verify(box, true);
  INFO(anchored.describe());
  CHECK(anchored.exit_code == 5);
  CHECK_THAT(anchored.err, Catch::Contains("checkpoint 'day1.anchor' (entry 6"));
  CHECK_THAT(anchored.err, Catch::Contains("was rewritten"));
}

TEST_CASE(
    "e2e anchor: an entry forged into the trail before the checkpoint is found only with "
    "the anchor",
    "[e2e][sqlite-only]") {
  Sandbox box;
  populate(box);
  // A forged entry 3 (an empty payload: nothing to contradict it); later entries and the rows
  // that name them move up by one, and everything from 3 on is re-hashed.
  std::string sql =
      "UPDATE audit_log SET seq = -seq - 1 WHERE seq >= 3; UPDATE audit_log SET seq = -seq WHERE "
      "seq < 0;";
  for (const auto& t : fact_tables(box)) {
    sql += "UPDATE " + t + " SET audit_seq = audit_seq + 1 WHERE audit_seq >= 3;";
  }
  // The rows recorded in the moved entries' payloads name their new entry too.
  for (int seq = 4; seq <= 9; ++seq) {
    sql += "UPDATE audit_log SET payload = replace(payload, '\"audit_seq\":" +
           std::to_string(seq - 1) + "', '\"audit_seq\":" + std::to_string(seq) +
           "') WHERE seq = " + std::to_string(seq) + ";";
  }
  sql +=
      "INSERT INTO audit_log (seq, recorded_at, occurred_at, actor, action, entity_kind, "
      "entity_id, reason, clock_overridden, tool_version, payload, prev_hash, hash, os_login) "
      "SELECT 3, recorded_at, occurred_at, 'alice', 'note.add', 'note', '1', 'forged', "
      "clock_overridden, tool_version, '{}', prev_hash, hash, os_login FROM audit_log WHERE seq "
      "= 2;";
  without_guards(box, sql);
  rehash_from(box, 3);
  const RunResult alone = verify(box, false);
  INFO(alone.describe());
  CHECK(alone.exit_code == 0);
  CHECK(alone.json().at("entries") == 9);
  const RunResult anchored = verify(box, true);
  INFO(anchored.describe());
  CHECK(anchored.exit_code == 5);
  CHECK_THAT(anchored.err, Catch::Contains("checkpoint 'day1.anchor' (entry 6"));
}

TEST_CASE("e2e anchor: a lost tail is found only with the anchor", "[e2e][sqlite-only]") {
  Sandbox box;
  populate(box);
  // Everything after entry 4 is gone (entries and their rows), as after losing a -wal file.
  std::string sql = "DELETE FROM audit_log WHERE seq > 4;";
  for (const auto& t : fact_tables(box)) sql += "DELETE FROM " + t + " WHERE audit_seq > 4;";
  without_guards(box, sql);
  const RunResult alone = verify(box, false);
  INFO(alone.describe());
  CHECK(alone.exit_code == 0);
  CHECK(alone.json().at("entries") == 4);
  const RunResult anchored = verify(box, true);
  INFO(anchored.describe());
  CHECK(anchored.exit_code == 5);
  CHECK_THAT(anchored.err, Catch::Contains("checkpoint 'day1.anchor' (entry 6") &&
                               Catch::Contains("the trail has only 4 entries; its tail was lost"));
}

TEST_CASE("e2e anchor: an edited or foreign checkpoint is refused", "[e2e]") {
  Sandbox box;
  populate(box);
  std::string text = cw::test::read_file(box.path("day1.anchor"));
  // Edited: the count changed by hand no longer matches the signature.
  std::string edited = text;
  edited.replace(edited.find("entries: 6"), 10, "entries: 5");
  box.write_file("edited.anchor", edited);
  RunResult r = box.run({"audit", "verify", "--anchor", "edited.anchor"});
  CHECK(r.exit_code == 5);
  CHECK_THAT(r.err, Catch::Contains("does not match its content"));
  // Signed by another key (another lab's store): refused against this lab's key.
  Sandbox other;
  populate(other);
  box.write_file("foreign.anchor", cw::test::read_file(other.path("day1.anchor")));
  r = box.run({"audit", "verify", "--anchor", "foreign.anchor"});
  CHECK(r.exit_code == 5);
  CHECK_THAT(r.err, Catch::Contains("was not signed with this lab's key"));
  // Not an anchor at all: bad input naming the file and line, exit 2.
  box.write_file("junk.anchor", "curvewarden anchor 1\nlab: x\nentries: many\n");
  r = box.run({"audit", "verify", "--anchor", "junk.anchor"});
  CHECK(r.exit_code == 2);
  CHECK_THAT(r.err, Catch::Contains("'junk.anchor' line 3"));
  // A key file others can read is refused.
  std::filesystem::permissions(box.key(), std::filesystem::perms::group_read,
                               std::filesystem::perm_options::add);
  r = box.run({"audit", "anchor", "--out", "again.anchor"});
  CHECK(r.exit_code == 4);
  CHECK_THAT(r.err, Catch::Contains("can be read by others"));
}
