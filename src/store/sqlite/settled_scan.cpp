// SPDX-License-Identifier: Apache-2.0
#include "store/sqlite/settled_scan.h"

namespace cw::store::sqlite {

std::string describe_steps(const NetSteps& steps) {
  if (steps.empty()) return "none";
  std::string out;
  for (const auto& [key, delta] : steps) {
    const auto& [instrument, at, state] = key;
    if (!out.empty()) out += ", ";
    out += (delta > 0 ? "+" : "") + std::to_string(delta) + " " + std::string(to_string(state)) +
           " from " + format_utc(at) + " (instrument " + std::to_string(instrument.value) + ")";
  }
  return out;
}

}  // namespace cw::store::sqlite
