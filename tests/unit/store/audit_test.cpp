// SPDX-License-Identifier: Apache-2.0
// Tests of the audit append (WriteTransaction) and the hash chain: rows and entry in one
// transaction, the chain links, and the canonical form recomputed independently.
//
// The independent path: the stored row is read through the SQLite C API, the canonical header
// is written out by hand from the layout documented in src/audit/audit_entry.h, and SHA-256 is
// computed with OpenSSL's EVP interface directly (not with audit::compute_hash / sha256_hex).
#include <catch2/catch.hpp>
#include <nlohmann/json.hpp>
#include <optional>
#include <stdexcept>
#include <string>

#include "audit/audit_entry.h"
#include "audit/sha256.h"
#include "core/date_include.h"
#include "core/error.h"
#include "store/store.h"
#include "store_test_support.h"

namespace {

using cw::Instant;
using cw::store::Actor;
using cw::store::EntryHeader;
using cw::store_test::evp_sha256_hex;
using cw::store_test::RawDb;
using cw::store_test::TempDir;

const std::string kZeros(64, '0');

Instant utc(int y, unsigned mo, unsigned d, int h = 0, int mi = 0) {
  return Instant{date::sys_days{date::year{y} / date::month{mo} / date::day{d}}} +
         std::chrono::hours{h} + std::chrono::minutes{mi};
}

/// A fixed clock that claims to be the system clock (so clock_overridden is false).
class UnflaggedClock final : public cw::Clock {
 public:
  explicit UnflaggedClock(Instant t) : t_(t) {}
  Instant now() const override { return t_; }
  bool is_overridden() const override { return false; }

 private:
  Instant t_;
};

/// A store in a temp dir with a fixed clock (recorded at 2026-03-02T09:00:00Z).
struct Fixture {
  TempDir tmp;
  std::filesystem::path path = tmp / "audit.db";
  cw::FixedClock clock{utc(2026, 3, 2, 9)};
  Actor actor{"alice", &clock, "curvewarden test", "labtech"};
  std::unique_ptr<cw::store::Store> c = open();

  std::unique_ptr<cw::store::Store> open() {
    cw::store::OpenOptions o;
    o.location = path.string();
    o.create = true;
    return cw::store::Store::open(o);
  }

  void add_instrument(const std::string& code, Instant at) {
    auto tx = c->write(actor);
    tx->registry_writer().add_instrument(code, std::string("Ion chromatograph"), at);
    tx->append_entry({"instrument.add", "instrument", code, std::nullopt, at});
    tx->commit();
  }
};

std::int64_t count(RawDb& raw, const std::string& table) {
  return raw.integer("SELECT count(*) FROM " + table);
}

}  // namespace

TEST_CASE("audit: sha256_hex matches the FIPS 180-2 test vectors", "[store][audit]") {
  // FIPS 180-2, appendix B.1 ("abc"), and the well-known digest of the empty string.
  CHECK(cw::audit::sha256_hex("abc") ==
        "ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad");
  CHECK(cw::audit::sha256_hex("") ==
        "e3b0c44298fc1c149afbf4c8996fb92427ae41e4649b934ca495991b7852b855");
  CHECK(evp_sha256_hex("abc") == cw::audit::sha256_hex("abc"));
}

TEST_CASE("audit: the canonical header is the compact JSON dump of its fields, awkward text too",
          "[store][audit]") {
  // Written by hand for speed: it must stay byte for byte what nlohmann's dump() writes.
  cw::audit::AuditEntry e;
  e.seq = 9007199254740993;
  e.recorded_at = "2026-12-01T12:00:00Z";
  e.occurred_at = "2026-11-30T23:59:59Z";
  e.actor = "Zoë \"Q\" O'Brien\\lab";
  e.action = "result.report";
  e.entity_kind = "result";
  e.entity_id = std::string("tab\tnew\nline\rcr\bbs\fff\x01\x1f\x7f") + "\xe2\x82\xac";
  e.tool_version = "0.9.0";
  for (const bool overridden : {false, true}) {
    for (const auto& reason :
         {std::optional<std::string>(), std::optional<std::string>("re: \u00b5g/L")}) {
      for (const auto& login :
           {std::optional<std::string>(), std::optional<std::string>("analyst")}) {
        e.clock_overridden = overridden;
        e.reason = reason;
        e.os_login = login;
        nlohmann::json expected = nlohmann::json::array(
            {e.seq, e.recorded_at, e.occurred_at, e.actor, e.action, e.entity_kind, e.entity_id});
        expected.push_back(reason ? nlohmann::json(*reason) : nlohmann::json(nullptr));
        expected.push_back(overridden);
        expected.push_back(e.tool_version);
        if (login) expected.push_back(*login);
        CHECK(cw::audit::canonical_header(e) == expected.dump());
      }
    }
  }
  e.actor = "\xff\xfe";  // not UTF-8: refused as nlohmann refuses it
  CHECK_THROWS(cw::audit::canonical_header(e));
}

TEST_CASE("audit: a write transaction commits its rows together with their entry",
          "[store][audit]") {
  Fixture f;
  f.add_instrument("IC-02", utc(2026, 3, 1, 8));

  RawDb raw(f.path);
  CHECK(count(raw, "instruments") == 1);
  CHECK(count(raw, "audit_log") == 1);
  CHECK(raw.integer("SELECT audit_seq FROM instruments") == 1);
  const auto row = raw.rows(
      "SELECT seq, recorded_at, occurred_at, actor, action, entity_kind, entity_id, reason, "
      "clock_overridden, tool_version, payload, prev_hash FROM audit_log")[0];
  CHECK(row == std::vector<std::string>{
                   "1", "2026-03-02T09:00:00Z", "2026-03-01T08:00:00Z", "alice", "instrument.add",
                   "instrument", "IC-02", "<null>", "1", "curvewarden test",
                   // The payload: the row as written, keys sorted, compact.
                   R"({"instruments":[{"audit_seq":1,"code":"IC-02","id":1,)"
                   R"("name":"Ion chromatograph","registered_at":"2026-03-01T08:00:00Z"}]})",
                   kZeros});
}

TEST_CASE("audit: an exception before commit leaves neither rows nor an entry", "[store][audit]") {
  Fixture f;
  f.add_instrument("IC-01", utc(2026, 3, 1, 8));

  SECTION("thrown after the entry was appended") {
    try {
      auto tx = f.c->write(f.actor);
      tx->registry_writer().add_instrument("IC-02", std::nullopt, utc(2026, 3, 2, 8));
      tx->append_entry({"instrument.add", "instrument", "IC-02", std::nullopt, utc(2026, 3, 2, 8)});
      throw std::runtime_error("power cut");
    } catch (const std::runtime_error&) {
    }
  }
  SECTION("thrown before the entry was appended") {
    try {
      auto tx = f.c->write(f.actor);
      tx->registry_writer().add_instrument("IC-02", std::nullopt, utc(2026, 3, 2, 8));
      throw std::runtime_error("power cut");
    } catch (const std::runtime_error&) {
    }
  }
  SECTION("commit refused for rows without an entry") {
    auto tx = f.c->write(f.actor);
    tx->registry_writer().add_instrument("IC-02", std::nullopt, utc(2026, 3, 2, 8));
    CHECK_THROWS_AS(tx->commit(), std::logic_error);
  }

  {
    RawDb raw(f.path);
    CHECK(count(raw, "instruments") == 1);
    CHECK(count(raw, "audit_log") == 1);
    CHECK(raw.integer("SELECT count(*) FROM instruments WHERE code = 'IC-02'") == 0);
  }
  // The rolled-back attempt leaves no gap: the next entry is 2 and links to entry 1.
  f.add_instrument("IC-03", utc(2026, 3, 2, 8));
  RawDb raw(f.path);
  CHECK(raw.integer("SELECT max(seq) FROM audit_log") == 2);
  CHECK(raw.text("SELECT prev_hash FROM audit_log WHERE seq = 2") ==
        raw.text("SELECT hash FROM audit_log WHERE seq = 1"));
  const auto report = f.c->read()->audit().verify();
  CHECK(report.ok);
  CHECK(report.entries == 2);
}

TEST_CASE("audit: each entry links to the hash of the one before", "[store][audit]") {
  Fixture f;
  f.add_instrument("IC-02", utc(2026, 3, 1, 8));
  {
    // Two entries in one transaction, the second writing rows of two tables.
    auto tx = f.c->write(f.actor);
    const auto id = tx->registry().instrument("IC-02")->id;
    tx->registry_writer().add_service_event(
        id, {cw::ServiceDirection::Out, "pump seal", utc(2026, 3, 1, 12)});
    tx->append_entry(
        {"instrument.service-out", "instrument", "IC-02", "pump seal", utc(2026, 3, 1, 12)});
    cw::Lot lot;
    lot.code = "CRM-1";
    lot.material = "Nitrate CRM";
    lot.expires_on = {2027, 3, 31};
    lot.registered_at = utc(2026, 3, 1, 13);
    lot.values.push_back({"nitrate", 1000.0, 5.0});
    tx->registry_writer().add_lot(lot);
    tx->append_entry({"lot.add", "lot", "CRM-1", std::nullopt, utc(2026, 3, 1, 13)});
    tx->commit();
  }

  RawDb raw(f.path);
  const auto rows = raw.rows("SELECT seq, prev_hash, hash, payload FROM audit_log ORDER BY seq");
  REQUIRE(rows.size() == 3);
  CHECK(rows[0][1] == kZeros);
  CHECK(rows[1][1] == rows[0][2]);
  CHECK(rows[2][1] == rows[1][2]);
  CHECK(rows[0][2] != rows[1][2]);
  CHECK(rows[1][2] != rows[2][2]);
  // Tables in name order ("lot_values" sorts before "lots"), each row's keys sorted.
  CHECK(rows[2][3] ==
        R"({"lot_values":[{"analyte":"nitrate","audit_seq":3,"id":1,"lot_id":1,)"
        R"("uncertainty":5.0,"value":1000.0}],"lots":[{"audit_seq":3,"certificate":null,)"
        R"("code":"CRM-1","expires_on":"2027-03-31","id":1,"in_use_days":null,)"
        R"("material":"Nitrate CRM","opened_on":null,"registered_at":"2026-03-01T13:00:00Z"}]})");

  const auto report = f.c->read()->audit().verify();
  CHECK(report.ok);
  CHECK(report.entries == 3);
  CHECK_FALSE(report.first_broken.has_value());
  CHECK(report.head_hash == rows[2][2]);
}

TEST_CASE("audit: the stored hash matches an independent SHA-256 of the canonical form",
          "[store][audit]") {
  Fixture f;
  f.add_instrument("IC-02", utc(2026, 3, 1, 8));
  UnflaggedClock unflagged(utc(2026, 3, 2, 10, 15));
  const Actor bob{"bob", &unflagged, "curvewarden test", "labtech"};
  {
    auto tx = f.c->write(bob);
    const auto id = tx->registry().instrument("IC-02")->id;
    tx->registry_writer().add_service_event(
        id, {cw::ServiceDirection::Out, "pump seal \"leaking\" ±", utc(2026, 3, 1, 12)});
    tx->append_entry({"instrument.service-out", "instrument", "IC-02", "pump seal \"leaking\" ±",
                      utc(2026, 3, 1, 12)});
    tx->commit();
  }

  RawDb raw(f.path);
  const auto rows = raw.rows("SELECT prev_hash, payload, hash FROM audit_log ORDER BY seq");
  REQUIRE(rows.size() == 2);

  // Entry 1: [seq, recorded_at, occurred_at, actor, action, entity_kind, entity_id,
  // reason-or-null, clock_overridden, tool_version, os_login] as compact JSON.
  const std::string header1 =
      R"([1,"2026-03-02T09:00:00Z","2026-03-01T08:00:00Z","alice","instrument.add",)"
      R"("instrument","IC-02",null,true,"curvewarden test","labtech"])";
  CHECK(rows[0][2] == evp_sha256_hex(kZeros + "\n" + header1 + "\n" + rows[0][1]));

  // Entry 2: a reason with quotes and a non-ASCII character, and a clock not overridden.
  const std::string header2 =
      R"([2,"2026-03-02T10:15:00Z","2026-03-01T12:00:00Z","bob","instrument.service-out",)"
      R"("instrument","IC-02","pump seal \"leaking\" ±",false,"curvewarden test","labtech"])";
  const std::string payload2 =
      R"({"instrument_service_events":[{"audit_seq":2,"direction":"out","id":1,)"
      R"("instrument_id":1,"occurred_at":"2026-03-01T12:00:00Z",)"
      R"("reason":"pump seal \"leaking\" ±"}]})";
  CHECK(rows[1][1] == payload2);
  CHECK(rows[1][2] == evp_sha256_hex(rows[0][2] + "\n" + header2 + "\n" + payload2));

  // The project's canonical header agrees with the hand-written one.
  const auto entries = f.c->read()->audit().list({});
  REQUIRE(entries.size() == 2);
  CHECK(cw::audit::canonical_header(entries[0]) == header1);
  CHECK(cw::audit::canonical_header(entries[1]) == header2);
}

TEST_CASE("audit: verify names the first entry that no longer holds", "[store][audit]") {
  Fixture f;
  f.add_instrument("IC-01", utc(2026, 3, 1, 8));
  f.add_instrument("IC-02", utc(2026, 3, 1, 9));
  f.add_instrument("IC-03", utc(2026, 3, 1, 10));
  RawDb raw(f.path);
  REQUIRE(raw.exec("DROP TRIGGER audit_log_no_update; DROP TRIGGER audit_log_no_delete;"
                   "DROP TRIGGER instruments_no_update;") == SQLITE_OK);

  SECTION("an entry is missing") {
    REQUIRE(raw.exec("DELETE FROM audit_log WHERE seq = 2") == SQLITE_OK);
    const auto r = f.c->read()->audit().verify();
    CHECK_FALSE(r.ok);
    CHECK(r.first_broken == 2);
    CHECK_THAT(r.problem, Catch::Contains("entry 2 is missing"));
  }
  SECTION("an entry's actor is changed") {
    REQUIRE(raw.exec("UPDATE audit_log SET actor = 'mallory' WHERE seq = 2") == SQLITE_OK);
    const auto r = f.c->read()->audit().verify();
    CHECK_FALSE(r.ok);
    CHECK(r.first_broken == 2);
    CHECK_THAT(r.problem, Catch::Contains("its hash does not match"));
  }
  SECTION("an entry is forged with a recomputed hash") {
    // A forger changes the actor of entry 2 and recomputes its hash: entry 2 now holds on its
    // own, but entry 3 no longer links to it.
    const std::string header =
        R"([2,"2026-03-02T09:00:00Z","2026-03-01T09:00:00Z","mallory","instrument.add",)"
        R"("instrument","IC-02",null,true,"curvewarden test","labtech"])";
    const std::string forged =
        evp_sha256_hex(raw.text("SELECT prev_hash FROM audit_log WHERE seq = 2") + "\n" + header +
                       "\n" + raw.text("SELECT payload FROM audit_log WHERE seq = 2"));
    REQUIRE(raw.exec("UPDATE audit_log SET actor = 'mallory', hash = '" + forged +
                     "' WHERE seq = 2") == SQLITE_OK);
    const auto r = f.c->read()->audit().verify();
    CHECK_FALSE(r.ok);
    CHECK(r.first_broken == 3);
    CHECK_THAT(r.problem, Catch::Contains("does not link to the entry before it"));
  }
  SECTION("a fact row is changed") {
    REQUIRE(raw.exec("UPDATE instruments SET name = 'Other' WHERE code = 'IC-03'") == SQLITE_OK);
    const auto r = f.c->read()->audit().verify();
    CHECK_FALSE(r.ok);
    CHECK(r.first_broken == 3);
    CHECK_THAT(r.problem, Catch::Contains("row instruments id 3 differs from what was recorded"));
  }
  SECTION("a fact row is added behind the tool's back") {
    REQUIRE(raw.exec("INSERT INTO instruments (code, registered_at, audit_seq) "
                     "VALUES ('IC-99', '2026-03-01T11:00:00Z', 3)") == SQLITE_OK);
    const auto r = f.c->read()->audit().verify();
    CHECK_FALSE(r.ok);
    CHECK(r.first_broken == 3);
    CHECK_THAT(r.problem, Catch::Contains("row instruments id 4 has no audit entry"));
  }
}

TEST_CASE("audit: verify reports the first break in the trail's order when there are several",
          "[store][audit]") {
  // Links and hashes are checked apart from the rows (on a thread of their own): over a trail
  // long enough for both to be under way at once, the earlier break still counts, and within one
  // entry its hash comes before its rows.
  Fixture f;
  constexpr int kEntries = 300;
  for (int i = 1; i <= kEntries; ++i) {
    f.add_instrument("IC-" + std::to_string(i), utc(2026, 3, 1, 8));
  }
  RawDb raw(f.path);
  REQUIRE(raw.exec("DROP TRIGGER audit_log_no_update; DROP TRIGGER instruments_no_update;") ==
          SQLITE_OK);
  const auto change_entry = [&](int seq) {
    REQUIRE(raw.exec("UPDATE audit_log SET actor = 'mallory' WHERE seq = " + std::to_string(seq)) ==
            SQLITE_OK);
  };
  const auto change_row = [&](int seq) {
    REQUIRE(raw.exec("UPDATE instruments SET name = 'Other' WHERE audit_seq = " +
                     std::to_string(seq)) == SQLITE_OK);
  };

  SECTION("a changed entry before a changed row") {
    change_entry(5);
    change_row(kEntries - 1);
    const auto r = f.c->read()->audit().verify();
    CHECK(r.first_broken == 5);
    CHECK_THAT(r.problem, Catch::Contains("its hash does not match"));
  }
  SECTION("a changed row before a changed entry") {
    change_row(5);
    change_entry(kEntries - 1);
    const auto r = f.c->read()->audit().verify();
    CHECK(r.first_broken == 5);
    CHECK_THAT(r.problem, Catch::Contains("row instruments id 5 differs from what was recorded"));
  }
  SECTION("an entry changed together with its row") {
    change_row(200);
    change_entry(200);
    const auto r = f.c->read()->audit().verify();
    CHECK(r.first_broken == 200);
    CHECK_THAT(r.problem, Catch::Contains("its hash does not match"));
  }
  SECTION("a changed last entry") {
    change_entry(kEntries);
    const auto r = f.c->read()->audit().verify();
    CHECK(r.first_broken == kEntries);
    CHECK_THAT(r.problem, Catch::Contains("its hash does not match"));
  }
  SECTION("an intact trail of several batches") {
    const auto r = f.c->read()->audit().verify();
    CHECK(r.ok);
    CHECK(r.entries == kEntries);
    CHECK(r.head_hash ==
          raw.text("SELECT hash FROM audit_log WHERE seq = " + std::to_string(kEntries)));
  }
}

TEST_CASE("audit: verify writes awkward text and numbers exactly as the payload holds them",
          "[store][audit]") {
  // verify writes each row's canonical text straight from the columns; the payload was written
  // through JSON objects. Quotes, backslashes, control characters, text beyond ASCII, and reals
  // of every shape must come out byte for byte the same, or the chain would not verify.
  Fixture f;
  const std::string name = GENERATE(std::string("tab\there \"quoted\" back\\slash"),
                                    std::string("bell \x07 escape \x1b nul-free \x01\x1f end"),
                                    std::string("caf\xc3\xa9 \xe2\x9c\x93 \xf0\x9f\xa7\xaa"),
                                    std::string("line\nbreak\r\n\b\f"), std::string(""));
  const double value = GENERATE(1000.0, 0.1, 1e-05, 1.5e-300, 123456789012345680.0, -0.0, 2.5e21,
                                0.30000000000000004, 7.0);
  const Instant at = utc(2026, 3, 1, 8);
  {
    auto tx = f.c->write(f.actor);
    tx->registry_writer().add_instrument("IC-01", name, at);
    tx->append_entry({"instrument.add", "instrument", "IC-01", std::nullopt, at});
    cw::Lot lot;
    lot.code = "CRM-" + name.substr(0, 3);
    lot.material = name;
    lot.expires_on = cw::CalendarDate{2027, 3, 31};
    lot.registered_at = at;
    lot.values.push_back({"nitrate", value, value / 3});
    tx->registry_writer().add_lot(lot);
    tx->append_entry({"lot.add", "lot", lot.code, name, at});
    tx->commit();
  }
  const auto report = f.c->read()->audit().verify();
  INFO(report.problem);
  CHECK(report.ok);
  CHECK(report.entries == 2);
}

TEST_CASE("audit: verify refuses a damaged value before a row it finds out of place",
          "[store][audit]") {
  // The reading thread copies the rows; the checking thread writes their text, and with it
  // finds a damaged value. A damaged value in an entry's rows counts before a row of a later
  // table (by name) claiming an earlier entry, found while the rows were read, as when one
  // thread checked them in that order.
  Fixture f;
  f.add_instrument("IC-01", utc(2026, 3, 1, 8));
  f.add_instrument("IC-02", utc(2026, 3, 1, 9));
  f.add_instrument("IC-03", utc(2026, 3, 1, 10));
  f.add_instrument("IC-04", utc(2026, 3, 1, 11));
  {
    // The tables are STRICT: only a schema edited behind the tool's back holds a blob.
    RawDb raw(f.path);
    REQUIRE(raw.exec("PRAGMA writable_schema = ON;"
                     "UPDATE sqlite_schema SET sql = replace(sql, ') STRICT', ')') "
                     "WHERE name = 'instruments';"
                     "PRAGMA writable_schema = OFF;") == SQLITE_OK);
  }
  RawDb raw(f.path);
  REQUIRE(raw.exec("DROP TRIGGER instruments_no_update;") == SQLITE_OK);
  // methods id 2 claims entry 2 but comes after id 1 (entry 3): found out of place at entry 3.
  const auto misplaced_method = [&] {
    REQUIRE(raw.exec("INSERT INTO methods (id, code, registered_at, audit_seq) VALUES "
                     "(1, 'M-1', '2026-03-01T10:00:00Z', 3), "
                     "(2, 'M-2', '2026-03-01T09:00:00Z', 2)") == SQLITE_OK);
  };

  SECTION("a blob") {
    REQUIRE(raw.exec("UPDATE instruments SET registered_at = x'00ff' WHERE audit_seq = 3") ==
            SQLITE_OK);
    CHECK_THROWS_WITH(f.c->read()->audit().verify(),
                      Catch::Contains("instruments.registered_at holds a blob"));
  }
  SECTION("a row out of place") {
    misplaced_method();
    const auto r = f.c->read()->audit().verify();
    CHECK_FALSE(r.ok);
    CHECK(r.first_broken == 2);
    CHECK_THAT(r.problem, Catch::Contains("row methods id 2 has no audit entry"));
  }
  SECTION("a blob in the same entry as a row out of place") {
    misplaced_method();
    REQUIRE(raw.exec("UPDATE instruments SET registered_at = x'00ff' WHERE audit_seq = 3") ==
            SQLITE_OK);
    CHECK_THROWS_WITH(f.c->read()->audit().verify(),
                      Catch::Contains("instruments.registered_at holds a blob"));
  }
  SECTION("a blob in the entry after a row out of place") {
    misplaced_method();
    REQUIRE(raw.exec("UPDATE instruments SET registered_at = x'00ff' WHERE audit_seq = 4") ==
            SQLITE_OK);
    const auto r = f.c->read()->audit().verify();
    CHECK(r.first_broken == 2);
    CHECK_THAT(r.problem, Catch::Contains("row methods id 2 has no audit entry"));
  }
}
