// SPDX-License-Identifier: Apache-2.0
// The picture of a curve: the plot library's input filled from a curve view.
#pragma once

#include "app/curve_view.h"
#include "plot/curve_plot.h"

namespace cw::report {

/// The plot of `v`: calibrators (excluded ones marked), the fitted function with its band, the
/// working range, the method's reporting LOD and LOQ, %RE per point against the method's limits,
/// the equation and r². The PDF creation date is `created_at`.
plot::CurvePlot curve_plot_of(const app::CurveView& v, Instant created_at);

}  // namespace cw::report
