// Parsing of the timestamps found in history files: ISO 8601 date-times and epoch seconds.
//
// Pure functions over a string_view: no allocation, no locale, no clock, no time-zone database.
// A parsed ISO 8601 time keeps its broken-down fields and its offset from UTC when the text had
// one; a time without an offset is a local time, and turning it into an instant is the job of
// LocalTimeZone (io/local_time_zone.h).
//
// Accepted ISO 8601 text (extended format, which is what history exports write):
//   YYYY-MM-DD{T|t|space}hh:mm[:ss[{.|,}f...]][Z|z|+hh:mm|-hh:mm|+hhmm|-hhmm|+hh|-hh]
// - year 0001-9999; month, day, hour 00-23, minute, second 00-59 are range-checked (no leap
//   second 60, no hour 24);
// - 1 to 9 fraction digits; digits beyond the sixth are truncated (resolution is 1 us);
// - offsets up to +/-23:59.
// Anything else (trailing text, missing fields, a date alone) is rejected with std::nullopt.
//
// Epoch seconds: [-]digits[.digits], at most 12 integer digits; fraction as above. No exponent,
// no sign '+', no spaces. Callers trim spaces and quotes before calling.
//
// Thread safety: all functions are pure and may be called from any thread.
#pragma once

#include <cstdint>
#include <optional>
#include <string_view>

#include "core/sensor_time.h"

namespace bw::io {

// A calendar date and wall-clock time without any zone attached.
struct CivilTime {
  int year = 1970;
  int month = 1;   // 1-12
  int day = 1;     // 1-31, valid for the month
  int hour = 0;    // 0-23
  int minute = 0;  // 0-59
  int second = 0;  // 0-59
  int micros = 0;  // 0-999999

  friend bool operator==(const CivilTime&, const CivilTime&) = default;
};

struct IsoTime {
  CivilTime civil;
  // Minutes east of UTC (Z gives 0; "-06:00" gives -360); empty for a local time.
  std::optional<int> offset_minutes;

  friend bool operator==(const IsoTime&, const IsoTime&) = default;
};

std::optional<IsoTime> parse_iso8601(std::string_view text);

std::optional<core::SensorTime> parse_epoch_seconds(std::string_view text);

// True when `text` is non-empty and made only of what parse_epoch_seconds accepts as
// characters ('-', '.', digits), i.e. the caller should read it as epoch seconds rather than
// ISO 8601. Says nothing about whether the number is well-formed.
bool looks_like_epoch_seconds(std::string_view text);

// Microseconds since 1970-01-01 00:00 of the civil time read as if it were UTC. Adding the
// zone's offset turns it into an instant; this is the common arithmetic of both cases.
core::Micros micros_since_epoch_as_utc(const CivilTime& civil);

// The instant of a time that carries an offset. REQUIRES: time.offset_minutes has a value.
core::SensorTime to_sensor_time(const IsoTime& time);

}  // namespace bw::io
