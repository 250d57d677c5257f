// SPDX-License-Identifier: Apache-2.0
// Batch fact loading.
#include "app/fact_set.h"

#include <algorithm>
#include <set>
#include <stdexcept>
#include <tuple>

#include "core/error.h"
#include "rules/westgard.h"

namespace cw::app {
namespace {

/// Ids not yet in a map, each once, in the order first met (sets keep this linear in the
/// thousands of ids `status` and `expiring` load).
template <class Id>
class Missing {
 public:
  template <class Map>
  void add(const Map& map, Id id) {
    if (!map.count(id) && seen_.insert(id).second) ids_.push_back(id);
  }
  const std::vector<Id>& ids() const { return ids_; }
  bool empty() const { return ids_.empty(); }

 private:
  std::set<Id> seen_;
  std::vector<Id> ids_;
};

[[noreturn]] void damaged_reference(const std::string& what) {
  throw StoreError("the store is damaged: " + what,
                   "run 'curvewarden audit verify' and restore the store from a backup");
}

[[noreturn]] void no_such_curve(CurveId id) {
  throw NotFoundError("no curve " + std::to_string(id.value),
                      "list curves with 'curvewarden curve list'");
}

}  // namespace

void FactSet::load(const std::vector<CurveId>& ids, store::CurveDetail detail) {
  std::vector<CurveId> wanted;
  std::set<CurveId> seen;
  for (CurveId id : ids) {
    const auto have = detail_.find(id);
    if (have != detail_.end() && have->second >= detail) continue;
    if (seen.insert(id).second) wanted.push_back(id);
  }
  if (wanted.empty()) return;
  std::vector<CurveId> fresh;
  for (auto& c : unit_.curves().curves(wanted, detail)) {
    const CurveId id = c.id;
    if (auto it = curves_.find(id); it != curves_.end()) {
      // Loaded before with less: complete it, keeping the object others refer to.
      const store::CurveDetail had = detail_.at(id);
      if (had < store::CurveDetail::Statistics) {
        it->second->fit = std::move(c.fit);
        it->second->acceptance = std::move(c.acceptance);
        it->second->lowest_level = c.lowest_level;
      }
      if (detail == store::CurveDetail::Points) it->second->points = std::move(c.points);
      detail_[id] = detail;
      continue;
    }
    fresh.push_back(id);
    detail_[id] = detail;
    curves_[id] = std::make_unique<Curve>(std::move(c));
  }
  if (fresh.empty()) return;
  for (auto& k : unit_.curves().checks_of(fresh)) checks_[k.curve_id].push_back(std::move(k));
  Missing<CalibrationId> calibrations;
  Missing<MethodId> methods;
  Missing<InstrumentId> instruments;
  for (CurveId id : fresh) {
    const Curve& c = *curves_.at(id);
    calibrations.add(calibrations_, c.calibration_id);
    methods.add(methods_, c.method_id);
    instruments.add(instruments_, c.instrument_id);
  }
  if (!calibrations.empty()) {
    for (auto& k : unit_.curves().calibrations(calibrations.ids())) {
      const CalibrationId id = k.id;
      calibrations_[id] = std::make_unique<Calibration>(std::move(k));
    }
  }
  Missing<LotId> lots;
  for (CalibrationId id : calibrations.ids()) {
    if (!calibrations_.count(id))
      damaged_reference("calibration " + std::to_string(id.value) + " is missing");
    for (LotId lot : calibrations_.at(id)->lots) lots.add(lots_, lot);
  }
  if (!methods.empty()) {
    for (auto& m : unit_.registry().methods(methods.ids())) {
      const MethodId id = m.id;
      methods_[id] = std::make_unique<Method>(std::move(m));
    }
  }
  if (!instruments.empty()) {
    for (auto& i : unit_.registry().instruments(instruments.ids())) {
      const InstrumentId id = i.id;
      instruments_[id] = std::make_unique<Instrument>(std::move(i));
    }
  }
  if (!lots.empty()) {
    for (auto& l : unit_.registry().lots(lots.ids())) {
      const LotId id = l.id;
      lots_[id] = std::make_unique<Lot>(std::move(l));
    }
  }
  // The trend rule reads the whole group's checks: one query per group whose method version
  // names a rule that can make a curve stale.
  for (CurveId id : fresh) {
    const Curve& c = *curves_.at(id);
    auto m = methods_.find(c.method_id);
    if (m == methods_.end()) continue;  // reported as damage when the facts are built
    for (const auto& v : m->second->versions) {
      if (v.id != c.method_version_id) continue;
      if (rules::rejection_rules(v.definition.check.trend_rules).empty()) break;
      const auto key = std::make_tuple(c.method_id, c.instrument_id, c.analyte);
      if (!group_checks_.count(key)) {
        group_checks_[key] =
            unit_.curves().checks_of_group(c.method_id, c.instrument_id, c.analyte);
      }
      break;
    }
  }
}

const Curve& FactSet::curve(CurveId id, store::CurveDetail detail) {
  load({id}, std::max(detail, store::CurveDetail::Statistics));
  auto it = curves_.find(id);
  if (it == curves_.end()) no_such_curve(id);
  return *it->second;
}

const Curve& FactSet::state_curve(CurveId id) {
  load({id}, store::CurveDetail::State);
  auto it = curves_.find(id);
  if (it == curves_.end()) no_such_curve(id);
  return *it->second;
}

const Method& FactSet::method(MethodId id) {
  auto it = methods_.find(id);
  if (it == methods_.end()) {
    auto found = unit_.registry().methods({id});
    if (found.empty()) damaged_reference("method id " + std::to_string(id.value) + " is missing");
    it = methods_.emplace(id, std::make_unique<Method>(std::move(found.front()))).first;
  }
  return *it->second;
}

void FactSet::load_methods(const std::vector<MethodId>& ids) {
  Missing<MethodId> missing;
  for (MethodId id : ids) missing.add(methods_, id);
  if (missing.empty()) return;
  for (auto& m : unit_.registry().methods(missing.ids())) {
    const MethodId id = m.id;
    methods_[id] = std::make_unique<Method>(std::move(m));
  }
}

const Instrument& FactSet::instrument(InstrumentId id) {
  auto it = instruments_.find(id);
  if (it == instruments_.end()) {
    auto found = unit_.registry().instruments({id});
    if (found.empty()) {
      damaged_reference("instrument id " + std::to_string(id.value) + " is missing");
    }
    it = instruments_.emplace(id, std::make_unique<Instrument>(std::move(found.front()))).first;
  }
  return *it->second;
}

const Calibration& FactSet::calibration(CalibrationId id) {
  auto it = calibrations_.find(id);
  if (it == calibrations_.end()) {
    auto found = unit_.curves().calibration(id);
    if (!found) damaged_reference("calibration " + std::to_string(id.value) + " is missing");
    it = calibrations_.emplace(id, std::make_unique<Calibration>(std::move(*found))).first;
  }
  return *it->second;
}

const rules::CurveFacts& FactSet::facts(CurveId id) {
  curve(id);
  return state_facts(id);
}

const rules::CurveFacts& FactSet::state_facts(CurveId id) {
  auto& slot = facts_[id];
  if (!slot) {
    const Curve& c = *curves_.at(id);
    auto f = std::make_unique<rules::CurveFacts>();
    f->curve = &c;
    f->method = &method(c.method_id);
    f->instrument = &instrument(c.instrument_id);
    for (LotId lot_id : calibration(c.calibration_id).lots) {
      auto it = lots_.find(lot_id);
      if (it == lots_.end()) {
        auto found = unit_.registry().lots({lot_id});
        if (found.empty()) {
          damaged_reference("lot id " + std::to_string(lot_id.value) + " is missing");
        }
        it = lots_.emplace(lot_id, std::make_unique<Lot>(std::move(found.front()))).first;
      }
      f->lots.push_back(it->second.get());
    }
    if (auto k = checks_.find(id); k != checks_.end()) f->checks = k->second;
    if (auto g = group_checks_.find(std::make_tuple(c.method_id, c.instrument_id, c.analyte));
        g != group_checks_.end()) {
      f->group_checks = g->second;
    }
    bool has_version = false;
    for (const auto& v : f->method->versions)
      has_version = has_version || v.id == c.method_version_id;
    if (!has_version) {
      damaged_reference("curve " + std::to_string(id.value) +
                        " refers to a method version its method does not have");
    }
    slot = std::move(f);
  }
  return *slot;
}

void FactSet::leave_out_checks(CurveId id, const std::vector<CheckId>& checks) {
  if (checks.empty()) return;
  if (facts_.count(id)) throw std::logic_error("checks left out after the facts were used");
  const auto left_out = [&](const Check& k) {
    return std::find(checks.begin(), checks.end(), k.id) != checks.end();
  };
  if (auto it = checks_.find(id); it != checks_.end()) std::erase_if(it->second, left_out);
  if (auto c = curves_.find(id); c != curves_.end()) {
    const Curve& curve = *c->second;
    const auto g =
        group_checks_.find(std::make_tuple(curve.method_id, curve.instrument_id, curve.analyte));
    if (g != group_checks_.end()) std::erase_if(g->second, left_out);
  }
}

std::vector<CurveId> FactSet::newer_live_in_group(const Curve& c, Instant at) {
  if (c.acquired_at > at) return {};
  return unit_.curves().live_in_group(c.method_id, c.instrument_id, c.analyte, c.acquired_at, at);
}

CurveStatus FactSet::status(CurveId id, Instant at) {
  return statuses({id}, at).at(id);
}

std::map<CurveId, CurveStatus> FactSet::statuses(const std::vector<CurveId>& ids, Instant at) {
  load(ids, store::CurveDetail::State);
  for (CurveId id : ids) {
    if (!curves_.count(id)) curve(id);  // NotFoundError for an unknown id
  }
  // One query per group: the live curves acquired since the group's oldest curve asked about.
  std::map<Group, Instant> oldest;
  for (CurveId id : ids) {
    const Curve& c = *curves_.at(id);
    if (c.acquired_at > at) continue;
    const Group g{c.method_id, c.instrument_id, c.analyte};
    auto [it, inserted] = oldest.emplace(g, c.acquired_at);
    if (!inserted) it->second = std::min(it->second, c.acquired_at);
  }
  std::map<Group, std::vector<CurveId>> members;
  std::vector<CurveId> all;
  for (const auto& [g, since] : oldest) {
    auto live =
        unit_.curves().live_in_group(std::get<0>(g), std::get<1>(g), std::get<2>(g), since, at);
    all.insert(all.end(), live.begin(), live.end());
    members[g] = std::move(live);
  }
  load(all, store::CurveDetail::State);
  return decide(ids, members, at);
}

std::map<CurveId, CurveStatus> FactSet::live_statuses(const std::vector<CurveId>& live,
                                                      Instant at) {
  load(live, store::CurveDetail::State);
  std::map<Group, std::vector<CurveId>> members;
  for (CurveId id : live) {
    if (!curves_.count(id)) curve(id);  // NotFoundError for an unknown id
    const Curve& c = *curves_.at(id);
    if (c.acquired_at > at || c.expires_at <= at) {
      throw std::logic_error("curve " + std::to_string(id.value) + " is not live at the moment");
    }
    members[{c.method_id, c.instrument_id, c.analyte}].push_back(id);
  }
  return decide(live, members, at);
}

std::map<CurveId, CurveStatus> FactSet::decide(const std::vector<CurveId>& ids,
                                               const std::map<Group, std::vector<CurveId>>& members,
                                               Instant at) {
  std::map<CurveId, CurveStatus> out;
  for (CurveId id : ids) {
    const rules::CurveFacts& own = state_facts(id);
    std::vector<const rules::CurveFacts*> newer;
    const Curve& c = *own.curve;
    if (c.acquired_at <= at) {
      if (auto m = members.find({c.method_id, c.instrument_id, c.analyte}); m != members.end()) {
        for (CurveId other : m->second) {
          const Curve& o = *curves_.at(other);
          if (other != id && o.acquired_at >= c.acquired_at) newer.push_back(&state_facts(other));
        }
      }
    }
    out.emplace(id, rules::evaluate(own, at, zone_, newer));
  }
  return out;
}

std::map<CurveGroup, FactSet::GroupActive> FactSet::active_in_groups(
    const std::vector<CurveGroup>& groups, Instant at) {
  struct Walk {
    const CurveGroup* group;
    std::vector<CurveId> live;  // newest first
    std::size_t next = 0;       // live[0, next) were decided and are not active
  };
  std::vector<Walk> walks;
  walks.reserve(groups.size());
  for (const CurveGroup& g : groups) {
    walks.push_back(
        {&g, unit_.curves().live_in_group(g.method, g.instrument, g.analyte, std::nullopt, at)});
  }
  std::map<CurveGroup, GroupActive> out;
  std::vector<Walk*> open;
  for (Walk& w : walks) {
    if (!w.live.empty()) open.push_back(&w);
  }
  // The newest curve of a group is most often its active one: one at first, then twice as many
  // of each group still open at every round.
  for (std::size_t take = 1; !open.empty(); take *= 2) {
    std::vector<CurveId> batch;
    for (const Walk* w : open) {
      const std::size_t end = std::min(w->live.size(), w->next + take);
      batch.insert(batch.end(), w->live.begin() + static_cast<std::ptrdiff_t>(w->next),
                   w->live.begin() + static_cast<std::ptrdiff_t>(end));
    }
    load(batch, store::CurveDetail::State);
    std::vector<Walk*> still;
    for (Walk* w : open) {
      const std::size_t end = std::min(w->live.size(), w->next + take);
      bool found = false;
      for (; w->next < end && !found; ++w->next) {
        const CurveId id = w->live[w->next];
        CurveStatus status = rules::evaluate(state_facts(id), at, zone_);
        if (status.state != CurveState::Active) continue;
        out.emplace(*w->group, GroupActive{id, std::move(status)});
        found = true;
      }
      if (!found && w->next < w->live.size()) still.push_back(w);
    }
    open = std::move(still);
  }
  return out;
}

std::vector<Signature> FactSet::signatures_of(const std::vector<CurveId>& ids) {
  std::vector<std::string> keys;
  keys.reserve(ids.size());
  for (CurveId id : ids) keys.push_back(std::to_string(id.value));
  return unit_.registry().signatures_of("curve", keys);
}

}  // namespace cw::app
