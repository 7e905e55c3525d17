// Turns local wall-clock times of one IANA time zone into instants (UTC).
//
// History exports often write times without an offset; they are local times of the site's zone
// (e.g. "America/Chicago"), which the caller names. The zone rules come from the operating
// system's time-zone database through the date library.
//
// Local times that do not map to exactly one instant are resolved deterministically, the same
// way as Python's zoneinfo with fold=0 (PEP 495):
// - ambiguous (the repeated hour when clocks fall back): the EARLIER instant, i.e. the offset in
//   force before the change (2026-11-01 01:30 America/Chicago -> 06:30Z, CDT);
// - nonexistent (the skipped hour when clocks spring forward): read with the offset in force
//   before the change, which shifts it forward by the gap (2026-03-08 02:30 America/Chicago ->
//   08:30Z, the same instant as 03:30 CDT).
// Each conversion reports which case applied through ConversionNote so callers can count them.
//
// Speed: consecutive times of a history file almost always share one offset, so the object
// remembers the last stretch of local time known to map uniquely with a single offset and
// answers from it without consulting the database.
//
// Thread safety: to_utc updates that cache; use one object per thread (copies are cheap and
// share the immutable zone rules).
#pragma once

#include <cstdint>
#include <string>
#include <utility>

#include "core/result.h"
#include "core/sensor_time.h"
#include "io/time_parse.h"

namespace date {
class time_zone;
}

namespace bw::io {

enum class ConversionNote { unique, ambiguous, nonexistent };

class LocalTimeZone {
 public:
  // Fails with a message naming the zone when the database does not know it.
  static Result<LocalTimeZone> find(const std::string& name);

  const std::string& name() const { return name_; }

  core::SensorTime to_utc(const CivilTime& local, ConversionNote& note);

  // The same, for a local time already flattened by micros_since_epoch_as_utc.
  core::SensorTime to_utc(core::Micros local, ConversionNote& note);

  // The local wall-clock time at instant `t`, flattened like micros_since_epoch_as_utc.
  core::Micros to_local(core::SensorTime t) const;

 private:
  LocalTimeZone(const date::time_zone* zone, std::string name)
      : zone_(zone), name_(std::move(name)) {}

  core::SensorTime convert_and_remember(core::Micros local, ConversionNote& note);

  const date::time_zone* zone_;  // owned by the date library's database; never null
  std::string name_;
  // Local times in [cached_begin_, cached_end_) map uniquely with cached_offset_.
  // Empty (begin == end) until the first conversion.
  core::Micros cached_begin_{0};
  core::Micros cached_end_{0};
  core::Micros cached_offset_{0};
};

}  // namespace bw::io
