// SPDX-License-Identifier: Apache-2.0
// An instrument (one physical analyser) and its service history.
#pragma once

#include <optional>
#include <string>
#include <vector>

#include "core/time.h"
#include "domain/ids.h"
#include "domain/run.h"

namespace cw {

enum class ServiceDirection { Out, Back };
std::string_view to_string(ServiceDirection d);  // "out" | "back"
std::optional<ServiceDirection> parse_service_direction(std::string_view text);

struct ServiceEvent {
  ServiceDirection direction = ServiceDirection::Out;
  std::string reason;
  Instant occurred_at;
};

/// The headers an instrument's exports use, saved so that its files are read without
/// --columns (an empty mapping clears the saved one).
struct SavedColumns {
  ColumnMapping columns;
  std::optional<std::string> reason;
  std::string saved_by;
  Instant occurred_at;
};

struct Instrument {
  InstrumentId id;
  std::string code;
  std::optional<std::string> name;
  Instant registered_at;
  std::vector<ServiceEvent> service;  ///< in time order
  std::vector<SavedColumns> columns;  ///< saved column mappings, in time order

  /// In service at `t`: no 'out' event at or before `t` that is not followed by a 'back'.
  bool in_service_at(Instant t) const;
  /// The last 'out' event at or before `t` while still out at `t`, if any.
  const ServiceEvent* out_of_service_event_at(Instant t) const;
  /// The column mapping in force at `t` (the latest saved at or before `t`), nullptr when none
  /// was saved or the latest one is empty.
  const SavedColumns* columns_at(Instant t) const;
  /// The instrument as it was known at `t`: its service events and saved mappings up to `t`
  /// (what `instrument show --at` lists).
  Instrument known_at(Instant t) const;
};

}  // namespace cw
