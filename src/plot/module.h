// SPDX-License-Identifier: Apache-2.0
// The drawing of plots and reports as a module (core/module_loader.h): cairo, pango, fontconfig
// and glib are loaded only by a command that draws. The binary's render_* functions
// (loader.cpp) forward to curvewarden-draw.so; the test programs link cw_plot directly. The
// plain structs of the headers below cross unchanged.
#pragma once

#include <string>

#include "plot/control_chart.h"
#include "plot/curve_plot.h"
#include "plot/curve_report.h"
#include "plot/run_report.h"

namespace cw::plot {

inline constexpr const char* kModuleFile = "curvewarden-draw.so";

// The module's entry points (C names), one per render_* function.
inline constexpr const char* kCurvePlotSymbol = "cw_draw_curve_plot";
inline constexpr const char* kControlChartSymbol = "cw_draw_control_chart";
inline constexpr const char* kCurveReportSymbol = "cw_draw_curve_report";
inline constexpr const char* kRunReportSymbol = "cw_draw_run_report";

using CurvePlotFunction = void (*)(const CurvePlot&, const std::string&);
using ControlChartFunction = void (*)(const ControlChart&, const std::string&);
using CurveReportFunction = int (*)(const CurveReport&, const std::string&);
using RunReportFunction = int (*)(const RunReport&, const std::string&);

/// Loads the module now (throws InstallationError when it cannot): called before a command
/// writes anything, so a missing module never leaves a recorded fact without its drawing.
void require_drawing();

}  // namespace cw::plot
