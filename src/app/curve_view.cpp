// SPDX-License-Identifier: Apache-2.0
// Curve views.
#include "app/curve_view.h"

namespace cw::app {

CurveView make_view(FactSet& facts, CurveId id, const CurveStatus& status, Instant at) {
  CurveView v;
  const Curve& c = facts.curve(id);
  v.curve = c;
  // What was recorded as of a later moment is not shown as of `at`.
  std::erase_if(v.curve.reviews, [at](const CurveReview& r) { return r.occurred_at > at; });
  std::erase_if(v.curve.retirements, [at](const CurveRetirement& r) { return r.occurred_at > at; });
  v.method_code = facts.method(c.method_id).code;
  v.version = facts.version_of(id);
  v.instrument_code = facts.instrument(c.instrument_id).code;
  for (const Lot* lot : facts.lots_of(id)) v.lots.push_back(*lot);
  v.status = status;
  v.as_of = at;
  return v;
}

std::vector<CurveView> make_views(FactSet& facts, const std::vector<CurveId>& ids, Instant at,
                                  bool with_points) {
  facts.load(ids, with_points ? store::CurveDetail::Points : store::CurveDetail::Statistics);
  const auto states = facts.statuses(ids, at);
  std::vector<CurveView> out;
  out.reserve(ids.size());
  for (CurveId id : ids) out.push_back(make_view(facts, id, states.at(id), at));
  if (with_points) {
    // Full views (curve show, log, review) carry the signatures: the manifestation of 21 CFR
    // 11.50 goes wherever the signed record is shown.
    for (Signature& g : facts.signatures_of(ids)) {
      for (CurveView& v : out) {
        if (std::to_string(v.curve.id.value) == g.entity_id && g.signed_at <= at) {
          v.signatures.push_back(g);
        }
      }
    }
  }
  return out;
}

std::vector<CurveView> make_views(FactSet& facts, const std::map<CurveId, CurveStatus>& states,
                                  Instant at) {
  std::vector<CurveId> ids;
  ids.reserve(states.size());
  for (const auto& [id, status] : states) ids.push_back(id);
  facts.load(ids, store::CurveDetail::Statistics);
  std::vector<CurveView> out;
  out.reserve(ids.size());
  for (const auto& [id, status] : states) out.push_back(make_view(facts, id, status, at));
  return out;
}

}  // namespace cw::app
