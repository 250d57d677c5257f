// SPDX-License-Identifier: Apache-2.0
// Filling the curve plot from a curve view.
#include "report/curve_plot_view.h"

#include "report/curve_views.h"
#include "report/numbers.h"

namespace cw::report {

plot::CurvePlot curve_plot_of(const app::CurveView& v, Instant created_at) {
  const Curve& c = v.curve;
  const auto& rules = v.version.definition.calibration;
  plot::CurvePlot p;
  p.title = "Curve " + std::to_string(c.id.value) + " · " + v.method_code + " v" +
            std::to_string(v.version.version) + " · " + v.instrument_code;
  p.analyte = c.analyte;
  p.unit = v.version.definition.unit;
  p.response_label = v.version.definition.internal_standard
                         ? "response / " + *v.version.definition.internal_standard
                         : "response";
  p.fit = c.fit;
  for (const auto& pt : c.points) {
    plot::CurvePlotPoint q;
    q.nominal = pt.nominal;
    q.response = pt.y;
    q.level = pt.level;
    q.replicate = pt.replicate;
    q.excluded = pt.excluded;
    q.exclusion_reason = pt.exclude_reason.value_or("");
    q.error_pct = pt.error_pct;
    q.within_limits = pt.within_limits;
    p.points.push_back(std::move(q));
  }
  p.range_low = c.fit.range_low;
  p.range_high = c.fit.range_high;
  if (const auto limits = fitting::reporting_limits(c.fit, rules.limits)) {
    p.lod = limits->lod;
    p.loq = limits->loq;
  }
  p.error_limit_pct = rules.max_error_pct;
  p.lowest_error_limit_pct = rules.max_error_pct_lowest;
  p.r2 = c.fit.r2;
  p.equation = equation_text(c.fit);
  p.page.created_at = created_at;
  return p;
}

}  // namespace cw::report
