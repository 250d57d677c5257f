// SPDX-License-Identifier: Apache-2.0
// Free text given by people (names, reasons, notes, sample ids), checked once at the boundary
// whether it comes from an option or from a file, so that what is stored and replayed is plain,
// visible, single-line text.
#pragma once

#include <cstddef>
#include <string>
#include <string_view>

namespace cw {

/// Length caps in characters (code points), documented in the README.
inline constexpr std::size_t kMaxNameChars = 200;     ///< names, titles, materials, sample ids
inline constexpr std::size_t kMaxReasonChars = 2000;  ///< reasons and notes, from options or files
inline constexpr std::size_t kMaxLabelChars = 100;    ///< analyte names, level labels, units

/// `text` with white space (ASCII and Unicode, e.g. the no-break space) trimmed from both ends,
/// after checking that it is well-formed UTF-8 without control characters (C0, DEL, C1 — a tab
/// or line break included), bidirectional formatting characters (U+061C, U+200E, U+200F,
/// U+202A–U+202E, U+2066–U+2069) or invisible separators (U+200B, U+2060, U+FEFF), that something
/// visible remains, and that it has at most `max_chars` characters. Throws ValidationError whose
/// message starts with `what` (an option such as "--reason" or a field name).
std::string clean_text(std::string_view text, std::string_view what, std::size_t max_chars);

/// True for the code points clean_text() trims (Unicode White_Space).
bool is_white_space(char32_t c);

}  // namespace cw
