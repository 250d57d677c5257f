// SPDX-License-Identifier: Apache-2.0
// The strict parsers every input goes through (options and files alike): plain decimals,
// whole numbers, free text, UTF-8, and instants within the calendar the store holds.
#include <catch2/catch.hpp>
#include <cmath>
#include <limits>
#include <string>

#include "core/clean_text.h"
#include "core/error.h"
#include "core/number.h"
#include "core/text.h"
#include "core/time.h"
#include "core/utf8.h"

namespace {

template <class Fn>
std::string message_of(Fn&& fn) {
  try {
    fn();
  } catch (const cw::ValidationError& e) {
    return e.what();
  }
  return "";
}

}  // namespace

TEST_CASE("number: plain decimals only, correctly rounded", "[core]") {
  for (const auto& [text, value] :
       std::vector<std::pair<std::string, double>>{{"0", 0.0},
                                                   {"-0.5", -0.5},
                                                   {"+2", 2.0},
                                                   {".5", 0.5},
                                                   {"5.", 5.0},
                                                   {"1e3", 1000.0},
                                                   {"1.5E-3", 0.0015},
                                                   {"  12.25  ", 12.25}}) {
    INFO(text);
    const auto p = cw::parse_decimal(text);
    REQUIRE(p.value.has_value());
    CHECK(*p.value == value);
  }
  // Correct rounding (IEEE 754 round-to-nearest): 0.1 is the double nearest 1/10, and the
  // classic hard case 2.2250738585072011e-308 reads as the smallest normal double (from memory:
  // the value made famous by a looping strtod).
  CHECK(*cw::parse_decimal("0.1").value == 0.1);
  CHECK(*cw::parse_decimal("2.2250738585072014e-308").value == std::numeric_limits<double>::min());
  for (const char* bad : {"0x10", "0X1p3", "inf", "-inf", "nan", "NaN", "1,5", "1 000", "12abc",
                          "--1", "1e", "e5", ".", "+-1", "1.2.3", "١٢"}) {
    INFO(bad);
    const auto p = cw::parse_decimal(bad);
    CHECK_FALSE(p.value.has_value());
    CHECK(p.problem == cw::NumberProblem::NotDecimal);
  }
  for (const char* empty : {"", "   "})
    CHECK(cw::parse_decimal(empty).problem == cw::NumberProblem::Empty);
  for (const char* range : {"1e999", "-1e400", "1e-320", "4e-324"}) {
    INFO(range);
    CHECK(cw::parse_decimal(range).problem == cw::NumberProblem::OutOfRange);
  }
  CHECK(*cw::parse_decimal("0e-999").value == 0.0);  // zero written with an exponent is zero
  // A negative zero is zero: its sign never reaches the store or the screen (IEEE 754 keeps it,
  // and "-0" == 0 compares equal, so only the sign bit shows it).
  for (const char* zero : {"-0", "-0.0", "-0e5", "-.0"}) {
    INFO(zero);
    CHECK_FALSE(std::signbit(*cw::parse_decimal(zero).value));
  }
  CHECK(cw::format_shortest(-0.0) == "0");
  CHECK(cw::format_plain(-0.0) == "0");
  CHECK(cw::format_fixed(-0.0, 2) == "0.00");
  CHECK(cw::format_fixed(-0.001, 2) == "-0.00");  // a negative that rounds to zero keeps its sign
}

TEST_CASE("number: messages name what was given and what is expected", "[core]") {
  CHECK(message_of([] { cw::decimal_or_throw("0x10", "--response"); }) ==
        "--response '0x10' is not a plain decimal number");
  CHECK(message_of([] { cw::decimal_or_throw(" ", "--response"); }) == "--response is empty");
  CHECK(message_of([] { cw::decimal_or_throw("1e999", "--response"); }) ==
        "--response '1e999' is out of range");
  CHECK(cw::whole_or_throw("42", "--replicates", 1, 1000) == 42);
  CHECK(message_of([] { cw::whole_or_throw("0", "--replicates", 1, 1000); }) ==
        "--replicates '0' is out of range");
  CHECK(message_of([] { cw::whole_or_throw("2.5", "--replicates", 1, 1000); }) ==
        "--replicates '2.5' is not a whole number");
  CHECK(message_of([] { cw::whole_or_throw("99999999999999999999", "--n", 1, 5); }) ==
        "--n '99999999999999999999' is out of range");
  CHECK(message_of([] {
          cw::require_finite(std::numeric_limits<double>::infinity(), "the recovery");
        }) == "the recovery is not a finite number (it overflows)");
}

TEST_CASE("utf8: well-formed sequences only (RFC 3629 §4)", "[core]") {
  CHECK(cw::is_valid_utf8("nitrate ± 5 µg/L"));
  CHECK(cw::is_valid_utf8("\xf0\x9f\xa7\xaa"));        // U+1F9EA, four bytes
  CHECK_FALSE(cw::is_valid_utf8("\xc0\xaf"));          // overlong '/'
  CHECK_FALSE(cw::is_valid_utf8("\xe0\x80\xaf"));      // overlong, three bytes
  CHECK_FALSE(cw::is_valid_utf8("\xed\xa0\x80"));      // surrogate U+D800
  CHECK_FALSE(cw::is_valid_utf8("\xf4\x90\x80\x80"));  // above U+10FFFF
  CHECK_FALSE(cw::is_valid_utf8("\xe2\x82"));          // truncated
  CHECK_FALSE(cw::is_valid_utf8("\xff"));
  std::size_t pos = 0;
  CHECK(cw::next_code_point("\xc2\xa0x", pos) == char32_t{0xA0});
  CHECK(pos == 2);
  CHECK(cw::code_point_count("µg") == 2);
}

TEST_CASE("clean text: trimmed, visible, one line, within its cap", "[core]") {
  CHECK(cw::clean_text("  pump seal  ", "--reason", 100) == "pump seal");
  // The no-break space and the ideographic space are white space to trim, not text.
  CHECK(cw::clean_text("\xc2\xa0r.okafor\xe3\x80\x80", "--as", 100) == "r.okafor");
  CHECK(message_of([] { cw::clean_text("\xc2\xa0", "--as", 100); }) == "--as is empty");
  CHECK(cw::clean_text("Dr.\xc2\xa0Lindqvist", "--as", 100) == "Dr.\xc2\xa0Lindqvist");
  CHECK_THAT(message_of([] { cw::clean_text("a\x1b[2Jb", "--reason", 100); }),
             Catch::Contains("U+001B"));
  CHECK_THAT(message_of([] { cw::clean_text("a\tb", "--reason", 100); }),
             Catch::Contains("U+0009"));
  CHECK_THAT(message_of([] { cw::clean_text(std::string("a\0b", 3), "--reason", 100); }),
             Catch::Contains("U+0000"));
  CHECK_THAT(message_of([] {
               cw::clean_text(
                   "a\xc2\x9b"
                   "b",
                   "--reason", 100);
             }),
             Catch::Contains("U+009B"));  // C1 control sequence introducer
  CHECK_THAT(message_of([] {
               cw::clean_text(
                   "abc\xe2\x80\xae"
                   "fed",
                   "--reason", 100);
             }),
             Catch::Contains("U+202E"));  // right-to-left override
  CHECK_THAT(message_of([] {
               cw::clean_text(
                   "a\xe2\x81\xa6"
                   "b",
                   "--reason", 100);
             }),
             Catch::Contains("U+2066"));  // left-to-right isolate
  CHECK_THAT(message_of([] {
               cw::clean_text(
                   "a\xe2\x80\x8b"
                   "b",
                   "--reason", 100);
             }),
             Catch::Contains("U+200B"));  // zero-width space
  CHECK(message_of([] { cw::clean_text("\xff", "--reason", 100); }) ==
        "--reason is not valid UTF-8 text");
  // The cap counts characters, not bytes.
  CHECK(cw::clean_text(std::string(100, 'x'), "--name", 100).size() == 100);
  std::string hundred_mu;
  for (int i = 0; i < 100; ++i) hundred_mu += "µ";
  CHECK(cw::clean_text(hundred_mu, "--name", 100) == hundred_mu);
  CHECK(message_of([] { cw::clean_text(std::string(101, 'x'), "--name", 100); }) ==
        "--name is 101 characters long");
}

TEST_CASE("time: instants lie in the years 0001 to 9999 once their offset is applied", "[core]") {
  CHECK(cw::format_utc(cw::parse_instant("9999-12-31T23:59:59Z")) == "9999-12-31T23:59:59Z");
  CHECK(cw::format_utc(cw::parse_instant("0001-01-01T00:00:00Z")) == "0001-01-01T00:00:00Z");
  CHECK(cw::format_utc(cw::parse_instant("0001-01-01T10:00:00+10:00")) == "0001-01-01T00:00:00Z");
  for (const char* outside :
       {"9999-12-31T23:00:00-14:00", "0001-01-01T00:30:00+14:00", "0000-06-01T00:00:00Z"}) {
    INFO(outside);
    CHECK_THAT(message_of([&] { cw::parse_instant(outside, "--at"); }),
               Catch::Contains("lies outside the years 0001 to 9999"));
  }
  CHECK_THAT(message_of([] { cw::parse_date("0000-12-01", "--expires"); }),
             Catch::Contains("is not a calendar date"));
}

TEST_CASE("time: durations are positive and at most 100 years", "[core]") {
  CHECK(cw::parse_duration("100 years") == cw::Duration{100, cw::Duration::Unit::Years});
  CHECK(cw::parse_duration("1200 months") == cw::Duration{1200, cw::Duration::Unit::Months});
  CHECK(cw::parse_duration("36600 days") == cw::Duration{36600, cw::Duration::Unit::Days});
  for (const char* too_long : {"101 years", "1201 months", "36601 days", "5229 weeks",
                               "878401 hours", "52704001 minutes"}) {
    INFO(too_long);
    CHECK_THAT(message_of([&] { cw::parse_duration(too_long, "valid_for"); }),
               Catch::Contains("is longer than 100 years"));
  }
  // Past the calendar: an addition that would leave the year 9999 is refused.
  const cw::LabZone utc = cw::LabZone::named("UTC");
  CHECK_THAT(message_of([&] {
               cw::add_duration(cw::parse_instant("9950-01-01T00:00:00Z"),
                                cw::Duration{100, cw::Duration::Unit::Years}, utc);
             }),
             Catch::Contains("lies beyond the year 9999"));
}
