// SPDX-License-Identifier: Apache-2.0
// Service history queries.
#include "domain/instrument.h"

#include "domain/enum_text.h"

namespace cw {
namespace {

constexpr std::pair<ServiceDirection, std::string_view> kDirections[] = {
    {ServiceDirection::Out, "out"}, {ServiceDirection::Back, "back"}};

}  // namespace

std::string_view to_string(ServiceDirection d) {
  return text_of(kDirections, d);
}
std::optional<ServiceDirection> parse_service_direction(std::string_view text) {
  return value_of(kDirections, text);
}

const ServiceEvent* Instrument::out_of_service_event_at(Instant t) const {
  const ServiceEvent* last = nullptr;
  for (const auto& e : service) {
    if (e.occurred_at > t) break;
    last = &e;
  }
  return last != nullptr && last->direction == ServiceDirection::Out ? last : nullptr;
}

const SavedColumns* Instrument::columns_at(Instant t) const {
  const SavedColumns* last = nullptr;
  for (const auto& c : columns) {
    if (c.occurred_at > t) break;
    last = &c;
  }
  return last != nullptr && !last->columns.empty() ? last : nullptr;
}

Instrument Instrument::known_at(Instant t) const {
  Instrument out = *this;
  std::erase_if(out.service, [t](const ServiceEvent& e) { return e.occurred_at > t; });
  std::erase_if(out.columns, [t](const SavedColumns& c) { return c.occurred_at > t; });
  return out;
}

bool Instrument::in_service_at(Instant t) const {
  return out_of_service_event_at(t) == nullptr;
}

}  // namespace cw
