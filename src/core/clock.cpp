// SPDX-License-Identifier: Apache-2.0
// System and fixed clocks.
#include "core/clock.h"

#include <cstdlib>

namespace cw {

Instant SystemClock::now() const {
  return std::chrono::floor<std::chrono::seconds>(std::chrono::system_clock::now());
}

std::unique_ptr<Clock> clock_from_environment() {
  if (const char* fixed = std::getenv("CURVEWARDEN_NOW"); fixed != nullptr && *fixed != '\0') {
    return std::make_unique<FixedClock>(parse_instant(fixed, "CURVEWARDEN_NOW"));
  }
  return std::make_unique<SystemClock>();
}

}  // namespace cw
