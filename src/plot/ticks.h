// SPDX-License-Identifier: Apache-2.0
// Round axis numbers: tick positions at 1, 2, 2.5 or 5 × 10^k spacing and the text of their labels.
#pragma once

#include <string>
#include <vector>

namespace cw::plot {

/// Tick positions for one axis.
struct Ticks {
  double step = 1;             ///< distance between ticks: 1, 2, 2.5 or 5 × 10^k
  int decimals = 0;            ///< fraction digits that write every tick exactly (0 for step >= 1)
  std::vector<double> values;  ///< ascending, multiples of step; exactly 0 where 0 is a tick
};

/// Ticks at the finest 1-2-2.5-5 spacing that puts at most `max_ticks` multiples of the step
/// inside [low, high], both ends included. A budget of 4 or more always leaves at least two
/// ticks; a smaller one that would leave fewer gets the next finer spacing instead. The values stay
/// inside the interval: the caller chooses the axis extent and the ticks fall on round numbers
/// within it. `low` may equal `high`; swapped ends are accepted. Throws ValidationError for
/// non-finite ends.
Ticks nice_ticks(double low, double high, int max_ticks = 7);

/// Labels for a set of ticks, scaled by a power of ten when the numbers would be long.
struct TickLabels {
  /// 0, or a multiple of 3 when the largest tick is >= 1e5 or every non-zero tick is < 1e-3 in
  /// magnitude; the labels then show value / 10^exponent.
  int exponent = 0;
  std::vector<std::string> labels;  ///< one per tick, minus sign written as U+2212
};

/// Label text for `ticks` (fixed decimals, so that all labels of an axis share their precision).
TickLabels tick_labels(const Ticks& ticks);

/// Axis title "name (unit)" with the scale of the labels folded in: "name (×10³ unit)",
/// "name (×10⁻³)"; just "name" when there is neither unit nor scale.
std::string axis_title(const std::string& name, const std::string& unit, int exponent);

/// `value` with `digits` significant digits in plain decimal notation (trailing zeros of the
/// fraction dropped, minus sign as U+2212); exponent notation "1.2×10⁻⁷" outside
/// 1e-4 <= |value| < 1e7.
std::string format_significant(double value, int digits = 4);

}  // namespace cw::plot
