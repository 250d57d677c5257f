// SPDX-License-Identifier: Apache-2.0
// What every use case needs, as plain values resolved by the front end (cli/ today): the open
// store, who acts, what "now" is, the moment the command is about, and the lab's time zone.
// Nothing here reads argv or the environment.
#pragma once

#include <functional>
#include <memory>
#include <optional>
#include <string>

#include "core/clock.h"
#include "core/time.h"
#include "store/store.h"

namespace cw::app {

/// Reads one passphrase (without echo on a terminal, or a line of a file descriptor) after showing
/// `prompt` where a person would see it; a new passphrase (`is_new`) is typed twice on a terminal.
/// Throws UsageError when there is no way to ask.
using PassphraseSource = std::function<std::string(const std::string& prompt, bool is_new)>;

struct SessionSpec {
  std::string location;       ///< the store: a file path
  std::string actor;          ///< the user acting: a canonical user code (checked when writing)
  std::string actor_source;   ///< where it came from, for messages: "--as", "CURVEWARDEN_USER", ...
  std::string os_login;       ///< the operating-system login of the process
  std::optional<Instant> at;  ///< the moment the command is about; nullopt: now
  std::shared_ptr<const Clock> clock;
  bool create = false;          ///< create the store when missing (init only)
  PassphraseSource passphrase;  ///< asked only by acts that are signed or set a passphrase
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
  /// A write transaction (the write lock is held from here until commit or destruction), once
  /// the acting user is found registered and enabled inside it (else UsageError, exit 2).
  std::unique_ptr<store::WriteUnit> write();
  /// A write transaction without that check: only for `init`, which registers the first admin
  /// when the store has no enabled admin (app/registry.cpp).
  std::unique_ptr<store::WriteUnit> write_to_register_first_admin() {
    return store_->write(actor_);
  }
  /// Asks for a passphrase through the front end (before any write lock is taken: a person may
  /// take a while to type it).
  std::string passphrase(const std::string& prompt, bool is_new = false) const;
  /// Where the acting user's code came from ("--as", "CURVEWARDEN_USER", "the login name").
  const std::string& actor_source() const { return actor_source_; }

 private:
  Session(std::unique_ptr<store::Store> store, std::shared_ptr<const Clock> clock,
          store::Actor actor, LabZone zone, Instant at, bool at_given, std::string actor_source,
          PassphraseSource passphrase);
  std::unique_ptr<store::Store> store_;
  std::shared_ptr<const Clock> clock_;
  store::Actor actor_;
  LabZone zone_;
  Instant at_;
  bool at_given_;
  std::string actor_source_;
  PassphraseSource passphrase_;
};

/// The program's version, recorded in every audit entry.
const char* tool_version();

}  // namespace cw::app
