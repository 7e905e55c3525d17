// Time as the estimators see it.
//
// SensorTime is a sample's own timestamp (UTC, microsecond resolution). Estimators never read a
// clock: every update takes the sample's time as an argument, so replay and live runs give the
// same result for the same samples. Durations between samples are converted to seconds as double
// only at the point of use.
#pragma once

#include <chrono>
#include <cstdint>

namespace bw::core {

using Micros = std::chrono::microseconds;
using SensorTime = std::chrono::time_point<std::chrono::system_clock, Micros>;

// Seconds from `from` to `to` (negative when `to` is earlier).
inline double seconds_between(SensorTime from, SensorTime to) {
  return std::chrono::duration<double>(to - from).count();
}

inline SensorTime sensor_time_from_seconds(double epoch_seconds) {
  return SensorTime(Micros(static_cast<std::int64_t>(epoch_seconds * 1e6)));
}

inline double to_epoch_seconds(SensorTime t) {
  return std::chrono::duration<double>(t.time_since_epoch()).count();
}

}  // namespace bw::core
