// SPDX-License-Identifier: Apache-2.0
// Text helpers.
#include "core/text.h"

#include <cctype>
#include <charconv>
#include <cmath>
#include <cstdio>
#include <cstdlib>

#include "core/clean_text.h"
#include "core/error.h"
#include "core/number.h"
#include "core/utf8.h"

namespace cw {

std::string trim(std::string_view s) {
  size_t b = 0, e = s.size();
  while (b < e && std::isspace(static_cast<unsigned char>(s[b]))) ++b;
  while (e > b && std::isspace(static_cast<unsigned char>(s[e - 1]))) --e;
  return std::string(s.substr(b, e - b));
}

std::string to_lower(std::string_view s) {
  std::string out(s);
  for (auto& c : out) c = static_cast<char>(std::tolower(static_cast<unsigned char>(c)));
  return out;
}

std::vector<std::string> split(std::string_view s, char sep) {
  std::vector<std::string> parts;
  size_t start = 0;
  while (true) {
    size_t at = s.find(sep, start);
    parts.emplace_back(
        s.substr(start, at == std::string_view::npos ? std::string_view::npos : at - start));
    if (at == std::string_view::npos) break;
    start = at + 1;
  }
  return parts;
}

std::optional<double> parse_number(std::string_view raw) {
  return parse_decimal(raw).value;
}

std::optional<long> parse_integer(std::string_view raw) {
  const std::string text = trim(raw);
  if (text.empty()) return std::nullopt;
  const char* begin = text.data();
  if (*begin == '+') ++begin;
  long value = 0;
  auto [ptr, ec] = std::from_chars(begin, text.data() + text.size(), value);
  if (ec != std::errc() || ptr != text.data() + text.size()) return std::nullopt;
  return value;
}

void check_code(std::string_view code, std::string_view what) {
  const std::string hint =
      "use 1 to 64 letters, digits and . _ - /, starting with a letter or digit";
  const auto ascii_ok = [](char c) {
    return std::isalnum(static_cast<unsigned char>(c)) || c == '.' || c == '_' || c == '-' ||
           c == '/';
  };
  if (code.empty()) throw ValidationError(std::string(what) + " is empty", hint);
  // Name the first character that is not allowed: printable ASCII in quotes, anything else by
  // its code point, so that the message itself stays plain text.
  for (std::size_t pos = 0; pos < code.size();) {
    const std::size_t at = pos;
    const auto cp = next_code_point(code, pos);
    if (!cp) {
      throw ValidationError(std::string(what) + " is not valid UTF-8 text", hint);
    }
    if (*cp < 0x80 && ascii_ok(static_cast<char>(*cp))) continue;
    char shown[16];
    if (*cp >= 0x20 && *cp < 0x7F) {
      std::snprintf(shown, sizeof shown, "'%c'", static_cast<char>(*cp));
    } else {
      std::snprintf(shown, sizeof shown, "U+%04X", static_cast<unsigned>(*cp));
    }
    const std::string printable =
        *cp >= 0x20 && *cp < 0x7F && is_valid_utf8(code) ? " " + quote(code) : "";
    throw ValidationError(std::string(what) + printable + " contains the character " + shown +
                              " (character " +
                              std::to_string(code_point_count(code.substr(0, at)) + 1) + ")",
                          hint);
  }
  if (code.size() > 64) {
    throw ValidationError(std::string(what) + " " + quote(code) + " is longer than 64 characters",
                          hint);
  }
  if (!std::isalnum(static_cast<unsigned char>(code.front()))) {
    throw ValidationError(
        std::string(what) + " " + quote(code) + " must start with a letter or digit", hint);
  }
}

void check_analyte_name(std::string_view name, std::string_view what) {
  const std::string hint =
      "use 1 to 100 visible characters without '=' and without leading or trailing spaces";
  const std::string clean = clean_text(name, what, kMaxLabelChars);
  if (clean.size() != name.size()) {
    throw ValidationError(std::string(what) + " " + quote(name) + " has leading or trailing spaces",
                          hint);
  }
  if (name.find('=') != std::string_view::npos) {
    throw ValidationError(
        std::string(what) + " " + quote(name) + " contains the forbidden character '='", hint);
  }
}

std::string format_sig(double value, int digits) {
  if (!std::isfinite(value)) return value != value ? "nan" : (value > 0 ? "inf" : "-inf");
  if (value == 0) return "0";
  const double magnitude = std::floor(std::log10(std::fabs(value)));
  char buf[64];
  if (magnitude >= -4 && magnitude < 9) {
    const int decimals = std::max(0, digits - 1 - static_cast<int>(magnitude));
    std::snprintf(buf, sizeof buf, "%.*f", decimals, value);
  } else {
    std::snprintf(buf, sizeof buf, "%.*e", digits - 1, value);
  }
  return buf;
}

std::string format_plain(double value, int digits) {
  if (!std::isfinite(value)) return format_sig(value, digits);
  if (value == 0) value = 0.0;  // a computed -0 prints as 0
  char buf[64];
  std::snprintf(buf, sizeof buf, "%.*g", digits, value);
  return buf;
}

std::string format_shortest(double value) {
  if (value == 0) value = 0.0;  // a computed -0 prints as 0
  char buf[64];
  const auto [end, ec] = std::to_chars(buf, buf + sizeof buf, value);
  if (ec != std::errc()) return format_plain(value, 17);
  return std::string(buf, end);
}

std::string format_fixed(double value, int decimals) {
  if (value == 0) value = 0.0;  // a computed -0 prints as 0
  char buf[64];
  std::snprintf(buf, sizeof buf, "%.*f", decimals, value);
  return buf;
}

namespace {

int side(double value, double reference) {
  return (value > reference) - (value < reference);
}

template <class Format>
std::string format_against(double value, std::initializer_list<double> references, int from, int to,
                           Format format) {
  if (!std::isfinite(value)) return format(value, from);
  for (int d = from; d <= to; ++d) {
    const std::string text = format(value, d);
    const double shown = std::strtod(text.c_str(), nullptr);
    bool same = true;
    for (double ref : references) same = same && side(shown, ref) == side(value, ref);
    if (same) return text;
  }
  return format_shortest(value);
}

}  // namespace

std::string format_fixed_against(double value, std::initializer_list<double> references,
                                 int min_decimals) {
  return format_against(value, references, min_decimals, 15,
                        [](double v, int d) { return format_fixed(v, d); });
}

std::string format_sig_against(double value, std::initializer_list<double> references,
                               int min_digits) {
  return format_against(value, references, min_digits, 17,
                        [](double v, int d) { return format_sig(v, d); });
}

std::string quote(std::string_view s) {
  return "'" + visible_breaks(s) + "'";
}

std::string visible_breaks(std::string_view s) {
  // Inside a value a tab or a line break would look like spacing or the end of the message:
  // written as the escapes readable_message() uses for other control characters.
  std::string out;
  for (const char c : s) {
    if (c == '\t') {
      out += "\\x09";
    } else if (c == '\n') {
      out += "\\x0A";
    } else if (c == '\r') {
      out += "\\x0D";
    } else {
      out += c;
    }
  }
  return out;
}

std::string readable_message(std::string_view s, std::size_t max_bytes) {
  static constexpr char kHex[] = "0123456789ABCDEF";
  std::string out;
  out.reserve(std::min(s.size(), max_bytes) + 32);
  std::size_t pos = 0;
  while (pos < s.size()) {
    if (out.size() >= max_bytes) {
      out += "... (" + std::to_string(s.size() - pos) + " more bytes)";
      break;
    }
    const std::size_t start = pos;
    const auto cp = next_code_point(s, pos);
    if (!cp) {
      const auto byte = static_cast<unsigned char>(s[pos++]);
      out += "\\x";
      out += kHex[byte >> 4];
      out += kHex[byte & 0xF];
    } else if ((*cp < 0x20 && *cp != '\n' && *cp != '\t') || *cp == 0x7F) {
      out += "\\x";
      out += kHex[(*cp >> 4) & 0xF];
      out += kHex[*cp & 0xF];
    } else if (*cp == 0xFEFF) {
      out += "\\u{FEFF}";
    } else {
      out.append(s.substr(start, pos - start));
    }
  }
  return out;
}

}  // namespace cw
