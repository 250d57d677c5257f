// SPDX-License-Identifier: Apache-2.0
// Curve views.
#include "app/curve_view.h"

namespace cw::app {

CurveView make_view(FactSet& facts, CurveId id, const CurveStatus& status, Instant at) {
  CurveView v;
  const Curve& c = facts.curve(id);
  v.curve = c;
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
  facts.load(ids, with_points);
  const auto states = facts.statuses(ids, at);
  std::vector<CurveView> out;
  out.reserve(ids.size());
  for (CurveId id : ids) out.push_back(make_view(facts, id, states.at(id), at));
  return out;
}

}  // namespace cw::app
