// SPDX-License-Identifier: Apache-2.0
// The strict number grammar.
#include "core/number.h"

#include <cctype>
#include <charconv>
#include <cmath>

#include "core/error.h"

namespace cw {
namespace {

std::string_view strip_spaces(std::string_view s) {
  while (!s.empty() && (s.front() == ' ' || s.front() == '\t')) s.remove_prefix(1);
  while (!s.empty() && (s.back() == ' ' || s.back() == '\t')) s.remove_suffix(1);
  return s;
}

bool is_digit(char c) {
  return c >= '0' && c <= '9';
}

/// True when `s` matches [+-]? (digits [. digits?] | . digits) ([eE] [+-]? digits)?;
/// `mantissa_zero` tells whether every mantissa digit is 0.
bool is_plain_decimal(std::string_view s, bool& mantissa_zero) {
  std::size_t i = 0;
  if (i < s.size() && (s[i] == '+' || s[i] == '-')) ++i;
  std::size_t digits = 0;
  mantissa_zero = true;
  while (i < s.size() && is_digit(s[i])) {
    mantissa_zero = mantissa_zero && s[i] == '0';
    ++i;
    ++digits;
  }
  if (i < s.size() && s[i] == '.') {
    ++i;
    while (i < s.size() && is_digit(s[i])) {
      mantissa_zero = mantissa_zero && s[i] == '0';
      ++i;
      ++digits;
    }
  }
  if (digits == 0) return false;
  if (i < s.size() && (s[i] == 'e' || s[i] == 'E')) {
    ++i;
    if (i < s.size() && (s[i] == '+' || s[i] == '-')) ++i;
    std::size_t exponent_digits = 0;
    while (i < s.size() && is_digit(s[i])) {
      ++i;
      ++exponent_digits;
    }
    if (exponent_digits == 0) return false;
  }
  return i == s.size();
}

}  // namespace

NumberParse parse_decimal(std::string_view raw) {
  const std::string_view text = strip_spaces(raw);
  if (text.empty()) return {std::nullopt, NumberProblem::Empty};
  bool mantissa_zero = true;
  if (!is_plain_decimal(text, mantissa_zero)) return {std::nullopt, NumberProblem::NotDecimal};
  const char* begin = text.data();
  if (*begin == '+') ++begin;  // from_chars takes no '+'
  double value = 0;
  const auto [ptr, ec] = std::from_chars(begin, text.data() + text.size(), value);
  if (ec == std::errc::result_out_of_range) return {std::nullopt, NumberProblem::OutOfRange};
  if (ec != std::errc() || ptr != text.data() + text.size()) {
    return {std::nullopt, NumberProblem::NotDecimal};
  }
  // A non-zero decimal that rounded to zero, or to a subnormal, has lost its digits.
  if (!std::isfinite(value) || (!mantissa_zero && std::fpclassify(value) != FP_NORMAL)) {
    return {std::nullopt, NumberProblem::OutOfRange};
  }
  // "-0" and "-0.0e5" are zero: no negative zero goes on to be stored or echoed as "-0".
  if (value == 0) value = 0.0;
  return {value, NumberProblem::Empty};
}

double decimal_or_throw(std::string_view text, std::string_view what) {
  const NumberParse parsed = parse_decimal(text);
  if (parsed.value) return *parsed.value;
  const std::string name(what);
  switch (parsed.problem) {
    case NumberProblem::Empty:
      throw ValidationError(name + " is empty", "give a number, e.g. 12.5");
    case NumberProblem::OutOfRange:
      throw ValidationError(name + " '" + std::string(strip_spaces(text)) + "' is out of range",
                            "give a number between about 1e-300 and 1e300 in magnitude");
    case NumberProblem::NotDecimal:
      break;
  }
  throw ValidationError(
      name + " '" + std::string(strip_spaces(text)) + "' is not a plain decimal number",
      "write digits with a decimal point and an optional exponent, e.g. 12.5, "
      "-0.03 or 1.2e3 (no units, commas, hex, inf or nan)");
}

std::int64_t whole_or_throw(std::string_view raw, std::string_view what, std::int64_t low,
                            std::int64_t high) {
  const std::string_view text = strip_spaces(raw);
  const std::string name(what);
  const std::string range =
      "a whole number from " + std::to_string(low) + " to " + std::to_string(high);
  if (text.empty()) throw ValidationError(name + " is empty", "give " + range);
  const char* begin = text.data();
  if (*begin == '+') ++begin;
  bool digits_only = begin < text.data() + text.size();
  for (const char* p = (*begin == '-' ? begin + 1 : begin); p < text.data() + text.size(); ++p) {
    digits_only = digits_only && is_digit(*p);
  }
  std::int64_t value = 0;
  const auto [ptr, ec] = std::from_chars(begin, text.data() + text.size(), value);
  if (!digits_only || ec == std::errc::invalid_argument || ptr != text.data() + text.size()) {
    throw ValidationError(name + " '" + std::string(text) + "' is not a whole number",
                          "give " + range);
  }
  if (ec == std::errc::result_out_of_range || value < low || value > high) {
    throw ValidationError(name + " '" + std::string(text) + "' is out of range", "give " + range);
  }
  return value;
}

double require_finite(double value, std::string_view what, const std::string& option) {
  if (std::isfinite(value)) return value;
  throw option_error(option, std::string(what) + " is not a finite number (it overflows)",
                     "check the values given: one is too large or too close to zero");
}

}  // namespace cw
