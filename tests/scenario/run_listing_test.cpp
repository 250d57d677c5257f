// SPDX-License-Identifier: Apache-2.0
// The same rules outside runs (quantify refused with check-due once samples_per_check are used
// up; a failing check log makes the results it lists rerun-required), and the listings: run
// list and show, result list and show with their filters, check list, and trace result with the
// run, its bracketing checks and the status history.
#include <catch2/catch.hpp>

#include "run_support.h"
#include "store/sqlite/diagnostics.h"
#include "store/sqlite/sql.h"
#include "store/store.h"

using namespace cw::scenario;

namespace {

Json quantify(const Lab& lab, std::int64_t curve, const std::string& at, const std::string& sample,
              int exit = 0) {
  return lab.json_at(
      at,
      {"quantify", "--curve", std::to_string(curve), "--response", kNitrateLow, "--sample", sample},
      exit);
}

Json check(const Lab& lab, std::int64_t curve, const std::string& at, const char* response,
           int exit = 0) {
  return lab.json_at(
      at,
      {"check", "log", "--curve", std::to_string(curve), "--nominal", "6", "--response", response},
      exit);
}

}  // namespace

TEST_CASE("quantify: refused with check-due once samples_per_check results are reported",
          "[scenario][run]") {
  MethodSpec spec;
  spec.samples_per_check = "2";
  RunLab rl(spec);
  check(rl.lab, rl.nitrate, "2026-03-02T09:00:00Z", kNitratePass);
  quantify(rl.lab, rl.nitrate, "2026-03-02T09:10:00Z", "W-1");
  quantify(rl.lab, rl.nitrate, "2026-03-02T09:20:00Z", "W-2");
  const auto before = rl.lab.counts();
  const Json due = quantify(rl.lab, rl.nitrate, "2026-03-02T09:30:00Z", "W-3", 3);
  CHECK(due.at("status") == "refused");
  CHECK(due.at("reasons") == Json::array({"check-due"}));
  CHECK_THAT(due.at("reason_details")[0].at("message").get<std::string>(),
             Catch::Contains("the method allows 2 sample(s) after a passing check; 2 have been "
                             "reported"));
  CHECK(rl.lab.counts().at("results") == before.at("results") + 1);  // recorded as refused
  // A passing check standard makes room again; a blank does not.
  rl.lab.json_at("2026-03-02T09:35:00Z", {"check", "log", "--curve", std::to_string(rl.nitrate),
                                          "--kind", "blank", "--response", kBlankPass});
  quantify(rl.lab, rl.nitrate, "2026-03-02T09:40:00Z", "W-3", 3);
  check(rl.lab, rl.nitrate, "2026-03-02T09:50:00Z", kNitratePass);
  CHECK(quantify(rl.lab, rl.nitrate, "2026-03-02T10:00:00Z", "W-3").at("status") == "reported");
}

TEST_CASE("quantify, check log: a result of the passing check's own second counts after it",
          "[scenario][run]") {
  // Times are kept to the second, and a lab entering work afterwards often gives the same --at
  // to a check and the samples it bracketed: what was recorded after the check counts after it.
  MethodSpec spec;
  spec.samples_per_check = "2";
  RunLab rl(spec);
  const std::string t = "2026-03-02T09:00:00Z";
  const auto before = quantify(rl.lab, rl.nitrate, t, "W-0").at("result_id");  // before the check
  check(rl.lab, rl.nitrate, t, kNitratePass);
  const auto r1 = quantify(rl.lab, rl.nitrate, t, "W-1").at("result_id");
  const auto r2 = quantify(rl.lab, rl.nitrate, t, "W-2").at("result_id");
  const Json due = quantify(rl.lab, rl.nitrate, t, "W-3", 3);
  CHECK(due.at("reasons") == Json::array({"check-due"}));
  const Json fail = check(rl.lab, rl.nitrate, "2026-03-02T09:30:00Z", kNitrateFail, 3);
  CHECK(fail.at("affected_results") == Json::array({r1, r2}));
  CHECK(before != r1);
  const Json w0 =
      rl.lab.json_at("2026-03-02T09:40:00Z", {"result", "show", std::to_string(before.get<int>())});
  CHECK(w0.at("status") == "reported");  // bracketed by the passing check recorded after it
}

TEST_CASE("check log: a failure makes the results it lists rerun-required, once",
          "[scenario][run]") {
  RunLab rl;
  check(rl.lab, rl.nitrate, "2026-03-02T09:00:00Z", kNitratePass);
  const auto r1 = quantify(rl.lab, rl.nitrate, "2026-03-02T09:10:00Z", "W-1").at("result_id");
  const auto r2 = quantify(rl.lab, rl.nitrate, "2026-03-02T09:20:00Z", "W-2").at("result_id");
  const Json fail = check(rl.lab, rl.nitrate, "2026-03-02T09:30:00Z", kNitrateFail, 3);
  CHECK(fail.at("affected_results") == Json::array({r1, r2}));
  CHECK(rl.lab.sql("SELECT count(*) FROM result_status_events") == "2");
  const Json shown =
      rl.lab.json_at("2026-03-02T09:40:00Z", {"result", "show", std::to_string(r1.get<int>())});
  CHECK(shown.at("status") == "rerun-required");
  CHECK(shown.at("recorded_status") == "reported");
  REQUIRE(shown.at("status_history").size() == 1);
  CHECK(shown.at("status_history")[0].at("reason") == "check-failed");
  CHECK(shown.at("status_history")[0].at("check_id") == fail.at("check_id"));
  CHECK(shown.at("status_history")[0].at("run_id").is_null());
  // A second failure lists them again but does not mark them twice.
  const Json again = check(rl.lab, rl.nitrate, "2026-03-02T09:50:00Z", kNitrateFail, 3);
  CHECK(again.at("affected_results") == Json::array({r1, r2}));
  CHECK(rl.lab.sql("SELECT count(*) FROM result_status_events") == "2");
}

TEST_CASE("listings: runs, results and checks with their filters, and trace result of a run",
          "[scenario][run]") {
  RunLab rl;
  const std::string csv = std::string(kRunHeader) +  //
                          row(1, "check", "CCV", "nitrate", kNitratePass, "6") +
                          row(2, "sample", "W-1", "nitrate", kNitrateLow) +
                          row(3, "sample", "W-2", "nitrate", kNitrateHigh) +
                          row(4, "check", "CCV", "nitrate", kNitratePass, "6") +
                          row(5, "sample", "W-3", "nitrate", kNitrateLow);
  const Json run = rl.import_json("day.csv", csv, 3);
  const std::int64_t run_id = run.at("run_id").get<std::int64_t>();
  const std::string later = "2026-03-02T15:00:00Z";
  quantify(rl.lab, rl.sulfate, later, "W-9");

  const Json runs = rl.lab.json_at(later, {"run", "list"});
  REQUIRE(runs.at("runs").size() == 1);
  CHECK(runs.at("runs")[0].at("run_id") == run_id);
  CHECK(runs.at("runs")[0].at("summary").at("nitrate").at("rerun_required") == 1);

  const Json shown = rl.lab.json_at(later, {"run", "show", std::to_string(run_id)});
  CHECK(shown.at("results") == run.at("results"));
  CHECK(shown.at("checks") == run.at("checks"));
  CHECK(shown.at("summary") == run.at("summary"));
  const RunResult text = rl.lab.run({"--at", later, "run", "show", std::to_string(run_id)});
  CHECK(text.exit_code == 0);
  CHECK_THAT(text.out, Catch::Contains("rerun-required"));

  const auto samples = [&](const std::vector<std::string>& filter) {
    std::vector<std::string> args{"result", "list"};
    args.insert(args.end(), filter.begin(), filter.end());
    std::vector<std::string> out;
    const Json listed = rl.lab.json_at(later, args);
    UNSCOPED_INFO(listed.dump());
    for (const auto& r : listed.at("results")) {
      out.push_back(r.at("sample").get<std::string>() + ":" + r.at("status").get<std::string>());
    }
    return out;
  };
  CHECK(samples({}) == std::vector<std::string>{"W-1:reported", "W-2:refused", "W-3:rerun-required",
                                                "W-9:reported"});
  CHECK(samples({"--run", std::to_string(run_id)}).size() == 3);
  CHECK(samples({"--status", "rerun-required"}) == std::vector<std::string>{"W-3:rerun-required"});
  CHECK(samples({"--sample", "W-2"}) == std::vector<std::string>{"W-2:refused"});
  CHECK(samples({"--since", "2026-03-02T14:00:00Z"}) == std::vector<std::string>{"W-9:reported"});
  CHECK(samples({"--status", "reported", "--run", std::to_string(run_id)}) ==
        std::vector<std::string>{"W-1:reported"});
  // As of a moment before the run, it has no results.
  CHECK(rl.lab.json_at("2026-03-02T11:00:00Z", {"result", "list"}).at("results") == Json::array());

  const Json checks =
      rl.lab.json_at(later, {"check", "list", "--curve", std::to_string(rl.nitrate)});
  REQUIRE(checks.at("checks").size() == 2);
  CHECK(checks.at("checks")[0].at("run_id") == run_id);
  CHECK(rl.lab.json_at(later, {"check", "list", "--curve", std::to_string(rl.sulfate)})
            .at("checks") == Json::array());

  // trace result: the run, the checks bracketing W-1 by position, and its status history.
  const auto w1 = result_of(run, "W-1").at("result_id").get<std::int64_t>();
  const Json trace = rl.lab.json_at(later, {"trace", "result", std::to_string(w1)});
  CHECK(trace.at("run").at("run_id") == run_id);
  CHECK(trace.at("run").at("position") == 2);
  REQUIRE(trace.at("checks").size() == 2);
  CHECK(trace.at("checks")[0].at("bracket") == "before");
  CHECK(trace.at("checks")[0].at("position") == 1);
  CHECK(trace.at("checks")[1].at("bracket") == "after");
  CHECK(trace.at("checks")[1].at("position") == 4);
  CHECK(trace.at("status_history") == Json::array());
  const auto w3 = result_of(run, "W-3").at("result_id").get<std::int64_t>();
  const Json trace3 = rl.lab.json_at(later, {"trace", "result", std::to_string(w3)});
  CHECK(trace3.at("result").at("status") == "rerun-required");
  REQUIRE(trace3.at("checks").size() == 1);  // no closing check after it
  CHECK(trace3.at("status_history")[0].at("reason") == "no-closing-check");
}

// SQLite's query plans of the SQLite backend's statements: [sqlite-only] (PostgreSQL's planner
// chooses by table statistics, and its statements are another backend's).
TEST_CASE("runs: the statements of re-import checks, run rows and status events use indexes",
          "[scenario][run][sqlite-only]") {
  RunLab rl;
  cw::store::OpenOptions options;
  options.location = rl.lab.box.location();
  auto store = cw::store::Store::open(options);
  namespace sql = cw::store::sqlite::sql;
  const auto plan = [&](const char* statement) {
    const std::string p = cw::store::sqlite::query_plan(*store, statement);
    UNSCOPED_INFO("plan:\n" << p);
    return p;
  };
  // The very statements the repositories execute.
  CHECK_THAT(plan(sql::kRunsWithSha256), Catch::Contains("runs_by_sha256"));
  CHECK_THAT(plan(sql::kStatusEventsOf), Catch::Contains("result_status_events_by_result"));
  const std::string rows = plan(sql::kResultsOfRun);
  CHECK_THAT(rows, Catch::Contains("sqlite_autoindex_run_results"));
  CHECK_THAT(rows, !Catch::Contains("SCAN r\n"));
  // A group's curves are found by an index on its three keys (either of the two that hold them).
  const std::string group = plan(sql::kChecksOfGroup);
  CHECK_THAT(group, Catch::Contains("SEARCH c USING"));
  CHECK_THAT(group, Catch::Contains("instrument_id=?") && Catch::Contains("method_id=?") &&
                        Catch::Contains("analyte=?"));
  CHECK_THAT(plan(sql::kCountReportedBetween), Catch::Contains("results_by_curve"));
}
