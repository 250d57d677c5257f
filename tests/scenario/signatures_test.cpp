// SPDX-License-Identifier: Apache-2.0
// Electronic signatures: a signed act needs the acting user's passphrase; a wrong one is a
// recorded refusal, counted, and locks the user after five in a row until an admin unlocks it;
// only an Argon2id hash is stored; the signature's manifestation (full name, time in the lab's
// zone, meaning) is shown with the curve.
#include <catch2/catch.hpp>

#include "scenario_support.h"

using namespace cw::scenario;
using cw::test::test_passphrase;

namespace {

const std::string kLogged = "2026-03-02T09:00:00Z";

std::string curve_awaiting_review(Lab& lab) {
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

/// Runs `args` as `user` at `at` with `passphrase` on descriptor 3 (given explicitly: the
/// harness then adds nothing).
RunResult signed_run(const Lab& lab, const std::string& user, const std::string& at,
                     std::vector<std::string> args, const std::string& passphrases) {
  std::vector<std::string> full{"--json", "--at", at, "--as", user, "--passphrase-fd", "3"};
  full.insert(full.end(), args.begin(), args.end());
  auto env = lab.box.environment({{"CURVEWARDEN_NOW", at}});
  return cw::test::run_process(cw::test::binary_path(), full, env, lab.box.dir(), "/dev/null",
                               passphrases);
}

bool verifies(const Lab& lab) {
  return lab.run({"audit", "verify"}).exit_code == 0;
}

}  // namespace

TEST_CASE("signatures: a wrong passphrase is recorded and counted, and five lock the user",
          "[scenario]") {
  Lab lab;
  const std::string id = curve_awaiting_review(lab);
  const std::vector<std::string> approve{"curve", "review", id, "--approve", "--reason", "ok"};

  for (int attempt = 1; attempt <= 5; ++attempt) {
    INFO("attempt " << attempt);
    const auto before = lab.counts();
    const auto r = signed_run(lab, "bob", "2026-03-02T10:00:00Z", approve, "not my passphrase\n");
    INFO(r.describe());
    CHECK(r.exit_code == 3);
    CHECK(r.json().at("error").at("code") == "refused");
    CHECK_THAT(r.err, Catch::Contains("wrong passphrase for user bob (" + std::to_string(attempt) +
                                      " in a row)"));
    if (attempt == 5) CHECK_THAT(r.err, Catch::Contains("the user is now locked"));
    const auto after = lab.counts();
    CHECK(after.at("signature_failures") == before.at("signature_failures") + 1);
    CHECK(after.at("refusals") == before.at("refusals") + 1);
    CHECK(after.at("curve_reviews") == before.at("curve_reviews"));
    CHECK(after.at("signatures") == before.at("signatures"));
  }
  CHECK(lab.sql("SELECT reasons FROM refusals ORDER BY id DESC LIMIT 1") ==
        "[\"wrong-passphrase\"]");

  // Locked: even the right passphrase is refused (and recorded), without being checked.
  const auto locked =
      signed_run(lab, "bob", "2026-03-02T10:10:00Z", approve, test_passphrase("bob") + "\n");
  INFO(locked.describe());
  CHECK(locked.exit_code == 3);
  CHECK_THAT(locked.err, Catch::Contains("user bob is locked after 5 wrong passphrases"));
  CHECK(lab.sql("SELECT reasons FROM refusals ORDER BY id DESC LIMIT 1") == "[\"user-locked\"]");
  // The user views say so.
  CHECK(lab.run({"user", "show", "bob", "--json"}).json().at("locked") == true);
  CHECK(lab.run({"user", "show", "carol", "--json"}).json().at("locked") == false);
  CHECK_THAT(lab.run({"user", "list"}).out, Catch::Contains("enabled, locked"));
  CHECK_THAT(lab.run({"user", "list", "--csv"}).out,
             Catch::Contains("bob,") && Catch::Contains(",true\r\n"));

  // Only an admin unlocks (a signed act of the admin); then bob signs.
  const auto self_unlock = signed_run(lab, "carol", "2026-03-02T10:20:00Z",
                                      {"user", "unlock", "bob", "--reason", "forgot it"},
                                      test_passphrase("carol") + "\n");
  CHECK(self_unlock.exit_code == 3);  // carol is a reviewer: not-permitted
  const auto unlock = signed_run(lab, "alice", "2026-03-02T10:25:00Z",
                                 {"user", "unlock", "bob", "--reason", "verified by phone"},
                                 test_passphrase("alice") + "\n");
  INFO(unlock.describe());
  REQUIRE(unlock.exit_code == 0);
  CHECK(unlock.json().at("locked") == false);
  const auto ok =
      signed_run(lab, "bob", "2026-03-02T10:30:00Z", approve, test_passphrase("bob") + "\n");
  INFO(ok.describe());
  CHECK(ok.exit_code == 0);
  CHECK(lab.sql("SELECT count(*) FROM curve_reviews") == "1");
  CHECK(verifies(lab));
}

TEST_CASE("signatures: the manifestation is stored with the act and shown with the curve",
          "[scenario]") {
  Lab lab("Europe/Berlin");
  const std::string id = curve_awaiting_review(lab);
  const auto r = signed_run(lab, "bob", "2026-03-02T10:00:00Z",
                            {"curve", "review", id, "--approve", "--reason", "fit checked"},
                            test_passphrase("bob") + "\n");
  INFO(r.describe());
  REQUIRE(r.exit_code == 0);
  // The signature row is in the same audit entry as the review.
  CHECK(lab.sql("SELECT a.action FROM signatures s JOIN audit_log a ON a.seq = s.audit_seq "
                "WHERE s.entity_kind = 'curve'") == "curve.approve");
  CHECK(lab.sql("SELECT count(*) FROM curve_reviews r JOIN signatures s ON s.audit_seq = "
                "r.audit_seq") == "1");

  const Json curve = lab.show_curve(std::stoll(id), "2026-03-02T11:00:00Z");
  REQUIRE(curve.at("signatures").size() == 1);
  const Json& g = curve.at("signatures")[0];
  CHECK(g.at("user") == "bob");
  CHECK(g.at("name") == "Test user bob");
  CHECK(g.at("meaning") == "approved");
  CHECK(g.at("signed_at") == "2026-03-02T10:00:00Z");
  CHECK(g.at("signed_at_local") == "2026-03-02 11:00 +01:00");
  const auto text =
      lab.box.run({"curve", "show", id}, {{"CURVEWARDEN_NOW", "2026-03-02T11:00:00Z"}});
  CHECK_THAT(text.out,
             Catch::Contains("signed: approved by Test user bob (bob), 2026-03-02 11:00 +01:00"));
}

TEST_CASE("signatures: only an Argon2id hash is stored, and a change needs the current passphrase",
          "[scenario]") {
  Lab lab;
  const std::string hash = lab.sql(
      "SELECT hash FROM user_passphrases u JOIN users s ON s.id = "
      "u.user_id WHERE s.code = 'bob'");
  CHECK(hash.rfind("$argon2id$", 0) == 0);
  CHECK(hash.find("passphrase of bob") == std::string::npos);

  // A wrong current passphrase: refused, recorded, nothing changed.
  const auto before = lab.counts();
  const auto wrong = signed_run(lab, "bob", Lab::kSetupAt, {"user", "passphrase"},
                                "guess guess guess\nnew passphrase of bob\n");
  CHECK(wrong.exit_code == 3);
  CHECK(lab.counts().at("user_passphrases") == before.at("user_passphrases"));

  // Too short a new one: bad input, nothing written.
  const auto short_one = signed_run(lab, "bob", Lab::kSetupAt, {"user", "passphrase"},
                                    test_passphrase("bob") + "\nshort\n");
  CHECK(short_one.exit_code == 2);
  CHECK_THAT(short_one.err, Catch::Contains("needs 10 to 1024"));

  const auto changed = signed_run(lab, "bob", Lab::kSetupAt, {"user", "passphrase"},
                                  test_passphrase("bob") + "\nnew passphrase of bob\n");
  INFO(changed.describe());
  REQUIRE(changed.exit_code == 0);
  const std::string id = curve_awaiting_review(lab);
  const std::vector<std::string> approve{"curve", "review", id, "--approve", "--reason", "ok"};
  CHECK(signed_run(lab, "bob", "2026-03-02T10:00:00Z", approve, test_passphrase("bob") + "\n")
            .exit_code == 3);
  CHECK(signed_run(lab, "bob", "2026-03-02T10:05:00Z", approve, "new passphrase of bob\n")
            .exit_code == 0);
  CHECK(verifies(lab));
}

TEST_CASE("signatures: with no terminal and no --passphrase-fd a signed act is refused as usage",
          "[scenario]") {
  Lab lab;
  const std::string id = curve_awaiting_review(lab);
  const auto before = lab.counts();
  const auto env = lab.box.environment({{"CURVEWARDEN_USER", "bob"}});
  const auto r = cw::test::run_process(cw::test::binary_path(),
                                       {"curve", "review", id, "--approve", "--reason", "ok"}, env,
                                       lab.box.dir());
  INFO(r.describe());
  CHECK(r.exit_code == 2);
  CHECK_THAT(r.err, Catch::Contains("no terminal to ask the passphrase on"));
  CHECK(lab.counts() == before);
  // A descriptor that is not open is named.
  const auto closed = cw::test::run_process(
      cw::test::binary_path(),
      {"curve", "review", id, "--approve", "--reason", "ok", "--passphrase-fd", "200"}, env,
      lab.box.dir());
  CHECK(closed.exit_code == 2);
  CHECK_THAT(closed.err, Catch::Contains("--passphrase-fd 200 is not an open descriptor"));
  CHECK(lab.counts() == before);
}
