// SPDX-License-Identifier: Apache-2.0
// Opening a session.
#include "app/session.h"

#include "app/users.h"
#include "core/error.h"

namespace cw::app {

const char* tool_version() {
  return "curvewarden 0.1.0";
}

Session::Session(std::unique_ptr<store::Store> store, std::shared_ptr<const Clock> clock,
                 store::Actor actor, LabZone zone, Instant at, bool at_given,
                 std::string actor_source, PassphraseSource passphrase)
    : store_(std::move(store)),
      clock_(std::move(clock)),
      actor_(std::move(actor)),
      zone_(std::move(zone)),
      at_(at),
      at_given_(at_given),
      actor_source_(std::move(actor_source)),
      passphrase_(std::move(passphrase)) {
  actor_.clock = clock_.get();
}

Session Session::open(const SessionSpec& spec) {
  store::OpenOptions options;
  options.location = spec.location;
  options.create = spec.create;
  options.os_login = spec.os_login;
  auto store = store::Store::open(options);
  LabZone zone = LabZone::system_default();
  {
    auto unit = store->read();
    if (auto settings = unit->registry().settings()) {
      try {
        zone = LabZone::named(settings->time_zone);
      } catch (const ValidationError&) {
        throw StoreError("the lab's time zone '" + settings->time_zone + "' in store '" +
                             store->location() + "' is not known on this machine",
                         "install the time-zone data (Debian package tzdata), or restore the "
                         "store from a backup if the zone name is damaged");
      }
    }
  }
  store::Actor actor{spec.actor, nullptr, tool_version(), spec.os_login};
  const Instant at = spec.at.value_or(spec.clock->now());
  return Session(std::move(store), spec.clock, std::move(actor), std::move(zone), at,
                 spec.at.has_value(), spec.actor_source, spec.passphrase);
}

std::string Session::passphrase(const std::string& prompt, bool is_new) const {
  if (!passphrase_) {
    throw UsageError("this act is signed and needs a passphrase, and there is no way to ask for it",
                     "run it on a terminal, or give --passphrase-fd N");
  }
  return passphrase_(prompt, is_new);
}

std::unique_ptr<store::WriteUnit> Session::write() {
  auto unit = store_->write(actor_);
  acting_user(*this, *unit);
  return unit;
}

}  // namespace cw::app
