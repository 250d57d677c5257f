// SPDX-License-Identifier: Apache-2.0
// UTF-8 validation and decoding (RFC 3629): the one definition of "valid text" for every layer.
#pragma once

#include <cstddef>
#include <optional>
#include <string_view>

namespace cw {

/// True when `s` is well-formed UTF-8: no overlong forms, no surrogates (U+D800–U+DFFF), nothing
/// above U+10FFFF, no truncated sequence.
bool is_valid_utf8(std::string_view s);

/// Decodes the code point starting at `pos` and advances `pos` past it; nullopt (and `pos`
/// unchanged) when the bytes there are not well-formed UTF-8.
std::optional<char32_t> next_code_point(std::string_view s, std::size_t& pos);

/// Number of code points in well-formed UTF-8 text.
std::size_t code_point_count(std::string_view s);

}  // namespace cw
