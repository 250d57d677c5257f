// SPDX-License-Identifier: Apache-2.0
// Checks render_curve_report() and render_run_report(): valid PDFs whose page count, text and
// bytes are as expected for curves of 5 and 40 points and a run of 500 rows; signatures by
// hand and electronic; refusals of bad paths.
#include <catch2/catch.hpp>
#include <filesystem>
#include <limits>
#include <string>
#include <vector>

#include "core/error.h"
#include "plot/curve_report.h"
#include "plot/run_report.h"
#include "plot_test_support.h"
#include "report_fixtures.h"

namespace {

using Catch::Matchers::Contains;
using namespace plot_test;

const std::vector<double> kFiveLevels = {0.5, 2, 10, 50, 100};
const std::vector<double> kEightLevels = {0.5, 1, 2, 5, 10, 20, 50, 100};

// pdftotext keeps the words of a line but not always their spacing: compare with runs of
// spaces collapsed.
std::string squeeze(const std::string& text) {
  std::string out;
  for (char c : text) {
    if (c == ' ' && !out.empty() && out.back() == ' ') continue;
    out += c;
  }
  return out;
}

// Number of form-feed separated pages in pdftotext output.
int pages_of(const std::string& path) {
  const std::string pages = pdf_info(path, "Pages");
  return pages.empty() ? 0 : std::stoi(pages);
}

// The facts every page shows: its number, the generation time and the caution line.
void check_every_page(const std::string& path, int pages) {
  for (int p = 1; p <= pages; ++p) {
    INFO("page " << p);
    const std::string text = squeeze(pdf_text(path, p));
    CHECK_THAT(text, Contains("page " + std::to_string(p) + " of " + std::to_string(pages)));
    CHECK_THAT(text, Contains("Generated 2024-03-05 14:30 +01:00 by mlopez"));
    CHECK_THAT(text, Contains("a qualified person reviews results before release"));
    CHECK_THAT(text, Contains("Riverside Water Laboratory"));
  }
}

void check_curve_report(const cw::plot::CurveReport& report, const std::string& name,
                        int expected_pages) {
  const std::string path = out_path(name + ".pdf");
  const std::string again = out_path(name + "-again.pdf");
  CHECK(cw::plot::render_curve_report(report, path) == expected_pages);
  cw::plot::render_curve_report(report, again);
  const std::string bytes = read_bytes(path);
  REQUIRE(bytes.rfind("%PDF-", 0) == 0);
  CHECK(bytes == read_bytes(again));
  if (!have_tool("pdfinfo") || !have_tool("pdftotext")) {
    WARN("poppler-utils not installed: the PDF's pages and text are not checked");
    return;
  }
  CHECK(pages_of(path) == expected_pages);
  CHECK(pdf_info(path, "CreationDate") == "2024-03-05T13:30:00Z");
  CHECK(pdf_info(path, "Title") == "Calibration report");
  CHECK(pdf_info(path, "Author") == "Riverside Water Laboratory");

  const std::string text = squeeze(pdf_text(path));
  for (const std::string& fact : std::vector<std::string>{
           "Calibration report",
           "Curve 17 · nitrate · NITRATE-IC version 2 · IC-02",
           "NITRATE-IC version 2 — Anions in drinking water by ion chromatography",
           "IC-02 (ion chromatograph, conductivity detector)",
           "NO3-2291",
           "CRM-2291-B",
           "2025-06-30",
           "MIX-0147",
           "CoA 0147/23",
           "2024-11-30",
           "Acquired 2024-03-01 09:12 +01:00",
           "jdoe (Jane Doe)",
           "akim (Alex Kim)",
           "ICH Q2(R2)",
           "DIN 32645",
           "Mandel's test",
           "s(y/x)",
           "Working range",
           "0.5–100 mg/L",
           "intercept a",
           "slope b",
           "Standard error",
           "State now",
           "active",
           report.fit.r2,
           report.fit.residual_sd,
           report.fit.limits[0].lod,
           "entry 57",
           "chain verified: 57 entries, intact",
           "page 1 of " + std::to_string(expected_pages)}) {
    CHECK_THAT(text, Contains(fact));
  }
  CHECK_THAT(text, Contains(report.accepted ? "accepted ·" : "rejected ·"));
  for (const cw::plot::ReportCriterion& c : report.criteria) CHECK_THAT(text, Contains(c.name));
  for (const cw::plot::ReportLevelRow& l : report.levels) CHECK_THAT(text, Contains(l.response));
  // The head hash is printed whole (it may wrap, so look for it without line breaks).
  std::string joined;
  for (char c : text) {
    if (c != '\n' && c != ' ') joined += c;
  }
  CHECK_THAT(joined, Contains(report_test::kHeadHash));
  check_every_page(path, expected_pages);
}

}  // namespace

TEST_CASE("render_curve_report: a curve of 5 points", "[plot][report]") {
  const cw::plot::CurveReport report = report_test::curve_report(kFiveLevels, 1);
  REQUIRE(report.levels.size() == 5);
  check_curve_report(report, "report-curve-5", 3);
}

TEST_CASE("render_curve_report: a curve of 40 points with an excluded injection",
          "[plot][report]") {
  const cw::plot::CurveReport report = report_test::curve_report(kEightLevels, 5, {{3, 2}});
  REQUIRE(report.levels.size() == 40);
  check_curve_report(report, "report-curve-40", 4);
  const std::string text = squeeze(pdf_text(out_path("report-curve-40.pdf")));
  CHECK_THAT(text, Contains("excluded"));
  CHECK_THAT(text, Contains("air bubble in the sample loop"));
  // The points table continues onto another page under its repeated header.
  CHECK_THAT(text, Contains("4 Calibration points (continued)"));
}

TEST_CASE("render_curve_report: a rejected, unreviewed curve says so", "[plot][report]") {
  cw::plot::CurveReport report = report_test::curve_report(kFiveLevels, 2);
  report.accepted = false;
  report.criteria[1] = {"coefficient of determination r²", "0.98412", "≥ 0.995", false};
  report.reviewer.reset();
  report.state = "rejected";
  report.usable = false;
  report.state_reasons = {"rejected: r² 0.98412 below minimum 0.995"};
  const std::string path = out_path("report-curve-rejected.pdf");
  const int pages = cw::plot::render_curve_report(report, path);
  if (!have_tool("pdftotext")) return;
  const std::string text = squeeze(pdf_text(path));
  CHECK_THAT(text, Contains("rejected · 3 of 4 criteria met"));
  CHECK_THAT(text, Contains("FAIL"));
  CHECK_THAT(text, Contains("not reviewed"));
  CHECK_THAT(text, Contains("results may not be quantified against this curve"));
  CHECK_THAT(text, Contains("r² 0.98412 below minimum 0.995"));
  check_every_page(path, pages);
}

TEST_CASE("render_curve_report: signatures by hand or their electronic manifestation",
          "[plot][report]") {
  cw::plot::CurveReport report = report_test::curve_report(kFiveLevels, 1);
  SECTION("no electronic signature: lines to sign and date") {
    const std::string path = out_path("report-curve-sign-by-hand.pdf");
    cw::plot::render_curve_report(report, path);
    if (!have_tool("pdftotext")) return;
    const std::string text = squeeze(pdf_text(path));
    CHECK_THAT(text, Contains("Sign-off"));
    CHECK_THAT(text, Contains("signature"));
    CHECK_THAT(text, Contains("I reviewed this calibration and its record."));
  }
  SECTION("an electronic signature shows its manifestation") {
    report.reviewer->signature =
        cw::plot::SignatureManifestation{"Alex Kim", "2024-03-01 11:05:12 +01:00", "approval"};
    const std::string path = out_path("report-curve-signed.pdf");
    cw::plot::render_curve_report(report, path);
    if (!have_tool("pdftotext")) return;
    const std::string text = squeeze(pdf_text(path));
    CHECK_THAT(text, Contains("Signed electronically by Alex Kim"));
    CHECK_THAT(text, Contains("2024-03-01 11:05:12 +01:00"));
    CHECK_THAT(text, Contains("Meaning: approval"));
  }
}

TEST_CASE("render_run_report: a run of 500 rows runs over many pages", "[plot][report]") {
  const cw::plot::RunReport report = report_test::run_report(500);
  REQUIRE(report.samples.size() == 500);
  const std::string path = out_path("report-run-500.pdf");
  const std::string again = out_path("report-run-500-again.pdf");
  const int pages = cw::plot::render_run_report(report, path);
  cw::plot::render_run_report(report, again);
  CHECK(pages > 1);
  CHECK(read_bytes(path) == read_bytes(again));
  if (!have_tool("pdfinfo") || !have_tool("pdftotext")) {
    WARN("poppler-utils not installed: the PDF's pages and text are not checked");
    return;
  }
  CHECK(pages_of(path) == pages);
  CHECK(pdf_info(path, "CreationDate") == "2024-03-05T13:30:00Z");
  const std::string text = squeeze(pdf_text(path));
  for (const std::string& fact : std::vector<std::string>{
           "Run report", "Run 31 · ANIONS-IC version 4 · IC-02", "IC-02_2024-03-04_sequence-A.csv",
           "3a7bd3e2360a3d29eea436fcfb7e44c735d117c42d1c1835420b6b9942dd4f1b",
           "ANIONS-IC version 4 — Anions in drinking water by ion chromatography",
           "2024-03-04 17:02 +01:00 by jdoe", "< 0.50 mg/L", "refused", "REFUSED", "RE-RUN",
           "84.2 %", "FAIL", "Bracketing outcome", "entry 57",
           "page 1 of " + std::to_string(pages)}) {
    CHECK_THAT(text, Contains(fact));
  }
  std::string joined;
  for (char c : text) {
    if (c != '\n' && c != ' ') joined += c;
  }
  CHECK_THAT(joined, Contains("resultsafterthecheckatposition253aretobere-run"));
  CHECK_THAT(joined, Contains("everyresultbracketedbypassingchecks"));
  // The banner counts what the rows say.
  int reported = 0, censored = 0;
  for (const cw::plot::ReportSampleRow& row : report.samples) {
    reported += row.status == cw::plot::SampleStatus::Reported ? 1 : 0;
    censored += row.censored ? 1 : 0;
  }
  CHECK(censored > 0);
  CHECK_THAT(text,
             Contains(std::to_string(reported) + " reported (" + std::to_string(censored) + " <)"));
  // The last sample is there.
  CHECK_THAT(text, Contains(report.samples.back().sample));
  CHECK_THAT(text, Contains("5499"));
  check_every_page(path, pages);
  // The samples table starts on one page and continues, with its header, on every later page
  // but those of the audit trail and cautions.
  int continued = 0;
  for (int p = 2; p <= pages; ++p) {
    const std::string page = squeeze(pdf_text(path, p));
    if (page.find("4 Samples (continued)") == std::string::npos) continue;
    ++continued;
    // "Result ID" wraps in its narrow column: its second word goes to the next line.
    CHECK_THAT(page, Contains("Pos. Result Sample Analyte Released U Flags Status Reasons"));
  }
  CHECK(continued >= pages - 3);
}

TEST_CASE("render_run_report: an empty run still makes a report", "[plot][report]") {
  cw::plot::RunReport report = report_test::run_report(0);
  report.checks.clear();
  const std::string path = out_path("report-run-empty.pdf");
  const int pages = cw::plot::render_run_report(report, path);
  if (!have_tool("pdftotext")) return;
  CHECK(pages_of(path) == pages);
  const std::string text = squeeze(pdf_text(path));
  CHECK_THAT(text, Contains("no samples in this run"));
  CHECK_THAT(text, Contains("no checks in this run"));
}

TEST_CASE("render_run_report: blanks are counted apart from check standards", "[plot][report]") {
  cw::plot::RunReport report = report_test::run_report(0);
  report.checks.clear();
  report.bracketing.clear();
  const auto row = [](int position, bool blank, bool passed) {
    cw::plot::ReportCheckRow c;
    c.position = position;
    c.analyte = blank ? "nitrate (blank)" : "nitrate";
    c.nominal = blank ? "blank" : "10";
    c.measured = "1 mg/L";
    c.passed = passed;
    c.blank = blank;
    return c;
  };
  report.checks = {row(1, false, true), row(2, true, true), row(3, true, false),
                   row(4, false, true), row(5, false, false)};
  cw::plot::ReportBracketing b;
  b.analyte = "nitrate";
  b.checks_passed = 2;
  b.checks_failed = 1;
  b.blanks_passed = 1;
  b.blanks_failed = 1;
  b.outcome = "check or blank failed at position 3, 5";
  report.bracketing.push_back(b);
  const std::string path = out_path("report-run-blanks.pdf");
  const int pages = cw::plot::render_run_report(report, path);
  if (!have_tool("pdftotext")) return;
  CHECK(pages_of(path) == pages);
  const std::string text = squeeze(pdf_text(path));
  CHECK_THAT(text, Contains("2 of 3 passed"));  // the banner's check standards
  CHECK_THAT(text, Contains("1 of 2 passed"));  // and its blanks
  CHECK_THAT(text, Contains("Blanks"));
}

TEST_CASE("render reports: a path that is not a PDF or cannot be created is refused",
          "[plot][report]") {
  const cw::plot::RunReport run = report_test::run_report(10);
  for (const std::string name : {"report.svg", "report.png", "report"}) {
    const std::string path = out_path(name);
    std::filesystem::remove(path);
    CHECK_THROWS_AS(cw::plot::render_run_report(run, path), cw::ValidationError);
    CHECK_FALSE(std::filesystem::exists(path));
  }
  CHECK_THROWS_AS(cw::plot::render_run_report(run, out_path("no-such-folder/run.pdf")),
                  cw::ValidationError);
  const cw::plot::CurveReport curve = report_test::curve_report(kFiveLevels, 1);
  CHECK_THROWS_AS(cw::plot::render_curve_report(curve, out_path("no-such-folder/curve.pdf")),
                  cw::ValidationError);
}

TEST_CASE("render_curve_report: an invalid plot leaves no file behind", "[plot][report]") {
  cw::plot::CurveReport report = report_test::curve_report(kFiveLevels, 1);
  report.plot.points[1].response = std::numeric_limits<double>::quiet_NaN();
  const std::string path = out_path("report-curve-invalid.pdf");
  std::filesystem::remove(path);
  CHECK_THROWS_AS(cw::plot::render_curve_report(report, path), cw::ValidationError);
  CHECK_FALSE(std::filesystem::exists(path));
}

TEST_CASE("render_curve_report: long texts everywhere stay on the page", "[plot][report]") {
  cw::plot::CurveReport report = report_test::curve_report(kEightLevels, 3, {{0, 1}, {5, 3}});
  report.frame.lab =
      "Regional Drinking Water and Environmental Monitoring Laboratory of the Upper Valley "
      "Water Authority, Department of Inorganic Chemistry";
  report.method_title =
      "Determination of dissolved anions (fluoride, chloride, nitrite, bromide, nitrate, "
      "phosphate, sulfate) in drinking, ground and surface water by ion chromatography with "
      "suppressed conductivity detection";
  report.note =
      "Eluent bottle replaced before the sequence; column temperature stabilised for 45 minutes. "
      "The first injection of the lowest level showed a shoulder and was excluded after review "
      "of the chromatogram with the section head.";
  for (int i = 0; i < 6; ++i) {
    report.lots.push_back({"LOT-" + std::to_string(7000 + i),
                           "single-anion standard solution traceable to a national metrology "
                           "institute, 1000 mg/L in water",
                           "certificate of analysis " + std::to_string(88000 + i) + "/2023-REV2",
                           "2025-0" + std::to_string(i + 1) + "-28",
                           i == 2 ? "withdrawn 2024-03-04: supplier notice of a wrong certified "
                                    "value"
                                  : ""});
  }
  report.levels[0].reason =
      "shoulder on the peak; integration not reliable, excluded after review of the "
      "chromatogram with the section head (see the laboratory notebook page 114)";
  report.state = "stale";
  report.usable = false;
  report.state_reasons = {
      "check-failed: check 23 at 2024-03-04 08:15 +01:00 recovered 84.2 % (limits 90–110 %)",
      "lot-withdrawn: LOT-7002 withdrawn 2024-03-04 (supplier notice of a wrong certified value)",
      "method-revised: NITRATE-IC version 3 in force since 2024-03-05 08:00 +01:00"};
  report.analyst.name = "jdoe (Jane Alexandra Doe-Montgomery, senior analyst, inorganic section)";
  report.reviewer->signature = cw::plot::SignatureManifestation{
      "Alexander Kim-Vasquez, head of the inorganic chemistry section",
      "2024-03-01 11:05:12 +01:00", "review and approval of the calibration and its record"};
  const std::string path = out_path("report-curve-long-texts.pdf");
  const std::string again = out_path("report-curve-long-texts-again.pdf");
  const int pages = cw::plot::render_curve_report(report, path);
  cw::plot::render_curve_report(report, again);
  CHECK(read_bytes(path) == read_bytes(again));
  if (!have_tool("pdftotext")) return;
  CHECK(pages_of(path) == pages);
  std::string joined;
  for (char c : pdf_text(path)) {
    if (c != '\n' && c != ' ' && c != '\f') joined += c;
  }
  // Wrapped, not cut: the ends of the long texts are there.
  for (const std::string tail :
       {"suppressedconductivitydetection", "withthesectionhead.", "notebookpage114)",
        "wrongcertifiedvalue", "since2024-03-0508:00+01:00", "ofthecalibrationanditsrecord"}) {
    CHECK_THAT(joined, Contains(tail));
  }
}
