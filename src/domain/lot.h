// SPDX-License-Identifier: Apache-2.0
// A reference-material lot with certified values, expiry and withdrawal.
#pragma once

#include <optional>
#include <string>
#include <vector>

#include "core/time.h"
#include "domain/ids.h"

namespace cw {

struct CertifiedValue {
  std::string analyte;
  double value = 0;
  std::optional<double> uncertainty;
};

struct LotWithdrawal {
  std::string reason;
  Instant occurred_at;
};

struct Lot {
  LotId id;
  std::string code;
  std::string material;
  CalendarDate expires_on;  ///< certificate expiry (usable through that day)
  std::optional<CalendarDate> opened_on;
  std::optional<int> in_use_days;  ///< usable for this many days after opening
  std::optional<std::string> certificate;
  /// Coverage factor k of the certified uncertainties (U = k·u); nullopt means k = 2, the usual
  /// certificate statement for about 95 % (Eurachem/CITAC QUAM 3rd ed. 2012).
  std::optional<double> coverage_factor;
  std::vector<CertifiedValue> values;
  Instant registered_at;
  std::optional<LotWithdrawal> withdrawal;

  /// The in-use expiry date: opened_on + in_use_days (usable through that day).
  std::optional<CalendarDate> in_use_expires_on() const;
  /// The earlier of the certificate expiry and the in-use expiry.
  CalendarDate effective_expires_on() const;
  /// The instant the lot stops being usable: the end of the lab-local day of the effective
  /// expiry date.
  Instant expiry_instant(const LabZone& zone) const {
    return zone.end_of_day(effective_expires_on());
  }
  bool is_expired_at(Instant t, const LabZone& zone) const { return t >= expiry_instant(zone); }
  bool is_withdrawn_at(Instant t) const { return withdrawal && withdrawal->occurred_at <= t; }
  /// The lot as it was known at `t`: without a withdrawal recorded as of a later moment.
  Lot known_at(Instant t) const {
    Lot out = *this;
    if (!is_withdrawn_at(t)) out.withdrawal.reset();
    return out;
  }
  const CertifiedValue* value_for(const std::string& analyte) const;
  double coverage() const { return coverage_factor.value_or(2.0); }
};

/// Parses a certified value as written on the command line: "ANALYTE=CONC", "ANALYTE=CONC±U" or
/// "ANALYTE=CONC+/-U" (CONC above 0, U not negative, both plain decimals). Throws ValidationError
/// starting with `what`.
CertifiedValue parse_certified_value(const std::string& text, const std::string& what);

}  // namespace cw
