// SPDX-License-Identifier: Apache-2.0
// Instants, calendar dates, durations and the lab's time zone.
//
// Instants are stored as UTC ISO-8601 text with a `Z` ("2026-12-01T09:30:00Z", second
// precision) and shown in the lab's IANA zone. Calendar units of a duration (days, weeks,
// months, years) are added in the lab's local calendar, so "7 days" keeps the wall-clock time
// across a DST change; hours and minutes are exact elapsed time.
#pragma once

#include <chrono>
#include <string>
#include <string_view>
#include <utility>

namespace date {
class time_zone;
}

namespace cw {

using Instant = std::chrono::sys_seconds;

/// A calendar date (no time of day), e.g. a lot's expiry date.
struct CalendarDate {
  int year = 1970;
  unsigned month = 1;
  unsigned day = 1;
  auto operator<=>(const CalendarDate&) const = default;
};

/// Parses an ISO-8601 instant that names its zone: `2026-12-01T09:30:00Z`,
/// `2026-12-01T10:30+01:00`, `2026-12-01 09:30Z`. Seconds are optional, fractions are
/// truncated. Throws ValidationError (naming `what`) for anything else, including a time
/// without a zone and a time that falls outside the years 0001–9999 once its offset is applied.
Instant parse_instant(std::string_view text, std::string_view what = "time");

/// True for instants in the years 0001 to 9999 (UTC): the only ones the store holds.
bool in_supported_range(Instant t);
/// The last instant the store holds: 9999-12-31T23:59:59Z.
Instant last_stored_moment();

/// Formats as `YYYY-MM-DDTHH:MM:SSZ` (the stored form).
std::string format_utc(Instant t);

/// Parses `YYYY-MM-DD`, refusing dates that do not exist (2026-02-30).
CalendarDate parse_date(std::string_view text, std::string_view what = "date");
std::string format_date(CalendarDate d);
CalendarDate add_days(CalendarDate d, int days);

/// A lab time zone (IANA name, resolved against the system zoneinfo).
class LabZone {
 public:
  /// Throws ValidationError when the zone is unknown.
  static LabZone named(std::string_view iana_name);
  /// $TZ when it names a known zone, else /etc/localtime, else UTC.
  static LabZone system_default();

  const std::string& name() const { return name_; }
  const date::time_zone* zone() const { return zone_; }

  /// `2026-12-01 10:30 +01:00` in this zone.
  std::string format_local(Instant t) const;
  /// The local calendar date holding `t`.
  CalendarDate local_date(Instant t) const;
  /// The instant at which local day `d` starts (00:00, or the first valid time after a gap).
  Instant start_of_day(CalendarDate d) const;
  /// The instant at which local day `d` ends (= start of the next day).
  Instant end_of_day(CalendarDate d) const { return start_of_day(add_days(d, 1)); }
  /// The lab-local ISO week (Monday 00:00 to the next Monday 00:00) holding `t`.
  std::pair<Instant, Instant> iso_week_of(Instant t) const;

 private:
  LabZone(std::string name, const date::time_zone* zone) : name_(std::move(name)), zone_(zone) {}
  std::string name_;
  const date::time_zone* zone_;
};

/// A span such as "7 days", "12 hours", "1 month", "30 minutes", "2 weeks", "1 year".
struct Duration {
  enum class Unit { Minutes, Hours, Days, Weeks, Months, Years };
  long count = 0;
  Unit unit = Unit::Days;

  bool operator==(const Duration&) const = default;
};

/// The largest count of `unit` a duration may have: 100 years' worth.
long max_count(Duration::Unit unit);

/// Parses "N unit" (unit singular or plural; also the short forms min, h, d, w, mo, y).
/// Throws ValidationError naming `what` when the text is not a positive duration of at most
/// 100 years.
Duration parse_duration(std::string_view text, std::string_view what = "duration");
/// Canonical text, e.g. "7 days", "1 month".
std::string to_string(const Duration& d);
/// `t` + `d`: minutes and hours exactly; calendar units in the lab's local calendar, keeping
/// the wall-clock time (the day is clamped to the month's end: Jan 31 + 1 month = Feb 28/29;
/// a wall-clock time that does not exist after a DST jump moves to the first valid instant).
/// Throws ValidationError when the result falls after the year 9999.
Instant add_duration(Instant t, const Duration& d, const LabZone& zone);
/// add_duration() without the range check (for callers that have bounded their inputs).
Instant add_duration_unchecked(Instant t, const Duration& d, const LabZone& zone);

}  // namespace cw
