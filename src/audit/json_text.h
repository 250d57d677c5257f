// SPDX-License-Identifier: Apache-2.0
// Compact JSON text written piece by piece, byte for byte as nlohmann::json::dump() (no indent,
// ensure_ascii off) writes the same values: what the canonical forms of the audit chain (entry
// headers, fact rows) are made of, without building JSON objects on the hot paths.
#pragma once

#include <array>
#include <cstdint>
#include <string>
#include <string_view>

namespace cw::audit {

/// A string as dump() writes it: quotes, backslashes and control characters escaped. Text beyond
/// ASCII goes through nlohmann itself (which refuses invalid UTF-8 with its type_error 316, as
/// dump() does).
void append_json_string(std::string& out, std::string_view text);

/// An integer as dump() writes it.
void append_json_integer(std::string& out, std::int64_t value);

/// A double as dump() writes it: the shortest text that reads back the same, with ".0" on whole
/// numbers; null for NaN and infinities.
void append_json_real(std::string& out, double value);

/// append_json_real for many values, remembering the texts of values met recently: the same
/// bytes, without formatting a value again (`audit verify` writes many repeated values: the
/// levels of a calibration, y equal to the response, zeros, ranges).
class RealWriter {
 public:
  void append(std::string& out, double value);

 private:
  struct Slot {
    std::uint64_t bits = 0;
    std::uint8_t size = 0;  ///< 0: empty
    std::array<char, 31> text{};
  };
  std::array<Slot, 512> slots_{};
};

}  // namespace cw::audit
