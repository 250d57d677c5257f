// SPDX-License-Identifier: Apache-2.0
// Internal to plot/: a drawing surface over cairo and pango with the few primitives the plots
// use (lines, fills, markers, text with measured extents) and a record of occupied rectangles
// for placing labels where they cover nothing.
#pragma once

#include <memory>
#include <string>
#include <vector>

#include "plot/plot.h"

// cairo's context type, declared as cairo.h does, so that this header needs no cairo include.
typedef struct _cairo cairo_t;

namespace cw::plot::detail {

struct Point {
  double x = 0;
  double y = 0;
};

/// Axis-aligned rectangle in page units, y downwards.
struct Rect {
  double x = 0;
  double y = 0;
  double w = 0;
  double h = 0;

  double right() const { return x + w; }
  double bottom() const { return y + h; }
  double centre_x() const { return x + w / 2; }
  double centre_y() const { return y + h / 2; }
  bool contains(const Rect& o) const {
    return o.x >= x && o.y >= y && o.right() <= right() && o.bottom() <= bottom();
  }
  double overlap_area(const Rect& o) const;
  Rect inflated(double d) const { return {x - d, y - d, w + 2 * d, h + 2 * d}; }
};

struct Rgb {
  double r = 0;
  double g = 0;
  double b = 0;
};

inline constexpr Rgb kBlack{0, 0, 0};
inline constexpr Rgb kWhite{1, 1, 1};
inline constexpr Rgb gray(double level) {
  return {level, level, level};
}

/// Line style: width, colour and dash pattern (empty = solid; on/off lengths in page units).
struct Stroke {
  double width = 1;
  Rgb colour = kBlack;
  std::vector<double> dash;
};

struct Font {
  double size = 12;  ///< pixel (page-unit) size, not points
  bool bold = false;
  bool italic = false;
  bool mono = false;  ///< DejaVu Sans Mono (hashes, codes) instead of DejaVu Sans
};

enum class Align { Start, Centre, End };

/// How a text block is laid out: one line (ellipsized beyond max_width when > 0) or wrapped at
/// max_width (at most max_lines lines, the last ellipsized).
struct TextBox {
  double max_width = 0;
  bool wrap = false;
  int max_lines = 0;  ///< 0 = no limit
};

enum class MarkerShape {
  FilledCircle,
  OpenCircle,
  OpenSquare,
  OpenDiamond,
  Cross,
  FilledDiamond,
  OpenTriangle,
};

/// A page being drawn; finish() writes it to the file named at construction. A canvas may also
/// draw into a rectangle of another canvas's page (the embedding constructor): a plot placed on
/// a report page stays vector graphics.
class Canvas {
 public:
  /// Opens the surface for `format` at `path` (SVG and PDF stream into the file as they are
  /// drawn, PNG is written by finish()). `title` becomes the PDF's title. Throws ValidationError
  /// when the file cannot be created.
  Canvas(OutputFormat format, const std::string& path, const PlotPage& page,
         const std::string& title);
  /// Draws onto a caller's cairo context: a drawing of `width` × `height` units whose top-left
  /// corner is at (frame.x, frame.y) of `target`, scaled uniformly to fit `frame` and clipped to
  /// it. The context's state is saved here and restored by finish() (or the destructor); nothing
  /// is written to a file and nothing is painted behind the drawing.
  Canvas(cairo_t* target, const Rect& frame, double width, double height);
  ~Canvas();
  Canvas(const Canvas&) = delete;
  Canvas& operator=(const Canvas&) = delete;

  double width() const;
  double height() const;

  /// The cairo context this canvas draws with, for embedding another drawing in its page.
  cairo_t* context() const;

  /// Size of `text` as it would be drawn (logical extents; x = y = 0).
  Rect measure(const std::string& text, const Font& font, const TextBox& box = {}) const;
  /// Draws `text` with the anchor (x, y) at the given horizontal and vertical alignment of its
  /// logical box; returns that box.
  Rect text(const std::string& text, double x, double y, const Font& font, Align h, Align v,
            Rgb colour = kBlack, const TextBox& box = {});
  /// `text` broken into lines no wider than `max_width` (at word boundaries, within a word only
  /// when it is wider than the line), as pango would wrap it; explicit line breaks are kept.
  /// Each line is returned without its trailing spaces; an empty text gives one empty line.
  std::vector<std::string> wrap(const std::string& text, const Font& font, double max_width) const;
  /// Draws `text` turned 90° anticlockwise (reading upwards), centred on (x, y); returns the
  /// rotated box.
  Rect vertical_text(const std::string& text, double x, double y, const Font& font,
                     Rgb colour = kBlack);

  void line(Point a, Point b, const Stroke& stroke);
  void polyline(const std::vector<Point>& points, const Stroke& stroke);
  void fill_polygon(const std::vector<Point>& points, Rgb colour);
  void fill_rect(const Rect& r, Rgb colour);
  void stroke_rect(const Rect& r, const Stroke& stroke);
  void circle(Point centre, double radius, const Stroke& stroke);

  /// A point marker of `radius` (the circle's radius; other shapes have the same visual
  /// weight). `data` markers carry kDataMarkerMiterLimit (see plot.h); legend samples do not.
  void marker(Point centre, MarkerShape shape, double radius, bool data, Rgb colour = kBlack);

  /// Restricts drawing to `r` until unclip().
  void clip(const Rect& r);
  void unclip();

  /// Sets the PDF's author field (other formats have none).
  void set_author(const std::string& author);
  /// Ends the current page and starts a new blank one (multi-page PDF; for SVG and PNG the
  /// drawing simply goes on).
  void next_page();
  /// Adds a bookmark to the PDF's outline pointing at height `y` of page `page` (1-based);
  /// ignored for other formats and for embedded canvases.
  void add_outline(const std::string& text, int page, double y);

  /// Completes the file (an embedded canvas: restores the caller's context). Throws
  /// ValidationError when it cannot be written.
  void finish();

 private:
  struct Impl;
  std::unique_ptr<Impl> impl_;
};

/// Rectangles already covered by something that a label must not hide.
class Occupancy {
 public:
  void add(const Rect& r) { taken_.push_back(r); }
  /// Total area of `r` that overlaps what has been added.
  double overlap(const Rect& r) const;

 private:
  std::vector<Rect> taken_;
};

/// Spreads labels along one axis so that none overlaps the next: `wanted` are the preferred
/// positions (label centres), `size` each label's extent along the axis plus its gap. The
/// result keeps the order and stays within [low, high] when the labels fit there.
std::vector<double> spread_labels(const std::vector<double>& wanted,
                                  const std::vector<double>& size, double low, double high);

}  // namespace cw::plot::detail
