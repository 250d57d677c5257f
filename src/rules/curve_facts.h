// SPDX-License-Identifier: Apache-2.0
// Rules engine: the state of a curve at a moment T as a pure function of stored facts.
//
// Overview. CurveFacts bundles what is known about one curve (its method with every version,
// its instrument with the service history, its lots, the checks against it). evaluate()
// applies each rule of rule_registry.cpp and the state precedence of product.md §5.2. Rules
// look only at facts that happened at or before T, so a fact recorded later never changes the
// answer for T. Nothing here reads the clock, the disk or the store: app/ loads the facts.
#pragma once

#include <vector>

#include "core/time.h"
#include "domain/check.h"
#include "domain/curve.h"
#include "domain/curve_state.h"
#include "domain/instrument.h"
#include "domain/lot.h"
#include "domain/method.h"

namespace cw::rules {

struct CurveFacts {
  const Curve* curve = nullptr;
  const Method* method = nullptr;          ///< with all its versions
  const Instrument* instrument = nullptr;  ///< with its service history
  std::vector<const Lot*> lots;            ///< the calibration's lots, with withdrawals
  std::vector<Check> checks;               ///< checks against this curve, in time order
  /// Checks against every curve of the same method, instrument and analyte, in time order (the
  /// check standard's trend); loaded when the method's trend_rules can make a curve stale.
  std::vector<Check> group_checks;

  /// The method version the curve was made under.
  const MethodVersion& version() const;
};

/// The curve's state at `at` and every reason that holds. `newer_in_group` holds the facts of
/// other curves of the same method, instrument and analyte (any order; older ones and ones
/// acquired after `at` are ignored): the curve is superseded when one of them, acquired later,
/// is itself active at `at`.
CurveStatus evaluate(const CurveFacts& facts, Instant at, const LabZone& zone,
                     const std::vector<const CurveFacts*>& newer_in_group = {});

/// The instant from which the curve was usable: acquisition, or approval when the method
/// requires review (nullopt while it is rejected, unreviewed or retired at `at`).
std::optional<Instant> usable_from(const CurveFacts& facts, Instant at);

}  // namespace cw::rules
