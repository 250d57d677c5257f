// SPDX-License-Identifier: Apache-2.0
// Registered users, their roles and what each role may do (21 CFR 11.10(d), (g): access limited to
// authorised people, authority checks). A user is a code (one canonical form, compared without
// regard to case), a full name and a history of status events; the current role and whether the
// user may act are those of the latest event.
#pragma once

#include <optional>
#include <span>
#include <string>
#include <string_view>
#include <vector>

#include "core/time.h"
#include "domain/ids.h"

namespace cw {

using UserId = Id<struct UserTag>;

enum class Role { Analyst, Reviewer, Quality, Admin };
std::string_view to_string(Role r);  // "analyst" | "reviewer" | "quality" | "admin"
std::optional<Role> parse_role(std::string_view text);
/// Every role, in the order of the table.
std::span<const Role> all_roles();

/// What a command needs the acting user's role to allow.
enum class Permission {
  Log,                 ///< curve log, check log, quantify, run import, lot add
  Review,              ///< curve review (approve or reject)
  Retire,              ///< curve retire
  ReviseMethods,       ///< method add, method revise
  WithdrawLots,        ///< lot withdraw
  ServiceInstruments,  ///< instrument add, service, columns
  ManageUsers,         ///< user add, disable, enable; lab settings
};
std::string_view to_string(Permission p);  // "log", "review", ...
std::span<const Permission> all_permissions();

/// The one table of which role may do what.
bool role_permits(Role role, Permission permission);

/// The canonical form of a user code: ASCII letters in lower case, everything else as given
/// (codes are compared in this form, so "ALICE", "Alice" and "alice" are one user).
std::string canonical_user_code(std::string_view code);

enum class UserStatus { Enabled, Disabled };
std::string_view to_string(UserStatus s);  // "enabled" | "disabled"
std::optional<UserStatus> parse_user_status(std::string_view text);

/// A change of a user's status or role: the first one is written when the user is registered.
struct UserEvent {
  UserStatus status = UserStatus::Enabled;
  Role role = Role::Analyst;
  std::string reason;
  std::string by;  ///< the code of the user who made the change
  Instant occurred_at;
};

struct User {
  UserId id;
  std::string code;  ///< canonical
  std::string name;  ///< full name, shown with every signature
  Instant registered_at;
  std::vector<UserEvent> events;  ///< in time order, at least one
  /// Locked by wrong passphrases in a row (signature_locked()) until an admin unlocks it: no
  /// status event of its own, so set where the user is read to be shown.
  bool locked = false;

  /// The latest event (status and role now).
  const UserEvent& current() const { return events.back(); }
  bool enabled() const { return current().status == UserStatus::Enabled; }
  Role role() const { return current().role; }
  /// The event in force at `t`: the latest at or before it; nullptr before the user was
  /// registered. An act recorded as of `t` (--at) needs the user's standing then as well as now.
  const UserEvent* standing_at(Instant t) const;
};

}  // namespace cw
