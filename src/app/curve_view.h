// SPDX-License-Identifier: Apache-2.0
// A curve with everything a reader needs, and its state at a moment.
#pragma once

#include <map>
#include <string>
#include <vector>

#include "app/fact_set.h"
#include "domain/curve.h"
#include "domain/curve_state.h"
#include "domain/lot.h"
#include "domain/method.h"
#include "domain/signature.h"

namespace cw::app {

struct CurveView {
  Curve curve;
  std::string method_code;
  MethodVersion version;
  std::string instrument_code;
  std::vector<Lot> lots;
  CurveStatus status;
  Instant as_of;
  std::vector<Signature> signatures;  ///< electronic signatures given to the curve, oldest first
};

/// The view of curve `id` with `status` (its state at `at`), from facts already loaded.
CurveView make_view(FactSet& facts, CurveId id, const CurveStatus& status, Instant at);
/// The views of many curves at `at`, states evaluated in one batch.
std::vector<CurveView> make_views(FactSet& facts, const std::vector<CurveId>& ids, Instant at,
                                  bool with_points = false);
/// The views of curves whose states at `at` are already decided (ids in ascending order), with
/// their statistics and without points.
std::vector<CurveView> make_views(FactSet& facts, const std::map<CurveId, CurveStatus>& states,
                                  Instant at);

}  // namespace cw::app
