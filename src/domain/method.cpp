// SPDX-License-Identifier: Apache-2.0
// Method version lookups and the translation of method rules into fitting criteria.
#include "domain/method.h"

#include <algorithm>

namespace cw {

fitting::AcceptanceCriteria CalibrationRules::acceptance_criteria() const {
  fitting::AcceptanceCriteria c;
  c.min_levels = min_levels;
  c.min_r2 = min_r2;
  c.max_error_pct = max_error_pct;
  c.max_error_pct_lowest = max_error_pct_lowest;
  c.min_levels_within = min_levels_within;
  c.max_rf_rsd_pct = max_rf_rsd_pct;
  return c;
}

bool MethodDefinition::has_analyte(const std::string& name) const {
  return std::find(analytes.begin(), analytes.end(), name) != analytes.end();
}

const MethodVersion* Method::version_at(Instant t) const {
  const MethodVersion* found = nullptr;
  for (const auto& v : versions) {
    if (v.effective_at <= t && (found == nullptr || v.version > found->version)) found = &v;
  }
  return found;
}

const MethodVersion* Method::version_number(int n) const {
  for (const auto& v : versions) {
    if (v.version == n) return &v;
  }
  return nullptr;
}

}  // namespace cw
