// SPDX-License-Identifier: Apache-2.0
// File reading and UTF-8 validation.
#include "import/text_file.h"

#include <filesystem>
#include <fstream>
#include <sstream>

#include "core/error.h"

namespace cw::import {

bool is_valid_utf8(std::string_view s) {
  size_t i = 0;
  while (i < s.size()) {
    const auto c = static_cast<unsigned char>(s[i]);
    size_t extra = 0;
    if (c < 0x80) {
      ++i;
      continue;
    } else if ((c & 0xE0) == 0xC0 && c >= 0xC2) {
      extra = 1;
    } else if ((c & 0xF0) == 0xE0) {
      extra = 2;
    } else if ((c & 0xF8) == 0xF0 && c <= 0xF4) {
      extra = 3;
    } else {
      return false;
    }
    for (size_t k = 1; k <= extra; ++k) {
      if (i + k >= s.size()) return false;
      if ((static_cast<unsigned char>(s[i + k]) & 0xC0) != 0x80) return false;
    }
    i += extra + 1;
  }
  return true;
}

std::string read_text_file(const std::string& path, std::size_t max_bytes) {
  SourceLocation where{path, std::nullopt, std::nullopt, {}};
  std::error_code ec;
  if (!std::filesystem::exists(path, ec)) {
    throw ValidationError(where, "cannot read '" + path + "': no such file",
                          "check the path (relative paths start from the current directory)");
  }
  if (std::filesystem::is_directory(path, ec)) {
    throw ValidationError(where, "cannot read '" + path + "': it is a directory");
  }
  std::ifstream in(path, std::ios::binary);
  if (!in)
    throw ValidationError(where, "cannot read '" + path + "': permission denied or unreadable");
  std::ostringstream buffer;
  buffer << in.rdbuf();
  std::string text = buffer.str();
  if (text.size() > max_bytes) {
    throw ValidationError(
        where, "'" + path + "' is larger than " + std::to_string(max_bytes >> 20) + " MiB");
  }
  if (!is_valid_utf8(text)) {
    throw ValidationError(where, "'" + path + "' is not UTF-8 text",
                          "save the file as UTF-8 (plain CSV or TOML text)");
  }
  return text;
}

}  // namespace cw::import
