#include "io/local_time_zone.h"

#include <date/tz.h>

#include <algorithm>
#include <exception>

namespace bw::io {
namespace {

using std::chrono::duration_cast;
using std::chrono::seconds;

core::Micros micros(seconds s) { return duration_cast<core::Micros>(s); }

}  // namespace

Result<LocalTimeZone> LocalTimeZone::find(const std::string& name) {
  try {
    return LocalTimeZone(date::locate_zone(name), name);
  } catch (const std::exception& e) {
    return Error{"unknown time zone '" + name + "' (expected an IANA name such as " +
                 "America/Chicago): " + e.what()};
  }
}

core::SensorTime LocalTimeZone::to_utc(const CivilTime& local, ConversionNote& note) {
  return to_utc(micros_since_epoch_as_utc(local), note);
}

core::SensorTime LocalTimeZone::to_utc(core::Micros local, ConversionNote& note) {
  if (local >= cached_begin_ && local < cached_end_) {
    note = ConversionNote::unique;
    return core::SensorTime(local - cached_offset_);
  }
  return convert_and_remember(local, note);
}

core::Micros LocalTimeZone::to_local(core::SensorTime t) const {
  const auto instant = date::sys_seconds(std::chrono::floor<seconds>(t.time_since_epoch()));
  return t.time_since_epoch() + micros(zone_->get_info(instant).offset);
}

core::SensorTime LocalTimeZone::convert_and_remember(core::Micros local, ConversionNote& note) {
  const auto local_seconds = date::local_seconds(std::chrono::floor<seconds>(local));
  const date::local_info info = zone_->get_info(local_seconds);
  // For all three results `first` is the offset in force before any change, which is both the
  // earlier instant of an ambiguous time and the forward shift of a nonexistent one.
  const core::Micros offset = micros(info.first.offset);
  switch (info.result) {
    case date::local_info::ambiguous:
      note = ConversionNote::ambiguous;
      return core::SensorTime(local - offset);
    case date::local_info::nonexistent:
      note = ConversionNote::nonexistent;
      return core::SensorTime(local - offset);
    case date::local_info::unique:
      break;
  }
  // The stretch of local time that maps uniquely with this offset ends where the neighbouring
  // offsets' gap or overlap begins: clip both ends by the larger/smaller of the two offsets.
  const date::sys_info& span = info.first;
  const seconds before = zone_->get_info(span.begin - seconds(1)).offset;
  const seconds after = zone_->get_info(span.end).offset;
  cached_begin_ = micros(span.begin.time_since_epoch() + std::max(span.offset, before));
  cached_end_ = micros(span.end.time_since_epoch() + std::min(span.offset, after));
  cached_offset_ = offset;
  note = ConversionNote::unique;
  return core::SensorTime(local - offset);
}

}  // namespace bw::io
