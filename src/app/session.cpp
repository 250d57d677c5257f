// SPDX-License-Identifier: Apache-2.0
// Opening a session.
#include "app/session.h"

#include "core/error.h"

namespace cw::app {

const char* tool_version() {
  return "curvewarden 0.1.0";
}

Session::Session(std::unique_ptr<store::Store> store, std::shared_ptr<const Clock> clock,
                 store::Actor actor, LabZone zone, Instant at, bool at_given)
    : store_(std::move(store)),
      clock_(std::move(clock)),
      actor_(std::move(actor)),
      zone_(std::move(zone)),
      at_(at),
      at_given_(at_given) {
  actor_.clock = clock_.get();
}

Session Session::open(const SessionSpec& spec) {
  store::OpenOptions options;
  options.location = spec.location;
  options.create = spec.create;
  auto store = store::Store::open(options);
  LabZone zone = LabZone::system_default();
  {
    auto unit = store->read();
    if (auto settings = unit->registry().settings()) {
      try {
        zone = LabZone::named(settings->time_zone);
      } catch (const ValidationError&) {
        throw StoreError("the lab's time zone '" + settings->time_zone + "' in store '" +
                             spec.location + "' is not known on this machine",
                         "install the time-zone data (Debian package tzdata), or restore the "
                         "store from a backup if the zone name is damaged");
      }
    }
  }
  store::Actor actor{spec.actor, nullptr, tool_version()};
  const Instant at = spec.at.value_or(spec.clock->now());
  return Session(std::move(store), spec.clock, std::move(actor), std::move(zone), at,
                 spec.at.has_value());
}

}  // namespace cw::app
