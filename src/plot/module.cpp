// SPDX-License-Identifier: Apache-2.0
// The entry points of curvewarden-draw.so (module.h). Everything else in the module is hidden:
// it carries its own copy of the drawing code and of what it uses.
#include "plot/module.h"

#include "core/module_loader.h"

#define CW_EXPORT __attribute__((visibility("default")))

extern "C" {

CW_EXPORT const char* cw_module_abi() {
  return cw::module_abi();
}

CW_EXPORT void cw_draw_curve_plot(const cw::plot::CurvePlot& plot, const std::string& path) {
  cw::plot::render_curve_plot(plot, path);
}

CW_EXPORT void cw_draw_control_chart(const cw::plot::ControlChart& chart, const std::string& path) {
  cw::plot::render_control_chart(chart, path);
}

CW_EXPORT int cw_draw_curve_report(const cw::plot::CurveReport& report, const std::string& path) {
  return cw::plot::render_curve_report(report, path);
}

CW_EXPORT int cw_draw_run_report(const cw::plot::RunReport& report, const std::string& path) {
  return cw::plot::render_run_report(report, path);
}

}  // extern "C"
