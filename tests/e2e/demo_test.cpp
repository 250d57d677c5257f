// SPDX-License-Identifier: Apache-2.0
// The demo (demo/run.sh) plays to the end with the built binary, and what it claims to show is
// in its store: the rejected calibration, the excluded injection, the self-review refused, the
// drift warned before the failing check, the re-run list and the refusals of the failed run,
// the method revision and the lot withdrawal with their impact, the week's expiries, the plots
// and reports, and a trail that verifies. The demo's data are invented (demo/gen/*.awk).
// The demo makes its own store file (demo/run.sh sets CURVEWARDEN_DB=demo.db), whatever the
// backend of the test run: [sqlite-only], so that the PostgreSQL pass does not play it again.
#include <catch2/catch.hpp>
#include <cstdio>
#include <filesystem>
#include <memory>
#include <set>
#include <string>

#include "harness.h"

// The demo plays once (a few seconds); the blocks below read its store (no SECTIONs, which
// would replay it for each).

namespace {

using cw::test::RunResult;
using cw::test::Sandbox;
using nlohmann::json;

std::string command_output(const std::string& command) {
  std::string out;
  std::unique_ptr<FILE, int (*)(FILE*)> pipe(popen(command.c_str(), "r"), pclose);
  REQUIRE(pipe != nullptr);
  char buffer[512];
  while (fgets(buffer, sizeof buffer, pipe.get()) != nullptr) out += buffer;
  return out;
}

/// The binary run on the demo's store as of the demo's last moment.
json query(const Sandbox& box, std::vector<std::string> args,
           const std::string& at = "2026-12-02T12:00:00Z") {
  args.push_back("--json");
  const RunResult r = box.run(args, {{"CURVEWARDEN_DB", (box.dir() / "out" / "demo.db").string()},
                                     {"CURVEWARDEN_NOW", at}});
  INFO(r.describe());
  REQUIRE(r.exit_code == 0);
  return r.json();
}

}  // namespace

TEST_CASE("e2e demo: three weeks of the fictional lab play to the end and show what they claim",
          "[e2e][demo][sqlite-only]") {
  Sandbox box;
  const auto out = box.dir() / "out";
  const RunResult demo =
      cw::test::run_process("/bin/bash", {std::string(CW_SOURCE_DIR) + "/demo/run.sh"},
                            box.environment({{"CURVEWARDEN_BIN", cw::test::binary_path().string()},
                                             {"CURVEWARDEN_DEMO_OUT", out.string()},
                                             {"CURVEWARDEN_DB", std::nullopt},
                                             {"CURVEWARDEN_USER", std::nullopt},
                                             {"CURVEWARDEN_NOW", std::nullopt}}),
                            box.dir());
  INFO(demo.describe());
  REQUIRE(demo.exit_code == 0);
  CHECK(demo.out.find("internal error") == std::string::npos);
  CHECK(demo.out.find("Audit trail intact") != std::string::npos);
  CHECK(demo.out.find("What to open") != std::string::npos);
  CHECK(demo.out.find('\033') == std::string::npos);  // not a terminal: no escape sequences

  {  // calibrations: one rejected, one injection excluded, self-review refused
    const json curves = query(box, {"curve", "list"})["curves"];
    int rejected_thm = 0;
    for (const auto& c : curves) {
      if (c["verdict"] == "rejected") {
        CHECK(c["method"] == "THM-GC");
        ++rejected_thm;
      }
    }
    CHECK(rejected_thm == 1);
    const json sulfate = query(box, {"curve", "show", "2"});
    int excluded = 0;
    for (const auto& p : sulfate["points"]) excluded += p["excluded"].get<bool>() ? 1 : 0;
    CHECK(excluded == 1);
    CHECK(cw::test::query_text(out / "demo.db", "SELECT count(*) FROM refusals") != "0");
  }

  {  // the drift is warned (4-1s) before the check fails, and the failure makes it stale
    const json before = query(
        box, {"trend", "--method", "ANION-IC", "--instrument", "IC-02", "--analyte", "nitrate"},
        "2026-11-26T12:00:00Z");
    std::set<std::string> warned;
    for (const auto& v : before["violations"]) {
      CHECK_FALSE(v["makes_stale"].get<bool>());
      warned.insert(v["rule"].get<std::string>());
    }
    CHECK(warned.count("4-1s") == 1);
    const json after = query(
        box, {"trend", "--method", "ANION-IC", "--instrument", "IC-02", "--analyte", "nitrate"},
        "2026-11-27T09:30:00Z");
    bool stale_13s = false;
    for (const auto& v : after["violations"]) {
      stale_13s = stale_13s || (v["rule"] == "1-3s" && v["makes_stale"].get<bool>());
    }
    CHECK(stale_13s);
  }

  {  // the failed run: four nitrate results to re-run, the rest refused, then re-run
    const json rerun = query(box, {"result", "list", "--status", "rerun-required"})["results"];
    REQUIRE(rerun.size() == 4);
    std::set<std::string> samples;
    for (const auto& r : rerun) {
      CHECK(r["analyte"] == "nitrate");
      samples.insert(r["sample"].get<std::string>());
    }
    CHECK(samples == std::set<std::string>{"DW-1127-01", "DW-1127-02", "DW-1127-03", "DW-1127-04"});
    const auto failed_run = rerun[0]["run_id"];
    const json run = query(box, {"run", "show", std::to_string(failed_run.get<long>())});
    CHECK(run["summary"]["nitrate"]["refused"] == 4);
    CHECK(run["summary"]["nitrate"]["checks_failed"] == 1);
    CHECK(run["summary"]["sulfate"]["reported"] == 8);
    // the same file was imported once only (the second import was refused)
    int imports = 0;
    const json runs = query(box, {"run", "list"})["runs"];
    for (const auto& r : runs) {
      imports += r["file_name"] == "data/run-IC-02-2026-11-27.csv" ? 1 : 0;
    }
    CHECK(imports == 1);
    // every sample of the failed run has a reported nitrate result from the re-run
    for (const auto& s : {"DW-1127-01", "DW-1127-05", "DW-1127-08"}) {
      bool reported = false;
      const json results = query(box, {"result", "list", "--sample", s})["results"];
      for (const auto& r : results) {
        reported = reported || (r["analyte"] == "nitrate" && r["status"] == "reported");
      }
      CHECK(reported);
    }
  }

  {  // the method revision refused a quantitation; the withdrawn lot's impact is traced
    bool revised = false;
    const json refused = query(box, {"result", "list", "--sample", "DW-1201-99"})["results"];
    REQUIRE(refused.size() == 1);
    for (const auto& r : refused) {
      CHECK(r["status"] == "refused");
      for (const auto& reason : r["reasons"]) revised = revised || reason == "method-revised";
    }
    CHECK(revised);
    const json trace = query(box, {"trace", "lot", "CRM-AN-0419"});
    CHECK(trace["lot"]["status"] == "withdrawn");
    CHECK(trace["curves"].size() == 8);
    CHECK(trace["results"].size() > 100);
  }

  {  // this week's expiries: the THM lot takes GC-01's curves with it; the board agrees
    const json expiring = query(box, {"expiring", "--this-week"})["curves"];
    REQUIRE(expiring.size() == 2);
    for (const auto& c : expiring) {
      CHECK(c["instrument"] == "GC-01");
      CHECK(c["limited_by"].dump().find("CRM-THM-0077") != std::string::npos);
    }
    const json status = query(box, {"status"});
    for (const auto& i : status["instruments"]) {
      INFO(i.dump());
      CHECK(i["counts"]["active"] == 2);
      CHECK(i["blocked"].empty());
    }
  }

  {  // plots and reports are written and readable; the trail verifies
    const std::string svg = cw::test::read_file(out / "plots" / "trend-nitrate-IC-02.svg");
    CHECK(svg.rfind("<?xml", 0) == 0);
    const std::string png =
        cw::test::read_file(out / "plots" / "curve-2-sulfate-excluded-injection.png");
    CHECK(png.rfind("\x89PNG", 0) == 0);
    const json runs = query(box, {"result", "list", "--status", "rerun-required"})["results"];
    const std::string run_pdf =
        (out / "reports" / ("run-" + std::to_string(runs[0]["run_id"].get<long>()) + ".pdf"))
            .string();
    CHECK(command_output("pdfinfo '" + run_pdf + "'").find("Pages:") != std::string::npos);
    const std::string text = command_output("pdftotext '" + run_pdf + "' -");
    CHECK(text.find("DW-1127-05") != std::string::npos);
    CHECK(text.find("111.6") != std::string::npos);
    // the curve report carries the reviewer's electronic signature
    std::string curve_pdf;
    for (const auto& f : std::filesystem::directory_iterator(out / "reports")) {
      if (f.path().filename().string().rfind("curve-", 0) == 0) curve_pdf = f.path().string();
    }
    REQUIRE_FALSE(curve_pdf.empty());
    CHECK(command_output("pdftotext '" + curve_pdf + "' -")
              .find("Signed electronically by Jonas Lindqvist") != std::string::npos);
    const RunResult verify =
        box.run({"audit", "verify"}, {{"CURVEWARDEN_DB", (out / "demo.db").string()}});
    INFO(verify.describe());
    CHECK(verify.exit_code == 0);
  }
}
