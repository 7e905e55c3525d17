#include "io/zone_calendar.h"

#include <cassert>
#include <chrono>

namespace bw::io {
namespace {

constexpr core::Micros kDay = std::chrono::hours(24);

}  // namespace

core::SensorTime ZoneCalendar::start_of(core::Micros local_midnight, core::Micros day_start) {
  ConversionNote note = ConversionNote::unique;
  return zone_.to_utc(local_midnight + day_start, note);
}

engine::LocalDay ZoneCalendar::day_containing(core::SensorTime t, core::Micros day_start) {
  assert(day_start >= core::Micros(0) && day_start < kDay);
  // The local date of t, then step back or forward one date while t lies outside its day: a
  // start moved by a clock change can put t on the neighbouring reporting day.
  core::Micros midnight = std::chrono::floor<std::chrono::days>(zone_.to_local(t));
  core::SensorTime start = start_of(midnight, day_start);
  while (start > t) {
    midnight -= kDay;
    start = start_of(midnight, day_start);
  }
  core::SensorTime end = start_of(midnight + kDay, day_start);
  while (end <= t) {
    midnight += kDay;
    start = end;
    end = start_of(midnight + kDay, day_start);
  }
  return {start, end};
}

Result<std::unique_ptr<engine::LocalCalendar>> make_site_calendar(const std::string& time_zone) {
  if (time_zone.empty() || time_zone == "UTC") {
    return std::unique_ptr<engine::LocalCalendar>(std::make_unique<engine::UtcCalendar>());
  }
  auto zone = LocalTimeZone::find(time_zone);
  if (!zone) return zone.error();
  return std::unique_ptr<engine::LocalCalendar>(
      std::make_unique<ZoneCalendar>(std::move(zone.value())));
}

}  // namespace bw::io
