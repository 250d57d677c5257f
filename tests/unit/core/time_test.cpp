// SPDX-License-Identifier: Apache-2.0
// Tests of src/core/time.h: ISO-8601 instants, calendar dates, durations, lab-local days and
// lab-local ISO weeks across DST changes and a year boundary.
//
// Calendar and time-zone facts used below were verified on the build machine with Python 3's
// datetime.date.isocalendar() / strftime('%A') and zoneinfo (reading the system tzdata in
// /usr/share/zoneinfo), independently of the date library under test:
//   - 2026-03-29 is a Sunday; Europe/Berlin switches from CET (+01:00) to CEST (+02:00) that
//     day at 01:00 UTC (EU rule: last Sunday of March, 01:00 UTC).
//   - 2026-11-01 is a Sunday; America/New_York switches from EDT (-04:00) to EST (-05:00) that
//     day at 06:00 UTC (US rule: first Sunday of November, 02:00 local daylight time).
//   - 1 January 2026 is a Thursday, so 2026 has 53 ISO weeks (a year whose 1 January is a
//     Thursday always does, ISO 8601); 2026-12-28 is the Monday of 2026-W53, and 2027-01-04 is
//     the Monday of 2027-W01 (2027-01-01 is a Friday and belongs to 2026-W53).
//   - 2026 is not a leap year (not divisible by 4); 2028 is (divisible by 4, not by 100).
#include <catch2/catch.hpp>
#include <cstdint>
#include <string>
#include <vector>

#include "core/date_include.h"
#include "core/error.h"
#include "core/time.h"

namespace Catch {
template <>
struct StringMaker<cw::CalendarDate> {
  static std::string convert(const cw::CalendarDate& d) { return cw::format_date(d); }
};
}  // namespace Catch

namespace {

using cw::CalendarDate;
using cw::Duration;
using cw::Instant;
using cw::LabZone;

/// An instant built with the date library alone (not with parse_instant, which is under test).
Instant utc(int y, unsigned mo, unsigned d, int h = 0, int mi = 0, int s = 0) {
  return Instant{date::sys_days{date::year{y} / date::month{mo} / date::day{d}}} +
         std::chrono::hours{h} + std::chrono::minutes{mi} + std::chrono::seconds{s};
}

/// The message of the ValidationError that `fn` throws ("" if it throws nothing).
template <class Fn>
std::string validation_message(Fn&& fn) {
  try {
    fn();
  } catch (const cw::ValidationError& e) {
    return e.what();
  }
  return "";
}

date::sys_days days_of(int y, unsigned mo, unsigned d) {
  return date::sys_days{date::year{y} / date::month{mo} / date::day{d}};
}

/// xorshift64: a fixed sequence of pseudo-random numbers from its seed.
struct Xorshift {
  std::uint64_t x;
  std::uint64_t operator()() {
    x ^= x << 13;
    x ^= x >> 7;
    x ^= x << 17;
    return x;
  }
};

}  // namespace

// ------------------------------------------------------------------------ parse_instant

TEST_CASE("time: parse_instant accepts Z and numeric offsets", "[core]") {
  CHECK(cw::parse_instant("2026-12-01T09:30:00Z") == utc(2026, 12, 1, 9, 30));
  CHECK(cw::parse_instant("2026-12-01T09:30:00z") == utc(2026, 12, 1, 9, 30));
  CHECK(cw::parse_instant("2026-12-01T10:30+01:00") == utc(2026, 12, 1, 9, 30));
  CHECK(cw::parse_instant("2026-12-01T04:30:00-05:00") == utc(2026, 12, 1, 9, 30));
  CHECK(cw::parse_instant("2026-12-01T15:00:00+05:30") == utc(2026, 12, 1, 9, 30));
  CHECK(cw::parse_instant("2026-12-01 09:30Z") == utc(2026, 12, 1, 9, 30));
  // An offset can move the instant into the next year.
  CHECK(cw::parse_instant("2026-12-31T23:30:00-01:00") == utc(2027, 1, 1, 0, 30));
  // Fractions of a second are truncated, never rounded up.
  CHECK(cw::parse_instant("2026-12-01T09:30:59.999Z") == utc(2026, 12, 1, 9, 30, 59));
  // 29 February exists in 2028.
  CHECK(cw::parse_instant("2028-02-29T12:00:00Z") == utc(2028, 2, 29, 12));
}

TEST_CASE("time: format_utc writes the stored form with Z", "[core]") {
  CHECK(cw::format_utc(utc(2026, 3, 2, 9, 0, 5)) == "2026-03-02T09:00:05Z");
  CHECK(cw::format_utc(cw::parse_instant("2026-03-29T03:00+02:00")) == "2026-03-29T01:00:00Z");
  // Written digit by digit: the same text as date::format over the supported years, leap days,
  // the ends of days and times before 1970 included.
  std::int64_t step = 0;
  for (std::int64_t s = -62135596800; s <= 253402300799; s += 86400 * 97 + 3607 + step++ % 53) {
    const cw::Instant t{std::chrono::seconds(s)};
    INFO(s);
    CHECK(cw::format_utc(t) == date::format("%Y-%m-%dT%H:%M:%SZ", t));
  }
  for (const char* text :
       {"2028-02-29T23:59:59Z", "1969-12-31T23:59:59Z", "2000-01-01T00:00:00Z"}) {
    CHECK(cw::format_utc(cw::parse_instant(text)) == text);
  }
}

TEST_CASE("time: the stored form is read and written like the date library does, 0001 to 9999",
          "[core]") {
  // Reference: Howard Hinnant's date library (date::format / date::parse), the general-purpose
  // library the fast paths of format_utc and parse_instant must agree with.
  Xorshift next{88172645463325252ULL};
  const cw::Instant first{date::sys_days{date::year{1} / 1 / 1}};
  const cw::Instant last{date::sys_days{date::year{9999} / 12 / 31} + std::chrono::seconds{86399}};
  const auto span = static_cast<std::uint64_t>((last - first).count());
  std::vector<cw::Instant> moments{first, last};
  for (int i = 0; i < 20000; ++i) {
    moments.push_back(first + std::chrono::seconds{static_cast<long>(next() % (span + 1))});
  }
  for (const cw::Instant t : moments) {
    const std::string reference = date::format("%Y-%m-%dT%H:%M:%SZ", t);
    REQUIRE(cw::format_utc(t) == reference);
    REQUIRE(cw::parse_instant(reference) == t);
  }
  // Leap days: 2028-02-29 exists, 2026-02-29 and 2100-02-29 do not (Gregorian rules).
  CHECK(cw::format_utc(cw::parse_instant("2028-02-29T23:59:59Z")) == "2028-02-29T23:59:59Z");
  CHECK_THROWS_AS(cw::parse_instant("2026-02-29T00:00:00Z"), cw::ValidationError);
  CHECK_THROWS_AS(cw::parse_instant("2100-02-29T00:00:00Z"), cw::ValidationError);
  CHECK_THROWS_AS(cw::parse_instant("0000-12-31T23:59:59Z"), cw::ValidationError);
  CHECK_THROWS_AS(cw::parse_instant("2026-12-01T24:00:00Z"), cw::ValidationError);
  CHECK_THROWS_AS(cw::parse_instant("2026-12-01T23:60:00Z"), cw::ValidationError);
  CHECK_THROWS_AS(cw::parse_instant("2026-12-01T23:59:60Z"), cw::ValidationError);
  CHECK_THROWS_AS(cw::parse_instant("2026-13-01T00:00:00Z"), cw::ValidationError);
  CHECK_THROWS_AS(cw::parse_instant("2026-1a-01T00:00:00Z"), cw::ValidationError);
  // Outside the supported range the general form is still written (never the fast path's).
  const cw::Instant before = first - std::chrono::seconds{1};
  CHECK(cw::format_utc(before) == date::format("%Y-%m-%dT%H:%M:%SZ", before));
}

TEST_CASE("time: format_local writes what the date library writes, in zones of every kind",
          "[core]") {
  // Reference: the date library's zoned formatting (%Y-%m-%d %H:%M %Ez), which format_local's
  // digit-by-digit path must match: whole-hour, half-hour and 45-minute offsets, negative ones,
  // +14:00, DST, and the local mean times of the 19th century whose offsets have seconds.
  Xorshift next{2463534242ULL};
  const cw::Instant first{date::sys_days{date::year{1} / 1 / 2}};
  const cw::Instant last{date::sys_days{date::year{9999} / 12 / 30}};
  const auto span = static_cast<std::uint64_t>((last - first).count());
  const char* zones[] = {"UTC",
                         "Europe/Berlin",
                         "America/New_York",
                         "Asia/Kolkata",
                         "Australia/Eucla",
                         "America/St_Johns",
                         "Pacific/Kiritimati",
                         "Europe/Amsterdam",
                         "Africa/Monrovia",
                         "America/Sao_Paulo"};
  for (const char* name : zones) {
    const LabZone zone = LabZone::named(name);
    std::vector<cw::Instant> moments{first, last, utc(1900, 1, 1), utc(2026, 3, 29, 1),
                                     utc(2026, 11, 1, 6)};
    for (int i = 0; i < 3000; ++i) {
      moments.push_back(first + std::chrono::seconds{static_cast<long>(next() % (span + 1))});
      // and as many in the years of real zone history
      moments.push_back(utc(1850, 1, 1) +
                        std::chrono::seconds{static_cast<long>(next() % (200ULL * 366 * 86400))});
    }
    for (const cw::Instant t : moments) {
      INFO(name << " " << date::format("%FT%TZ", t));
      REQUIRE(zone.format_local(t) ==
              date::format("%Y-%m-%d %H:%M %Ez", date::make_zoned(zone.zone(), t)));
    }
  }
  CHECK(LabZone::named("Asia/Kolkata").format_local(utc(2026, 12, 1, 23, 59, 59)) ==
        "2026-12-02 05:29 +05:30");
  CHECK(LabZone::named("America/St_Johns").format_local(utc(2026, 1, 1, 2, 0)) ==
        "2025-12-31 22:30 -03:30");
}

TEST_CASE("time: parse_instant refuses times without a zone and impossible times", "[core]") {
  struct Case {
    const char* text;
    const char* expected;  // distinctive part of the message
  };
  const Case cases[] = {
      {"2026-12-01T09:30:00", "does not name its zone"},
      {"2026-12-01T09:30", "does not name its zone"},
      {"2026-12-01", "has no time of day and zone"},
      {"2026-02-30T10:00:00Z", "is not a calendar date"},
      {"2026-02-29T10:00:00Z", "is not a calendar date"},  // 2026 is not a leap year
      {"2026-04-31T10:00:00Z", "is not a calendar date"},
      {"2026-13-01T10:00:00Z", "is not a calendar date"},
      {"2026-12-01T24:00:00Z", "is not a valid time of day"},
      {"2026-12-01T23:60:00Z", "is not a valid time of day"},
      {"2026-12-01T23:59:60Z", "is not a valid time of day"},  // no leap seconds
      {"2026-12-01T10:00:00+15:00", "invalid zone offset"},
      {"2026-12-01T10:00:00+01:60", "invalid zone offset"},
      {"2026-12-01T10:00:00Q", "invalid --at"},
      {"2026-12-01T10:00:00Z tomorrow", "unexpected text after --at"},
      {"2026-12-1T10:00Z", "invalid --at"},
      {"yesterday", "invalid --at"},
      {"", "invalid --at"},
  };
  for (const auto& c : cases) {
    INFO("text: '" << c.text << "'");
    const std::string message = validation_message([&] { cw::parse_instant(c.text, "--at"); });
    CHECK_THAT(message, Catch::Contains(c.expected));
    // The message names what was being read.
    CHECK_THAT(message, Catch::Contains("--at"));
  }
}

// --------------------------------------------------------------------------- parse_date

TEST_CASE("time: parse_date accepts real dates and refuses impossible ones", "[core]") {
  CHECK(cw::parse_date("2027-03-31") == CalendarDate{2027, 3, 31});
  CHECK(cw::parse_date(" 2028-02-29 ") == CalendarDate{2028, 2, 29});
  CHECK(cw::format_date(CalendarDate{2027, 1, 4}) == "2027-01-04");

  struct Case {
    const char* text;
    const char* expected;
  };
  const Case cases[] = {
      {"2026-02-30", "'2026-02-30' is not a calendar date"},
      {"2026-02-29", "is not a calendar date"},
      {"2026-04-31", "is not a calendar date"},
      {"2026-13-01", "is not a calendar date"},
      {"2026-00-10", "is not a calendar date"},
      {"2026-3-1", "invalid --expires"},
      {"31.03.2027", "invalid --expires"},
      {"2026-03-01T00:00Z", "invalid --expires"},
      {"", "invalid --expires"},
  };
  for (const auto& c : cases) {
    INFO("text: '" << c.text << "'");
    CHECK_THAT(validation_message([&] { cw::parse_date(c.text, "--expires"); }),
               Catch::Contains(c.expected));
  }
}

TEST_CASE("time: add_days crosses month and year ends", "[core]") {
  CHECK(cw::add_days({2026, 12, 31}, 1) == CalendarDate{2027, 1, 1});
  CHECK(cw::add_days({2028, 2, 28}, 1) == CalendarDate{2028, 2, 29});
  CHECK(cw::add_days({2026, 2, 28}, 1) == CalendarDate{2026, 3, 1});
  CHECK(cw::add_days({2026, 3, 1}, -1) == CalendarDate{2026, 2, 28});
  CHECK(cw::add_days({2026, 1, 25}, 10) == CalendarDate{2026, 2, 4});
}

// ------------------------------------------------------------------------------ LabZone

TEST_CASE("time: LabZone refuses unknown zone names", "[core]") {
  CHECK(LabZone::named("Europe/Berlin").name() == "Europe/Berlin");
  CHECK_THAT(validation_message([] { LabZone::named("Mars/Olympus"); }),
             Catch::Contains("unknown time zone 'Mars/Olympus'"));
  CHECK_THAT(validation_message([] { LabZone::named("../../etc/passwd"); }),
             Catch::Contains("unknown time zone"));
  CHECK_THAT(validation_message([] { LabZone::named("/etc/localtime"); }),
             Catch::Contains("unknown time zone"));
  CHECK_THAT(validation_message([] { LabZone::named(""); }), Catch::Contains("unknown time zone"));
}

TEST_CASE("time: local days are 23 and 25 hours long on DST change days", "[core]") {
  const auto berlin = LabZone::named("Europe/Berlin");
  // 2026-03-29 starts at 00:00 CET (+01:00) and ends at 00:00 CEST (+02:00) the next day.
  CHECK(berlin.start_of_day({2026, 3, 29}) == utc(2026, 3, 28, 23));
  CHECK(berlin.end_of_day({2026, 3, 29}) == utc(2026, 3, 29, 22));
  CHECK(berlin.end_of_day({2026, 3, 29}) - berlin.start_of_day({2026, 3, 29}) ==
        std::chrono::hours{23});

  const auto new_york = LabZone::named("America/New_York");
  // 2026-11-01 starts at 00:00 EDT (-04:00) and ends at 00:00 EST (-05:00) the next day.
  CHECK(new_york.start_of_day({2026, 11, 1}) == utc(2026, 11, 1, 4));
  CHECK(new_york.end_of_day({2026, 11, 1}) == utc(2026, 11, 2, 5));

  // The local date of an instant follows the zone, not UTC.
  CHECK(berlin.local_date(utc(2026, 3, 28, 23, 30)) == CalendarDate{2026, 3, 29});
  CHECK(new_york.local_date(utc(2026, 11, 2, 4, 59)) == CalendarDate{2026, 11, 1});
  CHECK(berlin.format_local(utc(2026, 12, 1, 9, 30)) == "2026-12-01 10:30 +01:00");
  CHECK(berlin.format_local(utc(2026, 7, 1, 9, 30)) == "2026-07-01 11:30 +02:00");
}

// --------------------------------------------------------------------------- ISO weeks

TEST_CASE("time: lab-local ISO week holding the Berlin spring DST change", "[core]") {
  const auto berlin = LabZone::named("Europe/Berlin");
  // Monday 2026-03-23 00:00 CET = 2026-03-22T23:00Z to Monday 2026-03-30 00:00 CEST =
  // 2026-03-29T22:00Z: a week of 7 × 24 − 1 = 167 hours.
  const std::pair<Instant, Instant> expected{utc(2026, 3, 22, 23), utc(2026, 3, 29, 22)};
  CHECK(berlin.iso_week_of(utc(2026, 3, 29, 12)) == expected);          // Sunday, after the switch
  CHECK(berlin.iso_week_of(utc(2026, 3, 29, 0, 30)) == expected);       // Sunday, before it
  CHECK(berlin.iso_week_of(utc(2026, 3, 22, 23)) == expected);          // first instant of the week
  CHECK(berlin.iso_week_of(utc(2026, 3, 29, 21, 59, 59)) == expected);  // last second
  CHECK(expected.second - expected.first == std::chrono::hours{167});
  // The instants on either side belong to the neighbouring weeks.
  CHECK(berlin.iso_week_of(utc(2026, 3, 22, 22, 59, 59)).second == utc(2026, 3, 22, 23));
  CHECK(berlin.iso_week_of(utc(2026, 3, 29, 22)).first == utc(2026, 3, 29, 22));

  // The date library's own ISO-week calendar agrees: 2026-03-29 is in 2026-W13, whose
  // Monday is 2026-03-23.
  const iso_week::year_weeknum_weekday week13{days_of(2026, 3, 29)};
  CHECK(static_cast<int>(week13.year()) == 2026);
  CHECK(static_cast<unsigned>(week13.weeknum()) == 13u);
  CHECK(week13.weekday() == iso_week::sun);
  CHECK(date::sys_days{iso_week::year_weeknum_weekday{week13.year(), week13.weeknum(),
                                                      iso_week::mon}} == days_of(2026, 3, 23));
}

TEST_CASE("time: lab-local ISO week holding the New York autumn DST change", "[core]") {
  const auto new_york = LabZone::named("America/New_York");
  // Monday 2026-10-26 00:00 EDT = 2026-10-26T04:00Z to Monday 2026-11-02 00:00 EST =
  // 2026-11-02T05:00Z: a week of 7 × 24 + 1 = 169 hours.
  const std::pair<Instant, Instant> expected{utc(2026, 10, 26, 4), utc(2026, 11, 2, 5)};
  CHECK(new_york.iso_week_of(utc(2026, 11, 1, 5, 30)) == expected);  // 01:30 EDT
  CHECK(new_york.iso_week_of(utc(2026, 11, 1, 6, 30)) == expected);  // 01:30 EST
  // Sunday 23:30 EST local is already Monday 04:30 in UTC: still this week.
  CHECK(new_york.iso_week_of(utc(2026, 11, 2, 4, 30)) == expected);
  CHECK(expected.second - expected.first == std::chrono::hours{169});

  const iso_week::year_weeknum_weekday week44{days_of(2026, 11, 1)};
  CHECK(static_cast<unsigned>(week44.weeknum()) == 44u);
  CHECK(date::sys_days{iso_week::year_weeknum_weekday{week44.year(), week44.weeknum(),
                                                      iso_week::mon}} == days_of(2026, 10, 26));
}

TEST_CASE("time: ISO week 2026-W53 spans the year boundary", "[core]") {
  const auto utc_zone = LabZone::named("UTC");
  // Hand-computed: 2026-12-28 is a Monday; 2026 has 53 ISO weeks because 1 Jan 2026 is a
  // Thursday; the week holding 2026-12-31 and 2027-01-01 runs from Monday 2026-12-28 to
  // Monday 2027-01-04.
  const std::pair<Instant, Instant> expected{utc(2026, 12, 28), utc(2027, 1, 4)};
  CHECK(utc_zone.iso_week_of(utc(2026, 12, 31, 12)) == expected);
  CHECK(utc_zone.iso_week_of(utc(2027, 1, 1, 12)) == expected);
  CHECK(utc_zone.iso_week_of(utc(2027, 1, 3, 23, 59, 59)) == expected);
  CHECK(utc_zone.iso_week_of(utc(2026, 12, 28)) == expected);
  CHECK(utc_zone.iso_week_of(utc(2027, 1, 4)).first == utc(2027, 1, 4));

  // The same facts from the date library's iso_week calendar.
  CHECK(static_cast<unsigned>(iso_week::year_lastweek{iso_week::year{2026}}.weeknum()) == 53u);
  CHECK(static_cast<unsigned>(iso_week::year_lastweek{iso_week::year{2027}}.weeknum()) == 52u);
  const iso_week::year_weeknum_weekday new_year{days_of(2027, 1, 1)};
  CHECK(static_cast<int>(new_year.year()) == 2026);
  CHECK(static_cast<unsigned>(new_year.weeknum()) == 53u);
  CHECK(new_year.weekday() == iso_week::fri);
  CHECK(date::sys_days{iso_week::year{2026} / iso_week::weeknum{53} / iso_week::mon} ==
        days_of(2026, 12, 28));
  CHECK(date::sys_days{iso_week::year{2027} / iso_week::weeknum{1} / iso_week::mon} ==
        days_of(2027, 1, 4));
  CHECK(date::weekday{days_of(2026, 1, 1)} == date::Thursday);

  // Lab-local, not UTC: Monday 2027-01-04 00:30 in Berlin is still Sunday 23:30 in UTC, yet
  // it belongs to the Berlin week 2027-W01 (2027-01-03T23:00Z to 2027-01-10T23:00Z).
  const auto berlin = LabZone::named("Europe/Berlin");
  const std::pair<Instant, Instant> berlin_w01{utc(2027, 1, 3, 23), utc(2027, 1, 10, 23)};
  CHECK(berlin.iso_week_of(utc(2027, 1, 3, 23, 30)) == berlin_w01);
  CHECK(utc_zone.iso_week_of(utc(2027, 1, 3, 23, 30)) == expected);
}

// ------------------------------------------------------------------------- durations

TEST_CASE("time: parse_duration reads counts and units", "[core]") {
  CHECK(cw::parse_duration("7 days") == Duration{7, Duration::Unit::Days});
  CHECK(cw::parse_duration("12 hours") == Duration{12, Duration::Unit::Hours});
  CHECK(cw::parse_duration("1 month") == Duration{1, Duration::Unit::Months});
  CHECK(cw::parse_duration("30 min") == Duration{30, Duration::Unit::Minutes});
  CHECK(cw::parse_duration("2 weeks") == Duration{2, Duration::Unit::Weeks});
  CHECK(cw::parse_duration("1 year") == Duration{1, Duration::Unit::Years});
  CHECK(cw::parse_duration("24h") == Duration{24, Duration::Unit::Hours});
  CHECK(cw::to_string(Duration{1, Duration::Unit::Months}) == "1 month");
  CHECK(cw::to_string(Duration{7, Duration::Unit::Days}) == "7 days");

  CHECK_THAT(validation_message([] { cw::parse_duration("0 days", "valid_for"); }),
             Catch::Contains("must be longer than zero"));
  for (const char* bad : {"7 fortnights", "seven days", "", "-1 days", "1.5 days", "days"}) {
    INFO("text: '" << bad << "'");
    CHECK_THAT(validation_message([&] { cw::parse_duration(bad, "valid_for"); }),
               Catch::Contains("invalid valid_for"));
  }
}

TEST_CASE("time: add_duration clamps months to the month's last day", "[core]") {
  const auto zone = LabZone::named("UTC");
  const Duration one_month{1, Duration::Unit::Months};
  // 2026 is not a leap year: 31 January + 1 month is 28 February, never 3 March.
  CHECK(cw::add_duration(utc(2026, 1, 31, 10), one_month, zone) == utc(2026, 2, 28, 10));
  // 2028 is a leap year.
  CHECK(cw::add_duration(utc(2028, 1, 31, 10), one_month, zone) == utc(2028, 2, 29, 10));
  CHECK(cw::add_duration(utc(2026, 3, 31, 10), one_month, zone) == utc(2026, 4, 30, 10));
  CHECK(cw::add_duration(utc(2026, 5, 15, 10), one_month, zone) == utc(2026, 6, 15, 10));
  // Two months from 31 January is 31 March: clamping happens once, at the target month.
  CHECK(cw::add_duration(utc(2026, 1, 31, 10), {2, Duration::Unit::Months}, zone) ==
        utc(2026, 3, 31, 10));
  CHECK(cw::add_duration(utc(2026, 12, 31, 10), one_month, zone) == utc(2027, 1, 31, 10));
  CHECK(cw::add_duration(utc(2028, 2, 29, 10), {1, Duration::Unit::Years}, zone) ==
        utc(2029, 2, 28, 10));
  // In the lab's zone: 10:00 CET on 31 January is 10:00 CET on 28 February.
  CHECK(cw::add_duration(utc(2026, 1, 31, 9), one_month, LabZone::named("Europe/Berlin")) ==
        utc(2026, 2, 28, 9));
}

TEST_CASE("time: add_duration keeps the wall-clock time across DST for calendar units", "[core]") {
  const auto berlin = LabZone::named("Europe/Berlin");
  const auto new_york = LabZone::named("America/New_York");

  // 10:00 CET on Saturday 2026-03-28 + 1 day = 10:00 CEST on Sunday: only 23 hours elapse.
  CHECK(cw::add_duration(utc(2026, 3, 28, 9), {1, Duration::Unit::Days}, berlin) ==
        utc(2026, 3, 29, 8));
  // Hours are exact elapsed time: + 24 hours is 11:00 CEST.
  CHECK(cw::add_duration(utc(2026, 3, 28, 9), {24, Duration::Unit::Hours}, berlin) ==
        utc(2026, 3, 29, 9));
  // Minutes too, straight across the switch at 01:00 UTC.
  CHECK(cw::add_duration(utc(2026, 3, 29, 0, 30), {90, Duration::Unit::Minutes}, berlin) ==
        utc(2026, 3, 29, 2));
  // A week from Wednesday 10:00 CET is Wednesday 10:00 CEST.
  CHECK(cw::add_duration(utc(2026, 3, 25, 9), {1, Duration::Unit::Weeks}, berlin) ==
        utc(2026, 4, 1, 8));
  // A month from 10:00 CET on 15 March is 10:00 CEST on 15 April.
  CHECK(cw::add_duration(utc(2026, 3, 15, 9), {1, Duration::Unit::Months}, berlin) ==
        utc(2026, 4, 15, 8));
  // 02:30 on 2026-03-29 does not exist in Berlin (clocks jump from 02:00 to 03:00): the
  // result is the first valid instant, 03:00 CEST = 01:00 UTC.
  CHECK(cw::add_duration(utc(2026, 3, 28, 1, 30), {1, Duration::Unit::Days}, berlin) ==
        utc(2026, 3, 29, 1));
  // 09:00 EDT on Saturday 2026-10-31 + 1 day = 09:00 EST on Sunday: 25 hours elapse.
  CHECK(cw::add_duration(utc(2026, 10, 31, 13), {1, Duration::Unit::Days}, new_york) ==
        utc(2026, 11, 1, 14));
  CHECK(cw::add_duration(utc(2026, 10, 31, 13), {7, Duration::Unit::Days}, new_york) ==
        utc(2026, 11, 7, 14));
}
