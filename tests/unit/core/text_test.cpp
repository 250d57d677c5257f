// SPDX-License-Identifier: Apache-2.0
// Tests of src/core/text.h: strict number parsing and the code and analyte-name rules that
// keep user text out of trouble (SQL metacharacters, control characters).
#include <catch2/catch.hpp>
#include <string>

#include "core/error.h"
#include "core/text.h"
#include "core/utf8.h"

namespace {

template <class Fn>
std::string validation_message(Fn&& fn) {
  try {
    fn();
  } catch (const cw::ValidationError& e) {
    return e.what();
  }
  return "";
}

}  // namespace

TEST_CASE("text: parse_number accepts whole finite decimals only", "[core]") {
  CHECK(cw::parse_number("1e3") == 1000.0);
  CHECK(cw::parse_number("-0.5") == -0.5);
  CHECK(cw::parse_number("+2") == 2.0);
  CHECK(cw::parse_number(" 3.25 ") == 3.25);
  for (const char* bad : {"nan", "inf", "-inf", "0x10", "1,5", "12abc", "", " ", "1e999", "--1"}) {
    INFO("text: '" << bad << "'");
    CHECK_FALSE(cw::parse_number(bad).has_value());
  }
}

TEST_CASE("text: parse_integer refuses fractions and trailing text", "[core]") {
  CHECK(cw::parse_integer("42") == 42L);
  CHECK(cw::parse_integer("-3") == -3L);
  for (const char* bad : {"4.0", "4x", "", "99999999999999999999"}) {
    INFO("text: '" << bad << "'");
    CHECK_FALSE(cw::parse_integer(bad).has_value());
  }
}

TEST_CASE("text: check_code accepts lab codes and refuses everything else", "[core]") {
  CHECK_NOTHROW(cw::check_code("IC-02", "instrument code"));
  CHECK_NOTHROW(cw::check_code("CRM/NO3.0042_b", "lot code"));
  CHECK_NOTHROW(cw::check_code(std::string(64, 'A'), "lot code"));

  CHECK(validation_message([] { cw::check_code("", "lot code"); }) == "lot code is empty");
  CHECK_THAT(validation_message([] { cw::check_code(std::string(65, 'A'), "lot code"); }),
             Catch::Contains("longer than 64 characters"));
  CHECK_THAT(validation_message([] { cw::check_code("-IC", "instrument code"); }),
             Catch::Contains("must start with a letter or digit"));
  CHECK_THAT(validation_message([] { cw::check_code("IC 02", "instrument code"); }),
             Catch::Contains("contains the character ' '"));
  CHECK_THAT(validation_message([] { cw::check_code("L1'; DROP TABLE lots;--", "lot code"); }),
             Catch::Contains("contains the character '''"));
  CHECK_THAT(validation_message([] { cw::check_code("A\"B", "lot code"); }),
             Catch::Contains("contains the character '\"'"));
}

TEST_CASE("text: check_analyte_name refuses '=', control characters and edge spaces", "[core]") {
  CHECK_NOTHROW(cw::check_analyte_name("nitrate (as N)", "analyte"));
  CHECK_THAT(validation_message([] { cw::check_analyte_name("a=b", "analyte"); }),
             Catch::Contains("forbidden character"));
  CHECK_THAT(validation_message([] { cw::check_analyte_name("ni\ttrate", "analyte"); }),
             Catch::Contains("control or formatting character U+0009"));
  CHECK_THAT(validation_message([] { cw::check_analyte_name(" nitrate", "analyte"); }),
             Catch::Contains("leading or trailing spaces"));
  CHECK(validation_message([] { cw::check_analyte_name("", "analyte"); }) == "analyte is empty");
}

TEST_CASE("text: messages show control characters, stray bytes and a BOM, and stay short",
          "[core]") {
  using namespace std::string_literals;
  CHECK(cw::readable_message("plain 'ü' text\nnext line\tand tab") ==
        "plain 'ü' text\nnext line\tand tab");
  CHECK(cw::readable_message("'2.1\0'"s) == "'2.1\\x00'");
  CHECK(cw::readable_message("a\x1b[31mred\x7f") == "a\\x1B[31mred\\x7F");
  CHECK(cw::readable_message("bad \xff\xfe byte") == "bad \\xFF\\xFE byte");
  CHECK(cw::readable_message("\xef\xbb\xbfname") == "\\u{FEFF}name");
  const std::string long_text(200000, 'x');
  const std::string shown = cw::readable_message("'" + long_text + "'");
  CHECK(shown.size() < 2100);
  CHECK_THAT(shown, Catch::EndsWith("... (198002 more bytes)"));
  // A cut never splits a character: 'é' is two bytes.
  std::string accents;
  for (int i = 0; i < 1500; ++i) accents += "é";
  const std::string cut = cw::readable_message(accents);
  CHECK(cw::is_valid_utf8(cut));
  // The error types keep their message so.
  const cw::ValidationError e("'" + "a\0b"s + "' is not a number");
  CHECK(std::string(e.what()) == "'a\\x00b' is not a number");
}
