// SPDX-License-Identifier: Apache-2.0
// Registered users: who may act, what their role allows, and the use cases that manage them.
// Every check is made inside the unit of work that then writes.
#pragma once

#include <optional>
#include <string>
#include <vector>

#include "app/session.h"
#include "domain/user.h"

namespace cw::app {

/// The acting user as registered in `unit`: UsageError (exit 2, naming where the code came from)
/// when no user has the code or the user is disabled.
User acting_user(Session& s, store::ReadUnit& unit);

/// The acting user, when the role allows `permission`; otherwise the refusal is recorded as
/// `<action>-refused` on `kind`/`id` (reason not-permitted) and RefusedError (exit 3) is thrown.
User authorize(Session& s, store::WriteUnit& unit, Permission permission, const std::string& action,
               const std::string& kind, const std::string& id);

struct AddUserRequest {
  std::string code;  ///< as typed (checked by check_code); stored canonical
  std::string name;
  Role role = Role::Analyst;
};
/// Registers a user (admin only, signed) with its first passphrase.
User add_user(Session& s, const AddUserRequest& request);
std::vector<User> list_users(Session& s);
User show_user(Session& s, const std::string& code);
/// Disables a user (it can no longer act); refused with a usage error when already disabled, or
/// when it is the acting admin itself.
User disable_user(Session& s, const std::string& code, const std::string& reason);
/// Ends a lockout after repeated wrong passphrases (admin only).
User unlock_user(Session& s, const std::string& code, const std::string& reason);
/// Sets a passphrase: the acting user's own (proving the current one first), or, by an admin
/// (signed), another user's, e.g. the first one of a user registered from an earlier trail.
User set_passphrase(Session& s, const std::optional<std::string>& code);

/// Enables a user again (a user registered from an earlier store's trail starts disabled), with
/// a new role when given.
User enable_user(Session& s, const std::string& code, std::optional<Role> role,
                 const std::string& reason);

}  // namespace cw::app
