// SPDX-License-Identifier: Apache-2.0
// The control chart of a check standard: recoveries in time order against the mean and the
// ±2s and ±3s limits, with rule violations marked.
#pragma once

#include <cstddef>
#include <optional>
#include <string>
#include <vector>

#include "plot/plot.h"

namespace cw::plot {

/// One check result on the chart.
struct ControlPoint {
  std::string check_id;  ///< the check's id as people see it (carried for tracing; not drawn)
  /// The instant as display text (e.g. "03-14 09:30", already in the lab's zone); labels the
  /// time axis when the points have no numeric time.
  std::string when;
  /// Numeric time in any unit (e.g. days since the first check). When every point has one, the
  /// points are placed and ordered by it and the axis gets round-number ticks; otherwise they
  /// are evenly spaced in the order given.
  std::optional<double> time;
  double recovery_pct = 0;  ///< in ControlChart::unit
};

/// A control rule broken at one point.
struct ControlViolation {
  std::size_t point_index = 0;  ///< index into ControlChart::points
  std::string rule;             ///< rule token as the rules report it, e.g. "1-3s", "2-2s"
  bool warning_only = false;    ///< a warning rule (e.g. "1-2s"), not a rejection
};

/// Everything the control chart shows.
struct ControlChart {
  std::string title;                      ///< first line, e.g. "Check NO3-CS · IC-02"
  std::string analyte;                    ///< e.g. "nitrate"
  std::string unit = "% recovery";        ///< y-axis name and unit of the values
  std::string time_label = "check time";  ///< x-axis name, e.g. "days since 1 March"
  std::vector<ControlPoint> points;
  double mean = 100;
  double low_2s = 0, high_2s = 0;  ///< warning limits, mean ∓ 2s
  double low_3s = 0, high_3s = 0;  ///< action limits, mean ∓ 3s
  /// Several violations may name the same point; their tokens are shown together.
  std::vector<ControlViolation> violations;
  PlotPage page{900, 560, {}};
};

/// Draws `chart` and writes it to `path` as SVG, PNG or PDF (by extension; see plot.h): the
/// points joined in time order (filled circles), the mean as a solid line, ±2s dashed and ±3s
/// dash-dot, each labelled with its value at the right; a point with a rejecting violation is a
/// filled diamond, one with only warnings an open triangle. Rule tokens stand beside their point
/// without overlapping other labels or points; a run of consecutive points with the same tokens
/// is labelled once ("1-3s (4 in a row)"), and a label with no free spot is left out and counted in
/// a note. Throws ValidationError for an unknown
/// extension, a page smaller than 480 × 360, non-finite numbers, limits out of order
/// (low_3s <= low_2s <= mean <= high_2s <= high_3s), a violation naming no point, or a file that
/// cannot be written.
void render_control_chart(const ControlChart& chart, const std::string& path);

}  // namespace cw::plot
