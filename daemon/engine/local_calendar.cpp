#include "engine/local_calendar.h"

#include <cassert>

namespace bw::engine {

LocalDay UtcCalendar::day_containing(core::SensorTime t, core::Micros day_start) {
  constexpr core::Micros kDay = std::chrono::hours(24);
  assert(day_start >= core::Micros(0) && day_start < kDay);
  const core::SensorTime shifted = t - day_start;
  const core::SensorTime start = std::chrono::floor<std::chrono::days>(shifted) + day_start;
  return {start, start + kDay};
}

}  // namespace bw::engine
