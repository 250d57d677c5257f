// SPDX-License-Identifier: Apache-2.0
// Internal to fitting/: plain-decimal number text for messages and finding details.
#pragma once

#include <algorithm>
#include <cmath>
#include <cstdio>
#include <string>

namespace cw::fitting::detail {

/// `value` rounded to `significant` digits, trailing zeros dropped, in plain decimal notation for
/// 1e-5 <= |value| < 1e15 (exponent notation outside that range).
inline std::string format_number(double value, int significant = 10) {
  if (std::isnan(value)) return "nan";
  if (std::isinf(value)) return value > 0 ? "inf" : "-inf";
  if (value == 0) return "0";
  char buffer[64];
  const double magnitude = std::abs(value);
  if (magnitude < 1e-5 || magnitude >= 1e15) {
    std::snprintf(buffer, sizeof buffer, "%.*g", significant, value);
    return buffer;
  }
  const int exponent = static_cast<int>(std::floor(std::log10(magnitude)));
  const int decimals = std::max(0, significant - 1 - exponent);
  std::snprintf(buffer, sizeof buffer, "%.*f", decimals, value);
  std::string text = buffer;
  if (text.find('.') != std::string::npos) {
    text.erase(text.find_last_not_of('0') + 1);
    if (text.back() == '.') text.pop_back();
  }
  if (text == "-0") text = "0";
  return text;
}

}  // namespace cw::fitting::detail
