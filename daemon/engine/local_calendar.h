// The site's reporting days, for records that cover one local day (site_model.h RecordPeriod).
//
// The engine never reads the time-zone database: the application gives it a LocalCalendar for
// the site's zone (io/zone_calendar.h); UtcCalendar serves sites and tests without one.
// A reporting day starts when the local wall clock reads `day_start` past midnight and ends when
// it next does, so it lasts 23 or 25 hours on the days clocks change. A local start time that
// the change skips or repeats is resolved as io/local_time_zone.h resolves local times.
//
// Promise: day_containing(t, s) returns {start, end} with start <= t < end, and the day
// containing `end` starts at `end`. Not thread-safe (an implementation may cache).
#pragma once

#include "core/sensor_time.h"

namespace bw::engine {

struct LocalDay {
  core::SensorTime start;
  core::SensorTime end;
};

class LocalCalendar {
 public:
  virtual ~LocalCalendar() = default;
  // REQUIRES: 0 <= day_start < 24 h.
  virtual LocalDay day_containing(core::SensorTime t, core::Micros day_start) = 0;
};

// Days of UTC: always 24 hours.
class UtcCalendar final : public LocalCalendar {
 public:
  LocalDay day_containing(core::SensorTime t, core::Micros day_start) override;
};

}  // namespace bw::engine
