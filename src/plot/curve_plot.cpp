// SPDX-License-Identifier: Apache-2.0
// render_curve_plot(): calibration panel, residual panel and the key column beside them.
#include "plot/curve_plot.h"

#include <algorithm>
#include <cmath>
#include <cstddef>
#include <map>
#include <set>
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
using detail::kRingRadius;
using detail::kSwatchWidth;
using detail::MarkerShape;
using detail::Point;
using detail::Rect;
using detail::Rgb;
using detail::Scale;
using detail::Stroke;
using detail::TextBox;

constexpr Rgb kCurveInk{0.08, 0.22, 0.50};
constexpr Rgb kBandFill{0.80, 0.86, 0.94};
constexpr Rgb kRangeFill = detail::gray(0.95);
constexpr Rgb kAcceptFill = detail::gray(0.925);
constexpr Rgb kLimitInk = detail::gray(0.30);
constexpr int kCurveSamples = 240;

const Stroke kCurveStroke{2.0, kCurveInk, {}};
const Stroke kBandEdge{0.8, kCurveInk, {4, 3}};
const Stroke kLodStroke{1.1, detail::gray(0.2), {6, 3}};
const Stroke kLoqStroke{1.1, detail::gray(0.2), {9, 3, 2, 3}};
const Stroke kAcceptEdge{1.0, kLimitInk, {5, 3}};
const Stroke kLowestEdge{1.6, kLimitInk, {1.5, 2}};
const Stroke kRingStroke{1.2, detail::kAlertInk, {}};

MarkerShape shape_of(const CurvePlotPoint& p) {
  if (p.excluded) return MarkerShape::Cross;
  switch (p.replicate) {
    case 1:
      return MarkerShape::FilledCircle;
    case 2:
      return MarkerShape::OpenCircle;
    case 3:
      return MarkerShape::OpenSquare;
    default:
      return p.replicate < 1 ? MarkerShape::FilledCircle : MarkerShape::OpenDiamond;
  }
}

std::string shape_label(MarkerShape shape) {
  switch (shape) {
    case MarkerShape::FilledCircle:
      return "replicate 1";
    case MarkerShape::OpenCircle:
      return "replicate 2";
    case MarkerShape::OpenSquare:
      return "replicate 3";
    case MarkerShape::OpenDiamond:
      return "replicate 4 or later";
    case MarkerShape::Cross:
      return "excluded from the fit";
    default:
      return "";
  }
}

double model_value(const fitting::FitResult& fit, double x) {
  return fit.intercept + fit.slope * x + fit.quadratic * x * x;
}

// Half-width of the confidence band of the mean response at x: t·√(gᵀ·Cov·g), g = (1, x, x²)
// (calibration-practice.md §3.4; zero rows and columns of Cov drop absent terms).
double band_half_width(const fitting::FitResult& fit, double t, double x) {
  const double g[3] = {1, x, x * x};
  double variance = 0;
  for (int i = 0; i < 3; ++i) {
    for (int j = 0; j < 3; ++j) variance += g[i] * fit.covariance[i][j] * g[j];
  }
  return t * std::sqrt(std::max(0.0, variance));
}

bool has_covariance(const fitting::FitResult& fit) {
  for (const auto& row : fit.covariance) {
    for (double v : row) {
      if (v != 0) return true;
    }
  }
  return false;
}

std::string display_model(fitting::Model model) {
  std::string text(fitting::to_string(model));
  std::replace(text.begin(), text.end(), '-', ' ');
  return text;
}

// "1/x²" rather than the token "1/x^2".
std::string display_weighting(fitting::Weighting weighting) {
  std::string text(fitting::to_string(weighting));
  if (const auto at = text.find("^2"); at != std::string::npos) text.replace(at, 2, "\u00b2");
  return text;
}

std::string plural(std::size_t n, const std::string& one, const std::string& many) {
  return std::to_string(n) + " " + (n == 1 ? one : many);
}

std::string with_unit(const std::string& value, const std::string& unit) {
  return unit.empty() ? value : value + " " + unit;
}

void validate(const CurvePlot& plot) {
  detail::validate_page(plot.page);
  using detail::require_finite;
  for (std::size_t i = 0; i < plot.points.size(); ++i) {
    const CurvePlotPoint& p = plot.points[i];
    const std::string which = "point " + std::to_string(i + 1) + "'s ";
    require_finite(p.nominal, which + "nominal concentration");
    require_finite(p.response, which + "response");
    if (p.error_pct) require_finite(*p.error_pct, which + "%RE");
  }
  require_finite(plot.range_low, "the working range's low end");
  require_finite(plot.range_high, "the working range's high end");
  if (plot.lod) require_finite(*plot.lod, "the LOD");
  if (plot.loq) require_finite(*plot.loq, "the LOQ");
  for (const auto& limit : {plot.error_limit_pct, plot.lowest_error_limit_pct}) {
    if (!limit) continue;
    require_finite(*limit, "the %RE limit");
    if (*limit <= 0) throw ValidationError("a %RE limit must be above 0");
  }
  require_finite(plot.fit.intercept, "the intercept");
  require_finite(plot.fit.slope, "the slope");
  require_finite(plot.fit.quadratic, "the quadratic coefficient");
  require_finite(plot.fit.residual_sd, "the residual standard deviation");
  for (const auto& row : plot.fit.covariance) {
    for (double v : row) require_finite(v, "a covariance entry");
  }
}

// Everything the layout needs, computed once.
class CurvePlotDrawing {
 public:
  CurvePlotDrawing(const CurvePlot& plot, Canvas& canvas) : p_(plot), c_(canvas) {}

  void draw() {
    prepare_data();
    const double heading_bottom = detail::draw_heading(c_, p_.title, subtitle());
    layout(heading_bottom);
    draw_upper_panel();
    draw_residual_panel();
    draw_axes();
    draw_key();
  }

 private:
  const CurvePlot& p_;
  Canvas& c_;

  // Data.
  double curve_lo_ = 0, curve_hi_ = 0;
  bool has_curve_ = false;
  double t_ = 0;  // 0: no band
  std::vector<double> curve_x_;
  double lowest_level_ = 0;
  bool has_lowest_level_ = false;
  std::vector<double> levels_;            // distinct nominals, ascending: the residual slots
  std::vector<std::string> level_names_;  // the level label of each slot
  bool show_level_names_ = false;

  // Layout.
  Rect upper_, lower_;
  Scale x_, y_, re_;
  Scale slot_;  // residual panel: level index to page x
  AxisTicks x_ticks_, y_ticks_, re_ticks_;
  double re_limit_ = 0;  // the residual axis runs from -re_limit_ to +re_limit_
  double lod_row_top_ = 0;
  double key_x_ = 0, key_w_ = 0;
  bool any_ring_ = false;

  void prepare_data() {
    curve_lo_ = p_.range_low;
    curve_hi_ = p_.range_high;
    if (curve_hi_ <= curve_lo_) {
      bool any = false;
      for (const CurvePlotPoint& q : p_.points) {
        if (q.excluded) continue;
        curve_lo_ = any ? std::min(curve_lo_, q.nominal) : q.nominal;
        curve_hi_ = any ? std::max(curve_hi_, q.nominal) : q.nominal;
        any = true;
      }
    }
    has_curve_ = curve_hi_ > curve_lo_;
    if (has_curve_ && p_.fit.dof >= 1 && has_covariance(p_.fit)) {
      t_ = fitting::student_t_quantile(0.975, p_.fit.dof);
    }
    if (has_curve_) {
      for (int i = 0; i <= kCurveSamples; ++i) {
        curve_x_.push_back(curve_lo_ + (curve_hi_ - curve_lo_) * i / kCurveSamples);
      }
    }
    // The lowest level: the smallest nominal among fitted points (all points when none is).
    for (bool fitted_only : {true, false}) {
      for (const CurvePlotPoint& q : p_.points) {
        if (fitted_only && q.excluded) continue;
        if (!has_lowest_level_ || q.nominal < lowest_level_) lowest_level_ = q.nominal;
        has_lowest_level_ = true;
      }
      if (has_lowest_level_) break;
    }
    std::map<double, std::string> levels;
    for (const CurvePlotPoint& q : p_.points) levels.emplace(q.nominal, q.level);
    std::set<std::string> distinct_names;
    for (const auto& [nominal, name] : levels) {
      levels_.push_back(nominal);
      level_names_.push_back(name);
      if (!name.empty()) distinct_names.insert(name);
    }
    show_level_names_ = distinct_names.size() == levels_.size() && !levels_.empty();
  }

  std::size_t slot_of(double nominal) const {
    return static_cast<std::size_t>(std::lower_bound(levels_.begin(), levels_.end(), nominal) -
                                    levels_.begin());
  }

  std::string subtitle() const {
    std::set<std::string> levels;
    std::size_t excluded = 0;
    for (const CurvePlotPoint& q : p_.points) {
      levels.insert(q.level);
      if (q.excluded) ++excluded;
    }
    std::string text = p_.analyte.empty() ? "" : p_.analyte + " \u00b7 ";
    text += display_model(p_.fit.model) + " fit, ";
    text += p_.fit.weighting == fitting::Weighting::None
                ? std::string("unweighted")
                : display_weighting(p_.fit.weighting) + " weighting";
    text += " \u00b7 " + plural(p_.points.size(), "point", "points") + " at " +
            plural(levels.size(), "level", "levels");
    if (excluded > 0) text += " (" + std::to_string(excluded) + " excluded)";
    return text;
  }

  // Data extents along x and y of the upper panel; the origin is included when the data start
  // near it, as calibration plots usually show it.
  void data_extents(double& x_lo, double& x_hi, double& y_lo, double& y_hi) const {
    std::vector<double> xs, ys;
    for (const CurvePlotPoint& q : p_.points) {
      xs.push_back(q.nominal);
      ys.push_back(q.response);
    }
    for (double x : curve_x_) {
      xs.push_back(x);
      const double y = model_value(p_.fit, x);
      ys.push_back(y);
      if (t_ > 0) {
        const double h = band_half_width(p_.fit, t_, x);
        ys.push_back(y - h);
        ys.push_back(y + h);
      }
    }
    if (p_.lod) xs.push_back(*p_.lod);
    if (p_.loq) xs.push_back(*p_.loq);
    if (xs.empty()) xs = {0, 1};
    if (ys.empty()) ys = {0, 1};
    const auto with_origin = [](std::vector<double>& v) {
      // Copied, not referenced: the push_back below may move the vector's storage.
      const auto [lo_at, hi_at] = std::minmax_element(v.begin(), v.end());
      const double lo = *lo_at;
      const double hi = *hi_at;
      if ((lo >= 0 && lo < 0.4 * hi) || (hi <= 0 && hi > 0.4 * lo)) v.push_back(0);
    };
    with_origin(xs);
    with_origin(ys);
    x_lo = *std::min_element(xs.begin(), xs.end());
    x_hi = *std::max_element(xs.begin(), xs.end());
    y_lo = *std::min_element(ys.begin(), ys.end());
    y_hi = *std::max_element(ys.begin(), ys.end());
  }

  double largest_limit() const {
    return std::max(p_.error_limit_pct.value_or(0), p_.lowest_error_limit_pct.value_or(0));
  }

  void layout(double heading_bottom) {
    const double width = c_.width();
    const double height = c_.height();
    const double tick_h = c_.measure("0", detail::kTickFont).h;
    const double axis_title_h = c_.measure("Ag", detail::kAxisTitleFont).h;
    const double label_h = c_.measure("LOQ", detail::kLabelFont).h;

    // Vertical: heading, LOD/LOQ label row, upper panel and its x axis, residual panel and its
    // level axis.
    lod_row_top_ = heading_bottom + 10;
    const bool has_limits_row = p_.lod || p_.loq;
    const double upper_top = lod_row_top_ + (has_limits_row ? label_h + 10 : 4);
    const double x_axis_h = detail::kTickLength + 2 + tick_h + 4 + axis_title_h;
    const double level_axis_h = x_axis_h + (show_level_names_ ? label_h : 0);
    const double gap = 14;
    const double lower_bottom = height - detail::kMargin - level_axis_h;
    const double available = lower_bottom - upper_top - x_axis_h - gap;
    const double upper_h = std::round(available * 0.68);
    const double lower_h = available - upper_h;

    // Horizontal: the key column takes the right of the page.
    key_w_ = std::clamp(width * 0.27, 200.0, 300.0);
    key_x_ = width - detail::kMargin - key_w_;
    const double plot_right = key_x_ - 24;

    // y ticks first: their label widths set the left margin.
    double x_lo, x_hi, y_lo, y_hi;
    data_extents(x_lo, x_hi, y_lo, y_hi);
    y_ = detail::padded_scale(y_lo, y_hi, 0.05);
    y_ticks_ = detail::choose_ticks(c_, y_.lo, y_.hi, upper_h, false, 22);

    re_limit_ = std::max(5.0, largest_limit() * 1.4);
    double worst = 0;
    for (const CurvePlotPoint& q : p_.points) {
      if (q.error_pct) worst = std::max(worst, std::abs(*q.error_pct));
    }
    // Beyond a cap the axis stops and the few points outside are pinned to its edge, so that
    // one wild excluded injection does not flatten every other residual.
    const double cap = largest_limit() > 0 ? largest_limit() * 4 : 50;
    re_limit_ = std::max(re_limit_, std::min(worst, cap) * 1.12);
    re_ticks_ = detail::choose_ticks(c_, -re_limit_, re_limit_, lower_h, false, 12);

    const double title_w = c_.measure("Ag", detail::kAxisTitleFont).h;
    const double label_w = std::max(y_ticks_.max_label_width, re_ticks_.max_label_width);
    const double plot_left = detail::kMargin + title_w + 8 + label_w + 3 + detail::kTickLength;

    upper_ = {plot_left, upper_top, plot_right - plot_left, upper_h};
    lower_ = {plot_left, upper_top + upper_h + x_axis_h + gap, plot_right - plot_left, lower_h};

    x_ = detail::padded_scale(x_lo, x_hi, 0.04);
    x_ticks_ = detail::choose_ticks(c_, x_.lo, x_.hi, upper_.w, true, 18);

    x_.from = upper_.x;
    x_.to = upper_.right();
    y_.from = upper_.bottom();
    y_.to = upper_.y;
    re_ = {-re_limit_, re_limit_, lower_.bottom(), lower_.y};
    slot_ = {-0.5, std::max(0.5, static_cast<double>(levels_.size()) - 0.5), lower_.x,
             lower_.right()};
  }

  double slot_width() const { return slot_.at(1) - slot_.at(0); }

  void draw_upper_panel() {
    c_.clip(upper_);
    // Working range, behind everything.
    if (p_.range_high > p_.range_low) {
      const double a = x_.at(p_.range_low);
      const double b = x_.at(p_.range_high);
      c_.fill_rect({a, upper_.y, b - a, upper_.h}, kRangeFill);
    }
    detail::draw_grid(c_, upper_, &x_, &x_ticks_, &y_, &y_ticks_);
    if (has_curve_) {
      if (t_ > 0) {
        std::vector<Point> top, bottom, polygon;
        for (double x : curve_x_) {
          const double y = model_value(p_.fit, x);
          const double h = band_half_width(p_.fit, t_, x);
          top.push_back({x_.at(x), y_.at(y + h)});
          bottom.push_back({x_.at(x), y_.at(y - h)});
        }
        polygon = top;
        polygon.insert(polygon.end(), bottom.rbegin(), bottom.rend());
        c_.fill_polygon(polygon, kBandFill);
        c_.polyline(top, kBandEdge);
        c_.polyline(bottom, kBandEdge);
      }
      std::vector<Point> curve;
      for (double x : curve_x_) curve.push_back({x_.at(x), y_.at(model_value(p_.fit, x))});
      c_.polyline(curve, kCurveStroke);
    }
    if (p_.lod) c_.line({x_.at(*p_.lod), upper_.y}, {x_.at(*p_.lod), upper_.bottom()}, kLodStroke);
    if (p_.loq) c_.line({x_.at(*p_.loq), upper_.y}, {x_.at(*p_.loq), upper_.bottom()}, kLoqStroke);
    c_.unclip();

    // Markers: filled first, open shapes over them (so both stay visible), crosses last.
    for (int pass = 0; pass < 3; ++pass) {
      for (const CurvePlotPoint& q : p_.points) {
        const MarkerShape shape = shape_of(q);
        const int wanted = shape == MarkerShape::FilledCircle ? 0
                           : shape == MarkerShape::Cross      ? 2
                                                              : 1;
        if (wanted != pass) continue;
        c_.marker({x_.at(q.nominal), y_.at(q.response)}, shape, detail::kMarkerRadius, true);
      }
    }
    c_.stroke_rect(upper_, {1, detail::kFrameInk, {}});
    draw_limit_labels();
  }

  // "LOD" and "LOQ" above the panel, pushed apart when the lines are close, with a leader line
  // from a displaced label to its line.
  void draw_limit_labels() {
    std::vector<std::string> names;
    std::vector<double> at, size;
    if (p_.lod) {
      names.push_back("LOD");
      at.push_back(x_.at(*p_.lod));
    }
    if (p_.loq) {
      names.push_back("LOQ");
      at.push_back(x_.at(*p_.loq));
    }
    if (names.empty()) return;
    for (const std::string& n : names) size.push_back(c_.measure(n, detail::kLabelFont).w + 8);
    const std::vector<double> placed =
        detail::spread_labels(at, size, upper_.x - 10, upper_.right() + 10);
    for (std::size_t i = 0; i < names.size(); ++i) {
      const Rect r = c_.text(names[i], placed[i], lod_row_top_, detail::kLabelFont, Align::Centre,
                             Align::Start, detail::gray(0.15));
      const Stroke leader{0.8, detail::gray(0.3), {}};
      if (std::abs(placed[i] - at[i]) > 1) {
        c_.line({placed[i], r.bottom() + 1}, {at[i], upper_.y}, leader);
      } else {
        c_.line({at[i], r.bottom() + 1}, {at[i], upper_.y}, leader);
      }
    }
  }

  void draw_residual_panel() {
    c_.clip(lower_);
    if (p_.error_limit_pct) {
      const double a = re_.at(*p_.error_limit_pct);
      const double b = re_.at(-*p_.error_limit_pct);
      c_.fill_rect({lower_.x, a, lower_.w, b - a}, kAcceptFill);
    }
    detail::draw_grid(c_, lower_, nullptr, nullptr, &re_, &re_ticks_);
    if (p_.error_limit_pct) {
      for (double sign : {1.0, -1.0}) {
        const double y = re_.at(sign * *p_.error_limit_pct);
        c_.line({lower_.x, y}, {lower_.right(), y}, kAcceptEdge);
      }
    }
    if (p_.lowest_error_limit_pct && has_lowest_level_) {
      const double cx = slot_.at(static_cast<double>(slot_of(lowest_level_)));
      const double half = std::min(slot_width() * 0.42, 36.0);
      for (double sign : {1.0, -1.0}) {
        const double y = re_.at(sign * *p_.lowest_error_limit_pct);
        c_.line({cx - half, y}, {cx + half, y}, kLowestEdge);
      }
    }
    c_.line({lower_.x, re_.at(0)}, {lower_.right(), re_.at(0)}, {1, detail::gray(0.35), {}});
    c_.unclip();

    // One slot per level; the replicates of a level are spread sideways within its slot so that
    // they do not hide each other.
    std::map<double, std::vector<std::size_t>> by_level;
    for (std::size_t i = 0; i < p_.points.size(); ++i) {
      if (p_.points[i].error_pct) by_level[p_.points[i].nominal].push_back(i);
    }
    for (const auto& [nominal, indices] : by_level) {
      const double n = static_cast<double>(indices.size());
      const double step = std::min(9.0, slot_width() * 0.6 / std::max(1.0, n - 1));
      const double centre = slot_.at(static_cast<double>(slot_of(nominal)));
      for (std::size_t k = 0; k < indices.size(); ++k) {
        const CurvePlotPoint& q = p_.points[indices[k]];
        const double px = centre + (static_cast<double>(k) - (n - 1) / 2) * step;
        const double value = *q.error_pct;
        double py = re_.at(std::clamp(value, -re_limit_, re_limit_));
        const bool pinned = std::abs(value) > re_limit_;
        if (pinned) {
          // Pinned to the edge, with a small arrowhead pointing the way it left the axis.
          const double sign = value > 0 ? -1 : 1;  // page y grows downwards
          py = (value > 0 ? lower_.y : lower_.bottom()) - sign * 7;
          const double tip = py + sign * 6.5;
          c_.fill_polygon({{px, tip}, {px - 3, tip - sign * 4}, {px + 3, tip - sign * 4}},
                          detail::gray(0.2));
        }
        c_.marker({px, py}, shape_of(q), detail::kMarkerRadius, true);
        if (!q.excluded && !q.within_limits) {
          c_.circle({px, py}, kRingRadius, kRingStroke);
          any_ring_ = true;
        }
      }
    }
    if (by_level.empty()) {
      c_.text("no back-calculated values", lower_.centre_x(), lower_.centre_y() - 10,
              detail::kLabelFont, Align::Centre, Align::Centre, detail::gray(0.3));
    }
    c_.stroke_rect(lower_, {1, detail::kFrameInk, {}});
  }

  void draw_axes() {
    const double upper_labels_bottom = detail::draw_x_ticks(c_, upper_, x_, x_ticks_, true);
    c_.text(axis_title("nominal concentration", p_.unit, x_ticks_.labels.exponent),
            upper_.centre_x(), upper_labels_bottom + 4, detail::kAxisTitleFont, Align::Centre,
            Align::Start);
    const double lower_labels_bottom = draw_level_ticks();
    c_.text(axis_title("calibration level", p_.unit, 0), lower_.centre_x(), lower_labels_bottom + 4,
            detail::kAxisTitleFont, Align::Centre, Align::Start);
    detail::draw_y_ticks(c_, upper_, y_, y_ticks_);
    detail::draw_y_ticks(c_, lower_, re_, re_ticks_);
    const double title_x = detail::kMargin + c_.measure("Ag", detail::kAxisTitleFont).h / 2;
    c_.vertical_text(axis_title(p_.response_label, "", y_ticks_.labels.exponent), title_x,
                     upper_.centre_y(), detail::kAxisTitleFont);
    c_.vertical_text("%RE", title_x, lower_.centre_y(), detail::kAxisTitleFont);
  }

  // Under each residual slot its nominal concentration and, below it, the level's name; on
  // every k-th slot when they would otherwise touch. Returns the bottom of the labels.
  double draw_level_ticks() {
    double bottom = lower_.bottom() + detail::kTickLength;
    if (levels_.empty()) return bottom;
    std::vector<std::string> values;
    double widest = 0;
    for (std::size_t i = 0; i < levels_.size(); ++i) {
      values.push_back(format_significant(levels_[i], 4));
      widest = std::max(widest, c_.measure(values.back(), detail::kTickFont).w);
      if (show_level_names_) {
        widest = std::max(widest, c_.measure(level_names_[i], detail::kLabelFont).w);
      }
    }
    const std::size_t every =
        std::max<std::size_t>(1, static_cast<std::size_t>(std::ceil((widest + 10) / slot_width())));
    const Stroke tick{1, detail::kFrameInk, {}};
    for (std::size_t i = 0; i < levels_.size(); ++i) {
      const double px = slot_.at(static_cast<double>(i));
      c_.line({px, lower_.bottom()}, {px, lower_.bottom() + detail::kTickLength}, tick);
      if (i % every != 0) continue;
      Rect r = c_.text(values[i], px, lower_.bottom() + detail::kTickLength + 2, detail::kTickFont,
                       Align::Centre, Align::Start);
      if (show_level_names_) {
        r = c_.text(level_names_[i], px, r.bottom(), detail::kLabelFont, Align::Centre,
                    Align::Start, detail::gray(0.35));
      }
      bottom = std::max(bottom, r.bottom());
    }
    return bottom;
  }

  std::vector<KeyEntry> calibrator_entries() const {
    std::map<MarkerShape, std::size_t> counts;
    for (const CurvePlotPoint& q : p_.points) ++counts[shape_of(q)];
    std::vector<KeyEntry> out;
    for (const auto& [shape, count] : counts) {
      out.push_back(
          {KeyEntry::Kind::Marker, shape_label(shape) + " (" + std::to_string(count) + ")", shape});
    }
    return out;
  }

  std::vector<KeyEntry> curve_entries() const {
    std::vector<KeyEntry> out;
    if (has_curve_) out.push_back({KeyEntry::Kind::Line, "fitted function", {}, kCurveStroke});
    if (has_curve_ && t_ > 0) {
      out.push_back(
          {KeyEntry::Kind::Band, "95 % confidence band of the mean", {}, kBandEdge, kBandFill});
    }
    if (p_.range_high > p_.range_low) {
      out.push_back({KeyEntry::Kind::Fill,
                     "working range " + format_significant(p_.range_low) + "\u2013" +
                         with_unit(format_significant(p_.range_high), p_.unit),
                     {},
                     {},
                     kRangeFill});
    }
    if (p_.lod) {
      out.push_back({KeyEntry::Kind::Line,
                     "LOD " + with_unit(format_significant(*p_.lod), p_.unit),
                     {},
                     kLodStroke});
    }
    if (p_.loq) {
      out.push_back({KeyEntry::Kind::Line,
                     "LOQ " + with_unit(format_significant(*p_.loq), p_.unit),
                     {},
                     kLoqStroke});
    }
    return out;
  }

  std::vector<KeyEntry> residual_entries() const {
    std::vector<KeyEntry> out;
    if (p_.error_limit_pct) {
      out.push_back({KeyEntry::Kind::Band,
                     "acceptance \u00b1" + format_significant(*p_.error_limit_pct) + " %",
                     {},
                     kAcceptEdge,
                     kAcceptFill});
    }
    if (p_.lowest_error_limit_pct && has_lowest_level_) {
      out.push_back({KeyEntry::Kind::Line,
                     "lowest level \u00b1" + format_significant(*p_.lowest_error_limit_pct) + " %",
                     {},
                     kLowestEdge});
    }
    if (any_ring_) out.push_back({KeyEntry::Kind::Ring, "outside its %RE limit", {}, kRingStroke});
    return out;
  }

  std::vector<std::string> fit_lines() const {
    std::vector<std::string> out;
    out.push_back("r\u00b2 = " + format_significant(p_.r2, 6));
    out.push_back("s(y/x) = " + format_significant(p_.fit.residual_sd) +
                  ", df = " + std::to_string(p_.fit.dof));
    return out;
  }

  // The key column. The fit in numbers stands at its foot, so that the equation and r² are
  // always shown; the legend and the exclusions fill the column from the top down to it, and a
  // final "…" says when something did not fit.
  void draw_key() {
    const double x = key_x_;
    const double text_x = x + kSwatchWidth + 7;
    const double text_w = key_x_ + key_w_ - text_x;

    struct FitLine {
      std::string text;
      detail::Font font;
      int max_lines;
      double gap_after;
    };
    std::vector<FitLine> fit = {{"Fit", detail::kKeyHeadingFont, 1, 3}};
    if (!p_.equation.empty()) fit.push_back({p_.equation, detail::kKeyFont, 3, 2});
    for (const std::string& line : fit_lines()) fit.push_back({line, detail::kKeyFont, 1, 2});
    double fit_h = 0;
    for (const FitLine& line : fit) {
      fit_h += c_.measure(line.text, line.font, {key_w_, line.max_lines != 1, line.max_lines}).h +
               line.gap_after;
    }
    double y = std::max(upper_.y, lower_.bottom() - fit_h);
    const double fit_top = y;
    for (const FitLine& line : fit) {
      const Rect r = c_.text(line.text, x, y, line.font, Align::Start, Align::Start, detail::kBlack,
                             {key_w_, line.max_lines != 1, line.max_lines});
      y = r.bottom() + line.gap_after;
    }

    const double ellipsis_h = c_.measure("\u2026", detail::kKeyFont).h;
    const double limit = fit_top - 12 - ellipsis_h;  // room kept for the "…"
    y = upper_.y;
    bool stopped = false;
    // Draws one text block if it fits above the limit.
    const auto block = [&](const std::string& text, const detail::Font& font, int max_lines,
                           detail::Rgb ink) {
      const TextBox box{key_w_, max_lines != 1, max_lines};
      const Rect r = c_.measure(text, font, box);
      if (stopped || y + r.h > limit) {
        stopped = true;
        return;
      }
      y = c_.text(text, x, y, font, Align::Start, Align::Start, ink, box).bottom();
    };

    const std::pair<std::string, std::vector<KeyEntry>> sections[] = {
        {"Calibrators", calibrator_entries()},
        {"Curve", curve_entries()},
        {"Residuals", residual_entries()},
    };
    for (const auto& [heading, entries] : sections) {
      if (entries.empty()) continue;
      block(heading, detail::kKeyHeadingFont, 1, detail::kBlack);
      y += 3;
      for (const KeyEntry& e : entries) {
        const TextBox box{text_w, true, 2};
        const Rect r = c_.measure(e.label, detail::kKeyFont, box);
        const double row = std::max(r.h, 16.0);
        if (stopped || y + row > limit) {
          stopped = true;
          break;
        }
        detail::draw_swatch(c_, e, x, y + std::min(row, 16.0) / 2);
        c_.text(e.label, text_x, y + std::min(row, 16.0) / 2 - std::min(r.h, 16.0) / 2,
                detail::kKeyFont, Align::Start, Align::Start, detail::kBlack, box);
        y += row + 3;
      }
      y += 8;
    }

    // Excluded points and why.
    std::vector<std::string> excluded;
    for (const CurvePlotPoint& q : p_.points) {
      if (!q.excluded) continue;
      std::string line = q.level.empty() ? "point" : q.level;
      line += " replicate " + std::to_string(q.replicate);
      if (!q.exclusion_reason.empty()) line += ": " + q.exclusion_reason;
      excluded.push_back(line);
    }
    if (!excluded.empty()) {
      block("Excluded", detail::kKeyHeadingFont, 1, detail::kBlack);
      y += 2;
      // When the column runs out, the last line that fits says how many are not listed.
      const double more_h = c_.measure("Ag", detail::kLabelFont).h + 2;
      for (std::size_t i = 0; i < excluded.size(); ++i) {
        const TextBox box{key_w_, true, 2};
        const double h = c_.measure(excluded[i], detail::kLabelFont, box).h + 2;
        const bool last = i + 1 == excluded.size();
        if (stopped || y + h + (last ? 0 : more_h) > limit) {
          block("and " + std::to_string(excluded.size() - i) + " more", detail::kLabelFont, 1,
                detail::gray(0.2));
          break;
        }
        block(excluded[i], detail::kLabelFont, 2, detail::gray(0.2));
        y += 2;
      }
    }
    if (stopped) {
      c_.text("\u2026", x, std::min(y, limit), detail::kKeyFont, Align::Start, Align::Start,
              detail::gray(0.3));
    }
  }
};

}  // namespace

double mean_response_half_width(const fitting::FitResult& fit, double x) {
  if (fit.dof < 1) return 0;
  return band_half_width(fit, fitting::student_t_quantile(0.975, fit.dof), x);
}

void detail::draw_curve_plot(const CurvePlot& plot, Canvas& canvas) {
  validate(plot);
  CurvePlotDrawing(plot, canvas).draw();
}

void render_curve_plot(const CurvePlot& plot, const std::string& path) {
  const OutputFormat format = output_format_for(path);
  validate(plot);
  Canvas canvas(format, path, plot.page, plot.title);
  detail::draw_curve_plot(plot, canvas);
  canvas.finish();
}

}  // namespace cw::plot
