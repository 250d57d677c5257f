// SPDX-License-Identifier: Apache-2.0
// The facts the rules engine needs (curves, their method, instrument, lots and checks), loaded in
// batches through one unit of work, and the state of curves at a moment.
#pragma once

#include <map>
#include <memory>
#include <string>
#include <tuple>
#include <vector>

#include "domain/curve.h"
#include "rules/curve_facts.h"
#include "store/store.h"

namespace cw::app {

class FactSet {
 public:
  FactSet(store::ReadUnit& unit, const LabZone& zone) : unit_(unit), zone_(zone) {}

  /// Loads the curves and everything their state needs in a handful of queries, whatever their
  /// number (one more per group whose method names trend rules: the group's checks), with as
  /// much of each curve as `detail` asks. Unknown ids are skipped.
  void load(const std::vector<CurveId>& ids,
            store::CurveDetail detail = store::CurveDetail::Statistics);

  /// The curve with at least its statistics (loaded on demand); NotFoundError naming it when
  /// there is none.
  const Curve& curve(CurveId id, store::CurveDetail detail = store::CurveDetail::Statistics);
  /// A curve as loaded to decide its state (its statistics may be absent): identity, group,
  /// moments and verdict. NotFoundError naming it when there is none.
  const Curve& state_curve(CurveId id);
  /// The facts of a curve whose statistics are loaded.
  const rules::CurveFacts& facts(CurveId id);
  /// The facts of a loaded curve as they are: its statistics may be absent (what the rules
  /// engine reads does not include them).
  const rules::CurveFacts& state_facts(CurveId id);
  const Method& method(MethodId id);
  /// Loads the methods not loaded yet in one query, so that `method()` of each reads nothing.
  /// Unknown ids are skipped (`method()` then reports the damage).
  void load_methods(const std::vector<MethodId>& ids);
  const Instrument& instrument(InstrumentId id);
  const Calibration& calibration(CalibrationId id);
  const MethodVersion& version_of(CurveId id) { return facts(id).version(); }
  std::vector<const Lot*> lots_of(CurveId id) { return facts(id).lots; }
  /// The electronic signatures given to these curves, oldest first (one query).
  std::vector<Signature> signatures_of(const std::vector<CurveId>& ids);

  /// Leaves `checks` of loaded curve `id` out of what its state is decided from: checks given
  /// the moment asked about but recorded after what is traced at it. A logic_error once the
  /// curve's facts have been used.
  void leave_out_checks(CurveId id, const std::vector<CheckId>& checks);

  /// The state at `at`, superseded included (the group's newer live curves are loaded).
  CurveStatus status(CurveId id, Instant at);
  /// The states of many curves at `at`, with one group query per distinct (method, instrument,
  /// analyte) and one batch load.
  std::map<CurveId, CurveStatus> statuses(const std::vector<CurveId>& ids, Instant at);
  /// The states at `at` of `live`: the live curves (acquired by `at`, expiry after it) of whole
  /// groups, as CurveReader::live_of_instrument and live_in_group return them. A curve's newer
  /// live curves are then among them, so no group is read again; one batch load. A logic_error
  /// for a curve that is not live at `at`.
  std::map<CurveId, CurveStatus> live_statuses(const std::vector<CurveId>& live, Instant at);

  /// The active curve of a group at `at`, with its state.
  struct GroupActive {
    CurveId curve;
    CurveStatus status;
  };
  /// The active curve of each group at `at` (groups with none are left out), reading no more of
  /// a group than it takes to find it. A group's live curves are decided newest first, on their
  /// own: the first active one is the group's (a curve is superseded only by a newer one active
  /// on its own, and no newer one is), every older one is superseded by it, and so none of those
  /// needs reading. One query per group for its live curves, then batch loads of the next few
  /// of every group still without an answer.
  std::map<CurveGroup, GroupActive> active_in_groups(const std::vector<CurveGroup>& groups,
                                                     Instant at);

 private:
  std::vector<CurveId> newer_live_in_group(const Curve& c, Instant at);
  using Group = std::tuple<MethodId, InstrumentId, std::string>;
  /// The states at `at` of `ids` (loaded), each against the curves of `members` (its group's
  /// live curves, loaded) acquired no earlier than itself.
  std::map<CurveId, CurveStatus> decide(const std::vector<CurveId>& ids,
                                        const std::map<Group, std::vector<CurveId>>& members,
                                        Instant at);

  store::ReadUnit& unit_;
  const LabZone& zone_;
  /// Every curve loaded, with how much of it: the state of many curves is decided without
  /// their statistics; those shown are completed in place (CurveFacts point at them).
  std::map<CurveId, std::unique_ptr<Curve>> curves_;
  std::map<CurveId, store::CurveDetail> detail_;
  std::map<CurveId, std::vector<Check>> checks_;
  std::map<MethodId, std::unique_ptr<Method>> methods_;
  std::map<InstrumentId, std::unique_ptr<Instrument>> instruments_;
  std::map<LotId, std::unique_ptr<Lot>> lots_;
  std::map<CalibrationId, std::unique_ptr<Calibration>> calibrations_;
  std::map<CurveId, std::unique_ptr<rules::CurveFacts>> facts_;
  /// Checks of a group (method, instrument, analyte), for the trend rule.
  std::map<std::tuple<MethodId, InstrumentId, std::string>, std::vector<Check>> group_checks_;
};

}  // namespace cw::app
