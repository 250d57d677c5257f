// SPDX-License-Identifier: Apache-2.0
// UTF-8 decoding after RFC 3629 §4 (the table of well-formed byte sequences).
#include "core/utf8.h"

namespace cw {

std::optional<char32_t> next_code_point(std::string_view s, std::size_t& pos) {
  if (pos >= s.size()) return std::nullopt;
  const auto byte = [&](std::size_t i) { return static_cast<unsigned char>(s[i]); };
  const unsigned char b0 = byte(pos);
  if (b0 < 0x80) {
    ++pos;
    return static_cast<char32_t>(b0);
  }
  std::size_t extra = 0;
  char32_t cp = 0;
  // Second-byte bounds exclude overlong forms (E0 80–9F, F0 80–8F), surrogates (ED A0–BF) and
  // code points above U+10FFFF (F4 90–BF).
  unsigned char low = 0x80, high = 0xBF;
  if (b0 >= 0xC2 && b0 <= 0xDF) {
    extra = 1;
    cp = b0 & 0x1F;
  } else if (b0 >= 0xE0 && b0 <= 0xEF) {
    extra = 2;
    cp = b0 & 0x0F;
    if (b0 == 0xE0) low = 0xA0;
    if (b0 == 0xED) high = 0x9F;
  } else if (b0 >= 0xF0 && b0 <= 0xF4) {
    extra = 3;
    cp = b0 & 0x07;
    if (b0 == 0xF0) low = 0x90;
    if (b0 == 0xF4) high = 0x8F;
  } else {
    return std::nullopt;
  }
  if (s.size() - pos <= extra) return std::nullopt;  // truncated sequence
  for (std::size_t k = 1; k <= extra; ++k) {
    const unsigned char b = byte(pos + k);
    const unsigned char lo = k == 1 ? low : 0x80;
    const unsigned char hi = k == 1 ? high : 0xBF;
    if (b < lo || b > hi) return std::nullopt;
    cp = (cp << 6) | (b & 0x3F);
  }
  pos += extra + 1;
  return cp;
}

bool is_valid_utf8(std::string_view s) {
  std::size_t pos = 0;
  while (pos < s.size()) {
    if (!next_code_point(s, pos)) return false;
  }
  return true;
}

std::size_t code_point_count(std::string_view s) {
  std::size_t n = 0;
  for (unsigned char c : s) n += (c & 0xC0) != 0x80 ? 1 : 0;
  return n;
}

}  // namespace cw
