// SPDX-License-Identifier: Apache-2.0
// What every use case needs, as plain values resolved by the front end (cli/ today): the open
// store, who acts, what "now" is, the moment the command is about, and the lab's time zone.
// Nothing here reads argv or the environment.
#pragma once

#include <memory>
#include <optional>
#include <string>

#include "core/clock.h"
#include "core/time.h"
#include "store/store.h"

namespace cw::app {

struct SessionSpec {
  std::string location;       ///< the store: a file path
  std::string actor;          ///< the person acting (already checked)
  std::optional<Instant> at;  ///< the moment the command is about; nullopt: now
  std::shared_ptr<const Clock> clock;
  bool create = false;  ///< create the store when missing (init only)
};

class Session {
 public:
  /// Opens the store and reads the lab's zone (the system zone before `init`).
  static Session open(const SessionSpec& spec);

  store::Store& store() { return *store_; }
  const store::Actor& actor() const { return actor_; }
  const LabZone& zone() const { return zone_; }
  void set_zone(LabZone zone) { zone_ = std::move(zone); }
  /// The moment the command is about: --at, else now.
  Instant at() const { return at_; }
  bool at_given() const { return at_given_; }
  Instant now() const { return clock_->now(); }
  const std::string& location() const { return store_->location(); }

  std::unique_ptr<store::ReadUnit> read() { return store_->read(); }
  /// A write transaction (the write lock is held from here until commit or destruction).
  std::unique_ptr<store::WriteUnit> write() { return store_->write(actor_); }

 private:
  Session(std::unique_ptr<store::Store> store, std::shared_ptr<const Clock> clock,
          store::Actor actor, LabZone zone, Instant at, bool at_given);
  std::unique_ptr<store::Store> store_;
  std::shared_ptr<const Clock> clock_;
  store::Actor actor_;
  LabZone zone_;
  Instant at_;
  bool at_given_;
};

/// The program's version, recorded in every audit entry.
const char* tool_version();

}  // namespace cw::app
