// SPDX-License-Identifier: Apache-2.0
// Scenarios of second-person review and retirement: self-review and review of a rejected
// curve are refused and recorded, approval activates, retirement withdraws, all audited.
#include <catch2/catch.hpp>

#include "scenario_support.h"

using namespace cw::scenario;

namespace {

const std::string kLogged = "2026-03-02T09:00:00Z";

std::string audit_actions_after(const Lab& lab, const std::string& seq) {
  return lab.sql(
      "SELECT " + cw::test::text_join(lab.box) +
      "(actor || ':' || action, ',') FROM (SELECT actor, action FROM audit_log WHERE seq > " + seq +
      " ORDER BY seq) AS t");
}

}  // namespace

TEST_CASE("curve review: self-review refused, approval by another person, retire", "[scenario]") {
  Lab lab;  // CURVEWARDEN_USER is alice
  lab.add_instrument("IC-01");
  lab.add_lot("CRM-A", "2026-12-31");
  MethodSpec spec;
  spec.analytes = {"nitrate"};
  spec.review_required = true;
  lab.add_method(spec);
  const std::string seq0 = lab.sql("SELECT max(seq) FROM audit_log");

  const Json log = lab.log_curve("ANION-IC", "IC-01", "CRM-A",
                                 std::string(kPointsHeader) + m1_rows(), kLogged, 0);
  const std::int64_t id = log.at("curves")[0].at("id").get<std::int64_t>();
  const std::string sid = std::to_string(id);
  CHECK(log.at("curves")[0].at("state") == "awaiting-review");

  // 1. The analyst who logged it cannot approve it: exit 3, the refusal is recorded.
  {
    const auto before = lab.counts();
    const auto r = lab.run_at("2026-03-02T10:00:00Z",
                              {"curve", "review", sid, "--approve", "--reason", "looks fine"});
    INFO(r.describe());
    CHECK(r.exit_code == 3);
    CHECK_THAT(r.err, Catch::Contains("alice"));
    CHECK(r.json().at("error").at("code") == "refused");
    const auto after = lab.counts();
    CHECK(after.at("refusals") == before.at("refusals") + 1);
    CHECK(after.at("audit_log") == before.at("audit_log") + 1);
    CHECK(after.at("curve_reviews") == before.at("curve_reviews"));
    CHECK(lab.sql("SELECT action || '|' || entity_kind || '|' || entity_id || '|' || actor || "
                  "'|' || reasons || '|' || occurred_at FROM refusals ORDER BY id DESC LIMIT 1") ==
          "curve.review|curve|" + sid + "|alice|[\"self-review\"]|2026-03-02T10:00:00Z");
    CHECK(lab.sql("SELECT action || '|' || entity_id || '|' || actor FROM audit_log ORDER BY seq "
                  "DESC LIMIT 1") == "curve.review-refused|" + sid + "|alice");
    CHECK(lab.show_curve(id, "2026-03-02T10:00:00Z").at("state") == "awaiting-review");
  }

  // 2. Bob approves: awaiting-review becomes active from the approval on.
  {
    const Json approved =
        lab.json_at("2026-03-02T11:00:00Z", {"--as", "bob", "curve", "review", sid, "--approve",
                                             "--reason", "fit and residuals reviewed"});
    CHECK(approved.at("state") == "active");
    REQUIRE(approved.at("reviews").size() == 1);
    CHECK(approved.at("reviews")[0].at("reviewer") == "bob");
    CHECK(approved.at("reviews")[0].at("decision") == "approve");
    CHECK(lab.sql("SELECT reviewer || '|' || decision || '|' || occurred_at FROM curve_reviews") ==
          "bob|approve|2026-03-02T11:00:00Z");
    // Time travel: before the approval the curve was still awaiting review.
    CHECK(lab.show_curve(id, "2026-03-02T10:59:59Z").at("state") == "awaiting-review");
    CHECK(lab.show_curve(id, "2026-03-02T11:00:00Z").at("state") == "active");
    // A second review of a decided curve is refused as well.
    const auto again = lab.run_at("2026-03-02T11:30:00Z", {"--as", "carol", "curve", "review", sid,
                                                           "--approve", "--reason", "again"});
    CHECK(again.exit_code == 3);
    CHECK(lab.sql("SELECT reasons FROM refusals ORDER BY id DESC LIMIT 1") ==
          "[\"not-awaiting-review\"]");
  }

  // 3. A curve rejected by acceptance cannot be reviewed, not even by someone else.
  std::int64_t rejected = 0;
  {
    const Json bad = lab.log_curve("ANION-IC", "IC-01", "CRM-A",
                                   std::string(kPointsHeader) +
                                       "nitrate,C1,2,19.8,1,\nnitrate,C2,4,40.5,1,\n"
                                       "nitrate,C3,6,60.3,1,\nnitrate,C4,8,79.6,1,\n",
                                   "2026-03-02T12:00:00Z", 3);
    rejected = bad.at("curves")[0].at("id").get<std::int64_t>();
    const auto before = lab.counts();
    const auto r = lab.run_at("2026-03-02T12:30:00Z",
                              {"--as", "bob", "curve", "review", std::to_string(rejected),
                               "--approve", "--reason", "override"});
    INFO(r.describe());
    CHECK(r.exit_code == 3);
    CHECK(lab.counts().at("refusals") == before.at("refusals") + 1);
    CHECK(lab.counts().at("curve_reviews") == before.at("curve_reviews"));
    CHECK(lab.sql("SELECT reasons || '|' || actor FROM refusals ORDER BY id DESC LIMIT 1") ==
          "[\"rejected\"]|bob");
    CHECK(lab.show_curve(rejected, "2026-03-02T12:30:00Z").at("state") == "rejected");
  }

  // 4. Retire the approved curve.
  {
    const Json retired = lab.json_at("2026-03-02T13:00:00Z",
                                     {"curve", "retire", sid, "--reason", "column replaced"});
    CHECK(retired.at("state") == "retired");
    REQUIRE(retired.at("retirements").size() == 1);
    CHECK(retired.at("retirements")[0].at("reason") == "column replaced");
    CHECK(lab.show_curve(id, "2026-03-02T12:59:59Z").at("state") == "active");
    CHECK(lab.show_curve(id, "2026-03-02T13:00:00Z").at("state") == "retired");
    const Json list = lab.json_at("2026-03-02T13:00:00Z", {"curve", "list", "--state", "retired"});
    CHECK(ids(list.at("curves")) == std::vector<std::int64_t>{id});
    // Retiring it again is refused and recorded.
    const auto again =
        lab.run_at("2026-03-02T13:10:00Z", {"curve", "retire", sid, "--reason", "twice"});
    CHECK(again.exit_code == 3);
    CHECK(lab.sql("SELECT reasons FROM refusals ORDER BY id DESC LIMIT 1") ==
          "[\"not-retirable\"]");
    CHECK(lab.sql("SELECT count(*) FROM curve_retirements") == "1");
  }

  // Every write above is in the audit trail, in order, by the person who acted; the chain
  // verifies.
  CHECK(audit_actions_after(lab, seq0) ==
        "alice:calibration.log,alice:curve.log,"
        "alice:curve.review-refused,"
        "bob:curve.approve,"
        "carol:curve.review-refused,"
        "alice:calibration.log,alice:curve.log,"
        "bob:curve.review-refused,"
        "alice:curve.retire,"
        "alice:curve.retire-refused");
  const Json verify = lab.json_at("2026-03-02T14:00:00Z", {"audit", "verify"});
  CHECK(verify.at("ok") == true);
  CHECK(verify.at("entries").get<std::int64_t>() ==
        std::stoll(lab.sql("SELECT count(*) FROM audit_log")));
}

TEST_CASE("curve review: a reviewer's rejection makes the curve rejected", "[scenario]") {
  Lab lab;
  lab.add_instrument("IC-01");
  lab.add_lot("CRM-A", "2026-12-31");
  MethodSpec spec;
  spec.analytes = {"nitrate"};
  spec.review_required = true;
  lab.add_method(spec);
  const Json log = lab.log_curve("ANION-IC", "IC-01", "CRM-A",
                                 std::string(kPointsHeader) + m1_rows(), kLogged, 0);
  const std::string sid = std::to_string(log.at("curves")[0].at("id").get<std::int64_t>());
  const Json rejected =
      lab.json_at("2026-03-02T10:00:00Z", {"--as", "bob", "curve", "review", sid, "--reject",
                                           "--reason", "wrong standard dilution series"});
  CHECK(rejected.at("state") == "rejected");
  CHECK(rejected.at("verdict") == "accepted");  // acceptance passed; the reviewer rejected it
  // A rejected curve cannot be used.
  const auto q = lab.run_at("2026-03-02T10:30:00Z",
                            {"quantify", "--curve", sid, "--response", "13.5", "--sample", "W-1"});
  CHECK(q.exit_code == 3);
  CHECK(strings(q.json().at("reasons")) == std::vector<std::string>{"rejected"});
}
