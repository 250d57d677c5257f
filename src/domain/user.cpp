// SPDX-License-Identifier: Apache-2.0
// Roles, permissions and user codes.
#include "domain/user.h"

#include <algorithm>

#include "domain/enum_text.h"

namespace cw {
namespace {

constexpr std::pair<Role, std::string_view> kRoles[] = {{Role::Analyst, "analyst"},
                                                        {Role::Reviewer, "reviewer"},
                                                        {Role::Quality, "quality"},
                                                        {Role::Admin, "admin"}};
constexpr Role kRoleList[] = {Role::Analyst, Role::Reviewer, Role::Quality, Role::Admin};

constexpr std::pair<Permission, std::string_view> kPermissions[] = {
    {Permission::Log, "log"},
    {Permission::Review, "review"},
    {Permission::Retire, "retire"},
    {Permission::ReviseMethods, "revise-methods"},
    {Permission::WithdrawLots, "withdraw-lots"},
    {Permission::ServiceInstruments, "service-instruments"},
    {Permission::ManageUsers, "manage-users"}};
constexpr Permission kPermissionList[] = {Permission::Log,          Permission::Review,
                                          Permission::Retire,       Permission::ReviseMethods,
                                          Permission::WithdrawLots, Permission::ServiceInstruments,
                                          Permission::ManageUsers};

constexpr std::pair<UserStatus, std::string_view> kStatuses[] = {
    {UserStatus::Enabled, "enabled"}, {UserStatus::Disabled, "disabled"}};

/// Which role may do what. An analyst logs; a reviewer also reviews and retires curves; quality
/// reviews, retires, and keeps methods, lots and instruments; an admin may do everything (a small
/// lab's head), and alone manages users. Whoever acts, the analyst who logged a calibration never
/// reviews it (domain/curve_transitions.h).
struct Grant {
  Permission permission;
  bool analyst, reviewer, quality, admin;
};
constexpr Grant kGrants[] = {
    // permission                    analyst reviewer quality admin
    {Permission::Log, true, true, true, true},
    {Permission::Review, false, true, true, true},
    {Permission::Retire, false, true, true, true},
    {Permission::ReviseMethods, false, false, true, true},
    {Permission::WithdrawLots, false, false, true, true},
    {Permission::ServiceInstruments, false, false, true, true},
    {Permission::ManageUsers, false, false, false, true},
};

}  // namespace

std::string_view to_string(Role r) {
  return text_of(kRoles, r);
}
std::optional<Role> parse_role(std::string_view text) {
  return value_of(kRoles, text);
}
std::span<const Role> all_roles() {
  return kRoleList;
}

std::string_view to_string(Permission p) {
  return text_of(kPermissions, p);
}
std::span<const Permission> all_permissions() {
  return kPermissionList;
}

const UserEvent* User::standing_at(Instant t) const {
  const UserEvent* in_force = nullptr;
  for (const UserEvent& e : events) {
    if (e.occurred_at <= t) in_force = &e;
  }
  return in_force;
}

bool role_permits(Role role, Permission permission) {
  for (const Grant& g : kGrants) {
    if (g.permission != permission) continue;
    switch (role) {
      case Role::Analyst:
        return g.analyst;
      case Role::Reviewer:
        return g.reviewer;
      case Role::Quality:
        return g.quality;
      case Role::Admin:
        return g.admin;
    }
  }
  return false;
}

std::string canonical_user_code(std::string_view code) {
  std::string out(code);
  std::transform(out.begin(), out.end(), out.begin(), [](char c) {
    return c >= 'A' && c <= 'Z' ? static_cast<char>(c - 'A' + 'a') : c;
  });
  return out;
}

std::string_view to_string(UserStatus s) {
  return text_of(kStatuses, s);
}
std::optional<UserStatus> parse_user_status(std::string_view text) {
  return value_of(kStatuses, text);
}

}  // namespace cw
