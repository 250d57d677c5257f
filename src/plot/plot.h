// SPDX-License-Identifier: Apache-2.0
// What every plot shares: the output format chosen by file extension, the page size and the date
// written into PDF files.
//
// Overview. This folder draws pictures of numbers it is given: curve_plot.h draws a calibration
// curve with its residual panel, control_chart.h a check standard's control chart, ticks.h
// chooses round axis numbers. document.h lays out printable A4 documents (text, tables and these
// plots as vector figures) as PDF, and curve_report.h and run_report.h are the two reports built
// on it. Inputs are plain structs filled by the caller; nothing here reads the store, the clock
// or the command line. cairo draws and writes the files (SVG, PNG or PDF by
// the file's extension) and pango lays out the text in DejaVu Sans; both stay inside the .cpp
// files of this folder.
//
// Black and white. Every series is told apart by marker shape or dash pattern; colour only
// repeats what shape already says, so the plots survive a monochrome printer.
//
// Counting markers in SVG. Each data marker (one per plotted point, in every panel) is one cairo
// path, stroked (and for the filled shapes filled) in a single operation, so cairo writes it as
// exactly one `<path>` element. Data markers, and nothing else, are stroked with a miter limit of
// kDataMarkerMiterLimit; their sharpest corner needs a limit of 2, so the value never changes how
// they look, but it appears in the element's style as `stroke-miterlimit:7;`. Legend samples use
// cairo's default limit (10) and are not counted. The curve plot has one marker per point in the
// upper panel plus one per point with a %RE in the residual panel; the control chart one per
// check.
#pragma once

#include <string>

#include "core/time.h"

namespace cw::plot {

/// File format of a plot, chosen by the extension of the output path.
enum class OutputFormat { Svg, Png, Pdf };

/// The format named by the extension of `path` (".svg", ".png" or ".pdf", any letter case).
/// Throws ValidationError naming the file and the allowed extensions for anything else.
OutputFormat output_format_for(const std::string& path);

/// The miter limit that marks data markers in SVG output (see the overview above).
inline constexpr double kDataMarkerMiterLimit = 7;

/// Size of the drawing and the creation date written into PDF files.
struct PlotPage {
  /// Width and height in CSS pixels for SVG and PNG (one PNG pixel each) and in PostScript
  /// points for PDF. At least 480 × 360; the layout is tuned for 900 × 700.
  double width = 900;
  double height = 700;
  /// Written as the PDF creation date (UTC), so that the same input gives the same bytes. Pass
  /// the instant the command runs at (CURVEWARDEN_NOW in tests and the demo).
  Instant created_at{};
};

}  // namespace cw::plot
