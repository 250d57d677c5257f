// SPDX-License-Identifier: Apache-2.0
// Fuzz target: the strict parsers of single values (times, dates, durations, numbers, free text,
// codes). The first byte picks the parser, the rest is the text.
#include <cstddef>
#include <cstdint>

#include "core/clean_text.h"
#include "core/number.h"
#include "core/text.h"
#include "core/time.h"
#include "fuzz_support.h"

extern "C" int LLVMFuzzerTestOneInput(const std::uint8_t* data, std::size_t size) {
  if (size == 0) return 0;
  const std::string text(reinterpret_cast<const char*>(data) + 1, size - 1);
  cw::fuzz::refusing_only_with_errors([&] {
    switch (data[0] % 7) {
      case 0:
        cw::parse_instant(text, "--at");
        break;
      case 1:
        cw::parse_date(text, "--expires");
        break;
      case 2:
        cw::parse_duration(text, "--within");
        break;
      case 3:
        cw::decimal_or_throw(text, "--response");
        break;
      case 4:
        cw::whole_or_throw(text, "--version", 1, 1000000);
        break;
      case 5:
        cw::clean_text(text, "--reason", cw::kMaxReasonChars);
        break;
      default:
        cw::check_code(text, "code");
        break;
    }
  });
  return 0;
}
