// SPDX-License-Identifier: Apache-2.0
// Read-only questions.
#include "app/queries.h"

#include <algorithm>

#include "app/registry.h"
#include "core/error.h"
#include "core/text.h"
#include "store/curve_repository.h"
#include "store/registry_repository.h"

namespace cw::app {
namespace {

std::vector<ExpiringCurve> active_expiring(Session& s, FactLoader& facts, Instant now, Instant to,
                                           std::optional<InstrumentId> instrument) {
  std::vector<ExpiringCurve> out;
  for (CurveId id : store::curves_expiring_between(s.db(), now, to)) {
    const Curve& c = facts.curve(id);
    if (instrument && c.instrument_id != *instrument) continue;
    if (c.expires_at <= now || c.acquired_at > now) continue;
    CurveView v = make_view(facts, id, now);
    if (v.status.state != CurveState::Active) continue;
    ExpiringCurve e;
    const Instant by_interval =
        add_duration(c.acquired_at, v.version.definition.calibration.valid_for, s.zone());
    e.limited_by = "valid for " + to_string(v.version.definition.calibration.valid_for);
    if (c.expires_at < by_interval) {
      for (const auto& lot : v.lots) {
        if (lot.expiry_instant(s.zone()) == c.expires_at)
          e.limited_by = "lot " + lot.code + " expiry";
      }
    }
    e.curve = std::move(v);
    out.push_back(std::move(e));
  }
  return out;
}

}  // namespace

ResultId parse_result_id(const std::string& text) {
  auto v = parse_integer(text);
  if (!v || *v < 1)
    throw UsageError("result id " + quote(text) + " is not a positive whole number");
  return ResultId{*v};
}

ExpiringOutcome expiring(Session& s, const ExpiringRequest& r) {
  if (r.this_week && r.within) throw UsageError("give --this-week or --within, not both");
  const Instant now = s.at();
  ExpiringOutcome out;
  if (r.this_week) {
    std::tie(out.from, out.to) = s.zone().iso_week_of(now);
  } else {
    const Duration d = parse_duration(r.within.value_or("7 days"), "--within");
    out.from = now;
    out.to = add_duration(now, d, s.zone());
  }
  store::ReadTransaction read(s.db());
  FactLoader facts(s);
  out.curves = active_expiring(s, facts, std::max(now, out.from), out.to, std::nullopt);
  return out;
}

std::vector<InstrumentStatus> status_board(Session& s) {
  const Instant now = s.at();
  store::ReadTransaction read(s.db());
  FactLoader facts(s);
  std::vector<InstrumentStatus> out;
  for (const auto& instrument : store::list_instruments(s.db())) {
    InstrumentStatus st;
    st.instrument = instrument;
    for (CurveState state : {CurveState::Active, CurveState::AwaitingReview, CurveState::Stale,
                             CurveState::Rejected, CurveState::Retired}) {
      st.counts[state] = 0;
    }
    // Curves past their expiry moment can no longer be active: count them in SQL.
    const auto settled = store::settled_curve_counts(s.db(), instrument.id, now);
    st.counts[CurveState::Rejected] += settled.rejected;
    st.counts[CurveState::Retired] += settled.retired;
    st.counts[CurveState::AwaitingReview] += settled.awaiting_review;
    st.counts[CurveState::Stale] += settled.stale;
    for (CurveId id : store::live_curves_of_instrument(s.db(), instrument.id, now)) {
      st.counts[facts.status(id, now).state] += 1;
    }
    st.expiring_soon = active_expiring(
        s, facts, now, add_duration(now, Duration{7, Duration::Unit::Days}, s.zone()),
        instrument.id);
    for (const auto& [method_id, analyte] :
         store::method_analytes_of_instrument(s.db(), instrument.id)) {
      const Method& method = facts.method(method_id);
      const MethodVersion* v = method.version_at(now);
      if (!v || !v->definition.has_analyte(analyte)) continue;
      bool active = false;
      for (CurveId id : store::live_curves_in_group(s.db(), method_id, instrument.id, analyte,
                                                    std::nullopt, now)) {
        if (facts.status(id, now).state == CurveState::Active) {
          active = true;
          break;
        }
      }
      if (!active) st.blocked.emplace_back(method.code, analyte);
    }
    st.recent_failures = store::recent_failed_checks(s.db(), instrument.id, now, 5);
    out.push_back(std::move(st));
  }
  return out;
}

ResultTrace trace_result(Session& s, ResultId id) {
  store::ReadTransaction read(s.db());
  auto result = store::find_result(s.db(), id);
  if (!result) throw NotFoundError("no result " + std::to_string(id.value));
  ResultTrace t;
  t.result = *result;
  FactLoader facts(s);
  if (result->method_id) t.method_code = facts.method(*result->method_id).code;
  if (result->instrument_id) t.instrument = facts.instrument(*result->instrument_id);
  if (result->curve_id) {
    const CurveId cid = *result->curve_id;
    t.curve = make_view(facts, cid, result->occurred_at);
    t.calibration = facts.calibration(facts.curve(cid).calibration_id);
    t.method_version = facts.version_of(cid);
    for (const Lot* lot : facts.lots_of(cid)) t.lots.push_back(*lot);
    for (const auto& k : facts.facts(cid).checks) {
      if (k.occurred_at <= result->occurred_at) {
        t.check_before = k;
      } else if (!t.check_after) {
        t.check_after = k;
      }
    }
  }
  return t;
}

CurveTrace trace_curve(Session& s, CurveId id) {
  store::ReadTransaction read(s.db());
  FactLoader facts(s);
  CurveTrace t;
  require_acquired(s, facts.curve(id));
  t.curve = make_view(facts, id, s.at());
  t.checks = facts.facts(id).checks;
  t.results = store::results_of_curve(s.db(), id);
  return t;
}

LotTrace trace_lot(Session& s, const std::string& code) {
  store::ReadTransaction read(s.db());
  LotTrace t;
  t.lot = get_lot(s, code);
  FactLoader facts(s);
  const auto ids = store::curves_of_lot(s.db(), t.lot.id);
  for (CurveId id : ids) t.curves.push_back(make_view(facts, id, s.at()));
  t.results = store::results_of_curves(s.db(), ids);
  return t;
}

}  // namespace cw::app
