// SPDX-License-Identifier: Apache-2.0
// Strict numbers for every input: the command line, points and run files, lot values. One
// grammar, correctly rounded, finite; a number a person could have typed into a form.
#pragma once

#include <cstdint>
#include <optional>
#include <string>
#include <string_view>

namespace cw {

/// Why a text is not a number.
enum class NumberProblem {
  Empty,       ///< nothing (or only spaces)
  NotDecimal,  ///< not a plain decimal: hex, inf, nan, a comma, a unit, two signs ...
  OutOfRange,  ///< a decimal whose magnitude does not fit a double (overflow or underflow)
};

/// Parses a plain decimal number: optional sign, digits with an optional '.', optional exponent
/// (`12`, `-0.5`, `1.2e3`, `.5`). Surrounding ASCII spaces are ignored. The value is correctly
/// rounded (std::from_chars). Hexadecimal, `inf`, `nan`, thousands separators and anything else
/// are refused, as is a value that overflows or underflows to zero from a non-zero decimal.
struct NumberParse {
  std::optional<double> value;
  NumberProblem problem = NumberProblem::Empty;
};
NumberParse parse_decimal(std::string_view text);

/// parse_decimal() or a ValidationError whose message starts with `what` and says what is wrong.
double decimal_or_throw(std::string_view text, std::string_view what);

/// A whole number written with digits only (optional sign), within [low, high]; otherwise a
/// ValidationError starting with `what` that names the range.
std::int64_t whole_or_throw(std::string_view text, std::string_view what, std::int64_t low,
                            std::int64_t high);

/// Checks that a value computed from inputs is finite; otherwise a ValidationError starting with
/// `what` (e.g. "the recovery from --response and --nominal") saying that it overflows, naming
/// `option` (when it is a command-line option) as the value to change.
double require_finite(double value, std::string_view what, const std::string& option = {});

}  // namespace cw
