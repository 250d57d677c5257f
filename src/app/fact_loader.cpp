// SPDX-License-Identifier: Apache-2.0
// Fact loading with per-command caches.
#include "app/fact_loader.h"

#include "core/error.h"
#include "store/curve_repository.h"
#include "store/registry_repository.h"

namespace cw::app {

const Curve& FactLoader::curve(CurveId id) {
  auto& slot = curves_[id];
  if (!slot) {
    auto found = store::find_curve(s_.db(), id);
    if (!found) {
      curves_.erase(id);
      throw NotFoundError("no curve " + std::to_string(id.value),
                          "list curves with 'curvewarden curve list'");
    }
    slot = std::make_unique<Curve>(std::move(*found));
  }
  return *slot;
}

const Method& FactLoader::method(MethodId id) {
  auto& slot = methods_[id];
  if (!slot) slot = std::make_unique<Method>(store::find_method(s_.db(), id).value());
  return *slot;
}

const Instrument& FactLoader::instrument(InstrumentId id) {
  auto& slot = instruments_[id];
  if (!slot) slot = std::make_unique<Instrument>(store::find_instrument(s_.db(), id).value());
  return *slot;
}

const Lot& FactLoader::lot(LotId id) {
  auto& slot = lots_[id];
  if (!slot) slot = std::make_unique<Lot>(store::find_lot(s_.db(), id).value());
  return *slot;
}

const Calibration& FactLoader::calibration(CalibrationId id) {
  auto& slot = calibrations_[id];
  if (!slot) slot = std::make_unique<Calibration>(store::find_calibration(s_.db(), id).value());
  return *slot;
}

const rules::CurveFacts& FactLoader::facts(CurveId id) {
  auto& slot = facts_[id];
  if (!slot) {
    const Curve& c = curve(id);
    auto f = std::make_unique<rules::CurveFacts>();
    f->curve = &c;
    f->method = &method(c.method_id);
    f->instrument = &instrument(c.instrument_id);
    for (LotId lot_id : calibration(c.calibration_id).lots) f->lots.push_back(&lot(lot_id));
    f->checks = store::checks_of_curve(s_.db(), id);
    slot = std::move(f);
  }
  return *slot;
}

CurveStatus FactLoader::status(CurveId id, Instant at) {
  const rules::CurveFacts& own = facts(id);
  std::vector<const rules::CurveFacts*> newer;
  if (own.curve->acquired_at <= at) {
    for (CurveId other :
         store::live_curves_in_group(s_.db(), own.curve->method_id, own.curve->instrument_id,
                                     own.curve->analyte, own.curve->acquired_at, at)) {
      if (other != id) newer.push_back(&facts(other));
    }
  }
  return rules::evaluate(own, at, s_.zone(), newer);
}

void FactLoader::forget_curve(CurveId id) {
  facts_.erase(id);
  curves_.erase(id);
}

}  // namespace cw::app
