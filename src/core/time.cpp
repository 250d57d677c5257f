// SPDX-License-Identifier: Apache-2.0
// Parsing and formatting of instants, dates and durations; lab-local calendar arithmetic.
#include "core/time.h"

#include <cctype>
#include <cstdlib>
#include <optional>

#include "core/date_include.h"
#include "core/error.h"
#include "core/text.h"

namespace cw {
namespace {

using namespace std::chrono_literals;

/// Reads exactly `width` digits at `pos`, advancing it.
std::optional<int> read_digits(std::string_view s, size_t& pos, size_t width) {
  if (pos + width > s.size()) return std::nullopt;
  int value = 0;
  for (size_t i = 0; i < width; ++i) {
    char c = s[pos + i];
    if (!std::isdigit(static_cast<unsigned char>(c))) return std::nullopt;
    value = value * 10 + (c - '0');
  }
  pos += width;
  return value;
}

bool read_char(std::string_view s, size_t& pos, char c) {
  if (pos < s.size() && s[pos] == c) {
    ++pos;
    return true;
  }
  return false;
}

std::optional<date::year_month_day> read_date(std::string_view s, size_t& pos) {
  auto y = read_digits(s, pos, 4);
  if (!y || !read_char(s, pos, '-')) return std::nullopt;
  auto m = read_digits(s, pos, 2);
  if (!m || !read_char(s, pos, '-')) return std::nullopt;
  auto d = read_digits(s, pos, 2);
  if (!d) return std::nullopt;
  return date::year{*y} / date::month{static_cast<unsigned>(*m)} /
         date::day{static_cast<unsigned>(*d)};
}

date::year_month_day to_ymd(CalendarDate d) {
  return date::year{d.year} / date::month{d.month} / date::day{d.day};
}

CalendarDate from_ymd(date::year_month_day ymd) {
  return {static_cast<int>(ymd.year()), static_cast<unsigned>(ymd.month()),
          static_cast<unsigned>(ymd.day())};
}

/// Two decimal digits of `v` (0–99) at `out`.
void put2(char* out, unsigned v) {
  out[0] = static_cast<char>('0' + v / 10);
  out[1] = static_cast<char>('0' + v % 10);
}

/// `YYYY-MM-DD?HH:MM:SS` (19 characters, `separator` between date and time) at `out`, for a
/// moment of the years 0001 to 9999, written digit by digit: this runs for every instant bound
/// to a statement or hashed, and for every finding the rules engine words.
void put_date_time(char* out, Instant t, char separator) {
  const auto day = std::chrono::floor<date::days>(t);
  const date::year_month_day ymd{day};
  const date::hh_mm_ss<std::chrono::seconds> tod{t - day};
  const auto year = static_cast<unsigned>(static_cast<int>(ymd.year()));
  put2(out, year / 100);
  put2(out + 2, year % 100);
  out[4] = '-';
  put2(out + 5, static_cast<unsigned>(ymd.month()));
  out[7] = '-';
  put2(out + 8, static_cast<unsigned>(ymd.day()));
  out[10] = separator;
  put2(out + 11, static_cast<unsigned>(tod.hours().count()));
  out[13] = ':';
  put2(out + 14, static_cast<unsigned>(tod.minutes().count()));
  out[16] = ':';
  put2(out + 17, static_cast<unsigned>(tod.seconds().count()));
}

/// The stored form `YYYY-MM-DDTHH:MM:SSZ` read without the general parser (the store holds only
/// this form, and reading it is on every row's path); nullopt when `s` is anything else or not
/// a valid moment, which the general parser then reports.
std::optional<Instant> read_stored_form(std::string_view s) {
  if (s.size() != 20 || s[4] != '-' || s[7] != '-' || s[10] != 'T' || s[13] != ':' ||
      s[16] != ':' || s[19] != 'Z') {
    return std::nullopt;
  }
  size_t pos = 0;
  const auto y = read_digits(s, pos, 4);
  pos = 5;
  const auto mo = read_digits(s, pos, 2);
  pos = 8;
  const auto d = read_digits(s, pos, 2);
  pos = 11;
  const auto h = read_digits(s, pos, 2);
  pos = 14;
  const auto mi = read_digits(s, pos, 2);
  pos = 17;
  const auto sec = read_digits(s, pos, 2);
  if (!y || !mo || !d || !h || !mi || !sec || *y < 1 || *h > 23 || *mi > 59 || *sec > 59) {
    return std::nullopt;
  }
  const date::year_month_day ymd{date::year{*y}, date::month{static_cast<unsigned>(*mo)},
                                 date::day{static_cast<unsigned>(*d)}};
  if (!ymd.ok()) return std::nullopt;
  return Instant{date::sys_days{ymd} + std::chrono::hours{*h} + std::chrono::minutes{*mi} +
                 std::chrono::seconds{*sec}};
}

}  // namespace

Instant parse_instant(std::string_view raw, std::string_view what) {
  if (auto stored = read_stored_form(raw)) return *stored;
  const std::string text = trim(raw);
  const std::string expected =
      "expected an ISO-8601 time with its zone, e.g. 2026-12-01T09:30:00Z or "
      "2026-12-01T10:30+01:00";
  size_t pos = 0;
  auto ymd = read_date(text, pos);
  if (!ymd) throw ValidationError("invalid " + std::string(what) + " " + quote(text), expected);
  if (!ymd->ok()) {
    throw ValidationError(std::string(what) + " " + quote(text) + " is not a calendar date",
                          expected);
  }
  if (pos == text.size()) {
    throw ValidationError(std::string(what) + " " + quote(text) + " has no time of day and zone",
                          expected);
  }
  if (!(read_char(text, pos, 'T') || read_char(text, pos, 't') || read_char(text, pos, ' '))) {
    throw ValidationError("invalid " + std::string(what) + " " + quote(text), expected);
  }
  auto hh = read_digits(text, pos, 2);
  if (!hh || !read_char(text, pos, ':')) {
    throw ValidationError("invalid " + std::string(what) + " " + quote(text), expected);
  }
  auto mm = read_digits(text, pos, 2);
  int ss = 0;
  if (!mm) throw ValidationError("invalid " + std::string(what) + " " + quote(text), expected);
  if (read_char(text, pos, ':')) {
    auto s = read_digits(text, pos, 2);
    if (!s) throw ValidationError("invalid " + std::string(what) + " " + quote(text), expected);
    ss = *s;
    if (read_char(text, pos, '.') || read_char(text, pos, ',')) {
      size_t start = pos;
      while (pos < text.size() && std::isdigit(static_cast<unsigned char>(text[pos]))) ++pos;
      if (pos == start) {
        throw ValidationError("invalid " + std::string(what) + " " + quote(text), expected);
      }
    }
  }
  if (*hh > 23 || *mm > 59 || ss > 59) {
    throw ValidationError(std::string(what) + " " + quote(text) + " is not a valid time of day",
                          expected);
  }
  std::chrono::seconds offset{0};
  if (pos == text.size()) {
    throw ValidationError(std::string(what) + " " + quote(text) + " does not name its zone",
                          "add 'Z' for UTC or an offset such as +01:00");
  }
  if (read_char(text, pos, 'Z') || read_char(text, pos, 'z')) {
    // UTC
  } else if (text[pos] == '+' || text[pos] == '-') {
    const int sign = text[pos] == '-' ? -1 : 1;
    ++pos;
    auto oh = read_digits(text, pos, 2);
    read_char(text, pos, ':');
    auto om = read_digits(text, pos, 2);
    if (!oh || !om || *oh > 14 || *om > 59) {
      throw ValidationError("invalid zone offset in " + std::string(what) + " " + quote(text),
                            expected);
    }
    offset = sign * (std::chrono::hours{*oh} + std::chrono::minutes{*om});
  } else {
    throw ValidationError("invalid " + std::string(what) + " " + quote(text), expected);
  }
  if (pos != text.size()) {
    throw ValidationError("unexpected text after " + std::string(what) + " " + quote(text),
                          expected);
  }
  const auto local = date::sys_days{*ymd} + std::chrono::hours{*hh} + std::chrono::minutes{*mm} +
                     std::chrono::seconds{ss};
  const Instant t{local - offset};
  if (!in_supported_range(t)) {
    throw ValidationError(
        std::string(what) + " " + quote(text) + " lies outside the years 0001 to 9999 (in UTC)",
        "check the year and the zone offset");
  }
  return t;
}

Instant last_stored_moment() {
  return Instant{date::sys_days{date::year{9999} / 12 / 31} + std::chrono::hours{24} -
                 std::chrono::seconds{1}};
}

bool in_supported_range(Instant t) {
  static const Instant first{date::sys_days{date::year{1} / 1 / 1}};
  static const Instant last = last_stored_moment();
  return t >= first && t <= last;
}

std::string format_utc(Instant t) {
  if (!in_supported_range(t)) return date::format("%Y-%m-%dT%H:%M:%SZ", t);
  std::string out(20, 'Z');
  put_date_time(out.data(), t, 'T');
  return out;
}

CalendarDate parse_date(std::string_view raw, std::string_view what) {
  const std::string text = trim(raw);
  size_t pos = 0;
  auto ymd = read_date(text, pos);
  if (!ymd || pos != text.size()) {
    throw ValidationError("invalid " + std::string(what) + " " + quote(text),
                          "expected a date as YYYY-MM-DD, e.g. 2027-03-31");
  }
  if (!ymd->ok() || ymd->year() < date::year{1}) {
    throw ValidationError(std::string(what) + " " + quote(text) + " is not a calendar date",
                          "expected a date as YYYY-MM-DD from 0001-01-01 to 9999-12-31, e.g. "
                          "2027-03-31");
  }
  return from_ymd(*ymd);
}

std::string format_date(CalendarDate d) {
  return date::format("%F", date::sys_days{to_ymd(d)});
}

CalendarDate add_days(CalendarDate d, int days) {
  return from_ymd(date::year_month_day{date::sys_days{to_ymd(d)} + date::days{days}});
}

LabZone LabZone::named(std::string_view iana_name) {
  const std::string name = trim(iana_name);
  if (name.empty() || name.find("..") != std::string::npos || name.front() == '/') {
    throw ValidationError("unknown time zone " + quote(name),
                          "give an IANA zone name such as Europe/Berlin or America/Chicago");
  }
  try {
    return LabZone(name, date::locate_zone(name));
  } catch (const std::exception&) {
    throw ValidationError("unknown time zone " + quote(name),
                          "give an IANA zone name such as Europe/Berlin or America/Chicago");
  }
}

LabZone LabZone::system_default() {
  if (const char* tz = std::getenv("TZ"); tz != nullptr && *tz != '\0') {
    std::string_view name = tz;
    if (name.front() == ':') name.remove_prefix(1);
    try {
      return named(name);
    } catch (const ValidationError&) {
      // fall through to /etc/localtime
    }
  }
  try {
    const date::time_zone* zone = date::current_zone();
    return LabZone(std::string(zone->name()), zone);
  } catch (const std::exception&) {
    return named("UTC");
  }
}

std::string LabZone::format_local(Instant t) const {
  const date::sys_info info = zone_->get_info(t);
  const Instant local{t + info.offset};                  // the wall clock, read as if it were UTC
  const auto offset_minutes = info.offset.count() / 60;  // truncated, as %Ez writes it
  if (!in_supported_range(t) || !in_supported_range(local) || offset_minutes <= -24 * 60 ||
      offset_minutes >= 24 * 60) {
    return date::format("%Y-%m-%d %H:%M %Ez", date::make_zoned(zone_, t));
  }
  // YYYY-MM-DD HH:MM:SS of the wall clock, its seconds then overwritten by the offset.
  std::string out(23, ' ');
  put_date_time(out.data(), local, ' ');
  const auto magnitude =
      static_cast<unsigned>(offset_minutes < 0 ? -offset_minutes : offset_minutes);
  out[16] = ' ';
  out[17] = info.offset.count() < 0 ? '-' : '+';
  put2(out.data() + 18, magnitude / 60);
  out[20] = ':';
  put2(out.data() + 21, magnitude % 60);
  return out;
}

CalendarDate LabZone::local_date(Instant t) const {
  const auto local = zone_->to_local(t);
  return from_ymd(date::year_month_day{date::floor<date::days>(local)});
}

Instant LabZone::start_of_day(CalendarDate d) const {
  const date::local_seconds midnight{date::local_days{to_ymd(d)}.time_since_epoch()};
  return zone_->to_sys(midnight, date::choose::earliest);
}

std::pair<Instant, Instant> LabZone::iso_week_of(Instant t) const {
  const CalendarDate today = local_date(t);
  const date::sys_days days{to_ymd(today)};
  const date::weekday wd{days};
  // ISO weeks start on Monday: iso_encoding() gives Monday = 1 ... Sunday = 7.
  const int back = static_cast<int>(wd.iso_encoding()) - 1;
  const CalendarDate monday = add_days(today, -back);
  return {start_of_day(monday), start_of_day(add_days(monday, 7))};
}

long max_count(Duration::Unit unit) {
  // 100 years of 366 days, in each unit (product.md: durations are bounded).
  switch (unit) {
    case Duration::Unit::Minutes:
      return 100L * 366 * 24 * 60;
    case Duration::Unit::Hours:
      return 100L * 366 * 24;
    case Duration::Unit::Days:
      return 100L * 366;
    case Duration::Unit::Weeks:
      return 100L * 366 / 7;
    case Duration::Unit::Months:
      return 1200;
    case Duration::Unit::Years:
      return 100;
  }
  return 0;
}

Duration parse_duration(std::string_view raw, std::string_view what) {
  const std::string text = trim(raw);
  const std::string hint =
      "expected a count and a unit, e.g. '12 hours', '7 days', '1 month' (units: minutes, "
      "hours, days, weeks, months, years)";
  size_t pos = 0;
  while (pos < text.size() && std::isdigit(static_cast<unsigned char>(text[pos]))) ++pos;
  if (pos == 0 || pos > 9) {
    throw ValidationError("invalid " + std::string(what) + " " + quote(text), hint);
  }
  const long count = std::stol(text.substr(0, pos));
  std::string unit = trim(text.substr(pos));
  for (auto& c : unit) c = static_cast<char>(std::tolower(static_cast<unsigned char>(c)));
  Duration d;
  d.count = count;
  if (unit == "min" || unit == "mins" || unit == "minute" || unit == "minutes") {
    d.unit = Duration::Unit::Minutes;
  } else if (unit == "h" || unit == "hour" || unit == "hours") {
    d.unit = Duration::Unit::Hours;
  } else if (unit == "d" || unit == "day" || unit == "days") {
    d.unit = Duration::Unit::Days;
  } else if (unit == "w" || unit == "week" || unit == "weeks") {
    d.unit = Duration::Unit::Weeks;
  } else if (unit == "mo" || unit == "month" || unit == "months") {
    d.unit = Duration::Unit::Months;
  } else if (unit == "y" || unit == "year" || unit == "years") {
    d.unit = Duration::Unit::Years;
  } else {
    throw ValidationError("invalid " + std::string(what) + " " + quote(text), hint);
  }
  if (count <= 0) {
    throw ValidationError(std::string(what) + " " + quote(text) + " must be longer than zero",
                          hint);
  }
  if (count > max_count(d.unit)) {
    throw ValidationError(std::string(what) + " " + quote(text) + " is longer than 100 years",
                          "durations are at most 100 years (" + std::to_string(max_count(d.unit)) +
                              " " + to_string(Duration{2, d.unit}).substr(2) + ")");
  }
  return d;
}

std::string to_string(const Duration& d) {
  const char* unit = "";
  switch (d.unit) {
    case Duration::Unit::Minutes:
      unit = "minute";
      break;
    case Duration::Unit::Hours:
      unit = "hour";
      break;
    case Duration::Unit::Days:
      unit = "day";
      break;
    case Duration::Unit::Weeks:
      unit = "week";
      break;
    case Duration::Unit::Months:
      unit = "month";
      break;
    case Duration::Unit::Years:
      unit = "year";
      break;
  }
  return std::to_string(d.count) + " " + unit + (d.count == 1 ? "" : "s");
}

Instant add_duration(Instant t, const Duration& d, const LabZone& zone) {
  const Instant end = add_duration_unchecked(t, d, zone);
  if (!in_supported_range(end)) {
    throw ValidationError(format_utc(t) + " + " + to_string(d) + " lies beyond the year 9999",
                          "use an earlier time or a shorter duration");
  }
  return end;
}

Instant add_duration_unchecked(Instant t, const Duration& d, const LabZone& zone) {
  switch (d.unit) {
    case Duration::Unit::Minutes:
      return t + std::chrono::minutes{d.count};
    case Duration::Unit::Hours:
      return t + std::chrono::hours{d.count};
    default:
      break;
  }
  const date::time_zone* tz = zone.zone();
  const auto local = tz->to_local(t);
  const auto local_day = date::floor<date::days>(local);
  const auto time_of_day = local - local_day;
  date::year_month_day ymd{local_day};
  date::local_days target;
  switch (d.unit) {
    case Duration::Unit::Days:
      target = local_day + date::days{d.count};
      break;
    case Duration::Unit::Weeks:
      target = local_day + date::days{7 * d.count};
      break;
    case Duration::Unit::Months:
    case Duration::Unit::Years: {
      date::year_month ym = ymd.year() / ymd.month();
      ym += d.unit == Duration::Unit::Months ? date::months{d.count} : date::months{12 * d.count};
      // Clamp: 31 January + 1 month is the last day of February, never 2 or 3 March.
      const date::day last = (ym / date::last).day();
      const date::day day = ymd.day() > last ? last : ymd.day();
      target = date::local_days{ym / day};
      break;
    }
    default:
      break;
  }
  return tz->to_sys(target + time_of_day, date::choose::earliest);
}

}  // namespace cw
