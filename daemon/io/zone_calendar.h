// The reporting days of a site's time zone (engine/local_calendar.h), from the operating
// system's time-zone database through LocalTimeZone. A day starts at local midnight plus
// `day_start`; a start the clock change skips or repeats is resolved as LocalTimeZone::to_utc
// does (a skipped time moves forward by the gap, a repeated one takes the earlier instant), so
// days are 23 or 25 hours long when clocks change. Not thread-safe (the zone caches offsets).
#pragma once

#include <memory>
#include <string>

#include "core/result.h"
#include "engine/local_calendar.h"
#include "io/local_time_zone.h"

namespace bw::io {

class ZoneCalendar final : public engine::LocalCalendar {
 public:
  explicit ZoneCalendar(LocalTimeZone zone) : zone_(std::move(zone)) {}
  engine::LocalDay day_containing(core::SensorTime t, core::Micros day_start) override;

 private:
  core::SensorTime start_of(core::Micros local_midnight, core::Micros day_start);

  LocalTimeZone zone_;
};

// The calendar of the named IANA zone; days of UTC when `time_zone` is empty or "UTC".
// Fails with LocalTimeZone::find's message for an unknown zone.
Result<std::unique_ptr<engine::LocalCalendar>> make_site_calendar(const std::string& time_zone);

}  // namespace bw::io
