// SPDX-License-Identifier: Apache-2.0
// Fuzz target: points files (CSV) read against a method.
#include <cstddef>
#include <cstdint>

#include "fuzz_support.h"
#include "import/points_file.h"

extern "C" int LLVMFuzzerTestOneInput(const std::uint8_t* data, std::size_t size) {
  const std::string text(reinterpret_cast<const char*>(data), size);
  const auto& method = cw::fuzz::method();
  cw::fuzz::refusing_only_with_errors(
      [&] { cw::import::parse_points_text("points.csv", text, method); });
  return 0;
}
