// SPDX-License-Identifier: Apache-2.0
// Scenarios of the points file (product.md §7) through `curve log`: every kind of bad input
// is refused with exit 2 naming the file, line and column and leaves the store untouched;
// harmless variations (CRLF, a byte-order mark, another column order) are accepted.
#include <algorithm>
#include <catch2/catch.hpp>
#include <regex>

#include "scenario_support.h"

using namespace cw::scenario;

namespace {

constexpr const char* kAt = "2026-03-02T09:00:00Z";

/// Five good nitrate levels (lines 2 to 6 after the header): the bad line, if any, is line 7.
const std::string kGoodRows =
    "nitrate,L1,1,10.2,1,\nnitrate,L2,2,19.8,1,\nnitrate,L3,4,40.5,1,\n"
    "nitrate,L4,6,60.3,1,\nnitrate,L5,8,79.6,1,\n";

struct BadCase {
  std::string name;
  std::string csv;
  std::string method = "ANION-IC";
  long line = 0;     ///< the line the error must name; 0: any line of the file (whole-file error)
  long column = 0;   ///< the column it must name; 0: no column is expected
  std::string says;  ///< a fragment of the message
};

std::vector<BadCase> bad_cases() {
  const std::string h = kPointsHeader;  // analyte(1) level(2) nominal(3) response(4) replicate(5)
  return {
      {"non-numeric response", h + kGoodRows + "nitrate,L6,10,n/a,1,\n", "ANION-IC", 7, 4, "'n/a'"},
      {"NaN nominal", h + kGoodRows + "nitrate,L6,NaN,99.1,1,\n", "ANION-IC", 7, 3, "'NaN'"},
      {"infinite response", h + kGoodRows + "nitrate,L6,10,inf,1,\n", "ANION-IC", 7, 4, "'inf'"},
      {"overflowing response", h + kGoodRows + "nitrate,L6,10,1e999,1,\n", "ANION-IC", 7, 4,
       "'1e999'"},
      {"negative nominal", h + kGoodRows + "nitrate,L6,-2,99.1,1,\n", "ANION-IC", 7, 3, "negative"},
      {"empty response", h + kGoodRows + "nitrate,L6,10,,1,\n", "ANION-IC", 7, 4, "empty"},
      {"decimal comma", h + kGoodRows + "nitrate,L6,\"10,5\",99.1,1,\n", "ANION-IC", 7, 3,
       "'10,5'"},
      {"duplicate level and replicate", h + kGoodRows + "nitrate,L2,2,20.1,1,\n", "ANION-IC", 7, 2,
       "line 3"},
      {"one nominal under two level names", h + kGoodRows + "nitrate,L6,4,40.1,1,\n", "ANION-IC", 7,
       2, "same nominal"},
      {"inconsistent nominal within a level", h + kGoodRows + "nitrate,L2,2.5,20.1,2,\n",
       "ANION-IC", 7, 3, "nominal"},
      {"replicate not a whole number", h + kGoodRows + "nitrate,L6,10,99.1,1.5,\n", "ANION-IC", 7,
       5, "'1.5'"},
      {"unknown analyte", h + kGoodRows + "chloride,L6,10,99.1,1,\n", "ANION-IC", 7, 1,
       "'chloride'"},
      // A reason is one line of text: a quoted line break is refused where its record starts
      // (the same rule as for --reason on the command line).
      {"a quoted line break in an exclude reason",
       h + kGoodRows + "sulfate,S1,2,7.1,1,\"re-injected:\nvial cap loose\"\n" +
           "chloride,L6,10,99.1,1,\n",
       "ANION-IC", 7, 6, "U+000A"},
      {"line count survives a quoted comma",
       h + kGoodRows + "sulfate,S1,2,7.1,1,\"re-injected, vial cap loose\"\n" +
           "chloride,L6,10,99.1,1,\n",
       "ANION-IC", 8, 1, "'chloride'"},
      {"missing column", "analyte,level,nominal,replicate\nnitrate,L1,1,1\n", "ANION-IC", 1, 0,
       "'response'"},
      {"unknown column", "analyte,level,nominal,response,area\nnitrate,L1,1,10.2,10.2\n",
       "ANION-IC", 1, 5, "'area'"},
      {"column named twice", "analyte,level,nominal,response,response\nnitrate,L1,1,10.2,10.2\n",
       "ANION-IC", 1, 5, "twice"},
      {"wrong number of fields", h + kGoodRows + "nitrate,L6,10,99.1,1,,extra\n", "ANION-IC", 7, 0,
       "fields"},
      {"too few distinct levels to fit a line",
       h + "nitrate,L1,1,10.2,1,\nnitrate,L1,1,10.4,2,\nnitrate,L2,2,19.8,1,\n", "ANION-IC", 0, 0,
       "at least 3"},
      {"empty file", "", "ANION-IC", 1, 0, "empty"},
      {"header only", h, "ANION-IC", 0, 0, "no data"},
      {"is_response on a method without internal standard",
       "analyte,level,nominal,response,replicate,is_response\n" +
           std::string("nitrate,L1,1,10.2,1,\nnitrate,L2,2,19.8,1,5000\n"),
       "ANION-IC", 3, 6, "internal standard"},
      {"no is_response column on a method with an internal standard", h + kGoodRows, "NO3-IS", 1, 0,
       "is_response"},
      {"unit other than the method's",
       "analyte,level,nominal,response,replicate,unit\nnitrate,L1,1,10.2,1,mg/L\n"
       "nitrate,L2,2,19.8,1,\xC2\xB5g/L\n",
       "ANION-IC", 3, 6, "mg/L"},
      {"quoted field never closed", h + kGoodRows + "nitrate,L6,\"10,99.1,1,\n", "ANION-IC", 7, 0,
       "never closed"},
      // 1/x is undefined at x = 0 (calibration-practice.md §1.3): a blank level must be excluded.
      {"zero level under 1/x weighting", h + "nitrate,L0,0,0.3,1,\n" + kGoodRows, "NO3-W", 2, 3,
       "cannot be weighted by 1/x"},
  };
}

}  // namespace

TEST_CASE("points file: bad input is refused naming file, line and column, and nothing is written",
          "[scenario]") {
  Lab lab;
  lab.add_instrument("IC-01");
  lab.add_lot("CRM-A", "2026-12-31");
  lab.add_method(MethodSpec{});
  MethodSpec with_is;
  with_is.code = "NO3-IS";
  with_is.internal_standard = "bromide";
  lab.add_method(with_is);
  MethodSpec weighted;
  weighted.code = "NO3-W";
  weighted.weighting = "1/x";
  lab.add_method(weighted);

  const auto cases = bad_cases();
  REQUIRE(cases.size() >= 15);
  int n = 0;
  for (const auto& c : cases) {
    const std::string file = lab.box.write_file("bad-" + std::to_string(++n) + ".csv", c.csv);
    const long last_line = 1 + static_cast<long>(std::count(c.csv.begin(), c.csv.end(), '\n'));
    const auto before = lab.counts();
    const auto r = lab.run_at(kAt, {"curve", "log", "--method", c.method, "--instrument", "IC-01",
                                    "--lot", "CRM-A", "--points", file});
    INFO("case: " << c.name << "\n" << r.describe());
    CHECK(r.exit_code == 2);
    CHECK(lab.counts() == before);
    CHECK_THAT(r.err, Catch::Contains("curvewarden: error: " + file));
    CHECK_THAT(r.err, Catch::Contains(c.says));
    Json error;
    REQUIRE_NOTHROW(error = r.json().at("error"));
    CHECK(error.at("file") == file);
    if (c.line > 0) {
      CHECK(error.at("line") == c.line);
      CHECK_THAT(r.err, Catch::Contains(file + ":" + std::to_string(c.line)));
    } else {
      // A whole-file error still names a line of the file (product.md §4: errors name the
      // file and line for input files).
      CHECK(error.at("line").is_number_integer());
      if (error.at("line").is_number_integer()) {
        CHECK(error.at("line").get<long>() >= 1);
        CHECK(error.at("line").get<long>() <= last_line);
      }
      CHECK(std::regex_search(r.err, std::regex(":[0-9]+")));
    }
    if (c.column > 0) {
      CHECK(error.at("column") == c.column);
      CHECK_THAT(r.err, Catch::Contains(file + ":" + std::to_string(c.line) + ":" +
                                        std::to_string(c.column)));
    }
  }
}

TEST_CASE("points file: CRLF line ends, a byte-order mark and another column order are accepted",
          "[scenario]") {
  Lab lab;
  lab.add_instrument("IC-01");
  lab.add_lot("CRM-A", "2026-12-31");
  MethodSpec spec;
  spec.analytes = {"nitrate"};
  lab.add_method(spec);

  auto check_m1 = [](const Json& log) {
    // calibration-practice.md §9 M1 (Miller & Miller ch. 5): b = 1.930357143, a = 1.517857143.
    REQUIRE(log.at("curves").size() == 1);
    const Json& c = log.at("curves")[0];
    CHECK(c.at("n_points") == 7);
    CHECK(c.at("parameters").at("slope").get<double>() == Approx(m1::kSlope).epsilon(1e-9));
    CHECK(c.at("parameters").at("intercept").get<double>() == Approx(m1::kIntercept).epsilon(1e-9));
    CHECK(c.at("verdict") == "accepted");
  };

  SECTION("UTF-8 byte-order mark and CRLF line ends") {
    std::string text = std::string(kPointsHeader) + m1_rows();
    std::string crlf = "\xEF\xBB\xBF";
    for (char ch : text) crlf += ch == '\n' ? std::string("\r\n") : std::string(1, ch);
    const Json log = lab.log_curve("ANION-IC", "IC-01", "CRM-A", crlf, kAt, 0);
    check_m1(log);
    CHECK(log.at("curves")[0].at("points")[0].at("line") == 2);
    CHECK(log.at("curves")[0].at("points")[6].at("line") == 8);
  }

  SECTION("columns in another order, optional ones left out") {
    std::string text = "response,nominal,level,analyte\n";
    const char* y[] = {"2.1", "5.0", "9.0", "12.6", "17.3", "21.0", "24.7"};
    for (int i = 0; i < 7; ++i) {
      text +=
          std::string(y[i]) + "," + std::to_string(2 * i) + ",L" + std::to_string(i) + ",nitrate\n";
    }
    const Json log = lab.log_curve("ANION-IC", "IC-01", "CRM-A", text, kAt, 0);
    check_m1(log);
    CHECK(log.at("curves")[0].at("points")[3].at("level") == "L3");
    CHECK(log.at("curves")[0].at("points")[3].at("replicate") == 1);
  }
}
