// SPDX-License-Identifier: Apache-2.0
// What every use case needs: the open store, who acts, what "now" is, the moment the command
// is about (--at), and the lab's time zone.
#pragma once

#include <memory>
#include <optional>
#include <string>

#include "core/clock.h"
#include "core/time.h"
#include "store/connection.h"

namespace cw::app {

/// The global options of every command (product.md §4).
struct GlobalOptions {
  std::optional<std::string> db;  ///< --db
  std::optional<std::string> as;  ///< --as
  std::optional<std::string> at;  ///< --at (ISO-8601 with zone)
  bool json = false;              ///< --json
};

class Session {
 public:
  /// Opens the store named by the options (--db, else $CURVEWARDEN_DB, else ./curvewarden.db).
  /// `create` only for init.
  static Session open(const GlobalOptions& options, bool create = false);

  store::Connection& db() { return db_; }
  const store::Actor& actor() const { return actor_; }
  const LabZone& zone() const { return zone_; }
  void set_zone(LabZone zone) { zone_ = std::move(zone); }
  /// The moment the command is about: --at, else now.
  Instant at() const { return at_; }
  bool at_given() const { return at_given_; }
  Instant now() const { return clock_->now(); }
  const std::string& db_path() const { return db_.path(); }

  /// Starts a write use case (BEGIN IMMEDIATE).
  store::WriteTransaction write() { return store::WriteTransaction(db_, actor_); }

 private:
  Session(store::Connection db, std::unique_ptr<Clock> clock, store::Actor actor, LabZone zone,
          Instant at, bool at_given);
  store::Connection db_;
  std::unique_ptr<Clock> clock_;
  store::Actor actor_;
  LabZone zone_;
  Instant at_;
  bool at_given_;
};

/// --db, else $CURVEWARDEN_DB, else ./curvewarden.db.
std::string resolve_db_path(const GlobalOptions& options);
/// --as, else $CURVEWARDEN_USER, else the login name; checked to be a usable name.
std::string resolve_actor(const GlobalOptions& options);

/// The program's version, recorded in every audit entry.
const char* tool_version();

}  // namespace cw::app
