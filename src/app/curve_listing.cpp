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
    in_batch_.clear();
    for (CurveId id : batch) in_batch_.insert(id.value);
    prepare_groups(facts, batch);
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
    for (CurveId other :
         superseding_.at(std::make_tuple(c.method_id, c.instrument_id, c.analyte))) {
      // A curve of another batch is loaded on first use and kept.
      const rules::CurveFacts& o =
          in_batch_.count(other.value) ? batch.facts(other) : kept_->facts(other);
      if (other != id && o.curve->acquired_at >= c.acquired_at) newer.push_back(&o);
    }
  }
  return rules::evaluate(own, at_, zone_, newer);
}

void CurveListing::prepare_groups(FactSet& batch, const std::vector<CurveId>& ids) {
  // The groups met for the first time: their live curves (only a live curve can be active at the
  // moment) loaded together, about kBatch curves at a time, and evaluated supersession aside.
  // evaluate() takes the newest active one that is newer than the curve judged, so the order
  // (newest first) is kept.
  std::vector<Group> groups;
  std::vector<std::vector<CurveId>> lives;
  std::size_t pending = 0;
  const auto settle = [&] {
    if (groups.empty()) return;
    std::vector<CurveId> outside;  // the batch's own curves are loaded already
    for (const auto& live : lives) {
      for (CurveId id : live) {
        if (!in_batch_.count(id.value)) outside.push_back(id);
      }
    }
    FactSet facts(*unit_, zone_);
    facts.load(outside);
    for (std::size_t i = 0; i < groups.size(); ++i) {
      std::vector<CurveId> active;
      for (CurveId id : lives[i]) {
        const rules::CurveFacts& f = in_batch_.count(id.value) ? batch.facts(id) : facts.facts(id);
        if (rules::evaluate(f, at_, zone_).state == CurveState::Active) active.push_back(id);
      }
      superseding_.emplace(std::move(groups[i]), std::move(active));
    }
    groups.clear();
    lives.clear();
    pending = 0;
  };
  for (CurveId id : ids) {
    const Curve& c = batch.curve(id);
    Group group{c.method_id, c.instrument_id, c.analyte};
    if (superseding_.count(group) ||
        std::find(groups.begin(), groups.end(), group) != groups.end()) {
      continue;
    }
    auto live =
        unit_->curves().live_in_group(c.method_id, c.instrument_id, c.analyte, std::nullopt, at_);
    pending += live.size();
    groups.push_back(std::move(group));
    lives.push_back(std::move(live));
    if (pending >= kBatch) settle();  // at most about kBatch curves loaded besides the batch
  }
  settle();
}

}  // namespace cw::app
