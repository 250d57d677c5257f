// SPDX-License-Identifier: Apache-2.0
// Tests of method-file validation (src/import/method_file.cpp): a valid file parses, and every
// problem is reported with the file, the line and the dotted key.
#include <catch2/catch.hpp>
#include <filesystem>
#include <fstream>
#include <string>
#include <vector>

#include "core/error.h"
#include "import/method_file.h"

namespace {

using Lines = std::vector<std::string>;

const char* const kFile = "anion.toml";

/// The valid method file of product.md §6. Line numbers (1-based) are what the tests expect
/// in the error locations, so they are noted on the right.
const Lines kValid = {
    R"(code = "ANION-IC")",                                                      // 1
    R"(title = "Nitrate and sulfate in drinking water by ion chromatography")",  // 2
    R"(unit = "mg/L")",                                                          // 3
    R"(analytes = ["nitrate", "sulfate"])",                                      // 4
    "",                                                                          // 5
    "[calibration]",                                                             // 6
    R"(model = "linear")",                                                       // 7
    R"(weighting = "1/x")",                                                      // 8
    "min_levels = 5",                                                            // 9
    "min_r2 = 0.995",                                                            // 10
    "max_error_pct = 15.0",                                                      // 11
    "max_error_pct_lowest = 20.0",                                               // 12
    "min_levels_within = 0.75",                                                  // 13
    R"(valid_for = "7 days")",                                                   // 14
    "review_required = true",                                                    // 15
    "",                                                                          // 16
    "[check]",                                                                   // 17
    "tolerance_pct = 10.0",                                                      // 18
    "samples_per_check = 10",                                                    // 19
    R"(check_every = "12 hours")",                                               // 20
    R"(trend_rules = ["1-3s", "2-2s", "R-4s"])",                                 // 21
};

std::string text_of(const Lines& lines) {
  std::string text;
  for (const auto& l : lines) text += l + "\n";
  return text;
}

/// kValid with line `n` replaced by `line`.
std::string replaced(size_t n, const std::string& line) {
  Lines l = kValid;
  l.at(n - 1) = line;
  return text_of(l);
}

/// kValid with `line` inserted after line `n` (so it becomes line n + 1).
std::string inserted(size_t n, const std::string& line) {
  Lines l = kValid;
  l.insert(l.begin() + static_cast<long>(n), line);
  return text_of(l);
}

/// kValid without lines `first` to `last` (inclusive).
std::string removed(size_t first, size_t last) {
  Lines l = kValid;
  l.erase(l.begin() + static_cast<long>(first - 1), l.begin() + static_cast<long>(last));
  return text_of(l);
}

struct Failure {
  bool thrown = false;
  std::string message;
  cw::SourceLocation where;
};

Failure failure_of(const std::string& text) {
  Failure f;
  try {
    cw::import::parse_method_text(kFile, text);
  } catch (const cw::ValidationError& e) {
    f.thrown = true;
    f.message = e.what();
    if (e.location()) f.where = *e.location();
  }
  return f;
}

struct Case {
  const char* what;
  std::string text;
  long line;          ///< expected line; 0 = the location carries no line
  std::string field;  ///< expected dotted key; "" = none
  std::string message;
};

void check_cases(const std::vector<Case>& cases) {
  for (const auto& c : cases) {
    INFO(c.what << "\n--- file ---\n" << c.text);
    const Failure f = failure_of(c.text);
    REQUIRE(f.thrown);
    INFO("message: " << f.message);
    CHECK_THAT(f.message, Catch::Contains(c.message));
    CHECK(f.where.file == kFile);
    if (c.line == 0) {
      CHECK_FALSE(f.where.line.has_value());
    } else {
      CHECK(f.where.line == c.line);
    }
    CHECK(f.where.field == c.field);
  }
}

}  // namespace

TEST_CASE("method_file: the method file of the product design parses", "[import]") {
  const std::string text = text_of(kValid);
  const auto parsed = cw::import::parse_method_text(kFile, text);
  const auto& d = parsed.definition;
  CHECK(d.code == "ANION-IC");
  CHECK(d.title == "Nitrate and sulfate in drinking water by ion chromatography");
  CHECK(d.unit == "mg/L");
  CHECK(d.analytes == std::vector<std::string>{"nitrate", "sulfate"});
  CHECK_FALSE(d.internal_standard.has_value());
  CHECK(d.calibration.model == cw::fitting::Model::Linear);
  CHECK(d.calibration.weighting == cw::fitting::Weighting::InvX);
  CHECK(d.calibration.min_levels == 5);
  CHECK(d.calibration.min_r2 == Approx(0.995).epsilon(1e-12));
  CHECK(d.calibration.max_error_pct == Approx(15.0).epsilon(1e-12));
  CHECK(d.calibration.max_error_pct_lowest == Approx(20.0).epsilon(1e-12));
  CHECK(d.calibration.min_levels_within == Approx(0.75).epsilon(1e-12));
  CHECK_FALSE(d.calibration.max_rf_rsd_pct.has_value());
  CHECK(d.calibration.valid_for == cw::Duration{7, cw::Duration::Unit::Days});
  CHECK(d.calibration.review_required);
  CHECK(d.check.tolerance_pct == Approx(10.0).epsilon(1e-12));
  CHECK(d.check.samples_per_check == 10);
  CHECK(d.check.check_every == cw::Duration{12, cw::Duration::Unit::Hours});
  CHECK(d.check.trend_rules == std::vector<std::string>{"1-3s", "2-2s", "R-4s"});
  CHECK_FALSE(d.check.blank_limit.has_value());
  CHECK(parsed.file_name == kFile);
  CHECK(parsed.text == text);
  // SHA-256 of the exact bytes, computed independently with Python's hashlib.
  CHECK(parsed.sha256 == "40228e9b2fcf63b45bc68083d5d144fc2ad9a13a2ea8affcfc7a7dcabb7ce7c5");
}

TEST_CASE("method_file: optional keys take their documented defaults", "[import]") {
  const std::string minimal =
      "code = \"PEST-GC\"\n"
      "title = \"Pesticides by GC\"\n"
      "unit = \"ug/L\"\n"
      "analytes = [\"atrazine\"]\n"
      "internal_standard = \"atrazine-d5\"\n"
      "[calibration]\n"
      "model = \"mean-response-factor\"\n"
      "weighting = \"none\"\n"
      "min_levels = 2\n"
      "valid_for = \"1 month\"\n"
      "[check]\n"
      "tolerance_pct = 20\n";
  const auto d = cw::import::parse_method_text("pest.toml", minimal).definition;
  CHECK(d.internal_standard == std::string("atrazine-d5"));
  CHECK(d.calibration.model == cw::fitting::Model::MeanResponseFactor);
  CHECK(d.calibration.weighting == cw::fitting::Weighting::None);
  CHECK(d.calibration.min_levels == 2);
  CHECK_FALSE(d.calibration.min_r2.has_value());
  CHECK_FALSE(d.calibration.max_error_pct.has_value());
  CHECK(d.calibration.valid_for == cw::Duration{1, cw::Duration::Unit::Months});
  CHECK(d.calibration.review_required);  // review is required unless the file says otherwise
  CHECK(d.check.tolerance_pct == Approx(20.0).epsilon(1e-12));  // an integer is a number too
  CHECK_FALSE(d.check.samples_per_check.has_value());
  CHECK_FALSE(d.check.check_every.has_value());
  CHECK(d.check.trend_rules.empty());
}

TEST_CASE("method_file: every model accepts its smallest fittable min_levels", "[import]") {
  // Levels needed for one residual degree of freedom (product.md §7): 3 for a line with
  // intercept, 2 through the origin, 4 for a quadratic, 2 for a mean response factor.
  CHECK_NOTHROW(cw::import::parse_method_text(kFile, replaced(9, "min_levels = 3")));
  CHECK_NOTHROW(cw::import::parse_method_text(
      kFile,
      text_of({kValid[0], kValid[1], kValid[2], kValid[3], "[calibration]",
               R"(model = "linear-through-origin")", R"(weighting = "none")", "min_levels = 2",
               R"(valid_for = "12 hours")", "[check]", "tolerance_pct = 10.0"})));
  CHECK_NOTHROW(cw::import::parse_method_text(
      kFile, text_of({kValid[0], kValid[1], kValid[2], kValid[3], "[calibration]",
                      R"(model = "quadratic")", R"(weighting = "1/x^2")", "min_levels = 4",
                      R"(valid_for = "24 hours")", "[check]", "tolerance_pct = 10.0"})));
}

TEST_CASE("method_file: unknown keys are refused with their line and dotted key", "[import]") {
  check_cases({
      {"top-level key", inserted(4, R"(colour = "blue")"), 5, "colour", "unknown key 'colour'"},
      {"key in [calibration]", inserted(15, "min_r3 = 0.99"), 16, "calibration.min_r3",
       "unknown key 'calibration.min_r3'"},
      {"key in [check]", inserted(21, "tolerance = 5.0"), 22, "check.tolerance",
       "unknown key 'check.tolerance'"},
      {"unknown table", inserted(21, "[extras]"), 22, "extras", "unknown key 'extras'"},
  });
}

TEST_CASE("method_file: values of the wrong type are refused", "[import]") {
  check_cases({
      {"title is a number", replaced(2, "title = 5"), 2, "title",
       "key 'title' must be a string, got a whole number"},
      {"min_levels is a string", replaced(9, R"(min_levels = "five")"), 9, "calibration.min_levels",
       "key 'calibration.min_levels' must be a whole number, got a string"},
      {"min_levels is a fraction", replaced(9, "min_levels = 5.5"), 9, "calibration.min_levels",
       "must be a whole number, got a number"},
      {"min_r2 is a string", replaced(10, R"(min_r2 = "high")"), 10, "calibration.min_r2",
       "key 'calibration.min_r2' must be a number, got a string"},
      {"review_required is a string", replaced(15, R"(review_required = "yes")"), 15,
       "calibration.review_required", "must be true or false, got a string"},
      {"analytes is a string", replaced(4, R"(analytes = "nitrate")"), 4, "analytes",
       "key 'analytes' must be a list of strings, got a string"},
      {"analytes holds a number", replaced(4, R"(analytes = ["nitrate", 3])"), 4, "analytes",
       "must hold only strings, got a whole number"},
      {"valid_for is a number", replaced(14, "valid_for = 7"), 14, "calibration.valid_for",
       "must be a string, got a whole number"},
      {"tolerance_pct is a boolean", replaced(18, "tolerance_pct = true"), 18,
       "check.tolerance_pct", "must be a number, got true/false"},
      {"trend_rules is a string", replaced(21, R"(trend_rules = "1-3s")"), 21, "check.trend_rules",
       "must be a list of strings, got a string"},
  });
}

TEST_CASE("method_file: a [check] that is not a table is refused", "[import]") {
  // [check] replaced by a string value at line 5.
  Lines l(kValid.begin(), kValid.begin() + 15);
  l.insert(l.begin() + 4, R"(check = "daily")");
  check_cases(
      {{"check = string", text_of(l), 5, "check", "key 'check' must be a table ([check])"}});
}

TEST_CASE("method_file: unknown enumeration values are refused", "[import]") {
  check_cases({
      {"model", replaced(7, R"(model = "cubic")"), 7, "calibration.model",
       "key 'calibration.model' has unknown model 'cubic'"},
      {"model names are case-sensitive", replaced(7, R"(model = "Linear")"), 7, "calibration.model",
       "unknown model 'Linear'"},
      {"weighting", replaced(8, R"(weighting = "1/z")"), 8, "calibration.weighting",
       "has unknown weighting '1/z'"},
      {"trend rule", replaced(21, R"(trend_rules = ["1-3s", "9-9s"])"), 21, "check.trend_rules",
       "has unknown rule '9-9s'"},
      {"trend rule twice", replaced(21, R"(trend_rules = ["1-3s", "1-3s"])"), 21,
       "check.trend_rules", "lists '1-3s' twice"},
  });
}

TEST_CASE("method_file: numbers outside their range are refused", "[import]") {
  check_cases({
      {"min_r2 above 1", replaced(10, "min_r2 = 1.5"), 10, "calibration.min_r2",
       "key 'calibration.min_r2' must be greater than 0 and at most 1, got 1.5"},
      {"min_r2 zero", replaced(10, "min_r2 = 0"), 10, "calibration.min_r2",
       "must be greater than 0 and at most 1, got 0"},
      {"min_r2 nan", replaced(10, "min_r2 = nan"), 10, "calibration.min_r2",
       "must be greater than 0 and at most 1, got nan"},
      {"max_error_pct negative", replaced(11, "max_error_pct = -5.0"), 11,
       "calibration.max_error_pct", "must be a percentage above 0, got -5"},
      {"max_error_pct infinite", replaced(11, "max_error_pct = inf"), 11,
       "calibration.max_error_pct", "must be a percentage above 0, got inf"},
      {"min_levels_within above 1", replaced(13, "min_levels_within = 1.2"), 13,
       "calibration.min_levels_within", "must be a fraction above 0 and at most 1, got 1.2"},
      {"min_levels zero", replaced(9, "min_levels = 0"), 9, "calibration.min_levels",
       "must be a whole number from 1 to 1000, got 0"},
      // Wider than 32 bits: once wrapped to a small int; now refused for its field.
      {"min_levels beyond 32 bits", replaced(9, "min_levels = 4294967301"), 9,
       "calibration.min_levels", "must be a whole number from 1 to 1000, got 4294967301"},
      {"tolerance_pct above 100", replaced(18, "tolerance_pct = 150.0"), 18, "check.tolerance_pct",
       "must be a percentage above 0 and at most 100, got 150"},
      {"samples_per_check zero", replaced(19, "samples_per_check = 0"), 19,
       "check.samples_per_check", "must be a whole number from 1 to 100000, got 0"},
      {"samples_per_check beyond 32 bits", replaced(19, "samples_per_check = 9223372036854775807"),
       19, "check.samples_per_check", "must be a whole number from 1 to 100000"},
      {"valid_for beyond 100 years", replaced(14, R"(valid_for = "101 years")"), 14,
       "calibration.valid_for", "is longer than 100 years"},
      {"blank_limit negative", inserted(21, "blank_limit = -1.0"), 22, "check.blank_limit",
       "must be zero or more, got -1"},
  });
}

TEST_CASE("method_file: missing required keys are named", "[import]") {
  // A missing key has no line of its own: the location names the table that lacks it (its
  // header line) and the dotted key.
  const Failure top = failure_of(removed(1, 1));
  REQUIRE(top.thrown);
  CHECK(top.message == "missing key 'code'");
  CHECK(top.where.file == kFile);
  CHECK(top.where.line == 1L);  // the top-level table starts at line 1
  CHECK(top.where.field == "code");

  for (const auto& [line, key] :
       std::vector<std::pair<size_t, std::string>>{{2, "title"}, {3, "unit"}, {4, "analytes"}}) {
    const Failure f = failure_of(removed(line, line));
    INFO("removed line " << line);
    REQUIRE(f.thrown);
    CHECK(f.message == "missing key '" + key + "'");
    CHECK(f.where.field == key);
  }

  check_cases({
      {"model", removed(7, 7), 6, "calibration.model", "missing key 'calibration.model'"},
      {"weighting", removed(8, 8), 6, "calibration.weighting",
       "missing key 'calibration.weighting'"},
      {"min_levels", removed(9, 9), 6, "calibration.min_levels",
       "missing key 'calibration.min_levels'"},
      {"valid_for", removed(14, 14), 6, "calibration.valid_for",
       "missing key 'calibration.valid_for'"},
      {"tolerance_pct", removed(18, 18), 17, "check.tolerance_pct",
       "missing key 'check.tolerance_pct'"},
  });

  const Failure no_calibration = failure_of(removed(6, 15));
  REQUIRE(no_calibration.thrown);
  CHECK(no_calibration.message == "missing key 'calibration'");
  CHECK(no_calibration.where.field == "calibration");
  const Failure no_check = failure_of(removed(17, 21));
  REQUIRE(no_check.thrown);
  CHECK(no_check.message == "missing key 'check'");
}

TEST_CASE("method_file: duplicate analytes and bad names are refused", "[import]") {
  check_cases({
      {"analyte twice", replaced(4, R"(analytes = ["nitrate", "sulfate", "nitrate"])"), 4,
       "analytes", "key 'analytes' lists 'nitrate' twice"},
      {"no analytes", replaced(4, "analytes = []"), 4, "analytes",
       "key 'analytes' is an empty list"},
      {"analyte with '='", replaced(4, R"(analytes = ["nitrate=1"])"), 4, "analytes",
       "forbidden character"},
      {"internal standard is an analyte", inserted(4, R"(internal_standard = "nitrate")"), 5,
       "internal_standard", "the internal standard 'nitrate' is also listed as an analyte"},
      {"method code with a space", replaced(1, R"(code = "ANION IC")"), 1, "code",
       "method code 'ANION IC' contains the character ' '"},
      {"blank title", replaced(2, R"(title = "   ")"), 2, "title", "key 'title' is empty"},
  });
}

TEST_CASE("method_file: durations that cannot be read are refused", "[import]") {
  check_cases({
      {"unknown unit", replaced(14, R"(valid_for = "7 fortnights")"), 14, "calibration.valid_for",
       "key 'calibration.valid_for': invalid duration '7 fortnights'"},
      {"zero", replaced(14, R"(valid_for = "0 days")"), 14, "calibration.valid_for",
       "must be longer than zero"},
      {"words", replaced(20, R"(check_every = "twice a day")"), 20, "check.check_every",
       "key 'check.check_every': invalid duration 'twice a day'"},
      {"negative", replaced(20, R"(check_every = "-12 hours")"), 20, "check.check_every",
       "invalid duration"},
  });
}

TEST_CASE("method_file: rules that contradict each other are refused", "[import]") {
  check_cases({
      {"mean-response-factor with weighting", replaced(7, R"(model = "mean-response-factor")"), 8,
       "calibration.weighting",
       "key 'calibration.weighting' must be 'none' for the mean-response-factor model"},
      {"linear with 2 levels", replaced(9, "min_levels = 2"), 9, "calibration.min_levels",
       "is 2, but the linear model needs at least 3 levels"},
      {"max_error_pct_lowest without max_error_pct", removed(11, 11), 11,
       "calibration.max_error_pct_lowest", "needs max_error_pct as well"},
  });
  // A quadratic needs 4 levels; through the origin 2.
  Lines quadratic = kValid;
  quadratic[6] = R"(model = "quadratic")";
  quadratic[8] = "min_levels = 3";
  Lines origin = kValid;
  origin[6] = R"(model = "linear-through-origin")";
  origin[8] = "min_levels = 1";
  check_cases({
      {"quadratic with 3 levels", text_of(quadratic), 9, "calibration.min_levels",
       "is 3, but the quadratic model needs at least 4 levels"},
      {"through the origin with 1 level", text_of(origin), 9, "calibration.min_levels",
       "is 1, but the linear-through-origin model needs at least 2 levels"},
  });
}

TEST_CASE("method_file: TOML syntax errors carry the line of the fault", "[import]") {
  check_cases({
      {"value missing", replaced(10, "min_r2 = "), 10, "", "not valid TOML"},
      {"unterminated string", replaced(3, R"(unit = "mg/L)"), 3, "", "not valid TOML"},
      {"key given twice", inserted(3, R"(unit = "mg/kg")"), 4, "", "not valid TOML"},
      {"table given twice", inserted(16, "[calibration]"), 17, "", "not valid TOML"},
  });
}

TEST_CASE("method_file: files that cannot be read are named", "[import]") {
  const auto dir = std::filesystem::temp_directory_path();
  const auto missing = (dir / "curvewarden-no-such-method.toml").string();
  std::filesystem::remove(missing);
  try {
    cw::import::read_method_file(missing);
    FAIL("no error for a missing file");
  } catch (const cw::ValidationError& e) {
    CHECK_THAT(e.what(), Catch::Contains("no such file"));
    REQUIRE(e.location());
    CHECK(e.location()->file == missing);
  }

  const auto latin1 = (dir / "curvewarden-latin1-method.toml").string();
  {
    std::ofstream out(latin1, std::ios::binary);
    out << text_of(kValid) << "# Zubeh\xf6r\n";  // ISO-8859-1 'ö': not UTF-8
  }
  try {
    cw::import::read_method_file(latin1);
    FAIL("no error for a file that is not UTF-8");
  } catch (const cw::ValidationError& e) {
    CHECK_THAT(e.what(), Catch::Contains("is not UTF-8 text"));
  }
  std::filesystem::remove(latin1);
}

TEST_CASE("method_file: trend targets are read together or refused", "[import]") {
  const auto d =
      cw::import::parse_method_text(kFile, inserted(21, "trend_mean = 100.5") + "trend_sd = 2.5\n")
          .definition;
  CHECK(d.check.trend_mean == 100.5);
  CHECK(d.check.trend_sd == 2.5);
  const Failure alone = failure_of(inserted(21, "trend_mean = 100"));
  CHECK(alone.thrown);
  CHECK(alone.message == "key 'check.trend_mean' needs 'check.trend_sd' as well");
  CHECK(alone.where.line == 22);
  const Failure zero = failure_of(inserted(21, "trend_mean = 100") + "trend_sd = 0\n");
  CHECK(zero.thrown);
  CHECK_THAT(zero.message, Catch::Contains("'check.trend_sd' must be a standard deviation"));
}
