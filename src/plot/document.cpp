// SPDX-License-Identifier: Apache-2.0
// render_document(): turns the blocks into a flow of measured units, breaks the flow into A4
// pages, then draws each page with its running head and footer.
//
// Two passes. The first measures every unit (a line of a paragraph, a table row, a figure) with
// the same pango layout that draws it and assigns it to a page; the second draws the pages, so
// that the footer can say "page N of M". A unit is never split: a paragraph breaks between
// lines, a table between rows, a figure moves whole to the next page.
#include "plot/document.h"

#include <algorithm>
#include <cmath>
#include <functional>
#include <map>
#include <memory>
#include <string>
#include <type_traits>
#include <utility>
#include <variant>
#include <vector>

#include "core/error.h"
#include "plot/canvas.h"
#include "plot/figures.h"

namespace cw::plot {
namespace {

using detail::Align;
using detail::Canvas;
using detail::Font;
using detail::gray;
using detail::kBlack;
using detail::kWhite;
using detail::Rect;
using detail::Rgb;
using detail::Stroke;
using detail::TextBox;

// The page: A4 with a text block of 495 × 696 points, a running head above it and a footer
// below it.
constexpr double kLeft = 50;
constexpr double kRight = kA4Width - 50;
constexpr double kTextWidth = kRight - kLeft;
constexpr double kHeadY = 30;                  // running head text
constexpr double kHeadRuleY = 44;              // rule under it
constexpr double kTop = 60;                    // first unit of a page
constexpr double kFooterRuleY = 784;           // rule over the footer
constexpr double kBottom = kFooterRuleY - 12;  // nothing of the flow below this

// Type: DejaVu Sans (and Sans Mono) from fonts-dejavu-core, regular and bold only.
const Font kTitleFont{17, true};
const Font kSubtitleFont{10};
const Font kHeading1Font{12, true};
const Font kHeading2Font{9.5, true};
const Font kBodyFont{9};
const Font kNoteFont{8};
const Font kNoticeFont{8.5};
const Font kKeyFont{8.5};
const Font kValueFont{9};
const Font kValueMonoFont{8.5, false, false, true};
const Font kCaptionFont{8.5, true};
const Font kHeaderCellFont{7.5, true};
const Font kCellFont{8};
const Font kCellBoldFont{8, true};
const Font kCellMonoFont{7.5, false, false, true};
const Font kBannerLabelFont{7, true};
const Font kBannerTextFont{11, true};
const Font kRunningHeadFont{7.5};
const Font kFooterFont{7.5};
const Font kFooterBoldFont{7.5, true};
const Font kFooterCautionFont{7};

constexpr Rgb kSecondaryInk = gray(0.32);
constexpr Rgb kMutedInk = gray(0.45);
constexpr Rgb kRuleInk = gray(0.55);
constexpr Rgb kHairlineInk = gray(0.82);
constexpr Rgb kHeaderFill = gray(0.86);
constexpr Rgb kStripeFill = gray(0.95);
constexpr Rgb kNoticeFill = gray(0.93);

constexpr double kCellPadX = 4;
constexpr double kCellPadY = 2.5;
constexpr int kMaxCellLines = 40;
constexpr double kFigureMinScale = 0.8;  // the smallest a figure is drawn to fit a page  // a
                                         // longer cell ends in "…" so that a row fits a page

// One measured piece of the flow, drawn with its top at y.
struct Unit {
  double height = 0;
  double space_before = 0;  // dropped at the top of a page
  bool keep_with_next = false;
  bool break_before = false;
  std::string outline;  // a bookmark to this unit, when not empty
  /// A unit that may be drawn smaller (a figure) says how small; 0: it may not.
  double min_height = 0;
  /// Draws the unit with its top at y, `height` high (its own height unless it shrank).
  std::function<void(Canvas&, double, double)> draw;
  // Units placed first when this one starts a page (a table's caption and header row).
  std::shared_ptr<const std::vector<Unit>> continuation;
};

struct Page {
  std::vector<std::function<void(Canvas&)>> ops;
  std::vector<std::pair<std::string, double>> outline;
};

// The text of a cell or line cut to `max_lines` lines, the last ending in "…" when cut.
std::vector<std::string> capped(std::vector<std::string> lines, std::size_t max_lines) {
  if (lines.size() <= max_lines) return lines;
  lines.resize(max_lines);
  lines.back() += "\u2026";
  return lines;
}

class Flow {
 public:
  explicit Flow(Canvas& canvas) : c_(canvas) {}

  std::vector<Unit> units;

  double line_height(const Font& font) const {
    const auto key = std::make_pair(font.size, (font.bold ? 2 : 0) + (font.mono ? 1 : 0));
    const auto it = line_heights_.find(key);
    if (it != line_heights_.end()) return it->second;
    const double h = c_.measure("Ag", font).h;
    line_heights_.emplace(key, h);
    return h;
  }

  void add_title(const Document& d) {
    if (!d.title.empty()) {
      lines_as_units(d.title, kTitleFont, kBlack, 0, 0, 2);
      units.back().keep_with_next = !d.subtitle.empty();
    }
    if (!d.subtitle.empty()) lines_as_units(d.subtitle, kSubtitleFont, kSecondaryInk, 3, 0, 1);
    pending_space_ = 10;
  }

  void add(const Heading& h) {
    const bool top = h.level <= 1;
    const Font& font = top ? kHeading1Font : kHeading2Font;
    const std::vector<std::string> lines = c_.wrap(h.text, font, kTextWidth);
    const double lh = line_height(font);
    Unit u;
    u.height = lh * static_cast<double>(lines.size()) + (top ? 4 : 2);
    u.space_before = take_space(top ? 16 : 10);
    u.keep_with_next = true;
    if (top) u.outline = h.text;
    last_heading_ = h.text;
    u.draw = [lines, font, lh, top](Canvas& c, double y, double) {
      for (std::size_t i = 0; i < lines.size(); ++i) {
        c.text(lines[i], kLeft, y + lh * static_cast<double>(i), font, Align::Start, Align::Start);
      }
      if (top) {
        const double rule_y = y + lh * static_cast<double>(lines.size()) + 1.5;
        c.line({kLeft, rule_y}, {kRight, rule_y}, {0.6, kBlack, {}});
      }
    };
    push(std::move(u));
    pending_space_ = top ? 6 : 3;
  }

  void add(const Paragraph& p) {
    switch (p.style) {
      case Paragraph::Style::Body:
        lines_as_units(p.text, kBodyFont, kBlack, take_space(4), 0, 0);
        pending_space_ = 4;
        break;
      case Paragraph::Style::Note:
        lines_as_units(p.text, kNoteFont, kSecondaryInk, take_space(3), 0, 0);
        pending_space_ = 4;
        break;
      case Paragraph::Style::Notice:
        add_notice(p.text);
        pending_space_ = 6;
        break;
    }
  }

  void add(const Banner& b) {
    if (b.items.empty()) return;
    const double gap = 8;
    const double n = static_cast<double>(b.items.size());
    const double item_w = (kTextWidth - gap * (n - 1)) / n;
    const double bar = 4, pad = 7;
    const double text_w = item_w - bar - 2 * pad;
    struct Laid {
      Banner::Item item;
      std::vector<std::string> lines;
    };
    std::vector<Laid> laid;
    std::size_t most = 1;
    for (const Banner::Item& item : b.items) {
      laid.push_back({item, capped(c_.wrap(item.text, kBannerTextFont, text_w), 3)});
      most = std::max(most, laid.back().lines.size());
    }
    const double label_h = line_height(kBannerLabelFont);
    const double text_h = line_height(kBannerTextFont);
    const double height = pad + label_h + 2 + text_h * static_cast<double>(most) + pad;
    Unit u;
    u.height = height;
    u.space_before = take_space(8);
    u.draw = [laid, item_w, gap, bar, pad, label_h, text_h, height](Canvas& c, double y, double) {
      double x = kLeft;
      for (const Laid& l : laid) {
        const Rect box{x, y, item_w, height};
        const Rgb ink = l.item.strong ? kWhite : kBlack;
        if (l.item.strong) {
          c.fill_rect(box, kBlack);
        } else {
          c.fill_rect(box, kNoticeFill);
          c.fill_rect({x, y, bar, height}, kBlack);
        }
        std::string label = l.item.label;
        for (char& ch : label) {
          if (ch >= 'a' && ch <= 'z') ch = static_cast<char>(ch - 'a' + 'A');
        }
        const double tx = x + bar + pad;
        c.text(label, tx, y + pad, kBannerLabelFont, Align::Start, Align::Start,
               l.item.strong ? gray(0.85) : kSecondaryInk);
        for (std::size_t i = 0; i < l.lines.size(); ++i) {
          c.text(l.lines[i], tx, y + pad + label_h + 2 + text_h * static_cast<double>(i),
                 kBannerTextFont, Align::Start, Align::Start, ink);
        }
        x += item_w + gap;
      }
    };
    push(std::move(u));
    pending_space_ = 8;
  }

  void add(const KeyValueList& list) {
    double key_w = 0;
    for (const auto& e : list.entries) key_w = std::max(key_w, c_.measure(e.key, kKeyFont).w);
    key_w = std::min(key_w + 14, kTextWidth * 0.3);
    const double value_x = kLeft + key_w;
    const double value_w = kTextWidth - key_w;
    bool first = true;
    for (std::size_t i = 0; i < list.entries.size(); ++i) {
      const auto& e = list.entries[i];
      const Font& value_font = e.mono ? kValueMonoFont : kValueFont;
      const auto keys = capped(c_.wrap(e.key, kKeyFont, key_w - 10), 3);
      const auto values = capped(c_.wrap(e.value, value_font, value_w), kMaxCellLines);
      const double klh = line_height(kKeyFont);
      const double vlh = line_height(value_font);
      const double h = std::max(klh * static_cast<double>(keys.size()),
                                vlh * static_cast<double>(values.size()));
      Unit u;
      u.height = h + 4;
      u.space_before = first ? take_space(2) : 0;
      u.keep_with_next = first && list.entries.size() > 1;
      u.draw = [keys, values, klh, vlh, value_x, value_font](Canvas& c, double y, double) {
        // The key sits on the value's first baseline although the fonts differ in size.
        const double key_dy = (vlh - klh) * 0.7;
        for (std::size_t k = 0; k < keys.size(); ++k) {
          c.text(keys[k], kLeft, y + 2 + key_dy + klh * static_cast<double>(k), kKeyFont,
                 Align::Start, Align::Start, kSecondaryInk);
        }
        for (std::size_t k = 0; k < values.size(); ++k) {
          c.text(values[k], value_x, y + 2 + vlh * static_cast<double>(k), value_font, Align::Start,
                 Align::Start);
        }
      };
      push(std::move(u));
      first = false;
    }
    pending_space_ = 6;
  }

  void add(const Table& t) { TableLayout(*this, t).emit(); }

  void add(const Figure& f) {
    double w = 0, h = 0;
    std::visit(
        [&](const auto& plot) {
          w = plot.page.width;
          h = plot.page.height;
        },
        f.plot);
    if (!(w > 0 && h > 0)) throw ValidationError("a figure has no size");
    double fw = kTextWidth;
    double fh = fw * h / w;
    const double max_h = kBottom - kTop - 40;
    if (fh > max_h) {
      fh = max_h;
      fw = fh * w / h;
    }
    const auto caption = f.caption.empty() ? std::vector<std::string>{}
                                           : capped(c_.wrap(f.caption, kNoteFont, kTextWidth), 4);
    const double clh = line_height(kNoteFont);
    const double caption_h = caption.empty() ? 0 : 4 + clh * static_cast<double>(caption.size());
    Unit u;
    u.height = fh + caption_h;
    // Rather than leave a third of a page empty, a figure may shrink a little to fit.
    u.min_height = fh * kFigureMinScale + caption_h;
    u.space_before = take_space(8);
    const auto plot = std::make_shared<const std::variant<CurvePlot, ControlChart>>(f.plot);
    u.draw = [plot, fw, fh, w, h, caption, caption_h, clh](Canvas& c, double y, double height) {
      const double scale = std::min(1.0, (height - caption_h) / fh);
      const Rect frame{kLeft + (kTextWidth - fw * scale) / 2, y, fw * scale, fh * scale};
      Canvas figure(c.context(), frame, w, h);
      std::visit(
          [&](const auto& p) {
            using T = std::decay_t<decltype(p)>;
            if constexpr (std::is_same_v<T, CurvePlot>) {
              detail::draw_curve_plot(p, figure);
            } else {
              detail::draw_control_chart(p, figure);
            }
          },
          *plot);
      figure.finish();
      c.stroke_rect(frame, {0.5, kHairlineInk, {}});
      for (std::size_t i = 0; i < caption.size(); ++i) {
        c.text(caption[i], kLeft, frame.bottom() + 4 + clh * static_cast<double>(i), kNoteFont,
               Align::Start, Align::Start, kSecondaryInk);
      }
    };
    push(std::move(u));
    pending_space_ = 8;
  }

  void add(const SignatureFields& s) {
    if (s.fields.empty()) return;
    const double gap = 14;
    const double n = static_cast<double>(s.fields.size());
    const double box_w = (kTextWidth - gap * (n - 1)) / n;
    const double pad = 7;
    const double inner = box_w - 2 * pad;
    const double lh = line_height(kKeyFont);
    struct Laid {
      std::string role;
      std::vector<std::string> lines;
      std::vector<std::string> signed_lines;
      bool name_line = false;
    };
    std::vector<Laid> laid;
    double content_h = 0;
    for (const auto& f : s.fields) {
      Laid l{f.role, {}, {}, f.name_line};
      for (const auto& line : f.lines) {
        for (auto& piece : c_.wrap(line, kKeyFont, inner)) l.lines.push_back(piece);
      }
      for (const auto& line : f.signed_lines) {
        for (auto& piece : c_.wrap(line, kKeyFont, inner - 6)) l.signed_lines.push_back(piece);
      }
      l.lines = capped(l.lines, 8);
      l.signed_lines = capped(l.signed_lines, 6);
      // Signing by hand needs room: 22 points above the rule of the name, 36 above the
      // signature's, 22 above the date's, each rule labelled underneath.
      const double below = l.signed_lines.empty()
                               ? (l.name_line ? 22.0 + 11 : 0.0) + 36 + 11 + 22 + 11
                               : 6 + lh * static_cast<double>(l.signed_lines.size()) + 4;
      content_h = std::max(content_h, line_height(kCaptionFont) + 3 +
                                          lh * static_cast<double>(l.lines.size()) + below);
      laid.push_back(std::move(l));
    }
    const double height = pad + content_h + pad;
    Unit u;
    u.height = height;
    u.space_before = take_space(10);
    const double caption_h = line_height(kCaptionFont);
    u.draw = [laid, box_w, gap, pad, lh, height, caption_h](Canvas& c, double y, double) {
      double x = kLeft;
      for (const Laid& l : laid) {
        c.stroke_rect({x, y, box_w, height}, {0.7, kBlack, {}});
        double ty = y + pad;
        c.text(l.role, x + pad, ty, kCaptionFont, Align::Start, Align::Start);
        ty += caption_h + 3;
        for (const auto& line : l.lines) {
          c.text(line, x + pad, ty, kKeyFont, Align::Start, Align::Start);
          ty += lh;
        }
        if (l.signed_lines.empty()) {
          // Ruled lines from the foot of the box up: date, signature, name.
          const double date_y = y + height - pad - 11;
          const double signature_y = date_y - 11 - 22;
          const double name_y = signature_y - 11 - 36;
          const std::pair<const char*, double> rules[] = {
              {"date", date_y}, {"signature", signature_y}, {"name", name_y}};
          for (const auto& [what, rule_y] : rules) {
            if (what[0] == 'n' && !l.name_line) continue;
            c.line({x + pad, rule_y}, {x + box_w - pad, rule_y}, {0.6, kBlack, {}});
            c.text(what, x + pad, rule_y + 1.5, kNoteFont, Align::Start, Align::Start,
                   kSecondaryInk);
          }
        } else {
          // The manifestation of an electronic signature, set off by a rule at its left.
          ty += 6;
          const double top = ty;
          for (const auto& line : l.signed_lines) {
            c.text(line, x + pad + 6, ty, kKeyFont, Align::Start, Align::Start);
            ty += lh;
          }
          c.line({x + pad + 1, top}, {x + pad + 1, ty}, {2, kBlack, {}});
        }
        x += box_w + gap;
      }
    };
    push(std::move(u));
    pending_space_ = 8;
  }

  void add(const Space& s) { pending_space_ += std::max(0.0, s.points); }

  void add(const PageBreak&) { break_next_ = true; }

 private:
  Canvas& c_;
  mutable std::map<std::pair<double, int>, double> line_heights_;
  double pending_space_ = 0;
  bool break_next_ = false;
  std::string last_heading_;

  // The space before the next unit: what the previous block left, at least `wanted`.
  double take_space(double wanted) {
    const double s = std::max(wanted, pending_space_);
    pending_space_ = 0;
    return s;
  }

  void push(Unit u) {
    if (break_next_) {
      u.break_before = true;
      break_next_ = false;
    }
    units.push_back(std::move(u));
  }

  // A wrapped text as one unit per line; the first two and the last two lines stay together.
  void lines_as_units(const std::string& text, const Font& font, Rgb ink, double space_before,
                      double indent, std::size_t max_lines) {
    std::vector<std::string> lines = c_.wrap(text, font, kTextWidth - indent);
    if (max_lines > 0) lines = capped(lines, max_lines);
    const double lh = line_height(font);
    const std::size_t n = lines.size();
    for (std::size_t i = 0; i < n; ++i) {
      Unit u;
      u.height = lh;
      u.space_before = i == 0 ? space_before : 0;
      u.keep_with_next = (i == 0 && n > 1) || (n > 2 && i + 2 == n);
      u.draw = [line = lines[i], font, ink, indent](Canvas& c, double y, double) {
        c.text(line, kLeft + indent, y, font, Align::Start, Align::Start, ink);
      };
      push(std::move(u));
    }
  }

  // A framed, shaded paragraph. Each line draws its own slice of the box, so that a notice
  // broken across pages is framed on both.
  void add_notice(const std::string& text) {
    const double pad = 6;
    const std::vector<std::string> lines = c_.wrap(text, kNoticeFont, kTextWidth - 2 * pad - 3);
    const double lh = line_height(kNoticeFont);
    const std::size_t n = lines.size();
    for (std::size_t i = 0; i < n; ++i) {
      const bool first = i == 0, last = i + 1 == n;
      Unit u;
      u.height = lh + (first ? pad : 0) + (last ? pad : 0);
      u.space_before = first ? take_space(6) : 0;
      // A notice of a few lines is kept whole; a longer one breaks like a paragraph.
      u.keep_with_next = n <= 8 ? !last : (first && n > 1) || (n > 2 && i + 2 == n);
      u.draw = [line = lines[i], first, pad, h = u.height](Canvas& c, double y, double) {
        c.fill_rect({kLeft, y, kTextWidth, h}, kNoticeFill);
        c.fill_rect({kLeft, y, 3, h}, kBlack);
        c.text(line, kLeft + 3 + pad, y + (first ? pad : 0), kNoticeFont, Align::Start,
               Align::Start);
      };
      push(std::move(u));
    }
  }

  // Column widths, wrapped cells and the units of one table.
  class TableLayout {
   public:
    TableLayout(Flow& flow, const Table& t) : f_(flow), t_(t) {}

    void emit() {
      const std::size_t cols = t_.columns.size();
      if (cols == 0) return;
      widths();
      auto continuation = std::make_shared<std::vector<Unit>>();
      const double space = f_.take_space(t_.caption.empty() ? 6 : 8);
      bool first = true;
      if (!t_.caption.empty()) {
        Unit caption = caption_unit(t_.caption);
        caption.space_before = space;
        caption.keep_with_next = true;
        f_.push(caption);
        first = false;
      }
      // On the pages it continues onto, the table is named by its caption, else by the heading
      // of its section.
      const std::string& name = t_.caption.empty() ? f_.last_heading_ : t_.caption;
      if (!name.empty()) {
        continuation->push_back(caption_unit(name + " (continued)"));
        continuation->back().keep_with_next = true;
      }
      Unit header = header_unit();
      header.space_before = first ? space : 1;
      header.keep_with_next = true;
      f_.push(header);
      Unit repeated = header_unit();
      repeated.space_before = 1;
      repeated.keep_with_next = true;
      continuation->push_back(std::move(repeated));

      if (t_.rows.empty()) {
        const auto lines = f_.c_.wrap(t_.empty_text, kNoteFont, kTextWidth - 2 * kCellPadX);
        const double lh = f_.line_height(kNoteFont);
        Unit u;
        u.height = lh * static_cast<double>(lines.size()) + 2 * kCellPadY;
        u.draw = [lines, lh, h = u.height](Canvas& c, double y, double) {
          for (std::size_t i = 0; i < lines.size(); ++i) {
            c.text(lines[i], kLeft + kCellPadX, y + kCellPadY + lh * static_cast<double>(i),
                   kNoteFont, Align::Start, Align::Start, kSecondaryInk);
          }
          c.line({kLeft, y + h}, {kRight, y + h}, {0.8, kBlack, {}});
        };
        f_.push(std::move(u));
      }
      const std::shared_ptr<const std::vector<Unit>> shared = continuation;
      for (std::size_t r = 0; r < t_.rows.size(); ++r) {
        Unit u = row_unit(t_.rows[r], r % 2 == 1, r + 1 == t_.rows.size());
        u.continuation = shared;
        // The first rows stay with the header; the last row does not stand alone on a page.
        u.keep_with_next = t_.rows.size() > 1 && (r == 0 || r + 2 == t_.rows.size());
        f_.push(std::move(u));
      }
      f_.pending_space_ = 8;
    }

   private:
    Flow& f_;
    const Table& t_;
    std::vector<double> x_;  // left edge of each column
    std::vector<double> w_;  // width of each column

    static const Font& font_of(const Table::Column& col, Table::Row::Style style) {
      if (col.mono) return kCellMonoFont;
      return style == Table::Row::Style::Strong ? kCellBoldFont : kCellFont;
    }

    std::string cell(const Table::Row& row, std::size_t c) const {
      return c < row.cells.size() ? row.cells[c] : std::string();
    }

    // Widest unbreakable word of `text`.
    double longest_word(const std::string& text, const Font& font) const {
      double widest = 0;
      std::size_t start = 0;
      while (start <= text.size()) {
        std::size_t end = text.find_first_of(" \n", start);
        if (end == std::string::npos) end = text.size();
        if (end > start) {
          widest = std::max(widest, f_.c_.measure(text.substr(start, end - start), font).w);
        }
        start = end + 1;
      }
      return widest;
    }

    void widths() {
      const std::size_t cols = t_.columns.size();
      std::vector<double> want(cols, 0), need(cols, 0);
      for (std::size_t c = 0; c < cols; ++c) {
        const Table::Column& col = t_.columns[c];
        double cells = 0;
        for (const Table::Row& row : t_.rows) {
          cells = std::max(cells, f_.c_.measure(cell(row, c), font_of(col, row.style)).w);
        }
        const double header = f_.c_.measure(col.header, kHeaderCellFont).w;
        const double header_word = longest_word(col.header, kHeaderCellFont);
        want[c] = std::max(cells, header) + 2 * kCellPadX + 0.5;
        need[c] = std::max(cells, header_word) + 2 * kCellPadX + 0.5;
      }
      double total_want = 0;
      for (double v : want) total_want += v;
      w_.assign(cols, 0);
      if (total_want <= kTextWidth) {
        // Room to spare goes to the wrapping columns, else to every column alike.
        double wrap_want = 0;
        for (std::size_t c = 0; c < cols; ++c) wrap_want += t_.columns[c].wrap ? want[c] : 0;
        const double extra = kTextWidth - total_want;
        for (std::size_t c = 0; c < cols; ++c) {
          const double share =
              wrap_want > 0 ? (t_.columns[c].wrap ? want[c] / wrap_want : 0) : want[c] / total_want;
          w_[c] = want[c] + extra * share;
        }
      } else {
        // Fixed columns keep their cells on one line (their headers may wrap). The wrapping
        // columns share what is left fairly: a column that wants less than an equal share gets
        // what it wants, the others split the rest equally, none below its floor (its longest
        // word, within bounds, so that a sample code is not broken).
        double fixed = 0, floors = 0;
        std::vector<double> floor(cols, 0);
        std::vector<std::size_t> open;  // wrapping columns still to be sized
        for (std::size_t c = 0; c < cols; ++c) {
          if (t_.columns[c].wrap) {
            double word = 0;
            for (const Table::Row& row : t_.rows) {
              word = std::max(word, longest_word(cell(row, c), font_of(t_.columns[c], row.style)));
            }
            floor[c] = std::min(want[c], std::clamp(word + 2 * kCellPadX + 0.5, 48.0, 110.0));
            floors += floor[c];
            open.push_back(c);
          } else {
            w_[c] = std::min(want[c], need[c]);
            fixed += w_[c];
          }
        }
        double left = kTextWidth - fixed;
        if (left >= floors) {
          // Settle the columns that need no more than an equal share (or are held up by their
          // floor) until none is left to settle; the rest divide what remains.
          for (bool settled = true; settled && !open.empty();) {
            settled = false;
            const double share = left / static_cast<double>(open.size());
            for (auto it = open.begin(); it != open.end();) {
              const std::size_t c = *it;
              if (want[c] <= share || floor[c] >= share) {
                w_[c] = want[c] <= share ? want[c] : floor[c];
                left -= w_[c];
                it = open.erase(it);
                settled = true;
              } else {
                ++it;
              }
            }
          }
          for (std::size_t c : open) w_[c] = left / static_cast<double>(open.size());
          // Every wrapping column got what it wants (the fixed columns gave up their header
          // widths): the room to spare goes to the wrapping columns, so the table spans the page.
          if (open.empty() && left > 0) {
            double wrap_total = 0;
            for (std::size_t c = 0; c < cols; ++c) wrap_total += t_.columns[c].wrap ? w_[c] : 0;
            for (std::size_t c = 0; c < cols; ++c) {
              if (t_.columns[c].wrap) w_[c] += left * w_[c] / wrap_total;
            }
          }
        } else {
          // Too many fixed columns: everything shrinks alike and cells wrap where they must.
          for (std::size_t c : open) w_[c] = floor[c];
          const double total = fixed + floors;
          for (double& v : w_) v *= kTextWidth / total;
        }
      }
      x_.assign(cols, kLeft);
      for (std::size_t c = 1; c < cols; ++c) x_[c] = x_[c - 1] + w_[c - 1];
    }

    Unit caption_unit(const std::string& text) const {
      const auto lines = capped(f_.c_.wrap(text, kCaptionFont, kTextWidth), 2);
      const double lh = f_.line_height(kCaptionFont);
      Unit u;
      u.height = lh * static_cast<double>(lines.size()) + 3;
      u.draw = [lines, lh](Canvas& c, double y, double) {
        for (std::size_t i = 0; i < lines.size(); ++i) {
          c.text(lines[i], kLeft, y + lh * static_cast<double>(i), kCaptionFont, Align::Start,
                 Align::Start);
        }
      };
      return u;
    }

    // A row of cells: wrapped, top-aligned, numbers right-aligned.
    struct LaidCell {
      std::vector<std::string> lines;
      Font font;
      double line_height = 0;
      Rgb ink;
      bool right = false;
    };

    Unit cells_unit(std::vector<LaidCell> cells, double lh_max, std::size_t most, bool header,
                    bool stripe, bool last) const {
      Unit u;
      u.height = lh_max * static_cast<double>(most) + 2 * kCellPadY;
      u.draw = [cells = std::move(cells), x = x_, w = w_, h = u.height, header, stripe, last](
                   Canvas& c, double y, double) {
        if (header) {
          c.fill_rect({kLeft, y, kTextWidth, h}, kHeaderFill);
        } else if (stripe) {
          c.fill_rect({kLeft, y, kTextWidth, h}, kStripeFill);
        }
        for (std::size_t i = 0; i < cells.size(); ++i) {
          const LaidCell& cell = cells[i];
          const double lh = cell.line_height;
          for (std::size_t k = 0; k < cell.lines.size(); ++k) {
            const double ty = y + kCellPadY + lh * static_cast<double>(k);
            if (cell.right) {
              c.text(cell.lines[k], x[i] + w[i] - kCellPadX, ty, cell.font, Align::End,
                     Align::Start, cell.ink);
            } else {
              c.text(cell.lines[k], x[i] + kCellPadX, ty, cell.font, Align::Start, Align::Start,
                     cell.ink);
            }
          }
        }
        if (header) c.line({kLeft, y + h}, {kRight, y + h}, {0.8, kBlack, {}});
        if (last) c.line({kLeft, y + h}, {kRight, y + h}, {0.8, kBlack, {}});
      };
      return u;
    }

    Unit header_unit() const {
      std::vector<LaidCell> cells;
      std::size_t most = 1;
      for (std::size_t c = 0; c < t_.columns.size(); ++c) {
        const Table::Column& col = t_.columns[c];
        auto lines = capped(f_.c_.wrap(col.header, kHeaderCellFont, w_[c] - 2 * kCellPadX), 3);
        most = std::max(most, lines.size());
        cells.push_back({std::move(lines), kHeaderCellFont, f_.line_height(kHeaderCellFont), kBlack,
                         col.numeric});
      }
      return cells_unit(std::move(cells), f_.line_height(kHeaderCellFont), most, true, false,
                        false);
    }

    Unit row_unit(const Table::Row& row, bool stripe, bool last) const {
      std::vector<LaidCell> cells;
      std::size_t most = 1;
      double lh_max = 0;
      const Rgb ink = row.style == Table::Row::Style::Muted ? kMutedInk : kBlack;
      for (std::size_t c = 0; c < t_.columns.size(); ++c) {
        const Table::Column& col = t_.columns[c];
        const Font& font = font_of(col, row.style);
        auto lines = capped(f_.c_.wrap(cell(row, c), font, w_[c] - 2 * kCellPadX), kMaxCellLines);
        lh_max = std::max(lh_max, f_.line_height(font));
        most = std::max(most, lines.size());
        cells.push_back({std::move(lines), font, f_.line_height(font), ink, col.numeric});
      }
      return cells_unit(std::move(cells), lh_max, most, false, stripe, last);
    }
  };
};

// Assigns the units to pages.
std::vector<Page> paginate(const std::vector<Unit>& units) {
  std::vector<Page> pages(1);
  double y = kTop;
  bool empty = true;  // nothing placed on the current page yet

  const auto place = [&](const Unit& u, double space, double height) {
    const double top = y + space;
    if (!u.outline.empty()) pages.back().outline.emplace_back(u.outline, top);
    pages.back().ops.push_back([draw = u.draw, top, height](Canvas& c) { draw(c, top, height); });
    y = top + height;
    empty = false;
  };
  const auto new_page = [&](const Unit& u) {
    pages.emplace_back();
    y = kTop;
    empty = true;
    if (u.continuation) {
      for (const Unit& c : *u.continuation) place(c, empty ? 0 : c.space_before, c.height);
    }
  };
  // The least height a unit can do with.
  const auto least = [](const Unit& u) { return u.min_height > 0 ? u.min_height : u.height; };

  for (std::size_t i = 0; i < units.size(); ++i) {
    const Unit& u = units[i];
    if (u.break_before && !empty) new_page(u);
    double space = empty ? 0 : u.space_before;
    // The height this unit needs on the page: itself and the units it keeps with.
    double needed = space + least(u);
    for (std::size_t k = i; units[k].keep_with_next && k + 1 < units.size(); ++k) {
      needed += units[k + 1].space_before + least(units[k + 1]);
      if (needed > kBottom - kTop) break;
    }
    const bool chain_fits = y + needed <= kBottom || needed > kBottom - kTop;
    if (!empty && (!chain_fits || y + space + least(u) > kBottom)) {
      new_page(u);
      space = empty ? 0 : u.space_before;
    }
    // A shrinkable unit takes its full height when the page has room for it (and for what it
    // keeps with), else what is left.
    double height = u.height;
    if (u.min_height > 0) {
      double after = 0;
      for (std::size_t k = i; units[k].keep_with_next && k + 1 < units.size(); ++k) {
        after += units[k + 1].space_before + least(units[k + 1]);
      }
      height = std::clamp(kBottom - y - space - after, u.min_height, u.height);
    }
    place(u, space, height);
  }
  return pages;
}

void draw_running_head(Canvas& c, const Document& d) {
  const double half = kTextWidth / 2 - 6;
  c.text(d.running_head_left, kLeft, kHeadY, kRunningHeadFont, Align::Start, Align::Start,
         kSecondaryInk, {half, false, 1});
  c.text(d.running_head_right, kRight, kHeadY, kRunningHeadFont, Align::End, Align::Start,
         kSecondaryInk, {half, false, 1});
  c.line({kLeft, kHeadRuleY}, {kRight, kHeadRuleY}, {0.5, kRuleInk, {}});
}

void draw_footer(Canvas& c, const Document& d, int page, int pages) {
  c.line({kLeft, kFooterRuleY}, {kRight, kFooterRuleY}, {0.5, kRuleInk, {}});
  const std::string number = "page " + std::to_string(page) + " of " + std::to_string(pages);
  const Rect n =
      c.text(number, kRight, kFooterRuleY + 5, kFooterBoldFont, Align::End, Align::Start);
  c.text(d.generated_text, kLeft, kFooterRuleY + 5, kFooterFont, Align::Start, Align::Start, kBlack,
         {std::max(10.0, kTextWidth - n.w - 12), false, 1});
  c.text(d.footer_caution, kLeft, n.bottom() + 2, kFooterCautionFont, Align::Start, Align::Start,
         kSecondaryInk, {kTextWidth, false, 1});
}

}  // namespace

int render_document(const Document& document, const std::string& path) {
  if (output_format_for(path) != OutputFormat::Pdf) {
    throw ValidationError(SourceLocation{path, std::nullopt, std::nullopt, {}},
                          "cannot write report '" + path + "': expected a .pdf file");
  }
  const PlotPage page{kA4Width, kA4Height, document.created_at};
  Canvas canvas(OutputFormat::Pdf, path, page, document.title);
  if (!document.author.empty()) canvas.set_author(document.author);

  Flow flow(canvas);
  flow.add_title(document);
  for (const Block& block : document.blocks) {
    std::visit([&](const auto& b) { flow.add(b); }, block);
  }
  const std::vector<Page> pages = paginate(flow.units);
  const int count = static_cast<int>(pages.size());
  for (int p = 0; p < count; ++p) {
    if (p > 0) canvas.next_page();
    draw_running_head(canvas, document);
    for (const auto& op : pages[static_cast<std::size_t>(p)].ops) op(canvas);
    draw_footer(canvas, document, p + 1, count);
    for (const auto& [text, y] : pages[static_cast<std::size_t>(p)].outline) {
      canvas.add_outline(text, p + 1, y);
    }
  }
  canvas.finish();
  return count;
}

}  // namespace cw::plot
