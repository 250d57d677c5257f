// SPDX-License-Identifier: Apache-2.0
// Checks render_curve_plot(): valid SVG, PNG and PDF files for curves of 5 and 40 points, a
// quadratic and a curve with excluded points; one marker per plotted point; reproducible PDF
// bytes; refusals of bad paths and input; and the confidence band against the textbook formula.
#include <catch2/catch.hpp>
#include <chrono>
#include <cmath>
#include <cstdio>
#include <filesystem>
#include <limits>
#include <set>
#include <string>
#include <utility>
#include <vector>

#include "core/error.h"
#include "fitting/fit.h"
#include "plot/curve_plot.h"
#include "plot/ticks.h"
#include "plot_test_support.h"

namespace {

using Catch::Matchers::Contains;
using Catch::Matchers::WithinRel;
using cw::fitting::Model;
using cw::fitting::Observation;
using cw::fitting::Weighting;
using cw::plot::CurvePlot;
using cw::plot::CurvePlotPoint;
using cw::plot::render_curve_plot;
using namespace plot_test;

// 2024-03-01T10:00:00Z, the instant the tests pretend to run at.
const cw::Instant kCreated =
    std::chrono::sys_days{std::chrono::year{2024} / 3 / 1} + std::chrono::hours{10};

// Deterministic scatter in [-1, 1] (a fixed sequence rather than a random engine, so that the
// pictures are the same everywhere).
double scatter(int i) {
  return std::sin(i * 2.399963);
}

// A plain equation text from the coefficients, as the caller would write it.
std::string equation(const cw::fitting::FitResult& fit) {
  std::string text = "y = " + cw::plot::format_significant(fit.intercept, 4);
  const auto term = [&](double c, const std::string& x) {
    text += (c < 0 ? " \u2212 " : " + ") + cw::plot::format_significant(std::abs(c), 5) + x;
  };
  term(fit.slope, "\u00b7x");
  if (fit.model == Model::Quadratic) term(fit.quadratic, "\u00b7x\u00b2");
  return text;
}

struct CurveSpec {
  std::vector<double> levels;  // nominal concentrations, mg/L
  int replicates = 1;
  Model model = Model::Linear;
  Weighting weighting = Weighting::InvX;
  double curvature = 0;                      // response loses curvature·x² (detector saturation)
  std::set<std::pair<int, int>> excluded{};  // (level index, replicate) pairs
};

// A nitrate calibration by ion chromatography (peak area against mg/L), fitted for real.
CurvePlot make_curve(const CurveSpec& spec) {
  std::vector<Observation> observations;
  std::vector<CurvePlotPoint> points;
  int i = 0;
  for (std::size_t level = 0; level < spec.levels.size(); ++level) {
    for (int rep = 1; rep <= spec.replicates; ++rep, ++i) {
      const double x = spec.levels[level];
      double y = 1500 + 8400 * x - spec.curvature * x * x;
      y *= 1 + 0.012 * scatter(i);
      y += 250 * scatter(i + 101);
      const bool excluded = spec.excluded.count({static_cast<int>(level), rep}) > 0;
      if (excluded) y *= 1.35;  // the injection that went wrong
      observations.push_back({x, y, excluded});
      CurvePlotPoint p;
      p.nominal = x;
      p.response = y;
      p.level = "L" + std::to_string(level + 1);
      p.replicate = rep;
      p.excluded = excluded;
      if (excluded) p.exclusion_reason = "air bubble in the sample loop";
      points.push_back(p);
    }
  }
  CurvePlot plot;
  plot.fit = cw::fitting::fit(spec.model, spec.weighting, observations);
  for (std::size_t k = 0; k < points.size(); ++k) {
    points[k].error_pct = plot.fit.points[k].error_pct;
    const double limit = points[k].nominal == spec.levels.front() ? 20 : 15;
    points[k].within_limits =
        !points[k].excluded && (!points[k].error_pct || std::abs(*points[k].error_pct) <= limit);
  }
  plot.points = points;
  plot.title = "Curve 17 \u00b7 NITRATE-IC v2 \u00b7 IC-02";
  plot.analyte = "nitrate";
  plot.unit = "mg/L";
  plot.response_label = "peak area";
  plot.range_low = plot.fit.range_low;
  plot.range_high = plot.fit.range_high;
  plot.lod = plot.fit.lod;
  plot.loq = plot.fit.loq;
  plot.error_limit_pct = 15;
  plot.lowest_error_limit_pct = 20;
  plot.r2 = plot.fit.r2;
  plot.equation = equation(plot.fit);
  plot.page.created_at = kCreated;
  return plot;
}

int expected_markers(const CurvePlot& plot) {
  int n = 0;
  for (const CurvePlotPoint& p : plot.points) n += p.error_pct ? 2 : 1;
  return n;
}

const std::vector<double> kFiveLevels = {0.5, 2, 10, 50, 100};
const std::vector<double> kEightLevels = {0.5, 1, 2, 5, 10, 20, 50, 100};

// Writes `plot` in all three formats under `name` and checks each file.
void check_all_formats(const CurvePlot& plot, const std::string& name) {
  SECTION("SVG: well-formed XML with one marker per plotted point") {
    const std::string path = out_path(name + ".svg");
    render_curve_plot(plot, path);
    const std::string svg = read_bytes(path);
    CHECK(xml_problem(svg, "svg").empty());
    CHECK_THAT(svg, Contains("width=\"900px\" height=\"700px\""));
    CHECK(count_svg_markers(svg) == expected_markers(plot));
    if (have_tool("rsvg-convert")) {
      const std::string png = out_path(name + ".svg.png");
      REQUIRE(run("rsvg-convert -o '" + png + "' '" + path + "'"));
      const auto size = png_size(read_bytes(png));
      REQUIRE(size);
      CHECK(size->width == 900);
      CHECK(size->height == 700);
    } else {
      WARN("rsvg-convert not installed: SVG checked structurally only");
    }
  }
  SECTION("PNG: signature, the page size in pixels, a blank page margin") {
    const std::string path = out_path(name + ".png");
    render_curve_plot(plot, path);
    const auto size = png_size(read_bytes(path));
    REQUIRE(size);
    CHECK(size->width == 900);
    CHECK(size->height == 700);
    CHECK(png_border_is_white(path, 8));
  }
  SECTION("PDF: one page, the same bytes twice, the given creation date and title") {
    const std::string path = out_path(name + ".pdf");
    const std::string again = out_path(name + "-again.pdf");
    render_curve_plot(plot, path);
    render_curve_plot(plot, again);
    const std::string bytes = read_bytes(path);
    CHECK(bytes.rfind("%PDF-", 0) == 0);
    CHECK(bytes == read_bytes(again));
    if (have_tool("pdfinfo")) {
      CHECK(pdf_info(path, "Pages") == "1");
      CHECK(pdf_info(path, "CreationDate") == "2024-03-01T10:00:00Z");
      CHECK(pdf_info(path, "Title") == plot.title);
    } else {
      WARN("pdfinfo not installed: page count not checked");
    }
  }
}

}  // namespace

TEST_CASE("render_curve_plot: a linear curve of 5 points", "[plot]") {
  const CurvePlot plot = make_curve({kFiveLevels, 1, Model::Linear});
  REQUIRE(plot.points.size() == 5);
  check_all_formats(plot, "curve-5-points");
}

TEST_CASE("render_curve_plot: 40 points, 8 levels of 5 replicates", "[plot]") {
  const CurvePlot plot = make_curve({kEightLevels, 5, Model::Linear});
  REQUIRE(plot.points.size() == 40);
  check_all_formats(plot, "curve-40-points");
}

TEST_CASE("render_curve_plot: a quadratic with its curved band", "[plot]") {
  const CurvePlot plot = make_curve({kEightLevels, 2, Model::Quadratic, Weighting::InvX, 12.0});
  REQUIRE(plot.fit.quadratic < 0);
  check_all_formats(plot, "curve-quadratic");
}

TEST_CASE("render_curve_plot: excluded points are drawn and counted", "[plot]") {
  const CurvePlot plot =
      make_curve({kEightLevels, 3, Model::Linear, Weighting::InvX, 0, {{2, 2}, {6, 1}}});
  int excluded = 0;
  for (const CurvePlotPoint& p : plot.points) excluded += p.excluded ? 1 : 0;
  REQUIRE(excluded == 2);
  check_all_formats(plot, "curve-excluded");
}

TEST_CASE("render_curve_plot: long texts, many exclusions and large numbers stay on the page",
          "[plot]") {
  // Trace-level calibration in µg/L with peak areas in the tens of millions, 12 levels of three,
  // a negative intercept and six exclusions with long reasons: more than the key can list.
  CurveSpec spec{{50, 100, 200, 500, 1000, 2000, 4000, 6000, 8000, 10000, 15000, 20000},
                 3,
                 Model::Quadratic,
                 Weighting::InvX2,
                 0.004};
  spec.excluded = {{0, 1}, {3, 2}, {5, 3}, {8, 1}, {10, 2}, {11, 3}};
  CurvePlot plot = make_curve(spec);
  for (CurvePlotPoint& p : plot.points) {
    p.response = p.response * 300 - 2.5e6;
    if (p.excluded) {
      p.exclusion_reason =
          "autosampler needle partly blocked; injection volume reported low by the instrument "
          "log, re-injected in the next sequence";
    }
  }
  plot.fit.intercept = plot.fit.intercept * 300 - 2.5e6;
  plot.fit.slope *= 300;
  plot.fit.quadratic *= 300;
  for (auto& row : plot.fit.covariance) {
    for (double& v : row) v *= 300.0 * 300.0;
  }
  plot.fit.residual_sd *= 300;
  plot.equation = equation(plot.fit) + "  (weighted 1/x², fitted over all twelve levels)";
  plot.title =
      "Curve 1234567 · PERFLUOROOCTANESULFONIC-ACID-LCMSMS-TRACE v12 · LC-MSMS-QQQ-07 "
      "· re-run after column change";
  plot.analyte = "perfluorooctanesulfonic acid (PFOS), linear and branched isomers summed";
  plot.unit = "µg/L";
  plot.response_label = "analyte/IS area ratio";
  plot.lod = 20;
  plot.loq = 61;

  const std::string png = out_path("curve-stress.png");
  render_curve_plot(plot, png);
  CHECK(png_border_is_white(png, 8));
  const std::string svg_path = out_path("curve-stress.svg");
  render_curve_plot(plot, svg_path);
  const std::string svg = read_bytes(svg_path);
  CHECK(xml_problem(svg, "svg").empty());
  CHECK(count_svg_markers(svg) == expected_markers(plot));
}

TEST_CASE("render_curve_plot: points without a %RE have no residual marker", "[plot]") {
  CurvePlot plot = make_curve({kFiveLevels, 2, Model::Linear});
  plot.points[0].error_pct.reset();
  plot.points[3].error_pct.reset();
  const std::string path = out_path("curve-missing-re.svg");
  render_curve_plot(plot, path);
  CHECK(count_svg_markers(read_bytes(path)) == 10 + 8);
}

TEST_CASE("render_curve_plot: optional parts may be absent", "[plot]") {
  CurvePlot plot = make_curve({kFiveLevels, 1, Model::LinearThroughOrigin, Weighting::None});
  plot.lod.reset();
  plot.loq.reset();
  plot.error_limit_pct.reset();
  plot.lowest_error_limit_pct.reset();
  plot.equation.clear();
  plot.analyte.clear();
  plot.unit.clear();
  const std::string path = out_path("curve-bare.svg");
  render_curve_plot(plot, path);
  const std::string svg = read_bytes(path);
  CHECK(xml_problem(svg, "svg").empty());
  CHECK(count_svg_markers(svg) == expected_markers(plot));
}

TEST_CASE("render_curve_plot: a curve without points still draws its function", "[plot]") {
  CurvePlot plot = make_curve({kFiveLevels, 1, Model::Linear});
  plot.points.clear();
  const std::string path = out_path("curve-no-points.svg");
  render_curve_plot(plot, path);
  const std::string svg = read_bytes(path);
  CHECK(xml_problem(svg, "svg").empty());
  CHECK(count_svg_markers(svg) == 0);
}

TEST_CASE("render_curve_plot: text that is not UTF-8 is drawn, not refused", "[plot]") {
  CurvePlot plot = make_curve({kFiveLevels, 1, Model::Linear});
  plot.analyte = "nitr\xe9te";  // Latin-1 é
  const std::string path = out_path("curve-latin1.svg");
  render_curve_plot(plot, path);
  CHECK(xml_problem(read_bytes(path), "svg").empty());
}

TEST_CASE("render_curve_plot: the PNG follows the page size", "[plot]") {
  CurvePlot plot = make_curve({kFiveLevels, 1, Model::Linear});
  plot.page.width = 1200;
  plot.page.height = 800;
  const std::string path = out_path("curve-1200x800.png");
  render_curve_plot(plot, path);
  const auto size = png_size(read_bytes(path));
  REQUIRE(size);
  CHECK(size->width == 1200);
  CHECK(size->height == 800);
}

TEST_CASE("render_curve_plot: the smallest page still keeps its margins", "[plot]") {
  CurvePlot plot = make_curve({kEightLevels, 3, Model::Linear, Weighting::InvX, 0, {{2, 2}}});
  plot.page.width = 640;
  plot.page.height = 480;
  const std::string path = out_path("curve-640x480.png");
  render_curve_plot(plot, path);
  CHECK(png_border_is_white(path, 6));
}

TEST_CASE("render_curve_plot: the format follows the extension in any letter case", "[plot]") {
  const CurvePlot plot = make_curve({kFiveLevels, 1, Model::Linear});
  const std::string path = out_path("curve-upper-case.PNG");
  render_curve_plot(plot, path);
  CHECK(png_size(read_bytes(path)).has_value());
}

TEST_CASE("render_curve_plot: refuses an unknown extension and writes nothing", "[plot]") {
  const CurvePlot plot = make_curve({kFiveLevels, 1, Model::Linear});
  for (const std::string name : {"curve.jpg", "curve", "curve.svg.txt"}) {
    const std::string path = out_path(name);
    std::filesystem::remove(path);
    try {
      render_curve_plot(plot, path);
      FAIL("no error for " << name);
    } catch (const cw::ValidationError& e) {
      CHECK_THAT(e.what(), Contains("'" + path + "'"));
      CHECK_THAT(e.what(), Contains(".svg, .png or .pdf"));
    }
    CHECK_FALSE(std::filesystem::exists(path));
  }
}

TEST_CASE("render_curve_plot: a file that cannot be created is a validation error", "[plot]") {
  const CurvePlot plot = make_curve({kFiveLevels, 1, Model::Linear});
  for (const std::string ext : {"svg", "png", "pdf"}) {
    const std::string path = out_path("no-such-folder/curve." + ext);
    CHECK_THROWS_AS(render_curve_plot(plot, path), cw::ValidationError);
  }
}

TEST_CASE("render_curve_plot: refuses non-finite numbers and tiny pages", "[plot]") {
  const std::string path = out_path("curve-refused.svg");
  SECTION("a NaN response") {
    CurvePlot plot = make_curve({kFiveLevels, 1, Model::Linear});
    plot.points[2].response = std::numeric_limits<double>::quiet_NaN();
    CHECK_THROWS_AS(render_curve_plot(plot, path), cw::ValidationError);
  }
  SECTION("an infinite LOD") {
    CurvePlot plot = make_curve({kFiveLevels, 1, Model::Linear});
    plot.lod = std::numeric_limits<double>::infinity();
    CHECK_THROWS_AS(render_curve_plot(plot, path), cw::ValidationError);
  }
  SECTION("a page below 480 × 360") {
    CurvePlot plot = make_curve({kFiveLevels, 1, Model::Linear});
    plot.page.width = 300;
    CHECK_THROWS_AS(render_curve_plot(plot, path), cw::ValidationError);
  }
}

TEST_CASE("render_curve_plot: the PNG bytes repeat too", "[plot]") {
  const CurvePlot plot = make_curve({kEightLevels, 2, Model::Quadratic, Weighting::InvX, 12.0});
  const std::string a = out_path("curve-repeat-a.png");
  const std::string b = out_path("curve-repeat-b.png");
  render_curve_plot(plot, a);
  render_curve_plot(plot, b);
  CHECK(read_bytes(a) == read_bytes(b));
}

TEST_CASE("mean_response_half_width: a straight line matches the textbook formula", "[plot]") {
  // Unweighted line: half-width t(0.975; n-2)·s·√(1/n + (x - x̄)²/Sxx) (Draper & Smith, Applied
  // Regression Analysis, 3rd ed., §3.3; Miller & Miller §5.9 for the same interval).
  std::vector<Observation> obs;
  std::vector<double> xs = {1, 2, 4, 6, 8, 10};
  for (std::size_t i = 0; i < xs.size(); ++i) {
    obs.push_back({xs[i], 0.3 + 2.1 * xs[i] + 0.2 * scatter(static_cast<int>(i))});
  }
  const auto fit = cw::fitting::fit(Model::Linear, Weighting::None, obs);
  double xbar = 0;
  for (double x : xs) xbar += x / static_cast<double>(xs.size());
  double sxx = 0;
  for (double x : xs) sxx += (x - xbar) * (x - xbar);
  const double t = cw::fitting::student_t_quantile(0.975, 4);
  for (double x : {0.0, 1.0, 5.0, 5.1666, 10.0, 12.0}) {
    const double expected =
        t * fit.residual_sd * std::sqrt(1.0 / 6 + (x - xbar) * (x - xbar) / sxx);
    CHECK_THAT(cw::plot::mean_response_half_width(fit, x), WithinRel(expected, 1e-9));
  }
}

TEST_CASE("mean_response_half_width: no band without degrees of freedom", "[plot]") {
  cw::fitting::FitResult fit;
  fit.dof = 0;
  fit.covariance[0][0] = 1;
  CHECK(cw::plot::mean_response_half_width(fit, 3) == 0);
}
