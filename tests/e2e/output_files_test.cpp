// SPDX-License-Identifier: Apache-2.0
// Files the tool writes on request: `curve show --plot` draws the curve as SVG, PNG or PDF; an
// unknown extension or a path that is not a regular file is refused before the store is read.
#include <sys/stat.h>

#include <catch2/catch.hpp>
#include <cstdio>
#include <memory>
#include <regex>
#include <string>

#include "core/text.h"
#include "harness.h"

namespace {

using cw::test::RunResult;
using cw::test::Sandbox;

void run_ok(const Sandbox& box, const std::vector<std::string>& args) {
  const RunResult r = box.run(args);
  INFO(r.describe());
  REQUIRE(r.exit_code == 0);
}

/// A store with one calibration of `levels` levels × `replicates` replicates of nitrate.
void populate(Sandbox& box, int levels, int replicates) {
  box.write_file("anion.toml", cw::test::method_toml());
  std::string csv = "analyte,level,nominal,response,replicate\n";
  for (int l = 1; l <= levels; ++l) {
    for (int r = 1; r <= replicates; ++r) {
      const double x = l * 2.5;
      const double y = 0.1 * x * (1 + 0.004 * ((l + r) % 3 - 1));  // invented, within 0.4 %
      csv += "nitrate,L" + std::to_string(l) + "," + std::to_string(x) + "," + std::to_string(y) +
             "," + std::to_string(r) + "\n";
    }
  }
  box.write_file("points.csv", csv);
  run_ok(box, {"init", "--tz", "UTC"});
  run_ok(box,
         {"user", "add", "m.reviewer", "--name", "Test user m.reviewer", "--role", "reviewer"});
  run_ok(box, {"instrument", "add", "IC-02"});
  run_ok(box, {"method", "add", "anion.toml"});
  run_ok(box, {"lot", "add", "CRM-1", "--material", "m", "--expires", "2027-03-31", "--value",
               "nitrate=1000"});
  run_ok(box, {"curve", "log", "--method", "ANION-IC", "--instrument", "IC-02", "--lot", "CRM-1",
               "--points", "points.csv"});
}

std::string command_output(const std::string& command) {
  std::string out;
  std::unique_ptr<FILE, int (*)(FILE*)> pipe(popen(command.c_str(), "r"), pclose);
  REQUIRE(pipe != nullptr);
  char buffer[512];
  while (fgets(buffer, sizeof buffer, pipe.get()) != nullptr) out += buffer;
  return out;
}

std::size_t count(const std::string& text, const std::string& what) {
  std::size_t n = 0;
  for (auto at = text.find(what); at != std::string::npos; at = text.find(what, at + 1)) ++n;
  return n;
}

}  // namespace

TEST_CASE("e2e output files: curve show --plot writes SVG, PNG and PDF", "[e2e]") {
  for (const auto& [levels, replicates] : std::vector<std::pair<int, int>>{{5, 1}, {8, 5}}) {
    DYNAMIC_SECTION(levels * replicates << " points") {
      Sandbox box;
      populate(box, levels, replicates);
      const int points = levels * replicates;

      run_ok(box, {"curve", "show", "1", "--plot", "curve.png"});
      const std::string png = cw::test::read_file(box.path("curve.png"));
      REQUIRE(png.size() > 24);
      CHECK(png.substr(0, 8) == "\x89PNG\r\n\x1a\n");  // PNG signature (ISO/IEC 15948)
      // IHDR width and height, big-endian: the default page of 900 × 700.
      const auto be32 = [&](std::size_t at) {
        return (static_cast<unsigned char>(png[at]) << 24) |
               (static_cast<unsigned char>(png[at + 1]) << 16) |
               (static_cast<unsigned char>(png[at + 2]) << 8) |
               static_cast<unsigned char>(png[at + 3]);
      };
      CHECK(be32(16) == 900u);
      CHECK(be32(20) == 700u);

      run_ok(box, {"curve", "show", "1", "--plot", "curve.svg"});
      const std::string svg = cw::test::read_file(box.path("curve.svg"));
      CHECK_THAT(svg, Catch::StartsWith("<?xml"));
      // One marker per calibrator in the curve panel and one per %RE in the residual panel,
      // each a path marked with stroke-miterlimit 7 (src/plot/plot.h).
      CHECK(count(svg, "stroke-miterlimit:7;") == static_cast<std::size_t>(2 * points));

      run_ok(box, {"curve", "show", "1", "--plot", "curve.pdf"});
      const std::string info = command_output("pdfinfo '" + box.path("curve.pdf").string() + "'");
      CHECK(std::regex_search(info, std::regex("Pages:\\s+1\\b")));
    }
  }
}

TEST_CASE("e2e output files: a bad plot path is refused before anything happens", "[e2e]") {
  Sandbox box;
  populate(box, 5, 1);
  const auto counts = cw::test::table_row_counts(box);
  const RunResult bad = box.run({"curve", "show", "1", "--plot", "curve.gif", "--json"});
  CHECK(bad.exit_code == 2);
  CHECK_THAT(bad.err, Catch::Contains("expected .svg, .png or .pdf"));
  CHECK_FALSE(std::filesystem::exists(box.path("curve.gif")));
  REQUIRE(mkfifo(box.path("pipe.png").c_str(), 0600) == 0);
  const RunResult pipe = box.run({"curve", "show", "1", "--plot", "pipe.png"});
  CHECK(pipe.exit_code == 2);
  CHECK(pipe.seconds < 1.0);
  CHECK_THAT(pipe.err, Catch::Contains("exists and is not a regular file"));
  CHECK(cw::test::table_row_counts(box) == counts);
}

TEST_CASE("e2e output files: the store's own files are never written over", "[e2e][sqlite-only]") {
  Sandbox box;
  populate(box, 5, 1);
  const std::string store_before = cw::test::read_file(box.db());
  const std::string key_before = cw::test::read_file(box.path("store.db.key"));
  const auto counts = cw::test::table_row_counts(box);
  std::filesystem::create_hard_link(box.db(), box.path("other-name.db"));
  for (const auto& args :
       std::vector<std::vector<std::string>>{{"audit", "anchor", "--out", "store.db"},
                                             {"audit", "anchor", "--out", "store.db.key"},
                                             {"audit", "anchor", "--out", "other-name.db"},
                                             {"audit", "anchor", "--out", "./store.db"},
                                             {"report", "curve", "1", "--out", "store.db.key"},
                                             {"curve", "show", "1", "--plot", "store.db"}}) {
    const RunResult r = box.run(args);
    INFO(r.describe());
    CHECK(r.exit_code == 2);
    CHECK_THAT(r.err, Catch::Contains("it is never written over"));
  }
  CHECK(cw::test::read_file(box.db()) == store_before);
  CHECK(cw::test::read_file(box.path("store.db.key")) == key_before);
  CHECK(cw::test::table_row_counts(box) == counts);
  CHECK(box.run({"audit", "verify"}).exit_code == 0);
}

TEST_CASE(
    "e2e output files: a report replaces only an earlier file of its kind, a checkpoint "
    "nothing",
    "[e2e]") {
  Sandbox box;
  populate(box, 5, 1);
  box.write_file("notes.pdf", "minutes of the lab meeting\n");
  const RunResult pdf = box.run({"report", "curve", "1", "--out", "notes.pdf"});
  INFO(pdf.describe());
  CHECK(pdf.exit_code == 2);
  CHECK_THAT(pdf.err, Catch::Contains("exists and is not a PDF"));
  CHECK(cw::test::read_file(box.path("notes.pdf")) == "minutes of the lab meeting\n");
  // An earlier report is replaced; so is an empty file.
  run_ok(box, {"report", "curve", "1", "--out", "curve.pdf"});
  run_ok(box, {"report", "curve", "1", "--out", "curve.pdf"});
  box.write_file("empty.png", "");
  run_ok(box, {"curve", "show", "1", "--plot", "empty.png"});
  run_ok(box, {"curve", "show", "1", "--plot", "empty.png"});
  box.write_file("notes.svg", "<html></html>\n");
  CHECK(box.run({"curve", "show", "1", "--plot", "notes.svg"}).exit_code == 2);
  // A checkpoint is kept: a second one to the same file is refused, the first unchanged.
  run_ok(box, {"audit", "anchor", "--out", "day1.anchor"});
  const std::string first = cw::test::read_file(box.path("day1.anchor"));
  const RunResult again = box.run({"audit", "anchor", "--out", "day1.anchor"});
  INFO(again.describe());
  CHECK(again.exit_code == 2);
  CHECK_THAT(again.err, Catch::Contains("a checkpoint never replaces a file"));
  CHECK(cw::test::read_file(box.path("day1.anchor")) == first);
}

TEST_CASE("e2e output files: '-' reads a method or points file from standard input", "[e2e]") {
  Sandbox box;
  run_ok(box, {"init", "--tz", "UTC"});
  run_ok(box, {"instrument", "add", "IC-02"});
  const RunResult method =
      box.run_with_input({"method", "add", "-", "--json"}, cw::test::method_toml());
  INFO(method.describe());
  REQUIRE(method.exit_code == 0);
  CHECK(method.json()["source_name"] == "(standard input)");
  run_ok(box, {"lot", "add", "CRM-1", "--material", "m", "--expires", "2027-03-31", "--value",
               "nitrate=1000"});
  const std::string csv =
      "analyte,level,nominal,response\nnitrate,1,1,0.101\nnitrate,2,2,0.199\n"
      "nitrate,3,5,0.502\nnitrate,4,10,1.001\nnitrate,5,20,1.998\n";
  const RunResult logged =
      box.run_with_input({"curve", "log", "--method", "ANION-IC", "--instrument", "IC-02", "--lot",
                          "CRM-1", "--points", "-", "--json"},
                         csv);
  INFO(logged.describe());
  REQUIRE(logged.exit_code == 0);
  CHECK(cw::test::query_text(box, "SELECT points_file FROM calibrations") == "(standard input)");
  // Errors in a file read from standard input name it and its line.
  const RunResult bad = box.run_with_input({"curve", "log", "--method", "ANION-IC", "--instrument",
                                            "IC-02", "--lot", "CRM-1", "--points", "-"},
                                           "analyte,level,nominal,response\nnitrate,1,x,1\n");
  CHECK(bad.exit_code == 2);
  CHECK_THAT(bad.err, Catch::Contains("(standard input):2:3"));
}

TEST_CASE("e2e output files: report curve writes a PDF a reviewer can sign", "[e2e]") {
  for (const auto& [levels, replicates] : std::vector<std::pair<int, int>>{{5, 1}, {8, 5}}) {
    DYNAMIC_SECTION(levels * replicates << " points") {
      Sandbox box;
      populate(box, levels, replicates);
      box.user = "m.reviewer";
      run_ok(box, {"curve", "review", "1", "--approve", "--reason", "residuals checked"});
      box.now = "2026-03-02T10:00:00Z";
      run_ok(box, {"check", "log", "--curve", "1", "--nominal", "10", "--response", "1.0"});

      const RunResult r = box.run({"report", "curve", "1", "--out", "curve 1.pdf", "--json"});
      INFO(r.describe());
      REQUIRE(r.exit_code == 0);
      const std::string pdf = box.path("curve 1.pdf").string();
      const std::string info = command_output("pdfinfo '" + pdf + "'");
      std::smatch pages;
      REQUIRE(std::regex_search(info, pages, std::regex("Pages:\\s+(\\d+)")));
      CHECK(r.json()["pages"] == std::stoi(pages[1]));
      CHECK(std::stoi(pages[1]) >= 2);

      const std::string text = command_output("pdftotext -layout '" + pdf + "' -");
      for (const char* fact :
           {"ANION-IC version 1", "IC-02", "CRM-1", "2027-03-31", "alice", "m.reviewer",
            "residuals checked", "calibration levels", "coefficient of determination", "worst %RE",
            "active", "curve.log", "curve.approve", "check.log", "Sign-off"}) {
        CHECK_THAT(text, Catch::Contains(fact));
      }
      // Every calibrator's response, as the points file gave it (echoed in shortest form).
      const RunResult shown = box.run({"curve", "show", "1", "--json"});
      REQUIRE(shown.exit_code == 0);
      const nlohmann::json shown_json = shown.json();  // kept alive for the loop
      for (const auto& p : shown_json["points"]) {
        CHECK_THAT(text, Catch::Contains(cw::format_shortest(p["response"].get<double>())));
      }
      // The head of the trail printed is the one `audit verify` recomputes.
      const RunResult verify = box.run({"audit", "verify", "--json"});
      REQUIRE(verify.exit_code == 0);
      CHECK_THAT(text, Catch::Contains(verify.json()["head_hash"].get<std::string>()));
      CHECK(r.json()["audit_head"]["hash"] == verify.json()["head_hash"]);
      // Page numbers in every footer.
      CHECK(count(text, "page 1 of " + std::string(pages[1])) == 1);
      CHECK(count(text, "Supports and never replaces") ==
            static_cast<std::size_t>(std::stoi(pages[1])));

      // The same store at the same moment gives the same bytes.
      run_ok(box, {"report", "curve", "1", "--out", "again.pdf"});
      CHECK(cw::test::read_file(box.path("again.pdf")) ==
            cw::test::read_file(box.path("curve 1.pdf")));
    }
  }
}

TEST_CASE("e2e output files: report curve refuses a bad path or curve and writes nothing",
          "[e2e]") {
  Sandbox box;
  populate(box, 5, 1);
  const auto counts = cw::test::table_row_counts(box);
  const RunResult ext = box.run({"report", "curve", "1", "--out", "report.png", "--json"});
  CHECK(ext.exit_code == 2);
  CHECK(ext.json()["error"]["option"] == "--out");
  CHECK_FALSE(std::filesystem::exists(box.path("report.png")));
  const RunResult missing = box.run({"report", "curve", "1"});
  CHECK(missing.exit_code == 2);
  CHECK_THAT(missing.err, Catch::Contains("--out"));
  const RunResult unknown = box.run({"report", "curve", "99", "--out", "r.pdf"});
  CHECK(unknown.exit_code == 2);
  CHECK_FALSE(std::filesystem::exists(box.path("r.pdf")));
  REQUIRE(mkfifo(box.path("pipe.pdf").c_str(), 0600) == 0);
  const RunResult pipe = box.run({"report", "curve", "1", "--out", "pipe.pdf"});
  CHECK(pipe.exit_code == 2);
  CHECK(pipe.seconds < 1.0);
  std::filesystem::create_directory(box.path("dir.pdf"));
  CHECK(box.run({"report", "curve", "1", "--out", "dir.pdf"}).exit_code == 2);
  CHECK(box.run({"report", "curve", "1", "--out", "no/such/folder/r.pdf"}).exit_code == 2);
  CHECK(cw::test::table_row_counts(box) == counts);
  CHECK(box.run({"audit", "verify"}).exit_code == 0);
}

TEST_CASE("e2e output files: report run writes every row of a 500-row run", "[e2e]") {
  Sandbox box;
  populate(box, 5, 1);
  box.user = "m.reviewer";
  run_ok(box, {"curve", "review", "1", "--approve", "--reason", "ok"});
  box.user = "alice";
  box.now = "2026-03-02T10:00:00Z";
  // 500 rows: a check standard before every 8 samples; one check in the middle fails (its
  // bracket must be re-run); a few samples read below the lowest calibrator (censored).
  std::string csv = "position,kind,sample,analyte,response,nominal\n";
  int samples = 0, checks = 0;
  for (int pos = 1; pos <= 500; ++pos) {
    if (pos % 9 == 1 || pos == 500) {
      const bool failing = pos == 244;  // 244 % 9 == 1
      csv += std::to_string(pos) + ",check,CS,nitrate," + (failing ? "0.80" : "1.0") + ",10\n";
      ++checks;
    } else {
      const bool low = pos % 50 == 7;
      csv += std::to_string(pos) + ",sample,Brunnen-Ö " + std::to_string(pos) + ",nitrate," +
             (low ? "0.05" : std::to_string(0.2 + 0.003 * (pos % 100))) + ",\n";
      ++samples;
    }
  }
  box.write_file("run.csv", csv);
  const RunResult imported =
      box.run({"run", "import", "run.csv", "--method", "ANION-IC", "--instrument", "IC-02"});
  INFO(imported.describe());
  REQUIRE(imported.exit_code == 3);  // the failing check leaves results to re-run

  const RunResult r = box.run({"report", "run", "1", "--out", "run.pdf", "--json"});
  INFO(r.describe());
  REQUIRE(r.exit_code == 0);
  CHECK(r.json()["samples"] == samples);
  CHECK(r.json()["checks"] == checks);
  const std::string pdf = box.path("run.pdf").string();
  const std::string info = command_output("pdfinfo '" + pdf + "'");
  std::smatch pages;
  REQUIRE(std::regex_search(info, pages, std::regex("Pages:\\s+(\\d+)")));
  const int n = std::stoi(pages[1]);
  CHECK(r.json()["pages"] == n);
  CHECK(n > 5);

  const std::string text = command_output("pdftotext -layout '" + pdf + "' -");
  const RunResult shown = box.run({"run", "show", "1", "--json"});
  REQUIRE(shown.exit_code == 0);
  const auto doc = shown.json();
  CHECK_THAT(text, Catch::Contains(doc["file_sha256"].get<std::string>()));
  // Every sample row is in the report, by its sample id.
  for (const auto& row : doc["results"]) {
    CHECK_THAT(text, Catch::Contains(row["sample"].get<std::string>()));
  }
  CHECK_THAT(text, Catch::Contains("RE-RUN"));
  CHECK_THAT(text, Catch::Contains("FAIL"));
  CHECK_THAT(text, Catch::Contains("< 2.5 mg/L"));  // censored at the lowest calibrator
  CHECK(count(text, "page 1 of " + std::to_string(n)) == 1);
  CHECK(count(text, "Supports and never replaces") == static_cast<std::size_t>(n));

  run_ok(box, {"report", "run", "1", "--out", "again.pdf"});
  CHECK(cw::test::read_file(box.path("again.pdf")) == cw::test::read_file(box.path("run.pdf")));
  const auto counts = cw::test::table_row_counts(box);
  CHECK(box.run({"report", "run", "2", "--out", "none.pdf"}).exit_code == 2);
  CHECK_FALSE(std::filesystem::exists(box.path("none.pdf")));
  CHECK(box.run({"report", "run", "1", "--out", "run.svg"}).exit_code == 2);
  CHECK(cw::test::table_row_counts(box) == counts);
}
