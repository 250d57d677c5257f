// SPDX-License-Identifier: Apache-2.0
// Shared by the fuzz targets: the method every points and run file is read against (the demo's),
// and the rule that a parser may refuse input only with cw::Error (any other exception, a crash
// or a sanitizer report is a finding).
#pragma once

#include <string>

#include "core/error.h"
#include "import/method_file.h"

namespace cw::fuzz {

inline const MethodDefinition& method() {
  static const MethodDefinition m = import::parse_method_text("method.toml", R"(code = "ANION-IC"
title = "Nitrate and sulfate in drinking water by ion chromatography"
unit = "mg/L"
analytes = ["nitrate", "sulfate"]

[calibration]
model = "linear"
weighting = "1/x"
min_levels = 5
min_r2 = 0.995
valid_for = "7 days"
review_required = true

[check]
tolerance_pct = 10.0
samples_per_check = 10
check_every = "12 hours"
)")
                                        .definition;
  return m;
}

template <class Fn>
void refusing_only_with_errors(Fn&& fn) {
  try {
    fn();
  } catch (const Error&) {
    // Bad input, reported with its location: what the parser is for.
  }
}

}  // namespace cw::fuzz
