// SPDX-License-Identifier: Apache-2.0
// Checks nice_ticks() on a few ranges (step, count, ends inside the range) and the text of tick
// labels, axis titles and plot numbers.
#include <catch2/catch.hpp>
#include <cmath>
#include <string>
#include <vector>

#include "core/error.h"
#include "plot/ticks.h"

namespace {

using Catch::Matchers::WithinAbs;
using Catch::Matchers::WithinRel;
using cw::plot::axis_title;
using cw::plot::format_significant;
using cw::plot::nice_ticks;
using cw::plot::tick_labels;
using cw::plot::Ticks;

void check_values(const Ticks& ticks, const std::vector<double>& expected) {
  REQUIRE(ticks.values.size() == expected.size());
  for (std::size_t i = 0; i < expected.size(); ++i) {
    CHECK_THAT(ticks.values[i],
               WithinAbs(expected[i], 1e-9 * std::max(1.0, std::abs(expected[i]))));
  }
}

}  // namespace

TEST_CASE("nice_ticks: round ends stay ticks", "[plot]") {
  const Ticks t = nice_ticks(0, 100, 6);
  CHECK_THAT(t.step, WithinRel(20.0, 1e-12));
  CHECK(t.decimals == 0);
  check_values(t, {0, 20, 40, 60, 80, 100});
}

TEST_CASE("nice_ticks: the finest 1-2-2.5-5 step within the tick budget", "[plot]") {
  SECTION("0 to 100 with up to 11 ticks steps by 10") {
    check_values(nice_ticks(0, 100, 11), {0, 10, 20, 30, 40, 50, 60, 70, 80, 90, 100});
  }
  SECTION("0 to 100 with up to 5 ticks steps by 25") {
    const Ticks t = nice_ticks(0, 100, 5);
    check_values(t, {0, 25, 50, 75, 100});
    CHECK(t.decimals == 0);
  }
  SECTION("0 to 1 with up to 5 ticks steps by 0.25, written with two decimals") {
    const Ticks t = nice_ticks(0, 1, 5);
    check_values(t, {0, 0.25, 0.5, 0.75, 1});
    CHECK(t.decimals == 2);
  }
  SECTION("a padded axis: ticks fall inside the ends") {
    // An axis from -4 to 104 (0..100 padded by 4 %): 0..100 by 20 inside it.
    check_values(nice_ticks(-4, 104, 7), {0, 20, 40, 60, 80, 100});
  }
}

TEST_CASE("nice_ticks: small, negative and large ranges", "[plot]") {
  SECTION("fractions") {
    const Ticks t = nice_ticks(0.0123, 0.0871, 8);
    CHECK_THAT(t.step, WithinRel(0.01, 1e-12));
    CHECK(t.decimals == 2);
    check_values(t, {0.02, 0.03, 0.04, 0.05, 0.06, 0.07, 0.08});
  }
  SECTION("symmetric around zero, with zero exactly zero") {
    const Ticks t = nice_ticks(-23.5, 23.5, 7);
    check_values(t, {-20, -10, 0, 10, 20});
    CHECK(t.values[2] == 0.0);
    CHECK_FALSE(std::signbit(t.values[2]));
  }
  SECTION("peak areas in the millions") {
    const Ticks t = nice_ticks(-45000, 2.34e6, 7);
    CHECK_THAT(t.step, WithinRel(5e5, 1e-12));
    check_values(t, {0, 5e5, 1e6, 1.5e6, 2e6});
  }
  SECTION("swapped ends") {
    check_values(nice_ticks(10, 0, 6), {0, 2, 4, 6, 8, 10});
  }
}

TEST_CASE("nice_ticks: a single value still gets round ticks around it", "[plot]") {
  const Ticks t = nice_ticks(50, 50, 5);
  REQUIRE(t.values.size() >= 2);
  CHECK(t.values.front() <= 50);
  CHECK(t.values.back() >= 50);
  const Ticks zero = nice_ticks(0, 0, 5);
  CHECK(zero.values.size() >= 2);
}

TEST_CASE("nice_ticks: never more ticks than asked, and at least two", "[plot]") {
  const double ranges[][2] = {{0, 1},       {0.5, 100},   {-3, 7},          {98.2, 101.7},
                              {1e-6, 3e-6}, {0, 1234567}, {-0.004, 0.0042}, {77, 78}};
  for (const auto& r : ranges) {
    for (int budget = 4; budget <= 12; ++budget) {
      const Ticks t = nice_ticks(r[0], r[1], budget);
      INFO("range " << r[0] << " to " << r[1] << ", at most " << budget);
      CHECK(static_cast<int>(t.values.size()) <= budget);
      CHECK(t.values.size() >= 2);
      CHECK(t.values.front() >= r[0] - 1e-9 * std::abs(r[0]));
      CHECK(t.values.back() <= r[1] + 1e-9 * std::abs(r[1]));
      const double m = t.step / std::pow(10.0, std::floor(std::log10(t.step) + 1e-9));
      CHECK((std::abs(m - 1) < 1e-9 || std::abs(m - 2) < 1e-9 || std::abs(m - 2.5) < 1e-9 ||
             std::abs(m - 5) < 1e-9));
    }
  }
}

TEST_CASE("nice_ticks: a budget under 4 takes a finer step rather than leave one tick", "[plot]") {
  // Steps of 0.005 would leave only 0 inside; 0.0025 leaves three.
  const Ticks t = nice_ticks(-0.004, 0.0042, 2);
  check_values(t, {-0.0025, 0, 0.0025});
}

TEST_CASE("nice_ticks: refuses a range that is not finite", "[plot]") {
  CHECK_THROWS_AS(nice_ticks(0, INFINITY), cw::ValidationError);
  CHECK_THROWS_AS(nice_ticks(NAN, 1), cw::ValidationError);
}

TEST_CASE("tick_labels: shared decimals, typographic minus, scaled large numbers", "[plot]") {
  SECTION("decimals follow the step") {
    const auto l = tick_labels(nice_ticks(-0.5, 0.5, 5));
    CHECK(l.exponent == 0);
    CHECK(l.labels == std::vector<std::string>{"\u22120.4", "\u22120.2", "0.0", "0.2", "0.4"});
  }
  SECTION("millions are shown in units of 10^6") {
    const auto l = tick_labels(nice_ticks(0, 2.4e6, 6));
    CHECK(l.exponent == 6);
    CHECK(l.labels == std::vector<std::string>{"0.0", "0.5", "1.0", "1.5", "2.0"});
  }
  SECTION("tiny values are shown in units of 10^-6") {
    const auto l = tick_labels(nice_ticks(0, 4e-4, 5));
    CHECK(l.exponent == -6);
    CHECK(l.labels == std::vector<std::string>{"0", "100", "200", "300", "400"});
  }
}

TEST_CASE("axis_title: unit and scale in one parenthesis", "[plot]") {
  CHECK(axis_title("nominal concentration", "mg/L", 0) == "nominal concentration (mg/L)");
  CHECK(axis_title("response", "", 6) == "response (\u00d710\u2076)");
  CHECK(axis_title("amount", "ng", -3) == "amount (\u00d710\u207b\u00b3 ng)");
  CHECK(axis_title("%RE", "", 0) == "%RE");
}

TEST_CASE("format_significant: plain decimals in the usual range, powers of ten outside",
          "[plot]") {
  CHECK(format_significant(0.123456, 4) == "0.1235");
  CHECK(format_significant(100.0, 4) == "100");
  CHECK(format_significant(99.996, 4) == "100");
  CHECK(format_significant(-2.5, 4) == "\u22122.5");
  CHECK(format_significant(0.999876543, 6) == "0.999877");
  CHECK(format_significant(0, 4) == "0");
  CHECK(format_significant(1.25e-7, 3) == "1.25\u00d710\u207b\u2077");
  CHECK(format_significant(2.5e8, 3) == "2.5\u00d710\u2078");
}
