// SPDX-License-Identifier: Apache-2.0
// The fast paths of `status` and `expiring` (counts of settled curves summed from the derived
// tally steps, the group's live curves read by expiry, the week's expiring curves shared out by
// instrument) and the batches of `curve list` give the same answers as the rules engine applied
// to every curve one by one, on generated histories of several seeds and at several moments;
// the tally steps stay equal to those built from the facts after late and back-dated reviews
// and retirements.
#include <algorithm>
#include <catch2/catch.hpp>
#include <chrono>
#include <cstdint>
#include <filesystem>
#include <map>
#include <memory>
#include <set>
#include <tuple>

#include "app/curve_listing.h"
#include "app/fact_set.h"
#include "app/queries.h"
#include "app/session.h"
#include "domain/expiry.h"
#include "store_generator.h"

namespace {

struct TempStore {
  std::filesystem::path dir;
  TempStore() {
    dir = std::filesystem::temp_directory_path() /
          ("cw-consistency-" + std::to_string(reinterpret_cast<std::uintptr_t>(this)) + "-" +
           std::to_string(std::chrono::steady_clock::now().time_since_epoch().count()));
    std::filesystem::create_directories(dir);
  }
  ~TempStore() {
    std::error_code ignored;
    std::filesystem::remove_all(dir, ignored);
  }
};

cw::app::Session session_at(const std::string& location, cw::Instant at,
                            const std::string& actor = "consistency-check") {
  cw::app::SessionSpec spec;
  spec.location = location;
  spec.actor = actor;
  spec.at = at;
  spec.clock = std::make_shared<cw::FixedClock>(at);
  return cw::app::Session::open(spec);
}

/// A generated history of 120 days ending 2026-12-01 12:00 UTC, in `dir`.
cw::bench::GeneratorOptions history(const std::filesystem::path& dir, unsigned seed,
                                    std::int64_t curves, int instruments, int methods) {
  cw::bench::GeneratorOptions o;
  o.location = (dir / "lab.db").string();
  o.curves = curves;
  o.seed = seed;
  o.end = cw::parse_instant("2026-12-01T12:00:00Z");
  o.days = 120;
  o.instruments = instruments;
  o.methods = methods;
  o.entries_per_transaction = 300;
  return o;
}

}  // namespace

TEST_CASE("status and expiring: equal to the rules engine applied curve by curve",
          "[bench][consistency]") {
  const auto seed = GENERATE(3u, 11u, 29u);
  TempStore tmp;
  const cw::bench::GeneratorOptions o = history(tmp.dir, seed, 400, 6, 12);
  const auto report = cw::bench::generate_store(o);
  REQUIRE(report.curves >= 200);

  std::size_t shown_expiring = 0;
  std::size_t shown_blocked = 0;
  // The end of the history, and moments inside it where many curves are live.
  for (const char* moment :
       {"2026-12-01T12:00:00Z", "2026-10-15T08:00:00Z", "2026-09-01T00:00:00Z"}) {
    INFO("seed " << seed << ", at " << moment);
    const cw::Instant at = cw::parse_instant(moment);
    cw::app::Session s = session_at(o.location, at);
    const auto board = cw::app::status_board(s);
    const auto expiring = cw::app::expiring(s, {});
    // The same, evaluated a few candidates at a time (groups split across chunks): compared
    // below with the default's list, order included.
    std::vector<std::vector<cw::CurveId>> chunked;
    for (const std::size_t chunk : {1, 3, 17}) {
      cw::app::ExpiringRequest small;
      small.chunk = chunk;
      chunked.emplace_back();
      for (const auto& e : cw::app::expiring(s, small).curves) chunked.back().push_back(e.id);
    }

    // The same questions, answered one curve at a time by the rules engine.
    auto unit = s.read();
    cw::app::FactSet facts(*unit, s.zone());
    std::map<cw::InstrumentId, std::map<cw::CurveState, long>> counts;
    std::vector<cw::CurveId> expected_expiring;
    cw::store::CurveFilter all;
    all.acquired_by = at;
    const auto ids = unit->curves().list(all);
    const auto week = cw::add_duration(at, {7, cw::Duration::Unit::Days}, s.zone());
    for (const auto& [id, status] : facts.statuses(ids, at)) {
      const cw::Curve& c = facts.curve(id);
      counts[c.instrument_id][status.state] += 1;
      if (status.state == cw::CurveState::Active && c.expires_at > at && c.expires_at < week) {
        expected_expiring.push_back(id);
      }
    }
    // Each group's active curve, found by deciding its live curves newest first until one is
    // active, is the one the engine finds active among all the group's curves (and with the same
    // state and reasons); a group with none active has no answer.
    {
      std::set<cw::CurveGroup> groups;
      std::map<cw::CurveGroup, cw::CurveId> expected_active;
      for (const auto& [id, status] : facts.statuses(ids, at)) {
        const cw::Curve& c = facts.curve(id);
        const cw::CurveGroup g{c.method_id, c.instrument_id, c.analyte};
        groups.insert(g);
        if (status.state == cw::CurveState::Active) {
          CHECK(expected_active.emplace(g, id).second);  // at most one per group
        }
      }
      cw::app::FactSet walking(*unit, s.zone());
      const auto found =
          walking.active_in_groups(std::vector<cw::CurveGroup>(groups.begin(), groups.end()), at);
      CHECK(found.size() == expected_active.size());
      for (const auto& [g, id] : expected_active) {
        INFO("group of curve " << id.value);
        const auto it = found.find(g);
        REQUIRE(it != found.end());
        CHECK(it->second.curve == id);
        const cw::CurveStatus expected = facts.status(id, at);
        CHECK(it->second.status.state == expected.state);
        CHECK(it->second.status.reasons == expected.reasons);
        CHECK(it->second.status.cause == expected.cause);
      }
    }
    // Blocked: a (method, analyte) the instrument has curves for, named by the method's current
    // version, with no active curve now.
    std::set<std::tuple<cw::InstrumentId, cw::MethodId, std::string>> with_active;
    for (const auto& [id, status] : facts.statuses(ids, at)) {
      const cw::Curve& c = facts.curve(id);
      if (status.state == cw::CurveState::Active) {
        with_active.emplace(c.instrument_id, c.method_id, c.analyte);
      }
    }
    std::map<cw::InstrumentId, std::set<std::pair<std::string, std::string>>> expected_blocked;
    cw::store::CurveFilter ever;
    ever.acquired_by = cw::parse_instant("9999-12-31T00:00:00Z");
    for (cw::CurveId id : unit->curves().list(ever)) {
      const cw::Curve& c = facts.curve(id);
      const cw::Method& method = facts.method(c.method_id);
      const cw::MethodVersion* v = method.version_at(at);
      if (!v || !v->definition.has_analyte(c.analyte)) continue;
      if (!with_active.count({c.instrument_id, c.method_id, c.analyte})) {
        expected_blocked[c.instrument_id].emplace(method.code, c.analyte);
      }
    }
    for (const auto& st : board) {
      for (const auto& [state, n] : st.counts) {
        INFO("instrument " << st.instrument.code << ", state " << cw::to_string(state));
        CHECK(n == counts[st.instrument.id][state]);
      }
      std::vector<cw::CurveId> expected_soon;
      for (cw::CurveId id : expected_expiring) {
        if (facts.curve(id).instrument_id == st.instrument.id) expected_soon.push_back(id);
      }
      std::sort(expected_soon.begin(), expected_soon.end(), [&](cw::CurveId a, cw::CurveId b) {
        return std::tie(facts.curve(a).expires_at, a) < std::tie(facts.curve(b).expires_at, b);
      });
      std::vector<cw::CurveId> soon;
      for (const auto& e : st.expiring_soon) soon.push_back(e.id);
      INFO("instrument " << st.instrument.code);
      CHECK(soon == expected_soon);
      const std::set<std::pair<std::string, std::string>> got_blocked(st.blocked.begin(),
                                                                      st.blocked.end());
      CHECK(got_blocked.size() == st.blocked.size());
      CHECK(got_blocked == expected_blocked[st.instrument.id]);
      shown_blocked += st.blocked.size();
    }
    // States are decided from curves read without their statistics; the curves shown are
    // completed in place and equal curves read in full from the start.
    {
      cw::app::FactSet full(*unit, s.zone());
      full.load(ids, cw::store::CurveDetail::Statistics);
      const auto with_statistics = full.statuses(ids, at);
      for (const auto& [id, status] : facts.statuses(ids, at)) {
        CHECK(status.state == with_statistics.at(id).state);
        CHECK(status.reasons == with_statistics.at(id).reasons);
        CHECK(status.cause == with_statistics.at(id).cause);
      }
      // What the lists show of a curve (read without its statistics) is the curve read in full.
      for (const auto& e : expiring.curves) {
        ++shown_expiring;
        const cw::Curve& read = full.curve(e.id);
        const cw::MethodVersion& version = full.version_of(e.id);
        CHECK(e.analyte == read.analyte);
        CHECK(e.expires_at == read.expires_at);
        CHECK(e.method_code == full.method(read.method_id).code);
        CHECK(e.method_version == version.version);
        CHECK(e.instrument_code == full.instrument(read.instrument_id).code);
        const cw::CurveExpiry expiry =
            cw::expiry_of(read.acquired_at, version, full.lots_of(e.id), s.zone());
        CHECK(e.limited_by ==
              (expiry.limiting_lot != nullptr
                   ? "lot " + expiry.limiting_lot->code + " expiry"
                   : "valid for " + to_string(version.definition.calibration.valid_for)));
      }
    }
    std::vector<cw::CurveId> got;
    for (const auto& e : expiring.curves) got.push_back(e.id);
    for (const auto& in_chunks : chunked) CHECK(in_chunks == got);
    // Soonest first, ties by id, whatever order the candidates were evaluated in.
    CHECK(std::is_sorted(expiring.curves.begin(), expiring.curves.end(),
                         [](const auto& a, const auto& b) {
                           return std::tie(a.expires_at, a.id) < std::tie(b.expires_at, b.id);
                         }));
    std::sort(got.begin(), got.end());
    std::sort(expected_expiring.begin(), expected_expiring.end());
    CHECK(got == expected_expiring);
    std::size_t on_boards = 0;
    for (const auto& st : board) on_boards += st.expiring_soon.size();
    CHECK(on_boards == expected_expiring.size());
    // The histories are not trivial: curves in several states.
    std::map<cw::CurveState, long> lab;
    for (const auto& [instrument, by_state] : counts)
      for (const auto& [state, n] : by_state) lab[state] += n;
    CHECK(lab[cw::CurveState::Stale] > 0);
    CHECK(lab.size() >= 3);
  }
  CHECK(shown_expiring > 0);  // the comparison of statistics above is not vacuous
  CHECK(shown_blocked > 0);   // nor is the comparison of blocked groups
}

namespace {

/// Each instrument's count of curves per state at `at`, decided by the rules engine curve by
/// curve.
std::map<cw::InstrumentId, std::map<cw::CurveState, long>> engine_counts(cw::app::Session& s,
                                                                         cw::Instant at) {
  auto unit = s.read();
  cw::app::FactSet facts(*unit, s.zone());
  cw::store::CurveFilter all;
  all.acquired_by = at;
  std::map<cw::InstrumentId, std::map<cw::CurveState, long>> counts;
  for (const auto& [id, status] : facts.statuses(unit->curves().list(all), at)) {
    counts[facts.curve(id).instrument_id][status.state] += 1;
  }
  return counts;
}

}  // namespace

TEST_CASE(
    "status: settled counts equal the rules engine after late and back-dated reviews and "
    "retirements",
    "[bench][consistency]") {
  const auto seed = GENERATE(5u, 17u);
  TempStore tmp;
  const cw::bench::GeneratorOptions o = history(tmp.dir, seed, 300, 4, 8);
  REQUIRE(cw::bench::generate_store(o).curves >= 150);
  const cw::Instant end = o.end;
  const cw::Instant start = end - std::chrono::hours(24 * 120);

  // Reviews and retirements of random curves at random moments, written in an order unrelated
  // to their time: before and after the curve's expiry, after "now", back-dated behind facts
  // already written, a second review of a reviewed curve. The store appends the tally steps; the
  // rules engine does not care whether the tool would have refused the act.
  std::uint64_t state = 0x9E3779B97F4A7C15ull ^ seed;
  const auto next = [&] {
    state ^= state << 13;
    state ^= state >> 7;
    state ^= state << 17;
    return state;
  };
  {
    cw::app::Session s = session_at(o.location, end, "bench-admin");  // a user of the history
    std::vector<cw::CurveId> ids;
    {
      auto unit = s.read();
      cw::store::CurveFilter all;
      all.acquired_by = end;
      ids = unit->curves().list(all);
    }
    const auto span = std::chrono::duration_cast<std::chrono::seconds>(end - start).count();
    auto unit = s.write();
    for (int i = 0; i < 240; ++i) {
      const cw::CurveId id = ids[next() % ids.size()];
      // Anywhere from the start of the history to 20 days after its end.
      const cw::Instant at =
          start + std::chrono::seconds(static_cast<std::int64_t>(next() % (span + 20 * 86400)));
      const std::string entity = std::to_string(id.value);
      switch (next() % 3) {
        case 0:
          unit->curve_writer().add_retirement(id, {"consistency-check", "column replaced", at});
          unit->append_entry({"curve.retire", "curve", entity, "column replaced", at});
          break;
        case 1:
          unit->curve_writer().add_review(
              id, {cw::ReviewDecision::Approve, "consistency-check", "late approval", at});
          unit->append_entry({"curve.approve", "curve", entity, "late approval", at});
          break;
        default:
          unit->curve_writer().add_review(
              id, {cw::ReviewDecision::Reject, "consistency-check", "late rejection", at});
          unit->append_entry({"curve.reject", "curve", entity, "late rejection", at});
      }
    }
    unit->commit();
  }

  cw::app::Session s = session_at(o.location, end);
  CHECK_FALSE(s.read()->curves().settled_tallies_disagreement().has_value());
  // Every sixth day of the history and beyond its end.
  for (int day = 0; day <= 140; day += 6) {
    const cw::Instant at = start + std::chrono::hours(24 * day + day % 24);
    INFO("seed " << seed << ", at " << cw::format_utc(at));
    cw::app::Session at_moment = session_at(o.location, at);
    auto expected = engine_counts(at_moment, at);
    for (const auto& st : cw::app::status_board(at_moment)) {
      for (const auto& [state, n] : st.counts) {
        INFO("instrument " << st.instrument.code << ", state " << cw::to_string(state));
        CHECK(n == expected[st.instrument.id][state]);
      }
    }
  }
}

TEST_CASE("curve list: its batches give the states of the rules engine applied to all curves",
          "[bench][consistency]") {
  const auto seed = GENERATE(3u, 11u);
  TempStore tmp;
  // 700 curves: several batches of cw::app::CurveListing::kBatch.
  const cw::bench::GeneratorOptions o = history(tmp.dir, seed, 700, 3, 6);
  const auto report = cw::bench::generate_store(o);
  REQUIRE(report.curves > static_cast<std::int64_t>(2 * cw::app::CurveListing::kBatch));

  for (const char* moment : {"2026-12-01T12:00:00Z", "2026-10-15T08:00:00Z"}) {
    const cw::Instant at = cw::parse_instant(moment);
    cw::app::Session s = session_at(o.location, at);
    std::map<cw::CurveId, cw::CurveStatus> expected;
    std::vector<cw::CurveId> order;
    {
      auto unit = s.read();
      cw::app::FactSet facts(*unit, s.zone());
      cw::store::CurveFilter all;
      all.acquired_by = at;
      order = unit->curves().list(all);
      expected = facts.statuses(order, at);
    }
    std::map<cw::CurveState, long> listed;
    std::vector<std::optional<cw::CurveState>> filters{std::nullopt};
    for (cw::CurveState state : cw::kAllCurveStates) filters.push_back(state);
    for (const auto& state : filters) {
      INFO("seed " << seed << ", at " << moment << ", state "
                   << (state ? std::string(cw::to_string(*state)) : "any"));
      cw::app::CurveListRequest r;
      r.state = state;
      cw::app::CurveListing listing(s, r);
      std::vector<cw::CurveId> want;
      for (cw::CurveId id : order) {
        if (!state || expected.at(id).state == *state) want.push_back(id);
      }
      for (int pass = 0; pass < 2; ++pass) {  // a second reading visits the same curves
        std::vector<cw::CurveId> got;
        listing.each([&](const cw::app::CurveView& v) {
          got.push_back(v.curve.id);
          const cw::CurveStatus& e = expected.at(v.curve.id);
          INFO("curve " << v.curve.id.value);
          CHECK(v.status.state == e.state);
          REQUIRE(v.status.reasons.size() == e.reasons.size());
          for (std::size_t i = 0; i < e.reasons.size(); ++i) {
            CHECK(v.status.reasons[i].reason == e.reasons[i].reason);
            CHECK(v.status.reasons[i].since == e.reasons[i].since);
            CHECK(v.status.reasons[i].message == e.reasons[i].message);
          }
          CHECK(v.status.cause.has_value() == e.cause.has_value());
          if (v.status.cause && e.cause) CHECK(v.status.cause->message == e.cause->message);
          if (!state && pass == 0) listed[v.status.state] += 1;
        });
        CHECK(got == want);
      }
    }
    // The histories are not trivial: superseded curves among them.
    long superseded = 0;
    for (const auto& [id, status] : expected) {
      for (const auto& f : status.reasons) superseded += f.reason == cw::Reason::Superseded;
    }
    CHECK(superseded > 0);
    CHECK(listed.size() >= 3);
  }
}
