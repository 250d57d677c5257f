// SPDX-License-Identifier: Apache-2.0
// Tests of the lot expiry arithmetic in src/domain/lot.h: certificate versus in-use expiry,
// and the end of the lab-local expiry day as the instant the lot stops being usable.
//
// Dates were hand-computed and cross-checked with Python 3's datetime (date + timedelta) and
// zoneinfo on the system tzdata; the DST facts are listed at the top of time_test.cpp.
#include <catch2/catch.hpp>
#include <string>

#include "core/date_include.h"
#include "core/time.h"
#include "domain/lot.h"

namespace Catch {
template <>
struct StringMaker<cw::CalendarDate> {
  static std::string convert(const cw::CalendarDate& d) { return cw::format_date(d); }
};
}  // namespace Catch

namespace {

using cw::CalendarDate;
using cw::Instant;
using cw::LabZone;
using cw::Lot;

Instant utc(int y, unsigned mo, unsigned d, int h = 0, int mi = 0, int s = 0) {
  return Instant{date::sys_days{date::year{y} / date::month{mo} / date::day{d}}} +
         std::chrono::hours{h} + std::chrono::minutes{mi} + std::chrono::seconds{s};
}

Lot lot(CalendarDate expires, std::optional<CalendarDate> opened = std::nullopt,
        std::optional<int> in_use_days = std::nullopt) {
  Lot l;
  l.code = "CRM-NO3-0042";
  l.material = "Nitrate in water, 1000 mg/L";
  l.expires_on = expires;
  l.opened_on = opened;
  l.in_use_days = in_use_days;
  return l;
}

}  // namespace

TEST_CASE("lot: an in-use expiry earlier than the certificate expiry wins", "[core][domain]") {
  // Opened 2026-12-01, usable for 10 days: in-use expiry 2026-12-11, before the certificate's
  // 2026-12-31.
  const Lot l = lot({2026, 12, 31}, CalendarDate{2026, 12, 1}, 10);
  REQUIRE(l.in_use_expires_on().has_value());
  CHECK(*l.in_use_expires_on() == CalendarDate{2026, 12, 11});
  CHECK(l.effective_expires_on() == CalendarDate{2026, 12, 11});
  // Usable through 2026-12-11: in UTC until 2026-12-12T00:00Z, in Berlin (CET, +01:00)
  // until 2026-12-11T23:00Z.
  CHECK(l.expiry_instant(LabZone::named("UTC")) == utc(2026, 12, 12));
  CHECK(l.expiry_instant(LabZone::named("Europe/Berlin")) == utc(2026, 12, 11, 23));
}

TEST_CASE("lot: an in-use expiry later than the certificate expiry does not extend it",
          "[core][domain]") {
  // Opened 2026-12-20 with 30 days in use: 2027-01-19, after the certificate's 2026-12-31.
  const Lot l = lot({2026, 12, 31}, CalendarDate{2026, 12, 20}, 30);
  CHECK(*l.in_use_expires_on() == CalendarDate{2027, 1, 19});
  CHECK(l.effective_expires_on() == CalendarDate{2026, 12, 31});
  CHECK(l.expiry_instant(LabZone::named("Europe/Berlin")) == utc(2026, 12, 31, 23));
}

TEST_CASE("lot: without an opening date or in-use period the certificate expiry holds",
          "[core][domain]") {
  CHECK_FALSE(lot({2027, 3, 31}).in_use_expires_on().has_value());
  CHECK(lot({2027, 3, 31}).effective_expires_on() == CalendarDate{2027, 3, 31});
  // Opened but without an in-use period: nothing shortens the certificate expiry.
  CHECK_FALSE(lot({2027, 3, 31}, CalendarDate{2026, 3, 1}).in_use_expires_on().has_value());
  // The in-use period counts across month ends: 2026-01-25 + 10 days = 2026-02-04.
  CHECK(*lot({2027, 3, 31}, CalendarDate{2026, 1, 25}, 10).in_use_expires_on() ==
        CalendarDate{2026, 2, 4});
  // Equal dates: either is the answer.
  CHECK(lot({2026, 2, 4}, CalendarDate{2026, 1, 25}, 10).effective_expires_on() ==
        CalendarDate{2026, 2, 4});
}

TEST_CASE("lot: the lot expires at the end of the lab-local expiry day", "[core][domain]") {
  const Lot l = lot({2026, 12, 31});
  const auto berlin = LabZone::named("Europe/Berlin");
  const auto new_york = LabZone::named("America/New_York");
  const auto utc_zone = LabZone::named("UTC");

  // Berlin: the day ends at 2027-01-01 00:00 CET = 2026-12-31T23:00Z.
  CHECK(l.expiry_instant(berlin) == utc(2026, 12, 31, 23));
  CHECK_FALSE(l.is_expired_at(utc(2026, 12, 31, 22, 59, 59), berlin));
  CHECK(l.is_expired_at(utc(2026, 12, 31, 23), berlin));
  // New York: 2027-01-01 00:00 EST = 2027-01-01T05:00Z; still usable at 23:00Z on the 31st.
  CHECK(l.expiry_instant(new_york) == utc(2027, 1, 1, 5));
  CHECK_FALSE(l.is_expired_at(utc(2027, 1, 1, 4, 59, 59), new_york));
  CHECK(l.is_expired_at(utc(2027, 1, 1, 5), new_york));
  // UTC.
  CHECK_FALSE(l.is_expired_at(utc(2026, 12, 31, 23, 59, 59), utc_zone));
  CHECK(l.is_expired_at(utc(2027, 1, 1), utc_zone));
}

TEST_CASE("lot: an expiry day with a DST change ends at local midnight after the change",
          "[core][domain]") {
  // 2026-03-29 in Berlin runs from 00:00 CET to 24:00 CEST: the lot is usable until
  // 2026-03-30 00:00 +02:00 = 2026-03-29T22:00Z (not 23:00Z, which a fixed +01:00 would give).
  const auto berlin = LabZone::named("Europe/Berlin");
  const Lot l = lot({2026, 3, 29});
  CHECK(l.expiry_instant(berlin) == utc(2026, 3, 29, 22));
  CHECK_FALSE(l.is_expired_at(utc(2026, 3, 29, 21, 59, 59), berlin));
  CHECK(l.is_expired_at(utc(2026, 3, 29, 22), berlin));
}

TEST_CASE("lot: withdrawal takes effect at its recorded instant", "[core][domain]") {
  Lot l = lot({2027, 3, 31});
  CHECK_FALSE(l.is_withdrawn_at(utc(2026, 6, 1)));
  l.withdrawal = cw::LotWithdrawal{"contaminated on opening", utc(2026, 6, 1, 12)};
  CHECK_FALSE(l.is_withdrawn_at(utc(2026, 6, 1, 11, 59, 59)));
  CHECK(l.is_withdrawn_at(utc(2026, 6, 1, 12)));
}
