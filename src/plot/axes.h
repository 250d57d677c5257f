// SPDX-License-Identifier: Apache-2.0
// Internal to plot/: the look shared by the plots (fonts, inks) and their axes: linear scales,
// tick choice that keeps labels apart, frames, grids and tick labels.
#pragma once

#include <string>
#include <vector>

#include "plot/canvas.h"
#include "plot/ticks.h"

namespace cw::plot::detail {

inline const Font kTitleFont{17, true};
inline const Font kSubtitleFont{12.5};
inline const Font kAxisTitleFont{12.5};
inline const Font kTickFont{11.5};
inline const Font kKeyFont{11.5};
inline const Font kKeyHeadingFont{11.5, true};
inline const Font kLabelFont{10.5};

inline constexpr double kMargin = 16;       ///< page edge to anything drawn
inline constexpr double kTickLength = 4;    ///< outward tick marks
inline constexpr double kMarkerRadius = 4;  ///< data markers

inline constexpr Rgb kGridInk = gray(0.88);
inline constexpr Rgb kFrameInk = kBlack;
inline constexpr Rgb kAlertInk{0.72, 0.09, 0.09};    ///< rejections, out-of-limit rings
inline constexpr Rgb kWarningInk{0.62, 0.38, 0.00};  ///< warnings

inline constexpr double kSwatchWidth = 30;  ///< width of a key sample
inline constexpr double kRingRadius = 7.5;  ///< ring around an out-of-limit point

/// One line of a key: a sample of what is drawn and what it means.
struct KeyEntry {
  enum class Kind { Marker, Line, Fill, Band, Ring } kind = Kind::Line;
  std::string label;
  MarkerShape shape = MarkerShape::FilledCircle;
  Stroke stroke{};
  Rgb fill{};  ///< Fill and Band: the area's colour; Marker: the marker's ink
  double radius = kMarkerRadius;
};

/// Draws the sample of `entry` in a box kSwatchWidth wide starting at x, centred on cy.
void draw_swatch(Canvas& canvas, const KeyEntry& entry, double x, double cy);

/// Linear map from data values [lo, hi] to page positions [from, to] (to < from for y).
struct Scale {
  double lo = 0;
  double hi = 1;
  double from = 0;
  double to = 1;
  double at(double v) const { return from + (v - lo) / (hi - lo) * (to - from); }
};

/// [lo, hi] widened by `fraction` of its span at each end (a unit interval around a single
/// value), so that markers at the extremes do not sit on the frame.
Scale padded_scale(double lo, double hi, double fraction);

/// Ticks and their label text for one axis.
struct AxisTicks {
  Ticks ticks;
  TickLabels labels;
  double max_label_width = 0;
};

/// The densest ticks in [lo, hi] whose labels keep at least `gap` page units apart along an axis
/// `length` units long (labels side by side when horizontal, stacked when vertical).
AxisTicks choose_ticks(const Canvas& canvas, double lo, double hi, double length, bool horizontal,
                       double gap);

/// Light grid lines at the ticks inside `area`.
void draw_grid(Canvas& canvas, const Rect& area, const Scale* x, const AxisTicks* x_ticks,
               const Scale* y, const AxisTicks* y_ticks);
/// Tick marks below `area` and their labels; returns the bottom of the labels.
double draw_x_ticks(Canvas& canvas, const Rect& area, const Scale& x, const AxisTicks& ticks,
                    bool with_labels);
/// Tick marks left of `area` and their labels; returns the left edge of the widest label.
double draw_y_ticks(Canvas& canvas, const Rect& area, const Scale& y, const AxisTicks& ticks);

/// Title and subtitle at the top of the page (each wrapped to at most two lines); returns the
/// bottom of the subtitle.
double draw_heading(Canvas& canvas, const std::string& title, const std::string& subtitle);

/// Checks the page size shared by every plot.
void validate_page(const PlotPage& page);
/// Throws ValidationError "<what> is not a finite number" unless `value` is finite.
void require_finite(double value, const std::string& what);

}  // namespace cw::plot::detail
