// SPDX-License-Identifier: Apache-2.0
// Reading input files whole, with errors that name the file.
#pragma once

#include <string>
#include <string_view>

namespace cw::import {

/// The file's bytes. Throws ValidationError naming the file when it cannot be read, is not
/// UTF-8 text, or is larger than `max_bytes`.
std::string read_text_file(const std::string& path, std::size_t max_bytes = 256u << 20);

/// True when `s` is valid UTF-8.
bool is_valid_utf8(std::string_view s);

}  // namespace cw::import
