// SPDX-License-Identifier: Apache-2.0
// Filling the control chart.
#include "report/control_chart_view.h"

#include <chrono>

#include "core/error.h"

namespace cw::report {

plot::ControlChart control_chart_of(const app::TrendOutcome& t, const LabZone& zone,
                                    Instant created_at) {
  if (!t.limits) {
    throw option_error("--plot",
                       "no control chart for " + t.analyte + " on " + t.method_code + " / " +
                           t.instrument_code + ": " + t.no_limits,
                       "a chart needs established limits: the method's trend targets or enough "
                       "passing check standards");
  }
  plot::ControlChart c;
  c.title = "Check standard · " + t.method_code + " v" + std::to_string(t.method_version) + " · " +
            t.instrument_code;
  c.analyte = t.analyte;
  c.mean = t.limits->mean;
  c.low_2s = t.limits->warn_low;
  c.high_2s = t.limits->warn_high;
  c.low_3s = t.limits->low;
  c.high_3s = t.limits->high;
  const Instant first = t.points.empty() ? t.as_of : t.points.front().check.occurred_at;
  c.time_label = "days since " + zone.format_local(first).substr(0, 16);
  for (const auto& p : t.points) {
    plot::ControlPoint q;
    q.check_id = std::to_string(p.check.id.value);
    q.when = zone.format_local(p.check.occurred_at).substr(5, 11);
    q.time = std::chrono::duration<double>(p.check.occurred_at - first).count() / 86400.0;
    q.recovery_pct = p.recovery_pct;
    c.points.push_back(std::move(q));
  }
  for (const auto& v : t.violations) {
    for (std::size_t i = 0; i < t.points.size(); ++i) {
      if (t.points[i].check.id == v.violation.check_id) {
        c.violations.push_back(
            {i, std::string(rules::to_string(v.violation.rule)), v.violation.warning_only});
      }
    }
  }
  c.page.created_at = created_at;
  return c;
}

}  // namespace cw::report
