// SPDX-License-Identifier: Apache-2.0
// How figures with a verdict are printed: never in a way that contradicts the verdict.
#pragma once

#include <optional>
#include <string>

#include "core/text.h"
#include "fitting/fit.h"

namespace cw::report {

/// r² with enough decimals (at least 6) to tell it from 1 and from its minimum.
inline std::string r2_text(const fitting::FitResult& f, std::optional<double> min_r2) {
  return min_r2 ? format_fixed_against(f.r2, {1.0, *min_r2}, 6)
                : format_fixed_against(f.r2, {1.0}, 6);
}

}  // namespace cw::report
