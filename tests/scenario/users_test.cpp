// SPDX-License-Identifier: Apache-2.0
// Registered users: only an enabled user records anything; the reviewer is compared as a user,
// not as a spelling; a role without the right is refused and recorded; users are listed; every
// entry records the operating-system login.
#include <catch2/catch.hpp>

#include "scenario_support.h"

using namespace cw::scenario;

namespace {

const std::string kLogged = "2026-03-02T09:00:00Z";

/// A lab with a method that requires review and one curve logged by alice; returns its id.
std::string lab_with_curve(Lab& lab) {
  lab.add_instrument("IC-01");
  lab.add_lot("CRM-A", "2026-12-31");
  MethodSpec spec;
  spec.analytes = {"nitrate"};
  spec.review_required = true;
  lab.add_method(spec);
  const Json log = lab.log_curve("ANION-IC", "IC-01", "CRM-A",
                                 std::string(kPointsHeader) + m1_rows(), kLogged, 0);
  return std::to_string(log.at("curves")[0].at("id").get<std::int64_t>());
}

std::string verify(const Lab& lab) {
  const auto r = lab.run({"audit", "verify", "--json"});
  INFO(r.describe());
  return r.json().at("ok").dump() + " " + std::to_string(r.exit_code);
}

}  // namespace

TEST_CASE("users: self-review is refused whatever the spelling of the name", "[scenario]") {
  Lab lab;
  const std::string id = lab_with_curve(lab);
  for (const std::string spelling : {"ALICE", "Alice", " alice "}) {
    INFO(spelling);
    const auto before = lab.counts();
    const auto r = lab.run_at("2026-03-02T10:00:00Z", {"--as", spelling, "curve", "review", id,
                                                       "--approve", "--reason", "looks fine"});
    INFO(r.describe());
    CHECK(r.exit_code == 3);
    CHECK_THAT(r.err, Catch::Contains("self-review") || Catch::Contains("second person"));
    const auto after = lab.counts();
    CHECK(after.at("refusals") == before.at("refusals") + 1);
    CHECK(after.at("curve_reviews") == before.at("curve_reviews"));
    // The refusal names the user in its canonical form.
    CHECK(lab.sql("SELECT actor FROM refusals ORDER BY id DESC LIMIT 1") == "alice");
  }
  // Another user, in any case, may review.
  const auto ok = lab.run_at("2026-03-02T10:30:00Z",
                             {"--as", "BOB", "curve", "review", id, "--approve", "--reason", "ok"});
  INFO(ok.describe());
  CHECK(ok.exit_code == 0);
  CHECK(lab.sql("SELECT reviewer FROM curve_reviews") == "bob");
  CHECK(verify(lab) == "true 0");
}

TEST_CASE("users: an unknown or disabled user records nothing (exit 2)", "[scenario]") {
  Lab lab;
  const std::string id = lab_with_curve(lab);
  const auto before = lab.counts();
  const auto unknown = lab.run_at("2026-03-02T10:00:00Z", {"--as", "mallory", "curve", "review", id,
                                                           "--approve", "--reason", "ok"});
  INFO(unknown.describe());
  CHECK(unknown.exit_code == 2);
  CHECK_THAT(unknown.err, Catch::Contains("--as 'mallory' is not a registered user"));
  CHECK(unknown.json().at("error").at("option") == "--as");
  CHECK(lab.counts() == before);

  // The environment variable is named when it is the source.
  const auto from_env =
      lab.box.run({"instrument", "add", "IC-09"}, {{"CURVEWARDEN_USER", "mallory"}});
  CHECK(from_env.exit_code == 2);
  CHECK_THAT(from_env.err, Catch::Contains("CURVEWARDEN_USER 'mallory' is not a registered user"));
  CHECK(lab.counts() == before);

  // Disabled by the admin: bob can no longer act; his disabling is itself an audited event.
  const auto off =
      lab.run_at("2026-03-02T10:05:00Z", {"user", "disable", "bob", "--reason", "left the lab"});
  INFO(off.describe());
  REQUIRE(off.exit_code == 0);
  CHECK(off.json().at("status") == "disabled");
  CHECK(lab.sql("SELECT action || '|' || entity_id || '|' || reason FROM audit_log ORDER BY seq "
                "DESC LIMIT 1") == "user.disable|bob|left the lab");
  const auto mid = lab.counts();
  const auto disabled = lab.run_at("2026-03-02T10:10:00Z", {"--as", "bob", "curve", "review", id,
                                                            "--approve", "--reason", "ok"});
  CHECK(disabled.exit_code == 2);
  CHECK_THAT(disabled.err, Catch::Contains("--as 'bob' is a disabled user (left the lab)"));
  CHECK(lab.counts() == mid);
  // Reading needs no registered user.
  CHECK(lab.box.run({"curve", "list"}, {{"CURVEWARDEN_USER", "mallory"}}).exit_code == 0);

  // Enabled again, bob reviews.
  REQUIRE(
      lab.run_at("2026-03-02T10:15:00Z", {"user", "enable", "bob", "--reason", "back from leave"})
          .exit_code == 0);
  CHECK(lab.run_at("2026-03-02T10:20:00Z",
                   {"--as", "bob", "curve", "review", id, "--approve", "--reason", "ok"})
            .exit_code == 0);
  CHECK(verify(lab) == "true 0");
}

TEST_CASE("users: an act recorded as of an earlier moment needs the user's standing then",
          "[scenario]") {
  Lab lab;
  const std::string id = lab_with_curve(lab);
  // Bob is disabled from 10:05 to 10:15, Zoe registered at 10:30.
  REQUIRE(lab.run_at("2026-03-02T10:05:00Z", {"user", "disable", "bob", "--reason", "on leave"})
              .exit_code == 0);
  REQUIRE(
      lab.run_at("2026-03-02T10:15:00Z", {"user", "enable", "bob", "--reason", "back"}).exit_code ==
      0);
  const auto added = lab.run_at("2026-03-02T10:30:00Z",
                                {"user", "add", "zoe", "--name", "Zoe Test", "--role", "reviewer"});
  INFO(added.describe());
  REQUIRE(added.exit_code == 0);
  const auto before = lab.counts();
  const std::string head = lab.sql("SELECT hash FROM audit_log ORDER BY seq DESC LIMIT 1");
  // Both now enabled reviewers, each recording an approval as of a moment they could not act.
  const auto back_dated = [&](const std::string& who, const std::string& at) {
    return lab.box.run(
        {"--json", "--at", at, "--as", who, "curve", "review", id, "--approve", "--reason", "ok"},
        {{"CURVEWARDEN_NOW", "2026-03-02T11:00:00Z"}});
  };
  const auto disabled = back_dated("bob", "2026-03-02T10:10:00Z");
  INFO(disabled.describe());
  CHECK(disabled.exit_code == 2);
  CHECK_THAT(disabled.err, Catch::Contains("--as 'bob' was a disabled user at 2026-03-02 10:10"));
  CHECK(disabled.json().at("error").at("option") == "--as");
  const auto unregistered = back_dated("zoe", "2026-03-02T10:20:00Z");
  INFO(unregistered.describe());
  CHECK(unregistered.exit_code == 2);
  CHECK_THAT(unregistered.err, Catch::Contains("--as 'zoe' was not yet registered at"));
  CHECK(lab.counts() == before);
  CHECK(lab.sql("SELECT hash FROM audit_log ORDER BY seq DESC LIMIT 1") == head);
  // At a moment each could act, the same act is recorded.
  const auto ok = back_dated("zoe", "2026-03-02T10:45:00Z");
  INFO(ok.describe());
  CHECK(ok.exit_code == 0);
  // Shown as of a moment before the approval, the curve has no review yet.
  for (const auto& [at, reviews] : std::vector<std::pair<std::string, std::size_t>>{
           {"2026-03-02T10:40:00Z", 0}, {"2026-03-02T10:50:00Z", 1}}) {
    const auto shown = lab.box.run({"--json", "--at", at, "curve", "show", id},
                                   {{"CURVEWARDEN_NOW", "2026-03-02T11:00:00Z"}});
    INFO(shown.describe());
    CHECK(shown.json().at("reviews").size() == reviews);
  }
  CHECK(verify(lab) == "true 0");
}

TEST_CASE("users: an admin cannot demote itself, so that one admin always remains", "[scenario]") {
  Lab lab;
  const auto before = lab.counts();
  const std::string digest_before = lab.sql("SELECT hash FROM audit_log ORDER BY seq DESC LIMIT 1");
  for (const std::string role : {"analyst", "reviewer", "quality"}) {
    INFO(role);
    const auto self = lab.run_at("2026-03-02T10:00:00Z",
                                 {"user", "enable", "alice", "--role", role, "--reason", "demote"});
    INFO(self.describe());
    CHECK(self.exit_code == 2);
    CHECK_THAT(self.err, Catch::Contains("cannot take away its own admin role"));
    CHECK(self.json().at("error").at("code") == "bad-input");
  }
  CHECK(lab.counts() == before);
  CHECK(lab.sql("SELECT hash FROM audit_log ORDER BY seq DESC LIMIT 1") == digest_before);
  // Nothing let a newcomer take the store over through init.
  const auto take = lab.box.run({"init", "--name", "Zed Outsider"}, {{"CURVEWARDEN_USER", "zed"}});
  CHECK(take.exit_code != 0);
  CHECK(lab.counts() == before);

  // A second admin may change the first one's role; the second remains.
  REQUIRE(lab.run_at("2026-03-02T10:05:00Z",
                     {"user", "enable", "bob", "--role", "admin", "--reason", "deputy"})
              .exit_code == 0);
  const auto other = lab.run_at(
      "2026-03-02T10:10:00Z",
      {"--as", "bob", "user", "enable", "alice", "--role", "analyst", "--reason", "handover"});
  INFO(other.describe());
  CHECK(other.exit_code == 0);
  CHECK(other.json().at("role") == "analyst");
  CHECK(lab.sql("SELECT count(*) FROM audit_log WHERE action = 'user.enable'") == "2");
  CHECK(verify(lab) == "true 0");
}

TEST_CASE("users: a role without the right is refused and recorded (exit 3)", "[scenario]") {
  Lab lab;
  const std::string id = lab_with_curve(lab);
  REQUIRE(lab.box.add_user("dave", "analyst").exit_code == 0);

  // An analyst may not review ...
  auto before = lab.counts();
  const auto review = lab.run_at("2026-03-02T10:00:00Z", {"--as", "dave", "curve", "review", id,
                                                          "--approve", "--reason", "ok"});
  INFO(review.describe());
  CHECK(review.exit_code == 3);
  CHECK_THAT(review.err, Catch::Contains("user dave (analyst) may not do this"));
  auto after = lab.counts();
  CHECK(after.at("refusals") == before.at("refusals") + 1);
  CHECK(after.at("curve_reviews") == before.at("curve_reviews"));
  CHECK(lab.sql("SELECT action || '|' || actor || '|' || reasons FROM refusals ORDER BY id DESC "
                "LIMIT 1") == "curve.review|dave|[\"not-permitted\"]");
  CHECK(lab.sql("SELECT action || '|' || actor FROM audit_log ORDER BY seq DESC LIMIT 1") ==
        "curve.review-refused|dave");

  // ... nor withdraw a lot, nor register users; a reviewer may not revise a method.
  for (const auto& [who, args] : std::vector<std::pair<std::string, std::vector<std::string>>>{
           {"dave", {"lot", "withdraw", "CRM-A", "--reason", "spilled"}},
           {"dave", {"user", "add", "eve", "--name", "Eve", "--role", "admin"}},
           {"bob", {"instrument", "service", "IC-01", "--out", "--reason", "leak"}}}) {
    std::vector<std::string> full{"--as", who};
    full.insert(full.end(), args.begin(), args.end());
    before = lab.counts();
    const auto r = lab.run_at("2026-03-02T10:30:00Z", full);
    INFO(r.describe());
    CHECK(r.exit_code == 3);
    after = lab.counts();
    CHECK(after.at("refusals") == before.at("refusals") + 1);
    CHECK(after.at("audit_log") == before.at("audit_log") + 1);
    CHECK(after.at("users") == before.at("users"));
    CHECK(after.at("lot_withdrawals") == before.at("lot_withdrawals"));
    CHECK(after.at("instrument_service_events") == before.at("instrument_service_events"));
  }
  // An analyst logs a check.
  CHECK(verify(lab) == "true 0");
}

TEST_CASE("users: add, list (text, JSON, CSV), codes ignore case", "[scenario]") {
  Lab lab;
  const auto add = lab.run_at(
      Lab::kSetupAt, {"user", "add", "Q.Moreau", "--name", "Quinn Moreau", "--role", "quality"});
  INFO(add.describe());
  REQUIRE(add.exit_code == 0);
  CHECK(add.json().at("code") == "q.moreau");
  CHECK(add.json().at("permissions") == Json::array({"log", "review", "retire", "revise-methods",
                                                     "withdraw-lots", "service-instruments"}));

  // The same code in another case is the same user: refused as a duplicate, nothing written.
  const auto before = lab.counts();
  const auto dup = lab.run_at(Lab::kSetupAt,
                              {"user", "add", "q.MOREAU", "--name", "Someone", "--role", "admin"});
  CHECK(dup.exit_code == 2);
  CHECK_THAT(dup.err, Catch::Contains("already registered (codes ignore case)"));
  CHECK(lab.counts() == before);
  // Bad role and bad code name their option.
  const auto role = lab.run({"user", "add", "x1", "--name", "X", "--role", "boss"});
  CHECK(role.exit_code == 2);
  CHECK_THAT(role.err, Catch::Contains("--role 'boss' is not a role"));
  const auto code = lab.run({"user", "add", "a b", "--name", "X", "--role", "analyst"});
  CHECK(code.exit_code == 2);
  CHECK(lab.counts() == before);

  const Json list = lab.json_at(Lab::kSetupAt, {"user", "list"});
  std::vector<std::string> rows;
  for (const auto& u : list.at("users")) {
    rows.push_back(u.at("code").get<std::string>() + ":" + u.at("role").get<std::string>() + ":" +
                   u.at("status").get<std::string>());
  }
  CHECK(rows == std::vector<std::string>{"alice:admin:enabled", "bob:reviewer:enabled",
                                         "carol:reviewer:enabled", "q.moreau:quality:enabled"});
  const auto csv = lab.run({"user", "list", "--csv"});
  REQUIRE(csv.exit_code == 0);
  CHECK(csv.out.rfind("code,name,role,status,permissions,registered_at,changed_at,locked\r\n", 0) ==
        0);
  CHECK_THAT(csv.out, Catch::Contains("q.moreau,Quinn Moreau,quality,enabled,"
                                      "log;review;retire;revise-methods;withdraw-lots;"
                                      "service-instruments,2026-02-01T08:00:00Z,"));
  const auto text = lab.run({"user", "show", "Q.MOREAU"});
  CHECK(text.exit_code == 0);
  CHECK_THAT(text.out, Catch::Contains("User q.moreau: Quinn Moreau"));
}

TEST_CASE("users: the first admin is registered by init, and every entry records the OS login",
          "[scenario]") {
  cw::test::Sandbox box;
  box.user = "Head.Of.Lab";
  const auto init = box.run({"init", "--tz", "UTC", "--name", "Noor Haddad", "--json"});
  INFO(init.describe());
  REQUIRE(init.exit_code == 0);
  CHECK(init.json().at("admin_registered").at("code") == "head.of.lab");
  CHECK(init.json().at("admin_registered").at("name") == "Noor Haddad");
  CHECK(init.json().at("admin_registered").at("role") == "admin");
  // One entry holds the lab's settings and its first admin.
  CHECK(cw::test::query_text(box, "SELECT count(*) FROM audit_log") == "1");
  CHECK(cw::test::query_text(box, "SELECT action || ' ' || actor FROM audit_log") ==
        "lab.init head.of.lab");
  CHECK(cw::test::query_text(box, "SELECT count(*) FROM users") == "1");
  // The operating-system login is recorded (never empty).
  CHECK_FALSE(cw::test::query_text(box, "SELECT os_login FROM audit_log").empty());

  // Again: idempotent, no second admin; --admin naming someone else is refused.
  CHECK(box.run({"init"}).exit_code == 0);
  const auto other = box.run({"init", "--admin", "someone", "--name", "Someone Else"});
  CHECK(other.exit_code == 2);
  CHECK(cw::test::query_text(box, "SELECT count(*) FROM users") == "1");
  // An unregistered login may not re-run init on an initialised store.
  const auto stranger = box.run({"init"}, {{"CURVEWARDEN_USER", "stranger"}});
  CHECK(stranger.exit_code == 2);
  CHECK_THAT(stranger.err, Catch::Contains("not a registered user"));
}
