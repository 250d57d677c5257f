// SPDX-License-Identifier: Apache-2.0
// Canvas over cairo (SVG, PNG and PDF surfaces) with text laid out by pango in DejaVu Sans.
#include "plot/canvas.h"

#include <cairo-pdf.h>
#include <cairo-svg.h>
#include <cairo.h>
#include <pango/pangocairo.h>

#include <algorithm>
#include <cmath>
#include <cstdio>
#include <numeric>
#include <string>
#include <vector>

#include "core/error.h"
#include "core/time.h"

namespace cw::plot::detail {
namespace {

constexpr double kPi = 3.14159265358979323846;
constexpr double kDefaultMiterLimit = 10;  // cairo's default

[[noreturn]] void fail(const std::string& path, cairo_status_t status) {
  if (path.empty()) {
    throw ValidationError(std::string("cannot draw: ") + cairo_status_to_string(status));
  }
  throw ValidationError(SourceLocation{path, std::nullopt, std::nullopt, {}},
                        "cannot write '" + path + "': " + cairo_status_to_string(status));
}

void set_colour(cairo_t* cr, Rgb c) {
  cairo_set_source_rgb(cr, c.r, c.g, c.b);
}

void apply(cairo_t* cr, const Stroke& stroke) {
  cairo_set_line_width(cr, stroke.width);
  set_colour(cr, stroke.colour);
  cairo_set_dash(cr, stroke.dash.empty() ? nullptr : stroke.dash.data(),
                 static_cast<int>(stroke.dash.size()), 0);
  cairo_set_miter_limit(cr, kDefaultMiterLimit);
}

}  // namespace

double Rect::overlap_area(const Rect& o) const {
  const double w_overlap = std::min(right(), o.right()) - std::max(x, o.x);
  const double h_overlap = std::min(bottom(), o.bottom()) - std::max(y, o.y);
  return w_overlap > 0 && h_overlap > 0 ? w_overlap * h_overlap : 0;
}

struct Canvas::Impl {
  OutputFormat format = OutputFormat::Svg;
  std::string path;
  double width = 0;
  double height = 0;
  cairo_surface_t* surface = nullptr;
  cairo_t* cr = nullptr;
  PangoLayout* layout = nullptr;
  int clip_depth = 0;
  bool finished = false;
  bool embedded = false;  // drawing on a caller's context: its state is restored, nothing owned

  // Loads text, font and box into the shared layout.
  void set_layout(const std::string& text, const Font& font, const TextBox& box, Align h) {
    PangoFontDescription* description = pango_font_description_new();
    pango_font_description_set_family(description, font.mono ? "DejaVu Sans Mono" : "DejaVu Sans");
    pango_font_description_set_absolute_size(description, font.size * PANGO_SCALE);
    pango_font_description_set_weight(description,
                                      font.bold ? PANGO_WEIGHT_BOLD : PANGO_WEIGHT_NORMAL);
    pango_font_description_set_style(description,
                                     font.italic ? PANGO_STYLE_ITALIC : PANGO_STYLE_NORMAL);
    pango_layout_set_font_description(layout, description);
    pango_font_description_free(description);
    // Text arrives as UTF-8; a stray invalid byte is shown as U+FFFD rather than making pango
    // complain on stderr.
    if (g_utf8_validate(text.c_str(), static_cast<gssize>(text.size()), nullptr)) {
      pango_layout_set_text(layout, text.c_str(), static_cast<int>(text.size()));
    } else {
      gchar* valid = g_utf8_make_valid(text.c_str(), static_cast<gssize>(text.size()));
      pango_layout_set_text(layout, valid, -1);
      g_free(valid);
    }
    pango_layout_set_alignment(layout, h == Align::Start    ? PANGO_ALIGN_LEFT
                                       : h == Align::Centre ? PANGO_ALIGN_CENTER
                                                            : PANGO_ALIGN_RIGHT);
    if (box.max_width > 0) {
      pango_layout_set_width(layout, static_cast<int>(box.max_width * PANGO_SCALE));
      pango_layout_set_ellipsize(layout, PANGO_ELLIPSIZE_END);
      if (box.wrap) {
        pango_layout_set_wrap(layout, PANGO_WRAP_WORD_CHAR);
        // A negative height is a line count for ellipsizing; -1 with wrapping would mean one
        // line, so an unlimited block is given a large count.
        pango_layout_set_height(layout, box.max_lines > 0 ? -box.max_lines : -1000);
      } else {
        pango_layout_set_height(layout, -1);
      }
    } else {
      pango_layout_set_width(layout, -1);
      pango_layout_set_ellipsize(layout, PANGO_ELLIPSIZE_NONE);
      pango_layout_set_height(layout, -1);
    }
  }

  // The shared layout. Unhinted metrics, so that text measures the same on every surface and at
  // every scale, and the layout of a PNG matches that of the SVG and PDF; a fixed language, so
  // that line breaking does not follow the user's locale.
  void create_layout() {
    layout = pango_cairo_create_layout(cr);
    PangoContext* context = pango_layout_get_context(layout);
    cairo_font_options_t* options = cairo_font_options_create();
    cairo_font_options_set_hint_metrics(options, CAIRO_HINT_METRICS_OFF);
    cairo_font_options_set_hint_style(options, CAIRO_HINT_STYLE_NONE);
    cairo_font_options_set_antialias(options, CAIRO_ANTIALIAS_GRAY);
    pango_cairo_context_set_font_options(context, options);
    cairo_font_options_destroy(options);
    pango_context_set_language(context, pango_language_from_string("en"));
    pango_layout_context_changed(layout);
  }

  // Logical extents of the loaded layout in page units.
  Rect extents() const {
    PangoRectangle logical;
    pango_layout_get_extents(layout, nullptr, &logical);
    return {static_cast<double>(logical.x) / PANGO_SCALE,
            static_cast<double>(logical.y) / PANGO_SCALE,
            static_cast<double>(logical.width) / PANGO_SCALE,
            static_cast<double>(logical.height) / PANGO_SCALE};
  }
};

Canvas::Canvas(OutputFormat format, const std::string& path, const PlotPage& page,
               const std::string& title)
    : impl_(std::make_unique<Impl>()) {
  Impl& d = *impl_;
  d.format = format;
  d.path = path;
  d.width = page.width;
  d.height = page.height;
  switch (format) {
    case OutputFormat::Svg:
      d.surface = cairo_svg_surface_create(path.c_str(), page.width, page.height);
      if (cairo_surface_status(d.surface) == CAIRO_STATUS_SUCCESS) {
        cairo_svg_surface_set_document_unit(d.surface, CAIRO_SVG_UNIT_PX);
      }
      break;
    case OutputFormat::Pdf: {
      d.surface = cairo_pdf_surface_create(path.c_str(), page.width, page.height);
      if (cairo_surface_status(d.surface) == CAIRO_STATUS_SUCCESS) {
        const std::string created = format_utc(page.created_at);
        cairo_pdf_surface_set_metadata(d.surface, CAIRO_PDF_METADATA_CREATE_DATE, created.c_str());
        // Metadata must be UTF-8: a stray invalid byte becomes U+FFFD, as in drawn text.
        gchar* valid = g_utf8_make_valid(title.c_str(), static_cast<gssize>(title.size()));
        cairo_pdf_surface_set_metadata(d.surface, CAIRO_PDF_METADATA_TITLE, valid);
        g_free(valid);
        cairo_pdf_surface_set_metadata(d.surface, CAIRO_PDF_METADATA_CREATOR, "Curvewarden");
      }
      break;
    }
    case OutputFormat::Png:
      d.surface =
          cairo_image_surface_create(CAIRO_FORMAT_RGB24, static_cast<int>(std::lround(page.width)),
                                     static_cast<int>(std::lround(page.height)));
      break;
  }
  const cairo_status_t status = cairo_surface_status(d.surface);
  if (status != CAIRO_STATUS_SUCCESS) {
    cairo_surface_destroy(d.surface);
    d.surface = nullptr;
    fail(path, status);
  }
  d.cr = cairo_create(d.surface);
  set_colour(d.cr, kWhite);
  cairo_paint(d.cr);
  cairo_set_line_join(d.cr, CAIRO_LINE_JOIN_MITER);

  d.create_layout();
}

Canvas::Canvas(cairo_t* target, const Rect& frame, double width, double height)
    : impl_(std::make_unique<Impl>()) {
  Impl& d = *impl_;
  d.embedded = true;
  d.width = width;
  d.height = height;
  d.cr = cairo_reference(target);
  cairo_save(d.cr);
  cairo_new_path(d.cr);
  cairo_rectangle(d.cr, frame.x, frame.y, frame.w, frame.h);
  cairo_clip(d.cr);
  cairo_translate(d.cr, frame.x, frame.y);
  const double scale = std::min(frame.w / width, frame.h / height);
  cairo_scale(d.cr, scale, scale);
  cairo_set_line_join(d.cr, CAIRO_LINE_JOIN_MITER);
  d.create_layout();
}

Canvas::~Canvas() {
  Impl& d = *impl_;
  if (d.embedded && !d.finished) {
    while (d.clip_depth > 0) unclip();
    cairo_restore(d.cr);
  }
  if (d.layout != nullptr) g_object_unref(d.layout);
  if (d.cr != nullptr) cairo_destroy(d.cr);
  if (d.surface != nullptr) cairo_surface_destroy(d.surface);
  // A drawing abandoned half way (an exception) leaves no half-written file behind.
  if (!d.finished && d.surface != nullptr && d.format != OutputFormat::Png) {
    std::remove(d.path.c_str());
  }
}

double Canvas::width() const {
  return impl_->width;
}

double Canvas::height() const {
  return impl_->height;
}

cairo_t* Canvas::context() const {
  return impl_->cr;
}

Rect Canvas::measure(const std::string& text, const Font& font, const TextBox& box) const {
  impl_->set_layout(text, font, box, Align::Start);
  const Rect e = impl_->extents();
  return {0, 0, e.w, e.h};
}

Rect Canvas::text(const std::string& text, double x, double y, const Font& font, Align h, Align v,
                  Rgb colour, const TextBox& box) {
  Impl& d = *impl_;
  d.set_layout(text, font, box, h);
  const Rect e = d.extents();
  const double left = h == Align::Start ? x : h == Align::Centre ? x - e.w / 2 : x - e.w;
  const double top = v == Align::Start ? y : v == Align::Centre ? y - e.h / 2 : y - e.h;
  set_colour(d.cr, colour);
  cairo_move_to(d.cr, left - e.x, top - e.y);
  pango_cairo_show_layout(d.cr, d.layout);
  cairo_new_path(d.cr);
  return {left, top, e.w, e.h};
}

std::vector<std::string> Canvas::wrap(const std::string& text, const Font& font,
                                      double max_width) const {
  Impl& d = *impl_;
  d.set_layout(text, font, {max_width, true, 0}, Align::Start);
  // The layout's own text: set_layout may have replaced invalid bytes.
  const char* laid_out = pango_layout_get_text(d.layout);
  std::vector<std::string> lines;
  for (GSList* l = pango_layout_get_lines_readonly(d.layout); l != nullptr; l = l->next) {
    const auto* line = static_cast<const PangoLayoutLine*>(l->data);
    std::string piece(laid_out + line->start_index, static_cast<std::size_t>(line->length));
    while (!piece.empty() && (piece.back() == ' ' || piece.back() == '\n' || piece.back() == '\r' ||
                              piece.back() == '\t')) {
      piece.pop_back();
    }
    lines.push_back(std::move(piece));
  }
  if (lines.empty()) lines.emplace_back();
  return lines;
}

Rect Canvas::vertical_text(const std::string& text, double x, double y, const Font& font,
                           Rgb colour) {
  Impl& d = *impl_;
  d.set_layout(text, font, {}, Align::Start);
  cairo_save(d.cr);
  cairo_translate(d.cr, x, y);
  cairo_rotate(d.cr, -kPi / 2);
  pango_cairo_update_layout(d.cr, d.layout);
  const Rect e = d.extents();
  set_colour(d.cr, colour);
  cairo_move_to(d.cr, -e.w / 2 - e.x, -e.h / 2 - e.y);
  pango_cairo_show_layout(d.cr, d.layout);
  cairo_new_path(d.cr);
  cairo_restore(d.cr);
  pango_cairo_update_layout(d.cr, d.layout);
  return {x - e.h / 2, y - e.w / 2, e.h, e.w};
}

void Canvas::line(Point a, Point b, const Stroke& stroke) {
  polyline({a, b}, stroke);
}

void Canvas::polyline(const std::vector<Point>& points, const Stroke& stroke) {
  if (points.size() < 2) return;
  cairo_t* cr = impl_->cr;
  cairo_new_path(cr);
  cairo_move_to(cr, points.front().x, points.front().y);
  for (std::size_t i = 1; i < points.size(); ++i) cairo_line_to(cr, points[i].x, points[i].y);
  apply(cr, stroke);
  cairo_set_line_join(cr, CAIRO_LINE_JOIN_ROUND);
  cairo_stroke(cr);
  cairo_set_line_join(cr, CAIRO_LINE_JOIN_MITER);
}

void Canvas::fill_polygon(const std::vector<Point>& points, Rgb colour) {
  if (points.size() < 3) return;
  cairo_t* cr = impl_->cr;
  cairo_new_path(cr);
  cairo_move_to(cr, points.front().x, points.front().y);
  for (std::size_t i = 1; i < points.size(); ++i) cairo_line_to(cr, points[i].x, points[i].y);
  cairo_close_path(cr);
  set_colour(cr, colour);
  cairo_fill(cr);
}

void Canvas::fill_rect(const Rect& r, Rgb colour) {
  cairo_t* cr = impl_->cr;
  cairo_new_path(cr);
  cairo_rectangle(cr, r.x, r.y, r.w, r.h);
  set_colour(cr, colour);
  cairo_fill(cr);
}

void Canvas::stroke_rect(const Rect& r, const Stroke& stroke) {
  cairo_t* cr = impl_->cr;
  cairo_new_path(cr);
  cairo_rectangle(cr, r.x, r.y, r.w, r.h);
  apply(cr, stroke);
  cairo_stroke(cr);
}

void Canvas::circle(Point centre, double radius, const Stroke& stroke) {
  cairo_t* cr = impl_->cr;
  cairo_new_path(cr);
  cairo_arc(cr, centre.x, centre.y, radius, 0, 2 * kPi);
  cairo_close_path(cr);
  apply(cr, stroke);
  cairo_stroke(cr);
}

void Canvas::marker(Point c, MarkerShape shape, double r, bool data, Rgb colour) {
  cairo_t* cr = impl_->cr;
  cairo_new_path(cr);
  bool filled = false;
  double width = 1.3;
  switch (shape) {
    case MarkerShape::FilledCircle:
      filled = true;
      [[fallthrough]];
    case MarkerShape::OpenCircle:
      cairo_arc(cr, c.x, c.y, r, 0, 2 * kPi);
      cairo_close_path(cr);
      break;
    case MarkerShape::OpenSquare: {
      const double s = r * 0.9;
      cairo_rectangle(cr, c.x - s, c.y - s, 2 * s, 2 * s);
      break;
    }
    case MarkerShape::FilledDiamond:
      filled = true;
      [[fallthrough]];
    case MarkerShape::OpenDiamond: {
      const double s = r * 1.3;
      cairo_move_to(cr, c.x, c.y - s);
      cairo_line_to(cr, c.x + s, c.y);
      cairo_line_to(cr, c.x, c.y + s);
      cairo_line_to(cr, c.x - s, c.y);
      cairo_close_path(cr);
      break;
    }
    case MarkerShape::OpenTriangle: {
      const double s = r * 1.35;
      cairo_move_to(cr, c.x, c.y - s);
      cairo_line_to(cr, c.x + s * 0.866, c.y + s * 0.5);
      cairo_line_to(cr, c.x - s * 0.866, c.y + s * 0.5);
      cairo_close_path(cr);
      break;
    }
    case MarkerShape::Cross: {
      const double s = r * 0.95;
      cairo_move_to(cr, c.x - s, c.y - s);
      cairo_line_to(cr, c.x + s, c.y + s);
      cairo_move_to(cr, c.x - s, c.y + s);
      cairo_line_to(cr, c.x + s, c.y - s);
      width = 1.8;
      break;
    }
  }
  set_colour(cr, colour);
  cairo_set_dash(cr, nullptr, 0, 0);
  cairo_set_line_width(cr, filled ? 0.8 : width);
  cairo_set_miter_limit(cr, data ? kDataMarkerMiterLimit : kDefaultMiterLimit);
  // Fill and stroke of one path: cairo's SVG surface writes them as one <path> element.
  if (filled) cairo_fill_preserve(cr);
  cairo_stroke(cr);
  cairo_set_miter_limit(cr, kDefaultMiterLimit);
}

void Canvas::clip(const Rect& r) {
  cairo_t* cr = impl_->cr;
  cairo_save(cr);
  cairo_new_path(cr);
  cairo_rectangle(cr, r.x, r.y, r.w, r.h);
  cairo_clip(cr);
  ++impl_->clip_depth;
}

void Canvas::unclip() {
  if (impl_->clip_depth == 0) return;
  cairo_restore(impl_->cr);
  --impl_->clip_depth;
}

void Canvas::set_author(const std::string& author) {
  Impl& d = *impl_;
  if (d.embedded || d.format != OutputFormat::Pdf) return;
  gchar* valid = g_utf8_make_valid(author.c_str(), static_cast<gssize>(author.size()));
  cairo_pdf_surface_set_metadata(d.surface, CAIRO_PDF_METADATA_AUTHOR, valid);
  g_free(valid);
}

void Canvas::next_page() {
  Impl& d = *impl_;
  if (d.embedded) return;
  while (d.clip_depth > 0) unclip();
  if (d.format == OutputFormat::Pdf) {
    cairo_show_page(d.cr);
    set_colour(d.cr, kWhite);
    cairo_paint(d.cr);
  }
}

void Canvas::add_outline(const std::string& text, int page, double y) {
  Impl& d = *impl_;
  if (d.embedded || d.format != OutputFormat::Pdf) return;
  char link[96];
  std::snprintf(link, sizeof link, "page=%d pos=[0 %.2f]", page, y);
  gchar* valid = g_utf8_make_valid(text.c_str(), static_cast<gssize>(text.size()));
  cairo_pdf_surface_add_outline(d.surface, CAIRO_PDF_OUTLINE_ROOT, valid, link,
                                static_cast<cairo_pdf_outline_flags_t>(0));
  g_free(valid);
}

void Canvas::finish() {
  Impl& d = *impl_;
  while (d.clip_depth > 0) unclip();
  cairo_status_t status = cairo_status(d.cr);
  if (d.embedded) {
    cairo_restore(d.cr);
    d.finished = true;
    if (status != CAIRO_STATUS_SUCCESS) fail(d.path, status);
    return;
  }
  if (status != CAIRO_STATUS_SUCCESS) fail(d.path, status);
  if (d.format == OutputFormat::Png) {
    cairo_surface_flush(d.surface);
    status = cairo_surface_write_to_png(d.surface, d.path.c_str());
  } else {
    cairo_surface_finish(d.surface);
    status = cairo_surface_status(d.surface);
  }
  if (status != CAIRO_STATUS_SUCCESS) fail(d.path, status);
  d.finished = true;
}

double Occupancy::overlap(const Rect& r) const {
  double total = 0;
  for (const Rect& t : taken_) total += r.overlap_area(t);
  return total;
}

std::vector<double> spread_labels(const std::vector<double>& wanted,
                                  const std::vector<double>& size, double low, double high) {
  const std::size_t n = wanted.size();
  std::vector<std::size_t> order(n);
  std::iota(order.begin(), order.end(), std::size_t{0});
  std::stable_sort(order.begin(), order.end(),
                   [&](std::size_t a, std::size_t b) { return wanted[a] < wanted[b]; });

  // Clusters of neighbouring labels laid edge to edge, each centred on the mean of its labels'
  // wanted positions and kept within [low, high]; overlapping clusters merge until none overlap.
  struct Cluster {
    std::size_t first, count;  // indices into `order`
    double extent, wanted_sum, start;
  };
  std::vector<Cluster> clusters;
  const auto place = [&](Cluster& c) {
    c.start = c.wanted_sum / static_cast<double>(c.count) - c.extent / 2;
    c.start = std::min(c.start, high - c.extent);
    c.start = std::max(c.start, low);
  };
  for (std::size_t k = 0; k < n; ++k) {
    Cluster c{k, 1, size[order[k]], wanted[order[k]], 0};
    place(c);
    clusters.push_back(c);
    while (clusters.size() >= 2) {
      Cluster& a = clusters[clusters.size() - 2];
      const Cluster& b = clusters.back();
      if (a.start + a.extent <= b.start + 1e-9) break;
      a.count += b.count;
      a.extent += b.extent;
      // The wanted sum is weighted by count so that the cluster's centre is the mean centre.
      a.wanted_sum += b.wanted_sum;
      clusters.pop_back();
      place(a);
    }
  }
  std::vector<double> out(n);
  for (const Cluster& c : clusters) {
    double at = c.start;
    for (std::size_t k = c.first; k < c.first + c.count; ++k) {
      out[order[k]] = at + size[order[k]] / 2;
      at += size[order[k]];
    }
  }
  return out;
}

}  // namespace cw::plot::detail
