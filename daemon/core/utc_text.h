// Instants written for people and for JSON: ISO 8601 in UTC, e.g. "2026-03-01T06:00:00Z" or,
// with milliseconds, "2026-03-01T06:00:00.250Z". Pure functions, thread-safe.
#pragma once

#include <string>

#include "core/sensor_time.h"

namespace bw::core {

enum class UtcPrecision { seconds, milliseconds };

// Rounds toward earlier instants (floor), also before 1970.
std::string format_utc(SensorTime t, UtcPrecision precision = UtcPrecision::seconds);

}  // namespace bw::core
