// SPDX-License-Identifier: Apache-2.0
// A printable document: headings, paragraphs, key–value lists, tables, figures and signature
// fields laid out on A4 pages and written as one PDF by cairo.
//
// The caller fills a Document with blocks of ready-made text (numbers already formatted) and
// plots; render_document() wraps the text, breaks tables across pages (repeating their column
// headers), keeps a heading with what follows it, moves a figure that does not fit to the next
// page, and puts a running head and a footer with "page N of M", the generation time and a
// one-line caution on every page. Nothing here reads the clock, the store or the command line:
// the same Document gives the same bytes.
#pragma once

#include <string>
#include <utility>
#include <variant>
#include <vector>

#include "core/time.h"
#include "plot/control_chart.h"
#include "plot/curve_plot.h"

namespace cw::plot {

/// Page size in PostScript points (A4 portrait).
inline constexpr double kA4Width = 595;
inline constexpr double kA4Height = 842;

/// A section title. Level 1 starts a section (and gets a bookmark in the PDF's outline),
/// level 2 a subsection.
struct Heading {
  std::string text;
  int level = 1;
};

/// Running text, wrapped to the text width.
struct Paragraph {
  enum class Style {
    Body,    ///< ordinary text
    Note,    ///< smaller, grey: definitions, explanations
    Notice,  ///< framed and shaded: standing notices such as the cautions
  };
  std::string text;
  Style style = Style::Body;
};

/// A highlighted statement across the text width (a verdict, a state): a short label in capitals
/// and bold text beside it, framed by a heavy rule at the left. `strong` draws the frame and
/// label in reverse (white on black), for outcomes the reader must not miss (a rejection).
struct Banner {
  struct Item {
    std::string label;  ///< e.g. "Verdict"
    std::string text;   ///< e.g. "accepted · 7 of 7 criteria met"
    bool strong = false;
  };
  std::vector<Item> items;  ///< side by side, each an equal share of the width
};

/// Labels and values in two columns; a long value wraps under itself.
struct KeyValueList {
  struct Entry {
    std::string key;
    std::string value;
    bool mono = false;  ///< value in a fixed-width font (hashes, codes)
  };
  std::vector<Entry> entries;
};

/// A table. Columns get their widths from their content: a column wide enough for its longest
/// cell when the text width allows, else the wrapping columns give way. The header row is
/// repeated at the top of every page the table continues onto, under "caption (continued)".
struct Table {
  struct Column {
    std::string header;
    bool numeric = false;  ///< right-aligned (numbers line up on their last digit)
    bool wrap = false;     ///< may be narrowed and its cells wrapped (reasons, definitions)
    bool mono = false;     ///< cells in a fixed-width font
  };
  struct Row {
    enum class Style {
      Normal,
      Strong,  ///< bold: a failure or refusal
      Muted,   ///< grey: an excluded point
    };
    std::vector<std::string> cells;  ///< one per column; missing cells are empty
    Style style = Style::Normal;
  };
  std::string caption;  ///< optional line above the table
  std::vector<Column> columns;
  std::vector<Row> rows;
  std::string empty_text = "none";  ///< shown in place of the rows when there are none
};

/// A plot drawn into the page as vector graphics, scaled to the text width (its page size
/// gives the aspect ratio and the size its layout is drawn at), with an optional caption.
struct Figure {
  std::variant<CurvePlot, ControlChart> plot;
  std::string caption;
};

/// Boxes for signatures side by side: each shows its printed lines (role, name, what it
/// means) and either an electronic signature's manifestation or blank lines to sign and date
/// by hand.
struct SignatureFields {
  struct Field {
    std::string role;                       ///< e.g. "Reviewed by"
    std::vector<std::string> lines;         ///< printed under the role: name, action, meaning
    std::vector<std::string> signed_lines;  ///< the manifestation; empty: sign by hand
    /// Signing by hand: a ruled line for the signer's printed name too (when the record names
    /// nobody yet).
    bool name_line = false;
  };
  std::vector<Field> fields;
};

/// Vertical space, in points.
struct Space {
  double points = 6;
};

/// Forces the next block onto a new page.
struct PageBreak {};

using Block = std::variant<Heading, Paragraph, Banner, KeyValueList, Table, Figure, SignatureFields,
                           Space, PageBreak>;

/// Everything on the pages.
struct Document {
  std::string title;               ///< first line of page 1; the PDF's title
  std::string subtitle;            ///< under the title (may be empty)
  std::string running_head_left;   ///< top left of every page, e.g. the laboratory
  std::string running_head_right;  ///< top right of every page, e.g. "Curve 17 · calibration"
  std::vector<Block> blocks;
  /// Footer, left: when the document was generated, as display text ("Generated 2024-03-01
  /// 11:00 +01:00").
  std::string generated_text;
  /// Footer, second line: one line of caution (shortened with an ellipsis if it is wider than
  /// the page).
  std::string footer_caution;
  /// Written as the PDF's creation date (UTC): the same input gives the same bytes.
  Instant created_at{};
  std::string author;  ///< the PDF's author field (e.g. the laboratory); may be empty
};

/// Lays out `document` on A4 pages and writes it to `path` as PDF. Returns the number of pages.
/// Throws ValidationError when `path` does not end in ".pdf", when a figure's plot is invalid
/// (see render_curve_plot() and render_control_chart()), or when the file cannot be written (no
/// file is left behind then).
int render_document(const Document& document, const std::string& path);

}  // namespace cw::plot
