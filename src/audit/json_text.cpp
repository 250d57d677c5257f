// SPDX-License-Identifier: Apache-2.0
// Compact JSON text, as nlohmann's dump() writes it.
#include "audit/json_text.h"

#include <array>
#include <bit>
#include <charconv>
#include <cmath>
#include <cstdint>
#include <cstring>
#include <nlohmann/json.hpp>

namespace cw::audit {

namespace {

/// What each byte becomes inside a JSON string: 0 itself, else the character after the
/// backslash ('u' for \u00XX).
constexpr std::array<char, 256> kEscapes = [] {
  std::array<char, 256> escapes{};
  for (int c = 0; c < 0x20; ++c) escapes[static_cast<std::size_t>(c)] = 'u';
  escapes['"'] = '"';
  escapes['\\'] = '\\';
  escapes['\b'] = 'b';
  escapes['\f'] = 'f';
  escapes['\n'] = 'n';
  escapes['\r'] = 'r';
  escapes['\t'] = 't';
  return escapes;
}();

}  // namespace

namespace {

constexpr std::uint64_t kOnes = 0x0101010101010101;
constexpr std::uint64_t kHighBits = 0x8080808080808080;

/// The high bit of each byte of `word` (eight ASCII bytes, the first lowest) that must be
/// escaped: below 0x20, a quote or a backslash. A borrow may set it on bytes after such a byte
/// too: the lowest bit set is exact, and there are never fewer bits set than such bytes.
constexpr std::uint64_t escape_mask(std::uint64_t word) {
  const auto zero_bytes = [](std::uint64_t v) { return (v - kOnes) & ~v & kHighBits; };
  return ((word - 0x20 * kOnes) & ~word & kHighBits) | zero_bytes(word ^ ('"' * kOnes)) |
         zero_bytes(word ^ ('\\' * kOnes));
}

/// How many high bits `mask` (of escape_mask) has: their sum, byte by byte, gathered in the top
/// byte by one multiplication (popcount is a library call on the baseline x86-64).
std::size_t count_bytes(std::uint64_t mask) {
  return static_cast<std::size_t>(((mask >> 7) * kOnes) >> 56);
}

std::uint64_t load(const char* p) {
  std::uint64_t word = 0;
  std::memcpy(&word, p, sizeof word);
  return word;
}

/// Writes byte `c` escaped at `p`; returns the end of what was written.
char* write_escape(char* p, unsigned char c) {
  static constexpr char kHex[] = "0123456789abcdef";
  *p++ = '\\';
  switch (c) {
    case '"':
      *p++ = '"';
      break;
    case '\\':
      *p++ = '\\';
      break;
    case '\b':
      *p++ = 'b';
      break;
    case '\f':
      *p++ = 'f';
      break;
    case '\n':
      *p++ = 'n';
      break;
    case '\r':
      *p++ = 'r';
      break;
    case '\t':
      *p++ = 't';
      break;
    default:
      *p++ = 'u';
      *p++ = '0';
      *p++ = '0';
      *p++ = kHex[c >> 4];
      *p++ = kHex[c & 0xF];
  }
  return p;
}

bool needs_escape(unsigned char c) {
  return c < 0x20 || c == '"' || c == '\\';
}

}  // namespace

void append_json_string(std::string& out, std::string_view text) {
  const char* const data = text.data();
  const std::size_t size = text.size();
  // First, eight bytes at a time: whether any byte is beyond ASCII, and at most how many need
  // an escape.
  std::uint64_t all = 0;
  std::size_t escapes = 0;
  std::size_t i = 0;
  for (; i + 8 <= size; i += 8) {
    const std::uint64_t word = load(data + i);
    all |= word;
    escapes += count_bytes(escape_mask(word));
  }
  for (; i < size; ++i) {
    const auto c = static_cast<unsigned char>(data[i]);
    all |= c;
    escapes += needs_escape(c) ? 1 : 0;
  }
  if ((all & kHighBits) != 0) {
    out += nlohmann::json(std::string(text)).dump();
    return;
  }
  const std::size_t start = out.size();
  if (escapes == 0) {
    out += '"';
    out.append(text);
    out += '"';
    return;
  }
  // Room for the longest escape (\u00XX) of each, trimmed after; runs without escapes are
  // copied whole.
  out.resize(start + size + 2 + 5 * escapes);
  char* p = out.data() + start;
  *p++ = '"';
  std::size_t run = 0;  // start of the bytes not yet copied
  i = 0;
  const auto escape_at = [&](std::size_t at) {
    std::memcpy(p, data + run, at - run);
    p = write_escape(p + (at - run), static_cast<unsigned char>(data[at]));
    run = at + 1;
  };
  while (i + 8 <= size) {
    const std::uint64_t mask = escape_mask(load(data + i));
    if (mask == 0) {
      i += 8;
      continue;
    }
    const std::size_t at = i + static_cast<std::size_t>(std::countr_zero(mask)) / 8;
    escape_at(at);
    i = at + 1;
  }
  for (; i < size; ++i) {
    if (needs_escape(static_cast<unsigned char>(data[i]))) escape_at(i);
  }
  std::memcpy(p, data + run, size - run);
  p += size - run;
  *p++ = '"';
  out.resize(static_cast<std::size_t>(p - out.data()));
}

void append_json_integer(std::string& out, std::int64_t value) {
  std::array<char, 24> buffer{};
  const auto result = std::to_chars(buffer.data(), buffer.data() + buffer.size(), value);
  out.append(buffer.data(), static_cast<std::size_t>(result.ptr - buffer.data()));
}

void append_json_real(std::string& out, double value) {
  if (!std::isfinite(value)) {
    out += "null";
    return;
  }
  std::array<char, 64> buffer{};
  const char* end = nlohmann::detail::to_chars(buffer.data(), buffer.data() + buffer.size(), value);
  out.append(buffer.data(), static_cast<std::size_t>(end - buffer.data()));
}

void RealWriter::append(std::string& out, double value) {
  const auto bits = std::bit_cast<std::uint64_t>(value);
  Slot& slot = slots_[static_cast<std::size_t>((bits * 0x9E3779B97F4A7C15) >> 55)];
  if (slot.size != 0 && slot.bits == bits) {
    out.append(slot.text.data(), slot.size);
    return;
  }
  const std::size_t start = out.size();
  append_json_real(out, value);
  const std::size_t size = out.size() - start;
  if (size <= slot.text.size()) {
    std::memcpy(slot.text.data(), out.data() + start, size);
    slot.bits = bits;
    slot.size = static_cast<std::uint8_t>(size);
  }
}

}  // namespace cw::audit
