// SPDX-License-Identifier: Apache-2.0
// Roles and permissions: the one table, and the canonical form of user codes.
#include <catch2/catch.hpp>

#include "domain/user.h"

using cw::Permission;
using cw::Role;

TEST_CASE("users: the role table, permission by permission", "[domain]") {
  using P = Permission;
  // Expected rows written out by hand (the table in README "Users and roles").
  struct Row {
    P permission;
    bool analyst, reviewer, quality, admin;
  };
  const Row rows[] = {
      {P::Log, true, true, true, true},
      {P::Review, false, true, true, true},
      {P::Retire, false, true, true, true},
      {P::ReviseMethods, false, false, true, true},
      {P::WithdrawLots, false, false, true, true},
      {P::ServiceInstruments, false, false, true, true},
      {P::ManageUsers, false, false, false, true},
  };
  REQUIRE(std::size(rows) == cw::all_permissions().size());
  for (const Row& r : rows) {
    INFO(to_string(r.permission));
    CHECK(cw::role_permits(Role::Analyst, r.permission) == r.analyst);
    CHECK(cw::role_permits(Role::Reviewer, r.permission) == r.reviewer);
    CHECK(cw::role_permits(Role::Quality, r.permission) == r.quality);
    CHECK(cw::role_permits(Role::Admin, r.permission) == r.admin);
  }
}

TEST_CASE("users: roles and statuses have one text form each", "[domain]") {
  for (Role r : cw::all_roles()) CHECK(cw::parse_role(cw::to_string(r)) == r);
  CHECK(cw::all_roles().size() == 4);
  CHECK_FALSE(cw::parse_role("Admin").has_value());
  CHECK_FALSE(cw::parse_role("").has_value());
  CHECK(cw::parse_user_status("enabled") == cw::UserStatus::Enabled);
  CHECK(cw::parse_user_status("disabled") == cw::UserStatus::Disabled);
  CHECK_FALSE(cw::parse_user_status("locked").has_value());
}

TEST_CASE("users: a code has one canonical form whatever its case", "[domain]") {
  CHECK(cw::canonical_user_code("R.Okafor") == "r.okafor");
  CHECK(cw::canonical_user_code("ALICE") == cw::canonical_user_code("alice"));
  CHECK(cw::canonical_user_code("lab-02/B") == "lab-02/b");
  // Only ASCII letters fold: other bytes (legacy free-text names) are kept as written.
  CHECK(cw::canonical_user_code("Dr. \xc3\x89mile") == "dr. \xc3\x89mile");
}
