// SPDX-License-Identifier: Apache-2.0
// Scenarios of `run import` (product.md §5.4): a whole sequence decided in one command with
// check-standard bracketing. Every check passing; a check failing mid-run (which results flip,
// which are refused); samples_per_check exceeded; a run without a closing check; two analytes
// where one fails; a blank above its limit; the same file refused and imported again on purpose;
// every status event in the audit trail; and a failure late in the file that leaves the store
// exactly as it was.
#include <catch2/catch.hpp>

#include "audit/sha256.h"
#include "run_support.h"

using namespace cw::scenario;

TEST_CASE("run import: every check passes, every sample is reported", "[scenario][run]") {
  RunLab rl;
  const std::string csv = std::string(kRunHeader) +  //
                          row(1, "check", "CCV-1", "nitrate", kNitratePass, "6") +
                          row(2, "sample", "W-01", "nitrate", kNitrateLow) +
                          row(3, "sample", "W-02", "nitrate", "21.0") +
                          row(4, "blank", "CCB-1", "nitrate", kBlankPass) +
                          row(5, "check", "CCV-2", "nitrate", kNitratePass, "6") +
                          row(6, "check", "CCV-S", "sulfate", kSulfatePass, "6") +
                          row(7, "sample", "W-01", "sulfate", kSulfateSample) +
                          row(8, "check", "CCV-S", "sulfate", kSulfatePass, "6");
  const auto before = rl.lab.counts();
  const Json run = rl.import_json("day.csv", csv, 0);
  CHECK(run.at("run_id").is_number_integer());
  CHECK(run.at("file_sha256") == cw::audit::sha256_hex(csv));
  CHECK(run.at("method") == "ANION-IC");
  CHECK(run.at("instrument") == "IC-01");
  CHECK(run.at("rows") == 8);
  CHECK(run.at("status_events") == 0);
  CHECK(run.at("failed_checks") == Json::array());
  REQUIRE(run.at("results").size() == 3);
  REQUIRE(run.at("checks").size() == 5);
  for (const auto& r : run.at("results")) {
    CHECK(r.at("status") == "reported");
    CHECK(r.at("rerun").is_null());
  }
  // M1 inverse prediction (calibration-practice.md §9 M1): x0 = (y0 − a)/b.
  const Json& w1 = run.at("results")[0];
  CHECK(w1.at("position") == 2);
  CHECK(w1.at("analyte") == "nitrate");
  CHECK(w1.at("curve_id") == rl.nitrate);
  CHECK(w1.at("concentration").get<double>() == Approx(3.876040703).epsilon(1e-8));
  CHECK(run.at("results")[2].at("concentration").get<double>() ==
        Approx(2.943905070).epsilon(1e-8));
  const Json& ccv = run.at("checks")[0];
  CHECK(ccv.at("position") == 1);
  CHECK(ccv.at("label") == "CCV-1");
  CHECK(ccv.at("kind") == "check");
  CHECK(ccv.at("nominal") == 6.0);
  CHECK(ccv.at("measured").get<double>() == Approx(6.207215541).epsilon(1e-8));
  CHECK(ccv.at("recovery_pct").get<double>() == Approx(103.4535924).epsilon(1e-8));
  CHECK(ccv.at("passed") == true);
  CHECK(run.at("checks")[1].at("kind") == "blank");
  const Json& n = run.at("summary").at("nitrate");
  CHECK(n.at("samples") == 2);
  CHECK(n.at("reported") == 2);
  CHECK(n.at("rerun_required") == 0);
  CHECK(n.at("checks_passed") == 2);
  CHECK(n.at("blanks_passed") == 1);
  CHECK(run.at("summary").at("sulfate").at("reported") == 1);

  // One run row, each result and check with its membership row and its own audit entry.
  const auto after = rl.lab.counts();
  CHECK(after.at("runs") - before.at("runs") == 1);
  CHECK(after.at("results") - before.at("results") == 3);
  CHECK(after.at("run_results") - before.at("run_results") == 3);
  CHECK(after.at("checks") - before.at("checks") == 5);
  CHECK(after.at("run_checks") - before.at("run_checks") == 5);
  CHECK(after.at("audit_log") - before.at("audit_log") == 1 + 3 + 5);
  CHECK(rl.lab.show_curve(rl.nitrate, kRunAt).at("state") == "active");
}

TEST_CASE("run import: a check failing mid-run flips its bracket and refuses what follows",
          "[scenario][run]") {
  RunLab rl;
  const std::string csv = std::string(kRunHeader) +  //
                          row(1, "check", "CCV", "nitrate", kNitratePass, "6") +
                          row(2, "sample", "S1", "nitrate", kNitrateLow) +
                          row(3, "sample", "S2", "nitrate", kNitrateLow) +
                          row(4, "check", "CCV", "nitrate", kNitratePass, "6") +
                          row(5, "sample", "S3", "nitrate", kNitrateLow) +
                          row(6, "sample", "S4", "nitrate", kNitrateHigh) +  // above range
                          row(7, "sample", "S5", "nitrate", kNitrateLow) +
                          row(8, "check", "CCV", "nitrate", kNitrateFail, "6") +
                          row(9, "sample", "S6", "nitrate", kNitrateLow) +
                          row(10, "check", "CCV", "nitrate", kNitratePass, "6") +
                          row(11, "sample", "S7", "nitrate", kNitrateLow);
  const RunResult r = rl.import("fail.csv", csv);
  INFO(r.describe());
  REQUIRE(r.exit_code == 3);  // recorded; the error names what needs attention
  CHECK_THAT(r.err, Catch::Contains("2 result(s) must be re-run, 3 refused, 1 check(s)"));
  const Json run = r.json();
  CHECK(run.at("error").at("code") == "refused");
  CHECK(status_by_sample(run) == std::map<std::string, std::string>{{"S1", "reported"},
                                                                    {"S2", "reported"},
                                                                    {"S3", "rerun-required"},
                                                                    {"S4", "refused"},
                                                                    {"S5", "rerun-required"},
                                                                    {"S6", "refused"},
                                                                    {"S7", "refused"}});
  const std::int64_t failing = run.at("checks")[2].at("check_id").get<std::int64_t>();
  CHECK(run.at("checks")[2].at("passed") == false);
  const Json& s3 = result_of(run, "S3");
  CHECK(s3.at("recorded_status") == "reported");  // the row is never edited
  CHECK(s3.at("rerun").at("reason") == "check-failed");
  CHECK(s3.at("rerun").at("check_id") == failing);
  CHECK(s3.at("rerun").at("run_id") == run.at("run_id"));
  CHECK_THAT(s3.at("rerun").at("detail").get<std::string>(),
             Catch::Contains("at position 8 failed: recovery 136.3 %"));
  CHECK(result_of(run, "S4").at("reasons") == Json::array({"above-range"}));
  CHECK(result_of(run, "S6").at("reasons") == Json::array({"check-failed"}));
  CHECK(result_of(run, "S7").at("reasons") == Json::array({"check-failed"}));  // no rescue
  CHECK(run.at("failed_checks").size() == 1);
  CHECK(run.at("status_events") == 2);
  CHECK(run.at("summary").at("nitrate").at("checks_failed") == 1);
  CHECK(run.at("summary").at("nitrate").at("checks_passed") == 3);
  // The failing check made the curve stale, as a check log would.
  const Json curve = rl.lab.show_curve(rl.nitrate, kRunAt);
  CHECK(curve.at("state") == "stale");
  CHECK(sorted_reasons(curve.at("reasons")) == std::vector<std::string>{"check-failed"});
}

TEST_CASE("run import: samples beyond samples_per_check are rerun-required", "[scenario][run]") {
  MethodSpec spec;
  spec.samples_per_check = "3";
  RunLab rl(spec);
  std::string csv = std::string(kRunHeader) + row(1, "check", "CCV", "nitrate", kNitratePass, "6");
  for (int i = 1; i <= 5; ++i) {
    csv += row(1 + i, "sample", "S" + std::to_string(i), "nitrate", kNitrateLow);
  }
  csv += row(7, "check", "CCV", "nitrate", kNitratePass, "6");
  const Json run = rl.import_json("many.csv", csv, 3);
  CHECK(status_by_sample(run) == std::map<std::string, std::string>{{"S1", "reported"},
                                                                    {"S2", "reported"},
                                                                    {"S3", "reported"},
                                                                    {"S4", "rerun-required"},
                                                                    {"S5", "rerun-required"}});
  const Json& s4 = result_of(run, "S4");
  CHECK(s4.at("rerun").at("reason") == "samples-per-check");
  CHECK(s4.at("rerun").at("check_id") == run.at("checks")[0].at("check_id"));
  CHECK_THAT(s4.at("rerun").at("detail").get<std::string>(),
             Catch::Contains("reported sample number 4 since check"));
  CHECK(run.at("summary").at("nitrate").at("rerun_required") == 2);
}

TEST_CASE(
    "run import: a run that ends without a closing check leaves its trailing results "
    "rerun-required",
    "[scenario][run]") {
  RunLab rl;
  // The first two samples come before any check of the run: the run's first check closes
  // their bracket (the curve was active when the run began).
  const std::string csv = std::string(kRunHeader) +  //
                          row(1, "sample", "A1", "nitrate", kNitrateLow) +
                          row(2, "sample", "A2", "nitrate", kNitrateLow) +
                          row(3, "check", "CCV", "nitrate", kNitratePass, "6") +
                          row(4, "sample", "B1", "nitrate", kNitrateLow) +
                          row(5, "sample", "B2", "nitrate", kNitrateLow);
  const Json run = rl.import_json("open.csv", csv, 3);
  CHECK(status_by_sample(run) == std::map<std::string, std::string>{{"A1", "reported"},
                                                                    {"A2", "reported"},
                                                                    {"B1", "rerun-required"},
                                                                    {"B2", "rerun-required"}});
  CHECK(result_of(run, "B1").at("rerun").at("reason") == "no-closing-check");
  CHECK(result_of(run, "B2").at("rerun").at("check_id") == run.at("checks")[0].at("check_id"));
}

TEST_CASE("run import: two analytes, one fails: the other is untouched", "[scenario][run]") {
  RunLab rl;
  const std::string csv = std::string(kRunHeader) +  //
                          row(1, "check", "CCV-N", "nitrate", kNitratePass, "6") +
                          row(2, "check", "CCV-S", "sulfate", kSulfatePass, "6") +
                          row(3, "sample", "W-01", "nitrate", kNitrateLow) +
                          row(4, "sample", "W-01s", "sulfate", kSulfateSample) +
                          row(5, "sample", "W-02", "nitrate", kNitrateLow) +
                          row(6, "sample", "W-02s", "sulfate", kSulfateSample) +
                          row(7, "check", "CCV-N", "nitrate", kNitrateFail, "6") +
                          row(8, "check", "CCV-S", "sulfate", kSulfatePass, "6") +
                          row(9, "sample", "W-03", "nitrate", kNitrateLow) +
                          row(10, "sample", "W-03s", "sulfate", kSulfateSample) +
                          row(11, "check", "CCV-S", "sulfate", kSulfatePass, "6");
  const Json run = rl.import_json("two.csv", csv, 3);
  CHECK(status_by_sample(run) == std::map<std::string, std::string>{{"W-01", "rerun-required"},
                                                                    {"W-02", "rerun-required"},
                                                                    {"W-03", "refused"},
                                                                    {"W-01s", "reported"},
                                                                    {"W-02s", "reported"},
                                                                    {"W-03s", "reported"}});
  CHECK(run.at("summary").at("sulfate").at("reported") == 3);
  CHECK(run.at("summary").at("sulfate").at("checks_failed") == 0);
  CHECK(run.at("summary").at("nitrate").at("rerun_required") == 2);
  CHECK(run.at("summary").at("nitrate").at("refused") == 1);
  CHECK(rl.lab.show_curve(rl.sulfate, kRunAt).at("state") == "active");
  CHECK(rl.lab.show_curve(rl.nitrate, kRunAt).at("state") == "stale");
}

TEST_CASE("run import: a blank above its limit fails its bracket like a check", "[scenario][run]") {
  RunLab rl;
  const std::string csv = std::string(kRunHeader) +  //
                          row(1, "check", "CCV", "nitrate", kNitratePass, "6") +
                          row(2, "sample", "S1", "nitrate", kNitrateLow) +
                          row(3, "blank", "CCB", "nitrate", kBlankFail) +
                          row(4, "sample", "S2", "nitrate", kNitrateLow) +
                          row(5, "check", "CCV", "nitrate", kNitratePass, "6");
  const Json run = rl.import_json("blank.csv", csv, 3);
  CHECK(status_by_sample(run) ==
        std::map<std::string, std::string>{{"S1", "rerun-required"}, {"S2", "refused"}});
  const Json& blank = run.at("checks")[1];
  CHECK(blank.at("kind") == "blank");
  CHECK(blank.at("passed") == false);
  // M1: 3.5 reads 1.026827012 against the curve's LOD 0.7399653784 (§9 M1).
  CHECK(blank.at("measured").get<double>() == Approx(1.026827012).epsilon(1e-8));
  CHECK(blank.at("limit_high").get<double>() == Approx(m1::kLod).epsilon(1e-8));
  CHECK_THAT(result_of(run, "S1").at("rerun").at("detail").get<std::string>(),
             Catch::Contains("blank"));
  CHECK(run.at("summary").at("nitrate").at("blanks_failed") == 1);
}

TEST_CASE("run import: a censored result shows what was released, in the run and its show",
          "[scenario][run]") {
  RunLab rl;
  // 2.5 reads about 0.1 mg/L on M1, below the lowest non-zero calibrator (2 mg/L).
  const std::string csv = std::string(kRunHeader) +
                          row(1, "check", "CCV", "nitrate", kNitratePass, "6") +
                          row(2, "sample", "W-low", "nitrate", "2.5") +
                          row(3, "check", "CCV", "nitrate", kNitratePass, "6");
  const Json run = rl.import_json("low.csv", csv, 0);
  const Json shown =
      rl.lab.json_at(kRunAt, {"run", "show", std::to_string(run.at("run_id").get<int>())});
  for (const Json* doc : {&run, &shown}) {
    const Json& r = result_of(*doc, "W-low");
    CHECK(r.at("status") == "reported");
    CHECK(r.at("concentration").is_null());
    CHECK(r.at("censored") == "<");
    CHECK(r.at("reporting_limit").get<double>() == 2.0);
  }
}

TEST_CASE("run import: a run read from standard input, redirected from a file or piped",
          "[scenario][run]") {
  RunLab rl;
  const std::string csv = std::string(kRunHeader) +
                          row(1, "check", "CCV", "nitrate", kNitratePass, "6") +
                          row(2, "sample", "S1", "nitrate", kNitrateLow) +
                          row(3, "check", "CCV", "nitrate", kNitratePass, "6");
  const std::vector<std::string> args{"--json", "--at",     kRunAt,     "run",          "import",
                                      "-",      "--method", "ANION-IC", "--instrument", "IC-01"};
  const cw::test::EnvOverrides now{{"CURVEWARDEN_NOW", kRunAt}};
  // The file is read twice (its rows checked, then imported): a pipe cannot be read again.
  const auto piped = [&] {
    const auto file = rl.lab.box.write_file("piped.csv", csv);
    std::vector<std::string> shell{"-c", "f=$1; shift; cat \"$f\" | \"$0\" \"$@\"",
                                   cw::test::binary_path().string(), file.string()};
    shell.insert(shell.end(), args.begin(), args.end());
    return cw::test::run_process("/bin/sh", shell, rl.lab.box.environment(now), rl.lab.box.dir());
  };
  SECTION("redirected") {
    const RunResult r = rl.lab.box.run_with_input(args, csv, now);
    INFO(r.describe());
    REQUIRE(r.exit_code == 0);
    CHECK(r.json().at("file_name") == "(standard input)");
    CHECK(status_by_sample(r.json()) == std::map<std::string, std::string>{{"S1", "reported"}});
    // The same rows piped in are the same file: refused, naming standard input.
    const RunResult again = piped();
    INFO(again.describe());
    CHECK(again.exit_code == 3);
    CHECK_THAT(again.err, Catch::Contains("'(standard input)' (sha256 "));
  }
  SECTION("piped") {
    const RunResult r = piped();
    INFO(r.describe());
    REQUIRE(r.exit_code == 0);
    CHECK(r.json().at("file_name") == "(standard input)");
    CHECK(r.json().at("results").size() == 1);
    CHECK(rl.lab.counts().at("runs") == 1);
  }
}

TEST_CASE("run import: the same file is refused, then imported again with --again",
          "[scenario][run]") {
  RunLab rl;
  const std::string csv = std::string(kRunHeader) +
                          row(1, "check", "CCV", "nitrate", kNitratePass, "6") +
                          row(2, "sample", "S1", "nitrate", kNitrateLow) +
                          row(3, "check", "CCV", "nitrate", kNitratePass, "6");
  const Json first = rl.import_json("day.csv", csv, 0);
  const auto before = rl.lab.counts();
  const RunResult again = rl.import("day.csv", csv, {}, "2026-03-02T13:00:00Z");
  INFO(again.describe());
  CHECK(again.exit_code == 3);
  CHECK_THAT(again.err, Catch::Contains("was imported before as run " +
                                        std::to_string(first.at("run_id").get<int>())));
  CHECK(again.json().at("error").at("code") == "refused");
  const auto after = rl.lab.counts();
  CHECK(after.at("refusals") == before.at("refusals") + 1);  // the refusal is recorded
  CHECK(after.at("results") == before.at("results"));
  CHECK(after.at("runs") == before.at("runs"));
  CHECK(rl.lab.sql("SELECT reasons FROM refusals ORDER BY id DESC LIMIT 1") ==
        "[\"already-imported\"]");
  CHECK(rl.lab.sql("SELECT action FROM audit_log ORDER BY seq DESC LIMIT 1") ==
        "run.import-refused");

  // --again needs its reason, and then imports the file as a new run.
  const RunResult no_reason = rl.import("day.csv", csv, {"--again"}, "2026-03-02T13:00:00Z");
  CHECK(no_reason.exit_code == 2);
  CHECK_THAT(no_reason.err, Catch::Contains("--again needs --reason TEXT"));
  const Json second = rl.import_json("day.csv", csv, 0, {"--again", "--reason", "re-integrated"},
                                     "2026-03-02T13:00:00Z");
  CHECK(second.at("run_id") != first.at("run_id"));
  CHECK(second.at("again_reason") == "re-integrated");
  CHECK(second.at("file_sha256") == first.at("file_sha256"));
  // --again on a file never imported is a mistake of usage, not a new fact.
  const RunResult fresh =
      rl.import("other.csv", csv + row(4, "sample", "S2", "nitrate", kNitrateLow),
                {"--again", "--reason", "why"}, "2026-03-02T14:00:00Z");
  CHECK(fresh.exit_code == 2);
  CHECK_THAT(fresh.err, Catch::Contains("was never imported"));
}

TEST_CASE("run import: the audit trail holds every status event", "[scenario][run]") {
  MethodSpec spec;
  spec.samples_per_check = "2";
  RunLab rl(spec);
  const std::string csv = std::string(kRunHeader) +  //
                          row(1, "check", "CCV", "nitrate", kNitratePass, "6") +
                          row(2, "sample", "S1", "nitrate", kNitrateLow) +
                          row(3, "sample", "S2", "nitrate", kNitrateLow) +
                          row(4, "sample", "S3", "nitrate", kNitrateLow) +  // samples-per-check
                          row(5, "check", "CCV", "nitrate", kNitratePass, "6") +
                          row(6, "sample", "S4", "nitrate", kNitrateLow) +
                          row(7, "check", "CCV", "nitrate", kNitrateFail, "6") +  // S4
                          row(8, "check", "CCV-S", "sulfate", kSulfatePass, "6") +
                          row(9, "sample", "T1", "sulfate", kSulfateSample);  // no closing check
  const Json run = rl.import_json("events.csv", csv, 3);
  CHECK(run.at("status_events") == 3);
  CHECK(rl.lab.sql("SELECT count(*) FROM result_status_events") == "3");
  CHECK(
      rl.lab.sql("SELECT " + cw::test::text_join(rl.lab.box) +
                 "(reason, ',') FROM (SELECT reason FROM result_status_events ORDER BY id) AS t") ==
      "samples-per-check,check-failed,no-closing-check");
  // Each event is in the payload of an entry of its own, naming its result.
  CHECK(rl.lab.sql("SELECT count(*) FROM result_status_events e JOIN audit_log a "
                   "ON a.seq = e.audit_seq WHERE a.action = 'result.rerun-required' AND "
                   "a.entity_kind = 'result' AND a.entity_id = CAST(e.result_id AS TEXT) AND "
                   "a.payload LIKE '%\"result_status_events\":[{%'") == "3");
  const Json verify = rl.lab.json_at(kRunAt, {"audit", "verify"});
  CHECK(verify.at("ok") == true);
}

TEST_CASE("run import: a bad row near the end of a large run leaves the store as it was",
          "[scenario][run]") {
  RunLab rl;
  // 3000 rows: a check and nine samples, over and over; row 2990 is bad.
  const auto build = [](const std::string& bad_row) {
    std::string csv = kRunHeader;
    for (long p = 1; p <= 3000; ++p) {
      if (p == 2990) {
        csv += bad_row;
      } else if (p % 10 == 1) {
        csv += row(p, "check", "CCV", "nitrate", kNitratePass, "6");
      } else {
        csv += row(p, "sample", "S" + std::to_string(p), "nitrate", kNitrateLow);
      }
    }
    return csv;
  };
  const std::string head_before =
      rl.lab.sql("SELECT hash FROM audit_log ORDER BY seq DESC LIMIT 1");
  const auto counts_before = rl.lab.counts();

  SECTION("found when the file is first read: nothing is written at all") {
    const RunResult r = rl.import("late.csv", build(row(2990, "sample", "S", "nitrate", "0x1A")));
    INFO(r.describe());
    CHECK(r.exit_code == 2);
    CHECK_THAT(r.err, Catch::Contains("late.csv:2991:5"));
    CHECK(r.json().at("error").at("line") == 2991);
  }
  SECTION("found only while deciding inside the transaction: everything is rolled back") {
    // A nominal below the curve's lowest calibrator that is not a blank (2 mg/L; M1 has a zero
    // level): the row is well formed, and the problem shows only when the check is judged on the
    // curve, after 2988 rows were written.
    const RunResult r =
        rl.import("late.csv", build(row(2990, "check", "CCV", "nitrate", kNitratePass, "1.5")));
    INFO(r.describe());
    CHECK(r.exit_code == 2);
    CHECK_THAT(r.err, Catch::Contains("late.csv:2991:6"));
    CHECK_THAT(r.err, Catch::Contains("lies outside the curve's working range, 2 to 12"));
  }
  CHECK(rl.lab.counts() == counts_before);
  CHECK(rl.lab.sql("SELECT hash FROM audit_log ORDER BY seq DESC LIMIT 1") == head_before);
  CHECK(rl.lab.json_at(kRunAt, {"audit", "verify"}).at("ok") == true);
}

TEST_CASE(
    "run import: a curve overdue for its check is taken up again by the run's opening "
    "check",
    "[scenario][run]") {
  MethodSpec spec;
  spec.check_every = "1 hours";  // logged at 08:00, overdue from 09:00; the run is at 12:00
  RunLab rl(spec);
  const std::string csv = std::string(kRunHeader) +  //
                          row(1, "sample", "EARLY", "nitrate", kNitrateLow) +
                          row(2, "check", "CCV", "nitrate", kNitratePass, "6") +
                          row(3, "sample", "W-1", "nitrate", kNitrateLow) +
                          row(4, "check", "CCV", "nitrate", kNitratePass, "6");
  const Json run = rl.import_json("overdue.csv", csv, 3);
  CHECK(run.at("curves")[0].at("state_at_start") == "stale");
  CHECK(run.at("curves")[0].at("reasons_at_start") == Json::array({"check-overdue"}));
  CHECK(status_by_sample(run) ==
        std::map<std::string, std::string>{{"EARLY", "refused"}, {"W-1", "reported"}});
  CHECK(result_of(run, "EARLY").at("reasons") == Json::array({"check-overdue"}));
}

TEST_CASE("run import: an analyte without any curve refuses the whole run", "[scenario][run]") {
  Lab lab;
  lab.add_instrument("IC-01");
  lab.add_lot("CRM-A", "2026-12-31");
  lab.add_method(MethodSpec{});
  lab.log_curve("ANION-IC", "IC-01", "CRM-A", std::string(kPointsHeader) + m1_rows(), kCurvesAt);
  const auto file = lab.box.write_file(
      "both.csv", std::string(kRunHeader) + row(1, "check", "CCV", "nitrate", kNitratePass, "6") +
                      row(2, "sample", "W-1", "sulfate", kSulfateSample));
  const auto before = lab.counts();
  const RunResult r = lab.run_at(
      kRunAt, {"run", "import", file.string(), "--method", "ANION-IC", "--instrument", "IC-01"});
  INFO(r.describe());
  CHECK(r.exit_code == 3);
  CHECK_THAT(r.err, Catch::Contains("can take the run's rows for sulfate"));
  const auto after = lab.counts();
  CHECK(after.at("refusals") == before.at("refusals") + 1);
  CHECK(after.at("runs") == before.at("runs"));
  CHECK(after.at("results") == before.at("results"));
  CHECK(after.at("checks") == before.at("checks"));
  CHECK(lab.sql("SELECT reasons FROM refusals ORDER BY id DESC LIMIT 1") ==
        "[\"no-active-curve\"]");
}
