// SPDX-License-Identifier: Apache-2.0
// Read-only questions.
#include "app/queries.h"

#include <algorithm>
#include <map>
#include <set>
#include <tuple>
#include <utility>

#include "app/curves.h"
#include "app/registry.h"
#include "core/error.h"
#include "core/text.h"
#include "domain/expiry.h"
#include "rules/curve_facts.h"

namespace cw::app {
namespace {

/// An active curve of `facts` as the expiring lists show it, with how its expiry is limited.
ExpiringCurve expiring_entry(FactSet& facts, CurveId id, const LabZone& zone) {
  const rules::CurveFacts& f = facts.state_facts(id);
  const Curve& c = *f.curve;
  const MethodVersion& version = f.version();
  const CurveExpiry expiry = expiry_of(c.acquired_at, version, f.lots, zone);
  ExpiringCurve e;
  e.id = c.id;
  e.analyte = c.analyte;
  e.method_code = f.method->code;
  e.method_version = version.version;
  e.instrument_code = f.instrument->code;
  e.expires_at = c.expires_at;
  e.limited_by = expiry.limiting_lot != nullptr
                     ? "lot " + expiry.limiting_lot->code + " expiry"
                     : "valid for " + to_string(version.definition.calibration.valid_for);
  return e;
}

void sort_soonest_first(std::vector<ExpiringCurve>& curves) {
  std::sort(curves.begin(), curves.end(), [](const ExpiringCurve& a, const ExpiringCurve& b) {
    return std::tie(a.expires_at, a.id) < std::tie(b.expires_at, b.id);
  });
}

// The active curves expiring in [now, to): a group has at most one active curve, so each group
// with a curve expiring in the window is asked for its active one, which is listed when it
// expires in the window (being active, its expiry is still ahead of `now`). `chunk_size` groups
// share one FactSet: memory stays bounded however many groups a busy store has.
std::vector<ExpiringCurve> active_expiring(store::ReadUnit& unit, const LabZone& zone, Instant now,
                                           Instant to, std::size_t chunk_size) {
  chunk_size = std::max<std::size_t>(chunk_size, 1);
  const std::vector<CurveGroup> groups = unit.curves().groups_expiring_between(now, to);
  std::vector<ExpiringCurve> out;
  for (std::size_t begin = 0; begin < groups.size(); begin += chunk_size) {
    const std::vector<CurveGroup> chunk(
        groups.begin() + static_cast<std::ptrdiff_t>(begin),
        groups.begin() + static_cast<std::ptrdiff_t>(std::min(groups.size(), begin + chunk_size)));
    FactSet facts(unit, zone);
    for (const auto& [group, active] : facts.active_in_groups(chunk, now)) {
      if (facts.state_curve(active.curve).expires_at < to) {
        out.push_back(expiring_entry(facts, active.curve, zone));
      }
    }
  }
  sort_soonest_first(out);
  return out;
}

}  // namespace

ExpiringOutcome expiring(Session& s, const ExpiringRequest& r) {
  const Instant now = s.at();
  ExpiringOutcome out;
  if (r.this_week) {
    std::tie(out.from, out.to) = s.zone().iso_week_of(now);
  } else {
    out.from = now;
    out.to = add_duration(now, r.within.value_or(Duration{7, Duration::Unit::Days}), s.zone());
  }
  auto unit = s.read();
  out.curves = active_expiring(*unit, s.zone(), std::max(now, out.from), out.to, r.chunk);
  return out;
}

std::vector<InstrumentStatus> status_board(Session& s) {
  const Instant now = s.at();
  const Instant week = add_duration(now, Duration{7, Duration::Unit::Days}, s.zone());
  auto unit = s.read();
  std::vector<InstrumentStatus> out;
  const std::vector<Instrument> instruments = unit->registry().instruments();
  std::vector<InstrumentId> ids;
  for (const auto& instrument : instruments) ids.push_back(instrument.id);
  auto failures = unit->curves().recent_failed_checks(ids, now, 5);
  for (const auto& instrument : instruments) {
    FactSet facts(*unit, s.zone());  // one instrument's live curves at a time
    InstrumentStatus st;
    st.instrument = instrument;
    for (CurveState state : kAllCurveStates) st.counts[state] = 0;
    // Curves whose expiry moment has passed are counted from the tally steps the store appends
    // as their facts arrive (domain/settled_state.h), not decided again one by one.
    for (const auto& [state, n] : unit->curves().settled_counts(instrument.id, now)) {
      st.counts[state] += n;
    }
    // The live curves (acquired by now, expiry still ahead) are decided once. They are every
    // curve a group can have active now, and every curve that can be shown as expiring within
    // the week: an active curve's expiry is still ahead of it.
    const auto live = unit->curves().live_of_instrument(instrument.id, now);
    std::set<std::pair<MethodId, std::string>> with_active;
    for (const auto& [id, status] : facts.live_statuses(live, now)) {
      st.counts[status.state] += 1;
      if (status.state != CurveState::Active) continue;
      const Curve& c = facts.state_curve(id);
      with_active.emplace(c.method_id, c.analyte);
      if (c.expires_at < week) st.expiring_soon.push_back(expiring_entry(facts, id, s.zone()));
    }
    sort_soonest_first(st.expiring_soon);
    const auto pairs = unit->curves().method_analytes(instrument.id);
    std::vector<MethodId> method_ids;
    for (const auto& pair : pairs) method_ids.push_back(pair.first);
    facts.load_methods(method_ids);  // one query, not one per pair
    for (const auto& [method_id, analyte] : pairs) {
      const Method& method = facts.method(method_id);
      const MethodVersion* v = method.version_at(now);
      if (!v || !v->definition.has_analyte(analyte)) continue;
      if (!with_active.count({method_id, analyte})) st.blocked.emplace_back(method.code, analyte);
    }
    st.recent_failures = std::move(failures.at(instrument.id));
    out.push_back(std::move(st));
  }
  return out;
}

ResultTrace trace_result(Session& s, ResultId id) {
  auto unit = s.read();
  auto result = unit->curves().result(id);
  if (!result) {
    throw NotFoundError("no result " + std::to_string(id.value),
                        "result ids are printed by 'quantify' and listed by 'trace curve'");
  }
  ResultTrace t;
  t.result = *result;
  FactSet facts(*unit, s.zone());
  if (result->method_id) t.method_code = facts.method(*result->method_id).code;
  if (result->instrument_id) t.instrument = facts.instrument(*result->instrument_id);
  if (result->curve_id) {
    const CurveId cid = *result->curve_id;
    facts.load({cid}, store::CurveDetail::Points);
    // Times are kept to the second: a check given the result's second but recorded after it
    // came after it, and the state at the result's time is decided without it.
    const std::vector<CheckId> later = unit->curves().checks_recorded_after(id);
    const std::vector<Check> checks = unit->curves().checks_of({cid});
    facts.leave_out_checks(cid, later);
    t.curve = make_views(facts, {cid}, result->occurred_at, true).front();
    t.calibration = facts.calibration(facts.curve(cid).calibration_id);
    t.method_version = facts.version_of(cid);
    for (const Lot* lot : facts.lots_of(cid)) t.lots.push_back(*lot);
    if (result->run_id && result->run_position) {
      // Within the run every row shares the run's time: position decides.
      t.run = unit->runs().run(*result->run_id);
      const long position = *result->run_position;
      unit->runs().each_run_check(*result->run_id, [&](const store::RunCheckRow& row) {
        if (row.check.curve_id != cid || row.check.kind != CheckKind::Check) return;
        if (row.position < position) {
          t.check_before = row.check;
          t.check_before_position = row.position;
        } else if (!t.check_after) {
          t.check_after = row.check;
          t.check_after_position = row.position;
        }
      });
      if (!t.check_before) {
        for (const auto& k : facts.facts(cid).checks) {  // the later ones left out
          if (k.kind == CheckKind::Check && k.run_id != result->run_id &&
              k.occurred_at <= result->occurred_at) {
            t.check_before = k;
          }
        }
      }
    } else {
      for (const auto& k : checks) {
        const bool recorded_after = std::find(later.begin(), later.end(), k.id) != later.end();
        if (k.occurred_at < result->occurred_at ||
            (k.occurred_at == result->occurred_at && !recorded_after)) {
          t.check_before = k;
        } else if (!t.check_after) {
          t.check_after = k;
        }
      }
    }
  }
  t.history = unit->runs().status_events_of(id);
  return t;
}

CurveTrace trace_curve(Session& s, CurveId id) {
  auto unit = s.read();
  FactSet facts(*unit, s.zone());
  require_acquired(s.at(), facts.curve(id, store::CurveDetail::Points), s.zone());
  CurveTrace t;
  t.curve = make_views(facts, {id}, s.at(), true).front();
  t.checks = facts.facts(id).checks;
  t.results = unit->curves().results_of({id});
  return t;
}

LotTrace trace_lot(Session& s, const std::string& code) {
  auto unit = s.read();
  LotTrace t;
  t.lot = get_lot(*unit, code);
  FactSet facts(*unit, s.zone());
  const auto ids = unit->curves().of_lot(t.lot.id);
  t.curves = make_views(facts, ids, s.at());
  t.results = unit->curves().results_of(ids);
  return t;
}

}  // namespace cw::app
