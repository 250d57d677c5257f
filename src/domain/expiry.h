// SPDX-License-Identifier: Apache-2.0
// The moment a curve stops being valid by the calendar (product.md §5.2): the earliest of
// acquisition + the method's valid_for and the end of the lab-local day on which a lot it used
// expires. One function, used by the rules, by `curve log` (which stores the moment) and by
// `expiring` (which says what limits it).
#pragma once

#include <optional>
#include <vector>

#include "core/time.h"
#include "domain/lot.h"
#include "domain/method.h"

namespace cw {

struct CurveExpiry {
  Instant valid_until;                ///< acquired + valid_for
  Instant at;                         ///< the earliest of valid_until and every lot's end
  const Lot* limiting_lot = nullptr;  ///< the lot whose expiry comes first, when it is earlier
};

/// The expiry of a curve acquired at `acquired_at` under `version` with `lots`.
CurveExpiry expiry_of(Instant acquired_at, const MethodVersion& version,
                      const std::vector<const Lot*>& lots, const LabZone& zone);

}  // namespace cw
