// Reporting days of a site's time zone, and a daily record over them.
//
// Clock changes in America/Chicago (US rules since 2007, Energy Policy Act of 2005; from
// memory): forward at 02:00 local on the second Sunday of March, back at 02:00 local on the first
// Sunday of November. Central time is UTC-6 (CST) in winter and UTC-5 (CDT) in summer.
// 2026-03-08 and 2026-11-01 are those Sundays.
#include "io/zone_calendar.h"

#include <gtest/gtest.h>

#include "../engine/record_sites.h"
#include "../engine/test_sites.h"
#include "engine/engine.h"

namespace bw::io {
namespace {

using engine::testing::kHour;
using engine::testing::utc;

constexpr double kMarch8 = 1772928000;     // 2026-03-08T00:00:00Z
constexpr double kNovember1 = 1793491200;  // 2026-11-01T00:00:00Z

core::Micros hours(double h) {
  return std::chrono::duration_cast<core::Micros>(std::chrono::duration<double>(h * 3600));
}

ZoneCalendar chicago() {
  auto zone = LocalTimeZone::find("America/Chicago");
  EXPECT_TRUE(zone.ok());
  return ZoneCalendar(std::move(zone.value()));
}

TEST(ZoneCalendar, TheSpringForwardDayHas23Hours) {
  ZoneCalendar calendar = chicago();
  // Noon local on March 8 is 17:00Z (CDT). The day runs from 00:00 CST (06:00Z) to 00:00 CDT
  // on March 9 (05:00Z).
  const auto day = calendar.day_containing(utc(kMarch8 + 17 * kHour), core::Micros(0));
  EXPECT_EQ(day.start, utc(kMarch8 + 6 * kHour));
  EXPECT_EQ(day.end, utc(kMarch8 + 29 * kHour));
}

TEST(ZoneCalendar, TheFallBackDayHas25Hours) {
  ZoneCalendar calendar = chicago();
  // From 00:00 CDT on November 1 (05:00Z) to 00:00 CST on November 2 (06:00Z).
  const auto day = calendar.day_containing(utc(kNovember1 + 18 * kHour), core::Micros(0));
  EXPECT_EQ(day.start, utc(kNovember1 + 5 * kHour));
  EXPECT_EQ(day.end, utc(kNovember1 + 30 * kHour));
}

TEST(ZoneCalendar, ADayStartingAt7IsTheLocalMorningToMorning) {
  ZoneCalendar calendar = chicago();
  // 06:59 CST on March 2 belongs to the day that started on March 1 at 07:00 CST (13:00Z).
  const double march1 = kMarch8 - 7 * 24 * kHour;
  const auto day = calendar.day_containing(utc(march1 + 36 * kHour + 59 * 60), hours(7));
  EXPECT_EQ(day.start, utc(march1 + 13 * kHour));
  EXPECT_EQ(day.end, utc(march1 + 37 * kHour));
  // The reporting day holding the spring change: 07:00 CST March 7 to 07:00 CDT March 8.
  const auto spring = calendar.day_containing(utc(kMarch8 + 6 * kHour), hours(7));
  EXPECT_EQ(spring.start, utc(kMarch8 - 11 * kHour));
  EXPECT_EQ(spring.end, utc(kMarch8 + 12 * kHour));
}

TEST(ZoneCalendar, AStartTheClockChangeSkipsMovesForwardByTheGap) {
  ZoneCalendar calendar = chicago();
  // 02:30 does not exist on March 8: read with the offset before the change (CST, UTC-6) it is
  // 08:30Z, which the clocks show as 03:30 CDT (as io/local_time_zone.h resolves it).
  const auto day = calendar.day_containing(utc(kMarch8 + 9 * kHour), hours(2.5));
  EXPECT_EQ(day.start, utc(kMarch8 + 8.5 * kHour));
  EXPECT_EQ(day.end, utc(kMarch8 + 31.5 * kHour));  // 02:30 CDT on March 9
  // Just before it, the time still belongs to the day that began on March 7 at 02:30 CST.
  const auto before = calendar.day_containing(utc(kMarch8 + 8.4 * kHour), hours(2.5));
  EXPECT_EQ(before.start, utc(kMarch8 - 24 * kHour + 8.5 * kHour));
  EXPECT_EQ(before.end, day.start);
}

TEST(ZoneCalendar, UtcIsUsedWhenTheSiteNamesNoZone) {
  auto calendar = make_site_calendar("");
  ASSERT_TRUE(calendar.ok());
  const auto day = calendar.value()->day_containing(utc(kMarch8 + 3 * kHour), hours(7));
  EXPECT_EQ(day.start, utc(kMarch8 - 17 * kHour));
  EXPECT_EQ(day.end, utc(kMarch8 + 7 * kHour));
  EXPECT_FALSE(make_site_calendar("America/Chikago").ok());
}

// A steady 2400 bbl/d over the local day of the spring change: the day has 23 hours, so the
// record holds 2300 bbl over 23 covered hours.
TEST(ZoneCalendar, TheDailyRecordOfTheSpringForwardDayCovers23Hours) {
  auto calendar = make_site_calendar("America/Chicago");
  ASSERT_TRUE(calendar.ok());
  engine::SiteSpec site = engine::testing::site_with(engine::testing::well_with_daily_record(0));
  site.time_zone = "America/Chicago";
  engine::Engine engine(std::move(site), {}, std::move(calendar.value()));
  engine::testing::RecordKeeper sink;
  for (double t = kMarch8 + 6 * kHour; t <= kMarch8 + 29 * kHour; t += 300) {
    engine.process({"W.RATE", utc(t), 2400, engine::Quality::good}, sink);
    engine.process({"W.TP", utc(t), 1500, engine::Quality::good}, sink);
  }
  ASSERT_EQ(sink.records.size(), 1u);
  const auto& r = sink.records[0];
  EXPECT_EQ(r.period_start, utc(kMarch8 + 6 * kHour));
  EXPECT_EQ(r.time, utc(kMarch8 + 29 * kHour));
  EXPECT_NEAR(r.field("covered_h"), 23, 1e-9);
  EXPECT_NEAR(r.field("injected_volume"), 2300, 1e-9);
  EXPECT_NEAR(r.field("injecting_hours"), 23, 1e-9);
}

TEST(ZoneCalendar, TheDailyRecordOfTheFallBackDayCovers25Hours) {
  auto calendar = make_site_calendar("America/Chicago");
  ASSERT_TRUE(calendar.ok());
  engine::Engine engine(engine::testing::site_with(engine::testing::well_with_daily_record(0)), {},
                        std::move(calendar.value()));
  engine::testing::RecordKeeper sink;
  for (double t = kNovember1 + 5 * kHour; t <= kNovember1 + 30 * kHour; t += 300) {
    engine.process({"W.RATE", utc(t), 2400, engine::Quality::good}, sink);
    engine.process({"W.TP", utc(t), 1500, engine::Quality::good}, sink);
  }
  ASSERT_EQ(sink.records.size(), 1u);
  EXPECT_NEAR(sink.records[0].field("covered_h"), 25, 1e-9);
  EXPECT_NEAR(sink.records[0].field("injected_volume"), 2500, 1e-9);
}

}  // namespace
}  // namespace bw::io
