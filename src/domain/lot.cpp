// SPDX-License-Identifier: Apache-2.0
// Lot expiry arithmetic.
#include "domain/lot.h"

namespace cw {

std::optional<CalendarDate> Lot::in_use_expires_on() const {
  if (!opened_on || !in_use_days) return std::nullopt;
  return add_days(*opened_on, *in_use_days);
}

CalendarDate Lot::effective_expires_on() const {
  const auto in_use = in_use_expires_on();
  return in_use && *in_use < expires_on ? *in_use : expires_on;
}

const CertifiedValue* Lot::value_for(const std::string& analyte) const {
  for (const auto& v : values) {
    if (v.analyte == analyte) return &v;
  }
  return nullptr;
}

}  // namespace cw
