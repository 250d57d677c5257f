// SPDX-License-Identifier: Apache-2.0
// The curve listing, evaluated in batches.
#include "app/curve_listing.h"

#include <algorithm>
#include <unordered_set>

#include "app/registry.h"
#include "rules/curve_facts.h"

namespace cw::app {

CurveListing::CurveListing(Session& s, const CurveListRequest& r)
    : zone_(s.zone()), at_(s.at()), state_(r.state), unit_(s.read()) {
  kept_ = std::make_unique<FactSet>(*unit_, zone_);
  store::CurveFilter filter;
  if (r.method) filter.method = get_method(*unit_, *r.method).id;
  if (r.instrument) filter.instrument = get_instrument(*unit_, *r.instrument).id;
  filter.analyte = r.analyte;
  filter.acquired_by = at_;
  ids_ = unit_->curves().list(filter);
  if (state_ == CurveState::Active) {
    // A curve whose expiry moment is not after the moment is expired, so never active: only the
    // live curves (CurveReader::live_of_instrument) are evaluated.
    std::unordered_set<std::int64_t> live;
    const auto add = [&](InstrumentId instrument) {
      for (CurveId id : unit_->curves().live_of_instrument(instrument, at_)) live.insert(id.value);
    };
    if (filter.instrument) {
      add(*filter.instrument);
    } else {
      for (const auto& instrument : unit_->registry().instruments()) add(instrument.id);
    }
    std::erase_if(ids_, [&](CurveId id) { return !live.count(id.value); });
  }
}

void CurveListing::each(const std::function<void(const CurveView&)>& visit) {
  for (std::size_t begin = 0; begin < ids_.size(); begin += kBatch) {
    const auto from = ids_.begin() + static_cast<std::ptrdiff_t>(begin);
    const std::vector<CurveId> batch(
        from, from + static_cast<std::ptrdiff_t>(std::min(kBatch, ids_.size() - begin)));
    FactSet facts(*unit_, zone_);
    facts.load(batch);
    for (CurveId id : batch) {
      const CurveStatus status = status_of(facts, id);
      if (state_ && status.state != *state_) continue;
      visit(make_view(facts, id, status, at_));
    }
  }
}

CurveStatus CurveListing::status_of(FactSet& batch, CurveId id) {
  // FactSet::statuses() with the group's newer live curves narrowed to those that can supersede
  // (evaluate() skips the others): the same state, without holding every live curve.
  const rules::CurveFacts& own = batch.facts(id);
  const Curve& c = *own.curve;
  std::vector<const rules::CurveFacts*> newer;
  if (c.acquired_at <= at_) {
    for (CurveId other : superseding(c)) {
      const rules::CurveFacts& o = kept_->facts(other);
      if (other != id && o.curve->acquired_at >= c.acquired_at) newer.push_back(&o);
    }
  }
  return rules::evaluate(own, at_, zone_, newer);
}

const std::vector<CurveId>& CurveListing::superseding(const Curve& c) {
  Group group{c.method_id, c.instrument_id, c.analyte};
  if (auto it = superseding_.find(group); it != superseding_.end()) return it->second;
  // Only a live curve can be active at the moment; evaluate() takes the newest active one that
  // is newer than the curve judged, so the order (newest first) is kept.
  const auto live =
      unit_->curves().live_in_group(c.method_id, c.instrument_id, c.analyte, std::nullopt, at_);
  std::vector<CurveId> active;
  {
    FactSet facts(*unit_, zone_);
    facts.load(live);
    for (CurveId id : live) {
      if (rules::evaluate(facts.facts(id), at_, zone_).state == CurveState::Active) {
        active.push_back(id);
      }
    }
  }
  kept_->load(active);
  return superseding_.emplace(std::move(group), std::move(active)).first->second;
}

}  // namespace cw::app
