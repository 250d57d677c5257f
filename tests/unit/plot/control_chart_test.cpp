// SPDX-License-Identifier: Apache-2.0
// Checks render_control_chart(): valid SVG, PNG and PDF files with violations, one marker per
// check, numeric and text time axes, reproducible PDF bytes and refusals of bad input.
#include <catch2/catch.hpp>
#include <chrono>
#include <cmath>
#include <cstdio>
#include <string>
#include <vector>

#include "core/error.h"
#include "plot/control_chart.h"
#include "plot_test_support.h"

namespace {

using Catch::Matchers::Contains;
using cw::plot::ControlChart;
using cw::plot::ControlPoint;
using cw::plot::ControlViolation;
using cw::plot::render_control_chart;
using namespace plot_test;

const cw::Instant kCreated =
    std::chrono::sys_days{std::chrono::year{2024} / 3 / 22} + std::chrono::hours{16};

// A nitrate check standard run twice a day for `n` runs: steady around 100 %, then drifting up
// over the last third, with the violations a Westgard evaluation would report for this series
// (written out here; the plot only draws them).
ControlChart drifting_check(int n, bool numeric_time) {
  ControlChart chart;
  chart.title = "Check NO3-CS-10 \u00b7 NITRATE-IC v2 \u00b7 IC-02";
  chart.analyte = "nitrate";
  chart.mean = 100.2;
  const double s = 1.6;
  chart.low_2s = chart.mean - 2 * s;
  chart.high_2s = chart.mean + 2 * s;
  chart.low_3s = chart.mean - 3 * s;
  chart.high_3s = chart.mean + 3 * s;
  chart.time_label = numeric_time ? "days since 1 March 2024" : "run (lab time)";
  for (int i = 0; i < n; ++i) {
    ControlPoint p;
    p.check_id = "C" + std::to_string(100 + i);
    const std::chrono::year_month_day date{std::chrono::sys_days{std::chrono::year{2024} / 3 / 1} +
                                           std::chrono::days{i / 2}};
    char when[32];
    std::snprintf(when, sizeof when, "%02u-%02u %s", static_cast<unsigned>(date.month()),
                  static_cast<unsigned>(date.day()), i % 2 == 0 ? "08:30" : "14:30");
    p.when = when;
    if (numeric_time) p.time = i / 2.0 + (i % 2 == 0 ? 0.35 : 0.6);
    double value = chart.mean + 1.1 * std::sin(i * 2.399963) * s;
    if (i > 2 * n / 3) value += (i - 2 * n / 3) * 0.55;  // the drift
    p.recovery_pct = value;
    chart.points.push_back(p);
  }
  // Flag what lies outside the limits, plus a run rule on two points in a row.
  for (int i = 0; i < n; ++i) {
    const double v = chart.points[static_cast<std::size_t>(i)].recovery_pct;
    const auto at = static_cast<std::size_t>(i);
    if (v > chart.high_3s || v < chart.low_3s) {
      chart.violations.push_back({at, "1-3s", false});
    } else if (v > chart.high_2s || v < chart.low_2s) {
      chart.violations.push_back({at, "1-2s", true});
      const auto prev = static_cast<std::size_t>(i - 1);
      if (i > 0 && chart.points[prev].recovery_pct > chart.high_2s) {
        chart.violations.push_back({at, "2-2s", false});
      }
    }
  }
  chart.page.created_at = kCreated;
  return chart;
}

}  // namespace

TEST_CASE("render_control_chart: a drifting check with violations", "[plot]") {
  const ControlChart chart = drifting_check(30, false);
  REQUIRE(chart.violations.size() >= 3);
  SECTION("SVG: well-formed XML with one marker per check") {
    const std::string path = out_path("control-30.svg");
    render_control_chart(chart, path);
    const std::string svg = read_bytes(path);
    CHECK(xml_problem(svg, "svg").empty());
    CHECK(count_svg_markers(svg) == 30);
    if (have_tool("rsvg-convert")) {
      const std::string png = out_path("control-30.svg.png");
      REQUIRE(run("rsvg-convert -o '" + png + "' '" + path + "'"));
      const auto size = png_size(read_bytes(png));
      REQUIRE(size);
      CHECK(size->width == 900);
      CHECK(size->height == 560);
    }
  }
  SECTION("PNG: signature and size") {
    const std::string path = out_path("control-30.png");
    render_control_chart(chart, path);
    const auto size = png_size(read_bytes(path));
    REQUIRE(size);
    CHECK(size->width == 900);
    CHECK(size->height == 560);
    CHECK(png_border_is_white(path, 8));
  }
  SECTION("PDF: one page, the same bytes twice, the given creation date") {
    const std::string a = out_path("control-30.pdf");
    const std::string b = out_path("control-30-again.pdf");
    render_control_chart(chart, a);
    render_control_chart(chart, b);
    const std::string bytes = read_bytes(a);
    CHECK(bytes == read_bytes(b));
    CHECK(bytes.rfind("%PDF-", 0) == 0);
    if (have_tool("pdfinfo")) {
      CHECK(pdf_info(a, "Pages") == "1");
      CHECK(pdf_info(a, "CreationDate") == "2024-03-22T16:00:00Z");
    }
  }
}

TEST_CASE("render_control_chart: numeric times place the points and order them", "[plot]") {
  ControlChart chart = drifting_check(60, true);
  // Given out of order: the chart sorts by time, and violations still name input indices.
  std::swap(chart.points[3], chart.points[40]);
  for (auto& v : chart.violations) {
    if (v.point_index == 3) {
      v.point_index = 40;
    } else if (v.point_index == 40) {
      v.point_index = 3;
    }
  }
  const std::string path = out_path("control-60-numeric.svg");
  render_control_chart(chart, path);
  const std::string svg = read_bytes(path);
  CHECK(xml_problem(svg, "svg").empty());
  CHECK(count_svg_markers(svg) == 60);
  render_control_chart(chart, out_path("control-60-numeric.png"));
}

TEST_CASE("render_control_chart: a long series in run order", "[plot]") {
  const ControlChart chart = drifting_check(240, false);
  const std::string path = out_path("control-240.svg");
  render_control_chart(chart, path);
  CHECK(count_svg_markers(read_bytes(path)) == 240);
  const std::string png = out_path("control-240.png");
  render_control_chart(chart, png);
  CHECK(png_border_is_white(png, 8));
}

TEST_CASE("render_control_chart: the smallest page still keeps its margins", "[plot]") {
  ControlChart chart = drifting_check(30, false);
  chart.page.width = 480;
  chart.page.height = 360;
  const std::string path = out_path("control-480x360.png");
  render_control_chart(chart, path);
  CHECK(png_border_is_white(path, 6));
}

TEST_CASE("render_control_chart: several rules on one point and a chart of no points", "[plot]") {
  SECTION("tokens of one point are shown together") {
    ControlChart chart = drifting_check(12, false);
    chart.points[5].recovery_pct = chart.high_3s + 1;
    chart.violations = {
        {5, "1-3s", false}, {5, "R-4s", false}, {5, "1-3s", false}, {6, "1-2s", true}};
    const std::string path = out_path("control-12-stacked.svg");
    render_control_chart(chart, path);
    CHECK(count_svg_markers(read_bytes(path)) == 12);
    render_control_chart(chart, out_path("control-12-stacked.png"));
  }
  SECTION("no points") {
    ControlChart chart = drifting_check(0, false);
    const std::string path = out_path("control-empty.svg");
    render_control_chart(chart, path);
    const std::string svg = read_bytes(path);
    CHECK(xml_problem(svg, "svg").empty());
    CHECK(count_svg_markers(svg) == 0);
  }
}

TEST_CASE("render_control_chart: refuses bad input", "[plot]") {
  const std::string path = out_path("control-refused.svg");
  SECTION("a violation naming a point the chart does not have") {
    ControlChart chart = drifting_check(10, false);
    chart.violations.push_back({10, "1-3s", false});
    try {
      render_control_chart(chart, path);
      FAIL("no error");
    } catch (const cw::ValidationError& e) {
      CHECK_THAT(e.what(), Contains("'1-3s'"));
    }
  }
  SECTION("limits out of order") {
    ControlChart chart = drifting_check(10, false);
    std::swap(chart.low_2s, chart.low_3s);
    CHECK_THROWS_AS(render_control_chart(chart, path), cw::ValidationError);
  }
  SECTION("a value that is not a number") {
    ControlChart chart = drifting_check(10, false);
    chart.points[4].recovery_pct = NAN;
    CHECK_THROWS_AS(render_control_chart(chart, path), cw::ValidationError);
  }
  SECTION("an unknown extension") {
    CHECK_THROWS_AS(render_control_chart(drifting_check(5, false), out_path("chart.gif")),
                    cw::ValidationError);
  }
}
