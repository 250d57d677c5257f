// SPDX-License-Identifier: Apache-2.0
// Service history queries.
#include "domain/instrument.h"

namespace cw {

std::string_view to_string(ServiceDirection d) {
  return d == ServiceDirection::Out ? "out" : "back";
}

const ServiceEvent* Instrument::out_of_service_event_at(Instant t) const {
  const ServiceEvent* last = nullptr;
  for (const auto& e : service) {
    if (e.occurred_at > t) break;
    last = &e;
  }
  return last != nullptr && last->direction == ServiceDirection::Out ? last : nullptr;
}

bool Instrument::in_service_at(Instant t) const {
  return out_of_service_event_at(t) == nullptr;
}

}  // namespace cw
