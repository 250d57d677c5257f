// SPDX-License-Identifier: Apache-2.0
// The binary's render_* functions: each forwards to curvewarden-draw.so (module.h), loaded the
// first time something is drawn (or earlier, by require_drawing).
#include "core/module_loader.h"
#include "plot/module.h"

namespace cw::plot {
namespace {

const Module& drawing() {
  return Module::load(kModuleFile, "the drawing of plots and reports");
}

template <typename Function>
Function entry(const char* name) {
  return reinterpret_cast<Function>(drawing().symbol(name));
}

}  // namespace

void require_drawing() {
  drawing();
}

void render_curve_plot(const CurvePlot& plot, const std::string& path) {
  static const auto draw = entry<CurvePlotFunction>(kCurvePlotSymbol);
  draw(plot, path);
}

void render_control_chart(const ControlChart& chart, const std::string& path) {
  static const auto draw = entry<ControlChartFunction>(kControlChartSymbol);
  draw(chart, path);
}

int render_curve_report(const CurveReport& report, const std::string& path) {
  static const auto draw = entry<CurveReportFunction>(kCurveReportSymbol);
  return draw(report, path);
}

int render_run_report(const RunReport& report, const std::string& path) {
  static const auto draw = entry<RunReportFunction>(kRunReportSymbol);
  return draw(report, path);
}

}  // namespace cw::plot
