// SPDX-License-Identifier: Apache-2.0
// The control chart of a check standard, filled from a trend outcome.
#pragma once

#include "app/trend.h"
#include "plot/control_chart.h"

namespace cw::report {

/// The chart of `t`: recoveries against days since the first point shown, the mean and the ±2s
/// and ±3s limits, every violation at its point. ValidationError when `t` has no limits (too few
/// passing checks and no method targets: there is nothing to chart against). The PDF creation
/// date is `created_at`.
plot::ControlChart control_chart_of(const app::TrendOutcome& t, const LabZone& zone,
                                    Instant created_at);

}  // namespace cw::report
