// SPDX-License-Identifier: Apache-2.0
// Internal to plot/: the plots drawn onto a canvas the caller owns, so that a report can place
// them on its pages as vector graphics (render_curve_plot() and render_control_chart() draw
// onto a canvas of their own file through the same functions).
#pragma once

#include "plot/canvas.h"
#include "plot/control_chart.h"
#include "plot/curve_plot.h"

namespace cw::plot::detail {

/// Checks `plot` as render_curve_plot() does and draws it onto `canvas`, which is
/// plot.page.width × plot.page.height units large (an embedded canvas scales it to its frame).
void draw_curve_plot(const CurvePlot& plot, Canvas& canvas);

/// Checks `chart` as render_control_chart() does and draws it onto `canvas`, which is
/// chart.page.width × chart.page.height units large.
void draw_control_chart(const ControlChart& chart, Canvas& canvas);

}  // namespace cw::plot::detail
