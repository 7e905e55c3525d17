// Numbers and durations as written in configuration files.
//
// A number is a finite decimal such as "18", "-0.5" or "2.5e3" (no "inf" or "nan"). A duration
// is a number of seconds, or a number followed by one of the units s, min, h, d with or without
// a space between ("90s", "15min", "6h", "1.5 d"). Parsing is exact about the whole text: any
// trailing character makes it fail. Pure functions, thread-safe.
#pragma once

#include <optional>
#include <string>
#include <string_view>

namespace bw::config {

std::optional<double> parse_number(std::string_view text);

// Seconds, or nothing when the text is not a duration. Negative values parse; bounds are the
// caller's job.
std::optional<double> parse_duration(std::string_view text);

// True when the text carries a duration unit, i.e. parses as a duration but not as a number.
bool has_duration_unit(std::string_view text);

// The largest unit that holds a whole number of it: 21600 -> "6h", 90 -> "90s", 129600 -> "36h";
// otherwise seconds: 0.5 -> "0.5s", 0 -> "0s".
std::string format_duration(double seconds);

// A number without trailing zeros, at most 6 significant digits: 20.143, 0.5, 1e+08.
std::string format_number(double value);

}  // namespace bw::config
