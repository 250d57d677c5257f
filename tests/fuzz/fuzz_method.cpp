// SPDX-License-Identifier: Apache-2.0
// Fuzz target: method files (TOML).
#include <cstddef>
#include <cstdint>

#include "fuzz_support.h"

extern "C" int LLVMFuzzerTestOneInput(const std::uint8_t* data, std::size_t size) {
  const std::string text(reinterpret_cast<const char*>(data), size);
  cw::fuzz::refusing_only_with_errors([&] { cw::import::parse_method_text("method.toml", text); });
  return 0;
}
