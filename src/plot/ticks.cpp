// SPDX-License-Identifier: Apache-2.0
// nice_ticks() and the text of tick labels and plot numbers.
#include "plot/ticks.h"

#include <algorithm>
#include <cmath>
#include <cstdio>
#include <string>
#include <utility>
#include <vector>

#include "core/error.h"

namespace cw::plot {
namespace {

constexpr const char* kMinus = "\u2212";

// "−" for a leading '-' (typographic minus); "-0" and "-0.00" become "0" and "0.00".
std::string typographic(std::string text) {
  if (text.empty() || text.front() != '-') return text;
  if (text.find_first_not_of("-0.") == std::string::npos) return text.substr(1);
  return kMinus + text.substr(1);
}

std::string superscript(int n) {
  static const char* const kDigits[] = {"\u2070", "\u00b9", "\u00b2", "\u00b3", "\u2074",
                                        "\u2075", "\u2076", "\u2077", "\u2078", "\u2079"};
  std::string digits = std::to_string(std::abs(n));
  std::string out = n < 0 ? "\u207b" : "";
  for (char c : digits) out += kDigits[c - '0'];
  return out;
}

std::string fixed(double value, int decimals) {
  char buffer[64];
  std::snprintf(buffer, sizeof buffer, "%.*f", std::max(0, decimals), value);
  return buffer;
}

// Fraction digits that write every multiple of `step` exactly (step is 1, 2, 2.5 or 5 × 10^k).
int decimals_for(double step) {
  for (int d = 0; d < 15; ++d) {
    const double scaled = step * std::pow(10.0, d);
    if (std::abs(scaled - std::round(scaled)) < 1e-6 * scaled) return d;
  }
  return 15;
}

}  // namespace

Ticks nice_ticks(double low, double high, int max_ticks) {
  if (!std::isfinite(low) || !std::isfinite(high)) {
    throw ValidationError("cannot place axis ticks on a range that is not finite");
  }
  if (low > high) std::swap(low, high);
  max_ticks = std::max(2, max_ticks);
  if (high - low <= 1e-12 * std::max(1.0, std::abs(high))) {
    // A single value: a small interval around it, so that the axis still has round numbers.
    const double half = low == 0 ? 1.0 : std::abs(low) * 0.1;
    low -= half;
    high += half;
  }
  // Start one decade below the spacing that would fit max_ticks exactly and take the first
  // step that leaves no more than max_ticks ticks inside [low, high].
  const double span = high - low;
  int exponent = static_cast<int>(std::floor(std::log10(span / max_ticks))) - 1;
  static constexpr double kMantissas[] = {1, 2, 2.5, 5};
  const auto ticks_at = [&](double step) {
    Ticks ticks;
    ticks.step = step;
    ticks.decimals = decimals_for(step);
    // A small tolerance keeps ends that are themselves round (0, 100) as ticks despite
    // rounding in low/step.
    const double first = std::ceil(low / step - 1e-9);
    const double last = std::floor(high / step + 1e-9);
    for (double i = first; i <= last; i += 1) ticks.values.push_back(i == 0 ? 0.0 : i * step);
    return ticks;
  };
  Ticks finer;
  for (;; ++exponent) {
    for (double mantissa : kMantissas) {
      Ticks ticks = ticks_at(mantissa * std::pow(10.0, exponent));
      if (static_cast<int>(ticks.values.size()) > max_ticks) {
        finer = std::move(ticks);
        continue;
      }
      // Fewer than two ticks can only happen for a budget under 4; the finer step is better.
      if (ticks.values.size() < 2 && finer.values.size() >= 2) return finer;
      return ticks;
    }
  }
}

TickLabels tick_labels(const Ticks& ticks) {
  TickLabels out;
  double largest = 0;
  for (double v : ticks.values) largest = std::max(largest, std::abs(v));
  if (largest >= 1e5 || (largest > 0 && largest < 1e-3)) {
    out.exponent = 3 * static_cast<int>(std::floor(std::log10(largest) / 3));
  }
  const double scale = std::pow(10.0, -out.exponent);
  const int decimals = decimals_for(ticks.step * scale);
  for (double v : ticks.values) out.labels.push_back(typographic(fixed(v * scale, decimals)));
  return out;
}

std::string axis_title(const std::string& name, const std::string& unit, int exponent) {
  std::string scale = exponent == 0 ? "" : "\u00d710" + superscript(exponent);
  std::string inside = scale;
  if (!unit.empty()) inside += (inside.empty() ? "" : " ") + unit;
  if (inside.empty()) return name;
  return name + " (" + inside + ")";
}

std::string format_significant(double value, int digits) {
  if (std::isnan(value)) return "n/a";
  if (std::isinf(value)) return value > 0 ? "\u221e" : std::string(kMinus) + "\u221e";
  if (value == 0) return "0";
  digits = std::max(1, digits);
  const double magnitude = std::abs(value);
  int exponent = static_cast<int>(std::floor(std::log10(magnitude)));
  // Rounding may carry into the next decade (9.9996 → 10.00).
  const double rounded = std::stod(fixed(magnitude / std::pow(10.0, exponent), digits - 1));
  if (rounded >= 10) ++exponent;
  const auto trim = [](std::string text) {
    if (text.find('.') != std::string::npos) {
      text.erase(text.find_last_not_of('0') + 1);
      if (text.back() == '.') text.pop_back();
    }
    return text;
  };
  if (exponent < -4 || exponent >= 7) {
    const double mantissa = value / std::pow(10.0, exponent);
    return typographic(trim(fixed(mantissa, digits - 1))) + "\u00d710" + superscript(exponent);
  }
  return typographic(trim(fixed(value, std::max(0, digits - 1 - exponent))));
}

}  // namespace cw::plot
