// SPDX-License-Identifier: Apache-2.0
// The expiry moment of a curve.
#include "domain/expiry.h"

namespace cw {

CurveExpiry expiry_of(Instant acquired_at, const MethodVersion& version,
                      const std::vector<const Lot*>& lots, const LabZone& zone) {
  CurveExpiry out;
  // Stored acquisitions and durations are bounded (years 1-9999, at most 100 years), so the
  // unchecked sum cannot leave the calendar of the date library.
  out.valid_until =
      add_duration_unchecked(acquired_at, version.definition.calibration.valid_for, zone);
  out.at = out.valid_until;
  for (const Lot* lot : lots) {
    const Instant end = lot->expiry_instant(zone);
    if (end < out.at) {
      out.at = end;
      out.limiting_lot = lot;
    }
  }
  return out;
}

}  // namespace cw
