// SPDX-License-Identifier: Apache-2.0
// Loads the facts the rules engine needs (curves, their method, instrument, lots and checks)
// once per command, and answers "what is the state of curve N at T".
#pragma once

#include <map>
#include <memory>
#include <vector>

#include "app/session.h"
#include "domain/curve.h"
#include "rules/curve_facts.h"

namespace cw::app {

class FactLoader {
 public:
  explicit FactLoader(Session& s) : s_(s) {}

  /// Throws NotFoundError naming the curve when there is none.
  const Curve& curve(CurveId id);
  const Method& method(MethodId id);
  const Instrument& instrument(InstrumentId id);
  const Lot& lot(LotId id);
  const Calibration& calibration(CalibrationId id);
  const rules::CurveFacts& facts(CurveId id);
  const MethodVersion& version_of(CurveId id) { return facts(id).version(); }
  std::vector<const Lot*> lots_of(CurveId id) { return facts(id).lots; }

  /// The state at `at`, superseded included (newer curves of the group are loaded as needed).
  CurveStatus status(CurveId id, Instant at);

  /// Drops cached checks and curves (after this command wrote new facts).
  void forget_curve(CurveId id);

 private:
  Session& s_;
  std::map<CurveId, std::unique_ptr<Curve>> curves_;
  std::map<MethodId, std::unique_ptr<Method>> methods_;
  std::map<InstrumentId, std::unique_ptr<Instrument>> instruments_;
  std::map<LotId, std::unique_ptr<Lot>> lots_;
  std::map<CalibrationId, std::unique_ptr<Calibration>> calibrations_;
  std::map<CurveId, std::unique_ptr<rules::CurveFacts>> facts_;
};

}  // namespace cw::app
