// SPDX-License-Identifier: Apache-2.0
// Users: the acting user's checks and the user registry's use cases.
#include "app/users.h"

#include "app/refusal.h"
#include "app/signatures.h"
#include "core/error.h"
#include "core/text.h"
#include "crypto/passphrase.h"

namespace cw::app {
namespace {

Error with_source(Error e, const std::string& source) {
  if (source.rfind("--", 0) == 0 || source == "CURVEWARDEN_USER") e.set_option(source);
  return e;
}

User get_user(store::ReadUnit& unit, const std::string& code) {
  auto u = unit.registry().user(canonical_user_code(code));
  if (!u) {
    throw NotFoundError("no user " + quote(code),
                        "see 'curvewarden user list'; an admin registers users with "
                        "'curvewarden user add CODE --name TEXT --role ROLE'");
  }
  u->locked = signature_locked(unit.registry().failed_signatures_in_a_row(u->id));
  return *u;
}

}  // namespace

User acting_user(Session& s, store::ReadUnit& unit) {
  const std::string& code = s.actor().name;
  const std::string& source = s.actor_source();
  auto u = unit.registry().user(code);
  if (!u) {
    throw with_source(
        UsageError(source + " " + quote(code) + " is not a registered user",
                   "only registered users record anything: an admin adds one with "
                   "'curvewarden user add CODE --name TEXT --role ROLE' (see 'curvewarden user "
                   "list')"),
        source);
  }
  if (!u->enabled()) {
    throw with_source(
        UsageError(source + " " + quote(code) + " is a disabled user (" + u->current().reason + ")",
                   "an admin enables it with 'curvewarden user enable " + code + " --reason TEXT'"),
        source);
  }
  // An act recorded as of an earlier moment (--at) needs the user's standing then too.
  const UserEvent* then = u->standing_at(s.at());
  if (then == nullptr) {
    throw with_source(
        UsageError(source + " " + quote(code) + " was not yet registered at " +
                       s.zone().format_local(s.at()) + " (registered " +
                       s.zone().format_local(u->registered_at) + ")",
                   "record the act at or after the user's registration, or as the user who "
                   "did it"),
        source);
  }
  if (then->status != UserStatus::Enabled) {
    throw with_source(
        UsageError(source + " " + quote(code) + " was a disabled user at " +
                       s.zone().format_local(s.at()) + " (" + then->reason + ")",
                   "record the act as the user who did it, at a moment that user was enabled"),
        source);
  }
  return *u;
}

User authorize(Session& s, store::WriteUnit& unit, Permission permission, const std::string& action,
               const std::string& kind, const std::string& id) {
  User u = acting_user(s, unit);
  // The right is needed now, and at the moment the act is recorded as of (--at).
  const Role then = u.standing_at(s.at())->role;
  for (const Role role : {u.role(), then}) {
    if (!role_permits(role, permission)) {
      refuse(unit, action, kind, id, {Reason::NotPermitted},
             "user " + u.code + " (" + std::string(to_string(role)) +
                 (role != u.role() ? " at " + s.zone().format_local(s.at()) : "") +
                 ") may not do this: it needs the right to " + std::string(to_string(permission)),
             s.at(), "ask a user whose role allows it; 'curvewarden user list' shows the roles");
    }
  }
  return u;
}

User add_user(Session& s, const AddUserRequest& request) {
  const std::string code = canonical_user_code(request.code);
  std::string passphrase = ask_signature(s, "registered user " + code);
  const std::string first = ask_new_passphrase(s, code);
  auto unit = s.write();
  const User by = authorize(s, *unit, Permission::ManageUsers, "user.add", "user", code);
  if (auto existing = unit->registry().user(code)) {
    throw ValidationError("user " + quote(code) + " is already registered" +
                              (existing->code != request.code ? " (codes ignore case)" : ""),
                          "user codes are unique and never reused; see 'curvewarden user list'");
  }
  sign(s, *unit, by, passphrase, {"user.add", "registered", "user", code});
  const UserId id = unit->registry_writer().add_user(code, request.name, s.at());
  unit->registry_writer().add_user_event(
      id, {UserStatus::Enabled, request.role, "registered", by.code, s.at()});
  unit->registry_writer().add_passphrase(id, first, s.at());
  unit->append_entry({"user.add", "user", code, std::nullopt, s.at()});
  User added = get_user(*unit, code);
  unit->commit();
  return added;
}

std::vector<User> list_users(Session& s) {
  auto unit = s.read();
  auto users = unit->registry().users();
  for (auto& u : users)
    u.locked = signature_locked(unit->registry().failed_signatures_in_a_row(u.id));
  return users;
}

User show_user(Session& s, const std::string& code) {
  auto unit = s.read();
  return get_user(*unit, code);
}

User disable_user(Session& s, const std::string& code, const std::string& reason) {
  const std::string canonical = canonical_user_code(code);
  std::string passphrase = ask_signature(s, "disabled user " + canonical);
  auto unit = s.write();
  const User by = authorize(s, *unit, Permission::ManageUsers, "user.disable", "user", canonical);
  const User u = get_user(*unit, canonical);
  if (!u.enabled()) throw ValidationError("user " + quote(u.code) + " is already disabled");
  if (u.code == by.code) {
    throw ValidationError("an admin cannot disable itself",
                          "another admin disables this user, so that one always remains");
  }
  sign(s, *unit, by, passphrase, {"user.disable", "disabled", "user", u.code});
  unit->registry_writer().add_user_event(u.id,
                                         {UserStatus::Disabled, u.role(), reason, by.code, s.at()});
  unit->append_entry({"user.disable", "user", u.code, reason, s.at()});
  User changed = get_user(*unit, canonical);
  unit->commit();
  return changed;
}

User enable_user(Session& s, const std::string& code, std::optional<Role> role,
                 const std::string& reason) {
  const std::string canonical = canonical_user_code(code);
  std::string passphrase = ask_signature(s, "enabled user " + canonical);
  auto unit = s.write();
  const User by = authorize(s, *unit, Permission::ManageUsers, "user.enable", "user", canonical);
  const User u = get_user(*unit, canonical);
  const Role new_role = role.value_or(u.role());
  if (u.enabled() && new_role == u.role()) {
    throw ValidationError("user " + quote(u.code) + " is already enabled as " +
                          std::string(to_string(u.role())));
  }
  // The one acting is an enabled admin: as long as it keeps that role, one always remains.
  if (u.code == by.code && new_role != Role::Admin) {
    throw ValidationError("an admin cannot take away its own admin role",
                          "another admin changes this user's role, so that one always remains");
  }
  sign(s, *unit, by, passphrase, {"user.enable", "enabled", "user", u.code});
  unit->registry_writer().add_user_event(u.id,
                                         {UserStatus::Enabled, new_role, reason, by.code, s.at()});
  unit->append_entry({"user.enable", "user", u.code, reason, s.at()});
  User changed = get_user(*unit, canonical);
  unit->commit();
  return changed;
}

User unlock_user(Session& s, const std::string& code, const std::string& reason) {
  const std::string canonical = canonical_user_code(code);
  std::string passphrase = ask_signature(s, "unlocked user " + canonical);
  auto unit = s.write();
  const User by = authorize(s, *unit, Permission::ManageUsers, "user.unlock", "user", canonical);
  const User u = get_user(*unit, canonical);
  const int failures = unit->registry().failed_signatures_in_a_row(u.id);
  if (!signature_locked(failures)) {
    throw ValidationError("user " + quote(u.code) + " is not locked (" + std::to_string(failures) +
                          " wrong passphrases in a row; " + std::to_string(kMaxFailedSignatures) +
                          " lock it)");
  }
  sign(s, *unit, by, passphrase, {"user.unlock", "unlocked", "user", u.code});
  // A status event ends the run of failures (failed_signatures_in_a_row counts after it).
  unit->registry_writer().add_user_event(u.id,
                                         {u.current().status, u.role(), reason, by.code, s.at()});
  unit->append_entry({"user.unlock", "user", u.code, reason, s.at()});
  User changed = get_user(*unit, canonical);
  unit->commit();
  return changed;
}

User set_passphrase(Session& s, const std::optional<std::string>& code) {
  const std::string target = canonical_user_code(code.value_or(s.actor().name));
  const bool own = target == s.actor().name;
  // Everything typed is asked before the write lock is taken.
  std::string proof = own ? s.passphrase("Current passphrase of " + target + ": ")
                          : ask_signature(s, "set the passphrase of " + target);
  const std::string hash = ask_new_passphrase(s, target);
  auto unit = s.write();
  User by = own ? acting_user(s, *unit)
                : authorize(s, *unit, Permission::ManageUsers, "user.passphrase", "user", target);
  const User u = get_user(*unit, target);
  if (own) {
    if (!unit->registry().passphrase_hash(u.id)) {
      crypto::wipe(proof);
      throw UsageError(
          "user " + u.code + " has no passphrase yet",
          "an admin sets the first one with 'curvewarden user passphrase " + u.code + "'");
    }
    prove_passphrase(s, *unit, u, proof, "user.passphrase");
  } else {
    sign(s, *unit, by, proof, {"user.passphrase", "set the passphrase", "user", u.code});
  }
  unit->registry_writer().add_passphrase(u.id, hash, s.at());
  unit->append_entry({"user.passphrase", "user", u.code, std::nullopt, s.at()});
  User changed = get_user(*unit, target);
  unit->commit();
  return changed;
}

}  // namespace cw::app
