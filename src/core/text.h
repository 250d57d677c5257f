// SPDX-License-Identifier: Apache-2.0
// Small text helpers shared by every layer: trimming, strict number parsing, code validation
// and number formatting with significant figures.
#pragma once

#include <initializer_list>
#include <optional>
#include <string>
#include <string_view>
#include <vector>

namespace cw {

std::string trim(std::string_view s);
std::string to_lower(std::string_view s);
std::vector<std::string> split(std::string_view s, char sep);

/// parse_decimal(text).value (core/number.h): a plain, finite decimal or nullopt.
std::optional<double> parse_number(std::string_view text);
/// Strict integer (optional sign, digits only), within long's range.
std::optional<long> parse_integer(std::string_view text);

/// Codes of instruments, methods and lots: 1–64 characters, letters, digits and . _ - /,
/// starting with a letter or digit. Throws ValidationError naming `what` otherwise.
void check_code(std::string_view code, std::string_view what);
/// Analyte names: clean_text() with at most 100 characters, no '=', and no leading or trailing
/// space (names must match the method file exactly). Throws ValidationError naming `what`.
void check_analyte_name(std::string_view name, std::string_view what);

/// `value` with `digits` significant figures, without an exponent for everyday magnitudes.
std::string format_sig(double value, int digits = 6);
/// `value` as a person would write it: up to `digits` significant figures, trailing zeros
/// dropped ("0.995", "15", "1000", "2.5e-07").
std::string format_plain(double value, int digits = 10);
/// `value` in its shortest form that reads back to the same double (std::to_chars), e.g. "6.9",
/// "1e-09", "1000": how echoed inputs are printed.
std::string format_shortest(double value);
/// `value` with a fixed number of decimals.
std::string format_fixed(double value, int decimals);
/// `value` with at least `min_decimals` decimals and as many more as it takes for the printed
/// figure to stand on the same side of every reference (a limit, 1 for r²) as the value itself:
/// r² 0.999999619 against a limit of 0.9999999 prints "0.9999996", never "1.000000"; a %RE of
/// 15.03 against 15 prints "15.03". At most 15 decimals.
std::string format_fixed_against(double value, std::initializer_list<double> references,
                                 int min_decimals);
/// The same with significant figures (at least `min_digits`): "about 50.04 mg/L, above 50".
std::string format_sig_against(double value, std::initializer_list<double> references,
                               int min_digits);
/// Wraps `s` in single quotes (user values in messages), through visible_breaks().
std::string quote(std::string_view s);
/// `s` with each tab or line break written as \x09, \x0A or \x0D (a user value in a message).
std::string visible_breaks(std::string_view s);

/// `s` as a message can show it: control characters other than line breaks and tabs, bytes that
/// are not UTF-8 and U+FEFF written as \xNN or \u{FEFF}, and text beyond `max_bytes` cut at a
/// character boundary with "... (N more bytes)". Errors are made of user input echoed back: a
/// NUL would end the message, a 200 000-character header would fill the terminal.
std::string readable_message(std::string_view s, std::size_t max_bytes = 2000);

}  // namespace cw
