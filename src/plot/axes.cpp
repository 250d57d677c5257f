// SPDX-License-Identifier: Apache-2.0
// Scales, tick choice, grids, tick labels and the page heading shared by the plots.
#include "plot/axes.h"

#include <algorithm>
#include <cmath>
#include <string>

#include "core/error.h"

namespace cw::plot::detail {

Scale padded_scale(double lo, double hi, double fraction) {
  if (hi - lo <= 1e-12 * std::max(1.0, std::abs(hi))) {
    const double half = lo == 0 ? 1.0 : std::abs(lo) * 0.1;
    return {lo - half, hi + half, 0, 1};
  }
  const double pad = (hi - lo) * fraction;
  return {lo - pad, hi + pad, 0, 1};
}

AxisTicks choose_ticks(const Canvas& canvas, double lo, double hi, double length, bool horizontal,
                       double gap) {
  AxisTicks best;
  for (int max_ticks = 12; max_ticks >= 2; --max_ticks) {
    AxisTicks candidate;
    candidate.ticks = nice_ticks(lo, hi, max_ticks);
    candidate.labels = tick_labels(candidate.ticks);
    double extent = 0;
    for (const std::string& label : candidate.labels.labels) {
      const Rect r = canvas.measure(label, kTickFont);
      candidate.max_label_width = std::max(candidate.max_label_width, r.w);
      extent = std::max(extent, horizontal ? r.w : r.h);
    }
    best = candidate;
    const std::size_t n = candidate.ticks.values.size();
    if (n < 2) break;
    const double spacing = candidate.ticks.step / (hi - lo) * length;
    if (spacing >= extent + gap) break;
  }
  return best;
}

void draw_grid(Canvas& canvas, const Rect& area, const Scale* x, const AxisTicks* x_ticks,
               const Scale* y, const AxisTicks* y_ticks) {
  const Stroke grid{0.7, kGridInk, {}};
  if (x != nullptr && x_ticks != nullptr) {
    for (double v : x_ticks->ticks.values) {
      const double px = x->at(v);
      canvas.line({px, area.y}, {px, area.bottom()}, grid);
    }
  }
  if (y != nullptr && y_ticks != nullptr) {
    for (double v : y_ticks->ticks.values) {
      const double py = y->at(v);
      canvas.line({area.x, py}, {area.right(), py}, grid);
    }
  }
}

double draw_x_ticks(Canvas& canvas, const Rect& area, const Scale& x, const AxisTicks& ticks,
                    bool with_labels) {
  const Stroke tick{1, kFrameInk, {}};
  double bottom = area.bottom() + kTickLength;
  for (std::size_t i = 0; i < ticks.ticks.values.size(); ++i) {
    const double px = x.at(ticks.ticks.values[i]);
    canvas.line({px, area.bottom()}, {px, area.bottom() + kTickLength}, tick);
    if (with_labels) {
      const Rect r = canvas.text(ticks.labels.labels[i], px, area.bottom() + kTickLength + 2,
                                 kTickFont, Align::Centre, Align::Start);
      bottom = std::max(bottom, r.bottom());
    }
  }
  return bottom;
}

double draw_y_ticks(Canvas& canvas, const Rect& area, const Scale& y, const AxisTicks& ticks) {
  const Stroke tick{1, kFrameInk, {}};
  double left = area.x - kTickLength;
  for (std::size_t i = 0; i < ticks.ticks.values.size(); ++i) {
    const double py = y.at(ticks.ticks.values[i]);
    canvas.line({area.x - kTickLength, py}, {area.x, py}, tick);
    const Rect r = canvas.text(ticks.labels.labels[i], area.x - kTickLength - 3, py, kTickFont,
                               Align::End, Align::Centre);
    left = std::min(left, r.x);
  }
  return left;
}

double draw_heading(Canvas& canvas, const std::string& title, const std::string& subtitle) {
  // Up to two lines each; anything longer ends in an ellipsis.
  const TextBox box{canvas.width() - 2 * kMargin, true, 2};
  const Rect t =
      canvas.text(title, kMargin, kMargin, kTitleFont, Align::Start, Align::Start, kBlack, box);
  const Rect s = canvas.text(subtitle, kMargin, t.bottom() + 3, kSubtitleFont, Align::Start,
                             Align::Start, gray(0.25), box);
  return s.bottom();
}

void draw_swatch(Canvas& c, const KeyEntry& e, double x, double cy) {
  const Point centre{x + kSwatchWidth / 2, cy};
  switch (e.kind) {
    case KeyEntry::Kind::Marker:
      c.marker(centre, e.shape, e.radius, false, e.fill);
      break;
    case KeyEntry::Kind::Line:
      c.line({x + 1, cy}, {x + kSwatchWidth - 1, cy}, e.stroke);
      break;
    case KeyEntry::Kind::Fill:
      c.fill_rect({x + 2, cy - 6, kSwatchWidth - 4, 12}, e.fill);
      c.stroke_rect({x + 2, cy - 6, kSwatchWidth - 4, 12}, {0.6, gray(0.6), {}});
      break;
    case KeyEntry::Kind::Band:
      c.fill_rect({x + 1, cy - 6, kSwatchWidth - 2, 12}, e.fill);
      c.line({x + 1, cy - 6}, {x + kSwatchWidth - 1, cy - 6}, e.stroke);
      c.line({x + 1, cy + 6}, {x + kSwatchWidth - 1, cy + 6}, e.stroke);
      break;
    case KeyEntry::Kind::Ring:
      c.marker(centre, MarkerShape::FilledCircle, e.radius, false);
      c.circle(centre, kRingRadius, e.stroke);
      break;
  }
}

void validate_page(const PlotPage& page) {
  require_finite(page.width, "the plot width");
  require_finite(page.height, "the plot height");
  if (page.width < 480 || page.height < 360 || page.width > 20000 || page.height > 20000) {
    throw ValidationError("cannot draw a plot of " + std::to_string(std::lround(page.width)) +
                          " × " + std::to_string(std::lround(page.height)) +
                          " (expected at least 480 × 360 and at most 20000 × 20000)");
  }
}

void require_finite(double value, const std::string& what) {
  if (!std::isfinite(value)) throw ValidationError(what + " is not a finite number");
}

}  // namespace cw::plot::detail
