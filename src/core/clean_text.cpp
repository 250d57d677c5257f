// SPDX-License-Identifier: Apache-2.0
// The one check of free text.
#include "core/clean_text.h"

#include <cstdio>
#include <vector>

#include "core/error.h"
#include "core/utf8.h"

namespace cw {
namespace {

/// Characters that would let stored text rewrite a terminal or reorder what a reader sees.
bool is_forbidden(char32_t c) {
  if (c < 0x20 || c == 0x7F || (c >= 0x80 && c <= 0x9F)) return true;  // C0, DEL, C1 controls
  if (c == 0x061C || c == 0x200E || c == 0x200F) return true;          // bidi marks
  if (c >= 0x202A && c <= 0x202E) return true;                         // bidi embeddings/overrides
  if (c >= 0x2066 && c <= 0x2069) return true;                         // bidi isolates
  if (c == 0x200B || c == 0x2060 || c == 0xFEFF) return true;          // invisible separators
  return c == 0x2028 || c == 0x2029;                                   // line/paragraph separators
}

std::string describe(char32_t c) {
  char buf[16];
  std::snprintf(buf, sizeof buf, "U+%04X", static_cast<unsigned>(c));
  return buf;
}

}  // namespace

bool is_white_space(char32_t c) {
  // Unicode White_Space property (PropList.txt), minus the line separators refused above.
  return c == 0x20 || (c >= 0x09 && c <= 0x0D) || c == 0x85 || c == 0xA0 || c == 0x1680 ||
         (c >= 0x2000 && c <= 0x200A) || c == 0x2028 || c == 0x2029 || c == 0x202F || c == 0x205F ||
         c == 0x3000;
}

std::string clean_text(std::string_view text, std::string_view what, std::size_t max_chars) {
  const std::string name(what);
  if (!is_valid_utf8(text)) {
    throw ValidationError(name + " is not valid UTF-8 text", "use plain text saved as UTF-8");
  }
  // Decode once; remember where the visible part starts and ends.
  std::vector<std::pair<std::size_t, char32_t>> points;  // (byte offset, code point)
  for (std::size_t pos = 0; pos < text.size();) {
    const std::size_t at = pos;
    points.emplace_back(at, *next_code_point(text, pos));
  }
  std::size_t first = 0, last = points.size();
  while (first < last && is_white_space(points[first].second)) ++first;
  while (last > first && is_white_space(points[last - 1].second)) --last;
  for (std::size_t i = first; i < last; ++i) {
    if (is_forbidden(points[i].second)) {
      throw ValidationError(name + " contains the control or formatting character " +
                                describe(points[i].second) + " (character " +
                                std::to_string(i - first + 1) + ")",
                            "use one line of visible text: no tabs, line breaks, terminal "
                            "escapes or direction overrides");
    }
  }
  if (first == last) {
    throw ValidationError(name + " is empty", "give some visible text");
  }
  if (last - first > max_chars) {
    throw ValidationError(name + " is " + std::to_string(last - first) + " characters long",
                          "at most " + std::to_string(max_chars) + " characters are allowed");
  }
  const std::size_t begin = points[first].first;
  const std::size_t end = last < points.size() ? points[last].first : text.size();
  return std::string(text.substr(begin, end - begin));
}

}  // namespace cw
