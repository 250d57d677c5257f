// SPDX-License-Identifier: Apache-2.0
// Reading a method file (TOML, product.md §6) into a MethodDefinition. Every key is checked;
// errors name the file, the line and the key.
#pragma once

#include <string>

#include "domain/method.h"

namespace cw::import {

struct MethodFile {
  MethodDefinition definition;
  std::string file_name;  ///< as given by the user
  std::string text;       ///< the file, byte for byte
  std::string sha256;     ///< of `text`
};

/// Reads and validates `path`. Throws ValidationError with the location on any problem.
MethodFile read_method_file(const std::string& path);
/// Validates `text` as if read from `file_name`.
MethodFile parse_method_text(const std::string& file_name, const std::string& text);

}  // namespace cw::import
