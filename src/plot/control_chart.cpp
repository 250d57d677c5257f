// SPDX-License-Identifier: Apache-2.0
// render_control_chart(): recoveries in time order, centre line, ±2s and ±3s limits, violations
// marked with their rule tokens placed where they cover no other label or point.
#include "plot/control_chart.h"

#include <algorithm>
#include <cmath>
#include <cstddef>
#include <cstdio>
#include <numeric>
#include <string>
#include <vector>

#include "core/error.h"
#include "plot/axes.h"
#include "plot/canvas.h"
#include "plot/figures.h"
#include "plot/ticks.h"

namespace cw::plot {
namespace {

using detail::Align;
using detail::AxisTicks;
using detail::Canvas;
using detail::KeyEntry;
using detail::MarkerShape;
using detail::Point;
using detail::Rect;
using detail::Rgb;
using detail::Scale;
using detail::Stroke;

const Stroke kMeanStroke{1.3, detail::gray(0.1), {}};
const Stroke kWarningStroke{1.1, detail::gray(0.15), {7, 4}};
const Stroke kActionStroke{1.2, detail::gray(0.15), {10, 3, 2, 3}};
const Stroke kSeriesStroke{1.1, detail::gray(0.5), {}};
constexpr double kPointRadius = 3.6;
constexpr double kFlagRadius = 4.6;

enum class Severity { None, Warning, Rejection };

// Line joining (a, b) meets rectangle r (Liang-Barsky clipping).
bool segment_hits(const Rect& r, Point a, Point b) {
  double t0 = 0, t1 = 1;
  const double dx = b.x - a.x, dy = b.y - a.y;
  const double p[4] = {-dx, dx, -dy, dy};
  const double q[4] = {a.x - r.x, r.right() - a.x, a.y - r.y, r.bottom() - a.y};
  for (int i = 0; i < 4; ++i) {
    if (p[i] == 0) {
      if (q[i] < 0) return false;
      continue;
    }
    const double t = q[i] / p[i];
    if (p[i] < 0) {
      t0 = std::max(t0, t);
    } else {
      t1 = std::min(t1, t);
    }
    if (t0 > t1) return false;
  }
  return true;
}

void validate(const ControlChart& chart) {
  detail::validate_page(chart.page);
  using detail::require_finite;
  for (std::size_t i = 0; i < chart.points.size(); ++i) {
    const std::string which = "check point " + std::to_string(i + 1) + "'s ";
    require_finite(chart.points[i].recovery_pct, which + "value");
    if (chart.points[i].time) require_finite(*chart.points[i].time, which + "time");
  }
  const double lines[] = {chart.low_3s, chart.low_2s, chart.mean, chart.high_2s, chart.high_3s};
  for (double v : lines) require_finite(v, "a control limit");
  if (!std::is_sorted(std::begin(lines), std::end(lines))) {
    throw ValidationError(
        "control limits out of order (expected low 3s <= low 2s <= mean <= high 2s <= high 3s)");
  }
  for (const ControlViolation& v : chart.violations) {
    if (v.point_index >= chart.points.size()) {
      throw ValidationError("a '" + v.rule + "' violation names point " +
                            std::to_string(v.point_index + 1) + ", but the chart has " +
                            std::to_string(chart.points.size()) + " points");
    }
  }
}

class ControlChartDrawing {
 public:
  ControlChartDrawing(const ControlChart& chart, Canvas& canvas) : ch_(chart), c_(canvas) {}

  void draw() {
    prepare();
    const double heading_bottom = detail::draw_heading(c_, ch_.title, subtitle());
    layout(heading_bottom);
    draw_plot();
    draw_axes();
    draw_line_labels();
    draw_tokens();
    draw_legend();
  }

 private:
  const ControlChart& ch_;
  Canvas& c_;

  bool numeric_time_ = false;
  std::vector<std::size_t> order_;     // point indices in time order
  std::vector<std::size_t> position_;  // point index -> rank in time order
  std::vector<Severity> severity_;     // per point
  std::vector<std::string> tokens_;    // per point, joined rule tokens
  std::size_t rejections_ = 0, warnings_ = 0;

  Rect area_;
  Scale x_, y_;
  AxisTicks x_ticks_, y_ticks_;
  double legend_top_ = 0;
  std::vector<Point> at_;  // per point, page position
  detail::Occupancy taken_;

  void prepare() {
    const std::size_t n = ch_.points.size();
    numeric_time_ = n > 0 && std::all_of(ch_.points.begin(), ch_.points.end(),
                                         [](const ControlPoint& p) { return p.time.has_value(); });
    order_.resize(n);
    std::iota(order_.begin(), order_.end(), std::size_t{0});
    if (numeric_time_) {
      std::stable_sort(order_.begin(), order_.end(), [&](std::size_t a, std::size_t b) {
        return *ch_.points[a].time < *ch_.points[b].time;
      });
    }
    position_.resize(n);
    for (std::size_t k = 0; k < n; ++k) position_[order_[k]] = k;

    severity_.assign(n, Severity::None);
    tokens_.assign(n, "");
    for (const ControlViolation& v : ch_.violations) {
      Severity& s = severity_[v.point_index];
      const Severity these = v.warning_only ? Severity::Warning : Severity::Rejection;
      s = std::max(s, these);
      std::string& t = tokens_[v.point_index];
      // Each token once per point, in the order given.
      const std::string padded = ", " + t + ",";
      if (padded.find(", " + v.rule + ",") == std::string::npos) {
        t += (t.empty() ? "" : ", ") + v.rule;
      }
    }
    for (Severity s : severity_) {
      if (s == Severity::Rejection) ++rejections_;
      if (s == Severity::Warning) ++warnings_;
    }
  }

  std::string subtitle() const {
    std::string text = ch_.analyte.empty() ? "" : ch_.analyte + " \u00b7 ";
    text += std::to_string(ch_.points.size()) + (ch_.points.size() == 1 ? " check" : " checks");
    if (!ch_.points.empty() && !ch_.points[order_.front()].when.empty() &&
        !ch_.points[order_.back()].when.empty() && ch_.points.size() > 1) {
      text += " from " + ch_.points[order_.front()].when + " to " + ch_.points[order_.back()].when;
    }
    text += " \u00b7 ";
    if (rejections_ + warnings_ == 0) return text + "no rule violated";
    text += std::to_string(rejections_) + (rejections_ == 1 ? " point" : " points") +
            " rejected by a rule, " + std::to_string(warnings_) + " with warnings only";
    return text;
  }

  struct LineLabel {
    std::string text;
    double value;
  };
  // As many decimals as the tick labels, at least one, the same for all five lines.
  std::vector<LineLabel> line_labels() const {
    const int decimals = std::clamp(y_ticks_.ticks.decimals, 1, 4);
    const auto l = [&](const std::string& name, double v) {
      char text[64];
      std::snprintf(text, sizeof text, "%.*f", decimals, v);
      std::string number = text;
      if (number.front() == '-') number = "\u2212" + number.substr(1);
      return LineLabel{name + "  " + number, v};
    };
    return {l("+3s", ch_.high_3s), l("+2s", ch_.high_2s), l("mean", ch_.mean),
            l("\u22122s", ch_.low_2s), l("\u22123s", ch_.low_3s)};
  }

  std::vector<KeyEntry> legend_entries() const {
    std::vector<KeyEntry> out;
    out.push_back({KeyEntry::Kind::Marker,
                   "check result",
                   MarkerShape::FilledCircle,
                   {},
                   detail::kBlack,
                   kPointRadius});
    if (rejections_ > 0) {
      out.push_back({KeyEntry::Kind::Marker,
                     "rejected by a rule",
                     MarkerShape::FilledDiamond,
                     {},
                     detail::kAlertInk,
                     kFlagRadius});
    }
    if (warnings_ > 0) {
      out.push_back({KeyEntry::Kind::Marker,
                     "warning only",
                     MarkerShape::OpenTriangle,
                     {},
                     detail::kWarningInk,
                     kFlagRadius});
    }
    out.push_back({KeyEntry::Kind::Line, "mean", {}, kMeanStroke});
    out.push_back({KeyEntry::Kind::Line, "\u00b12s warning limits", {}, kWarningStroke});
    out.push_back({KeyEntry::Kind::Line, "\u00b13s action limits", {}, kActionStroke});
    return out;
  }

  // Rows of legend entries (indices) that fit the page width.
  std::vector<std::vector<std::size_t>> legend_rows(const std::vector<KeyEntry>& entries,
                                                    std::vector<double>& widths) const {
    const double available = c_.width() - 2 * detail::kMargin;
    std::vector<std::vector<std::size_t>> rows(1);
    double used = 0;
    widths.clear();
    for (std::size_t i = 0; i < entries.size(); ++i) {
      const double w =
          detail::kSwatchWidth + 6 + c_.measure(entries[i].label, detail::kKeyFont).w + 22;
      widths.push_back(w);
      if (used + w > available && !rows.back().empty()) {
        rows.emplace_back();
        used = 0;
      }
      rows.back().push_back(i);
      used += w;
    }
    return rows;
  }

  void layout(double heading_bottom) {
    const double width = c_.width();
    const double height = c_.height();
    const double tick_h = c_.measure("0", detail::kTickFont).h;
    const double title_h = c_.measure("Ag", detail::kAxisTitleFont).h;
    const double key_h = std::max(16.0, c_.measure("Ag", detail::kKeyFont).h);

    std::vector<double> widths;
    const std::size_t legend_row_count = legend_rows(legend_entries(), widths).size();
    const double legend_h = static_cast<double>(legend_row_count) * (key_h + 4);
    legend_top_ = height - detail::kMargin - legend_h;
    const double bottom = legend_top_ - 10 - title_h - 5 - tick_h - 2 - detail::kTickLength;
    const double top = heading_bottom + 16;

    // y: the points and every limit line, with room above and below for rule tokens.
    double lo = ch_.low_3s, hi = ch_.high_3s;
    for (const ControlPoint& p : ch_.points) {
      lo = std::min(lo, p.recovery_pct);
      hi = std::max(hi, p.recovery_pct);
    }
    y_ = detail::padded_scale(lo, hi, 0.10);
    y_ticks_ = detail::choose_ticks(c_, y_.lo, y_.hi, bottom - top, false, 18);

    double right_w = 0;
    for (const LineLabel& l : line_labels()) {
      right_w = std::max(right_w, c_.measure(l.text, detail::kLabelFont).w);
    }
    const double left =
        detail::kMargin + title_h + 8 + y_ticks_.max_label_width + 3 + detail::kTickLength;
    const double right = width - detail::kMargin - right_w - 8;
    area_ = {left, top, right - left, bottom - top};
    y_.from = area_.bottom();
    y_.to = area_.y;

    const std::size_t n = ch_.points.size();
    if (numeric_time_) {
      double t_lo = *ch_.points[order_.front()].time, t_hi = *ch_.points[order_.back()].time;
      x_ = detail::padded_scale(t_lo, t_hi, 0.03);
      x_ticks_ = detail::choose_ticks(c_, x_.lo, x_.hi, area_.w, true, 18);
    } else {
      // Evenly spaced in the order given, half a step in from each side.
      x_ = {-0.5, std::max(0.5, static_cast<double>(n) - 0.5), 0, 1};
    }
    x_.from = area_.x;
    x_.to = area_.right();

    at_.resize(n);
    for (std::size_t i = 0; i < n; ++i) {
      const double xv = numeric_time_ ? *ch_.points[i].time : static_cast<double>(position_[i]);
      at_[i] = {x_.at(xv), y_.at(ch_.points[i].recovery_pct)};
    }
  }

  void draw_plot() {
    detail::draw_grid(c_, area_, numeric_time_ ? &x_ : nullptr, &x_ticks_, &y_, &y_ticks_);
    c_.clip(area_);
    const auto hline = [&](double v, const Stroke& s) {
      c_.line({area_.x, y_.at(v)}, {area_.right(), y_.at(v)}, s);
    };
    hline(ch_.high_3s, kActionStroke);
    hline(ch_.low_3s, kActionStroke);
    hline(ch_.high_2s, kWarningStroke);
    hline(ch_.low_2s, kWarningStroke);
    hline(ch_.mean, kMeanStroke);
    std::vector<Point> series;
    for (std::size_t i : order_) series.push_back(at_[i]);
    c_.polyline(series, kSeriesStroke);
    c_.unclip();

    for (std::size_t i : order_) {
      switch (severity_[i]) {
        case Severity::None:
          c_.marker(at_[i], MarkerShape::FilledCircle, kPointRadius, true);
          taken_.add(Rect{at_[i].x - kPointRadius, at_[i].y - kPointRadius, 2 * kPointRadius,
                          2 * kPointRadius}
                         .inflated(2));
          break;
        case Severity::Warning:
          c_.marker(at_[i], MarkerShape::OpenTriangle, kFlagRadius, true, detail::kWarningInk);
          taken_.add(Rect{at_[i].x - kFlagRadius * 1.3, at_[i].y - kFlagRadius * 1.4,
                          2.6 * kFlagRadius, 2.2 * kFlagRadius}
                         .inflated(2));
          break;
        case Severity::Rejection:
          c_.marker(at_[i], MarkerShape::FilledDiamond, kFlagRadius, true, detail::kAlertInk);
          taken_.add(Rect{at_[i].x - kFlagRadius * 1.3, at_[i].y - kFlagRadius * 1.3,
                          2.6 * kFlagRadius, 2.6 * kFlagRadius}
                         .inflated(2));
          break;
      }
    }
    if (ch_.points.empty()) {
      // Between the mean and the upper warning line, on white, so that no line strikes it out.
      const std::string note = "no check results";
      const Rect size = c_.measure(note, detail::kAxisTitleFont);
      const double cy = (y_.at(ch_.mean) + y_.at(ch_.high_2s)) / 2;
      c_.fill_rect(Rect{area_.centre_x() - size.w / 2, cy - size.h / 2, size.w, size.h}.inflated(4),
                   detail::kWhite);
      c_.text(note, area_.centre_x(), cy, detail::kAxisTitleFont, Align::Centre, Align::Centre,
              detail::gray(0.35));
    }
    c_.stroke_rect(area_, {1, detail::kFrameInk, {}});
  }

  void draw_axes() {
    detail::draw_y_ticks(c_, area_, y_, y_ticks_);
    double labels_bottom = area_.bottom() + detail::kTickLength;
    if (numeric_time_) {
      labels_bottom = detail::draw_x_ticks(c_, area_, x_, x_ticks_, true);
    } else if (!ch_.points.empty()) {
      // A tick at every point; labels on every k-th point so that they keep apart.
      const std::size_t n = ch_.points.size();
      double widest = 0;
      for (const ControlPoint& p : ch_.points) {
        widest = std::max(widest, c_.measure(p.when, detail::kTickFont).w);
      }
      const double spacing = area_.w / static_cast<double>(n);
      const std::size_t every =
          std::max<std::size_t>(1, static_cast<std::size_t>(std::ceil((widest + 14) / spacing)));
      const Stroke tick{1, detail::kFrameInk, {}};
      // Short ticks at the unlabelled points, unless they would merge into a solid band.
      const bool minor_ticks = spacing >= 4;
      for (std::size_t k = 0; k < n; ++k) {
        const double px = x_.at(static_cast<double>(k));
        const bool labelled = k % every == 0;
        if (labelled || minor_ticks) {
          canvas_tick(px, labelled ? detail::kTickLength : detail::kTickLength / 2, tick);
        }
        if (!labelled) continue;
        const Rect r =
            c_.text(ch_.points[order_[k]].when, px, area_.bottom() + detail::kTickLength + 2,
                    detail::kTickFont, Align::Centre, Align::Start);
        labels_bottom = std::max(labels_bottom, r.bottom());
      }
    }
    c_.text(axis_title(ch_.time_label, "", numeric_time_ ? x_ticks_.labels.exponent : 0),
            area_.centre_x(), labels_bottom + 5, detail::kAxisTitleFont, Align::Centre,
            Align::Start);
    const double title_x = detail::kMargin + c_.measure("Ag", detail::kAxisTitleFont).h / 2;
    c_.vertical_text(axis_title(ch_.unit, "", y_ticks_.labels.exponent), title_x, area_.centre_y(),
                     detail::kAxisTitleFont);
  }

  void canvas_tick(double px, double length, const Stroke& s) {
    c_.line({px, area_.bottom()}, {px, area_.bottom() + length}, s);
  }

  // Value labels of the five lines, right of the frame, spread apart when lines are close.
  void draw_line_labels() {
    const std::vector<LineLabel> labels = line_labels();
    std::vector<double> wanted, size;
    for (const LineLabel& l : labels) {
      wanted.push_back(y_.at(l.value));
      size.push_back(c_.measure(l.text, detail::kLabelFont).h + 1);
    }
    const std::vector<double> placed = detail::spread_labels(
        wanted, size, area_.y - size.front() / 2, area_.bottom() + size.front() / 2);
    for (std::size_t i = 0; i < labels.size(); ++i) {
      c_.text(labels[i].text, area_.right() + 6, placed[i], detail::kLabelFont, Align::Start,
              Align::Centre, detail::gray(0.1));
    }
  }

  // Rule tokens. Consecutive points (in time order) flagged with the same tokens form a run,
  // labelled once at its first point ("1-3s (4 in a row)"). A label goes to the first free spot
  // around its point, trying eight directions at growing distances: free means inside the frame
  // and covering no marker and no other label; among free spots, those crossing the series line
  // or a limit line cost more. A label moved away from its point gets a leader line; one that
  // finds no free spot is left out and counted in a note above the frame.
  void draw_tokens() {
    std::vector<Point> series;
    for (std::size_t i : order_) series.push_back(at_[i]);
    const double limit_ys[] = {y_.at(ch_.high_3s), y_.at(ch_.high_2s), y_.at(ch_.mean),
                               y_.at(ch_.low_2s), y_.at(ch_.low_3s)};
    const Rect inside = area_.inflated(-2);

    std::vector<std::pair<std::size_t, std::size_t>> runs;  // (first point, length)
    for (std::size_t k = 0; k < order_.size(); ++k) {
      const std::size_t i = order_[k];
      if (severity_[i] == Severity::None) continue;
      if (k > 0) {
        const std::size_t previous = order_[k - 1];
        if (severity_[previous] == severity_[i] && tokens_[previous] == tokens_[i]) {
          ++runs.back().second;
          continue;
        }
      }
      runs.emplace_back(i, 1);
    }

    std::size_t omitted = 0;
    for (const auto& [i, count] : runs) {
      const Rgb ink = severity_[i] == Severity::Rejection ? detail::kAlertInk : detail::kWarningInk;
      const std::string text =
          tokens_[i] + (count > 1 ? " (" + std::to_string(count) + " in a row)" : "");
      const Rect size = c_.measure(text, detail::kLabelFont);
      const double w = size.w + 4, h = size.h + 2;  // with a thin white margin
      const Point p = at_[i];
      const bool above_first = ch_.points[i].recovery_pct >= ch_.mean;

      double best_cost = 1e300;
      Rect best{};
      double best_distance = 0;
      for (double r : {8.0, 18.0, 30.0, 46.0}) {
        const Rect up{p.x - w / 2, p.y - r - h, w, h};
        const Rect down{p.x - w / 2, p.y + r, w, h};
        const double near_y = above_first ? p.y - r * 0.7 - h : p.y + r * 0.7;
        const double far_y = above_first ? p.y + r * 0.7 : p.y - r * 0.7 - h;
        const Rect candidates[] = {
            above_first ? up : down,       above_first ? down : up,
            {p.x + r, p.y - h / 2, w, h},  {p.x - r - w, p.y - h / 2, w, h},
            {p.x + r * 0.7, near_y, w, h}, {p.x - r * 0.7 - w, near_y, w, h},
            {p.x + r * 0.7, far_y, w, h},  {p.x - r * 0.7 - w, far_y, w, h},
        };
        for (std::size_t k = 0; k < std::size(candidates); ++k) {
          const Rect& box = candidates[k];
          if (!inside.contains(box) || taken_.overlap(box) > 0) continue;
          double cost = r * 4 + static_cast<double>(k);
          for (std::size_t s = 1; s < series.size(); ++s) {
            if (segment_hits(box, series[s - 1], series[s])) cost += 30;
          }
          for (double ly : limit_ys) {
            if (ly > box.y && ly < box.bottom()) cost += 6;
          }
          if (cost < best_cost) {
            best_cost = cost;
            best = box;
            best_distance = r;
          }
        }
      }
      if (best_cost >= 1e300) {
        ++omitted;
        continue;
      }
      taken_.add(best);
      if (best_distance > 8) {
        // From the marker's edge to the nearest point of the label.
        const Point to{std::clamp(p.x, best.x, best.right()),
                       std::clamp(p.y, best.y, best.bottom())};
        const double length = std::hypot(to.x - p.x, to.y - p.y);
        const double start = kFlagRadius * 1.4;
        if (length > start) {
          const Point from{p.x + (to.x - p.x) * start / length,
                           p.y + (to.y - p.y) * start / length};
          c_.line(from, to, {0.7, ink, {}});
        }
      }
      c_.fill_rect(best, detail::kWhite);
      c_.text(text, best.centre_x(), best.centre_y(), detail::kLabelFont, Align::Centre,
              Align::Centre, ink);
    }
    if (omitted > 0) {
      c_.text(std::to_string(omitted) + (omitted == 1 ? " rule label" : " rule labels") +
                  " left out for lack of room",
              area_.right(), area_.y - 3, detail::kLabelFont, Align::End, Align::End,
              detail::gray(0.3));
    }
  }

  void draw_legend() {
    const std::vector<KeyEntry> entries = legend_entries();
    std::vector<double> widths;
    const auto rows = legend_rows(entries, widths);
    const double key_h = std::max(16.0, c_.measure("Ag", detail::kKeyFont).h);
    double y = legend_top_;
    for (const auto& row : rows) {
      double total = 0;
      for (std::size_t i : row) total += widths[i];
      total -= 22;  // no gap after the last entry
      double x = (c_.width() - total) / 2;
      for (std::size_t i : row) {
        detail::draw_swatch(c_, entries[i], x, y + key_h / 2);
        c_.text(entries[i].label, x + detail::kSwatchWidth + 6, y + key_h / 2, detail::kKeyFont,
                Align::Start, Align::Centre);
        x += widths[i];
      }
      y += key_h + 4;
    }
  }
};

}  // namespace

void detail::draw_control_chart(const ControlChart& chart, Canvas& canvas) {
  validate(chart);
  ControlChartDrawing(chart, canvas).draw();
}

void render_control_chart(const ControlChart& chart, const std::string& path) {
  const OutputFormat format = output_format_for(path);
  validate(chart);
  Canvas canvas(format, path, chart.page, chart.title);
  detail::draw_control_chart(chart, canvas);
  canvas.finish();
}

}  // namespace cw::plot
