#include "config/quantity.h"

#include <array>
#include <charconv>
#include <cmath>
#include <cstdio>
#include <utility>

namespace bw::config {
namespace {

// Largest first, so format_duration picks the largest unit that renders exactly.
constexpr std::array<std::pair<std::string_view, double>, 4> kDurationUnits{{
    {"d", 86400.0},
    {"h", 3600.0},
    {"min", 60.0},
    {"s", 1.0},
}};

std::string_view trim(std::string_view text) {
  while (!text.empty() && (text.front() == ' ' || text.front() == '\t')) text.remove_prefix(1);
  while (!text.empty() && (text.back() == ' ' || text.back() == '\t')) text.remove_suffix(1);
  return text;
}

}  // namespace

std::optional<double> parse_number(std::string_view text) {
  text = trim(text);
  // from_chars refuses a leading '+', which people write; accept it once.
  if (!text.empty() && text.front() == '+') text.remove_prefix(1);
  if (text.empty()) return std::nullopt;
  double value = 0;
  const char* end = text.data() + text.size();
  auto [ptr, ec] = std::from_chars(text.data(), end, value);
  if (ec != std::errc() || ptr != end || !std::isfinite(value)) return std::nullopt;
  return value;
}

std::optional<double> parse_duration(std::string_view text) {
  text = trim(text);
  if (auto seconds = parse_number(text)) return seconds;
  for (const auto& [unit, scale] : kDurationUnits) {
    if (text.size() > unit.size() && text.ends_with(unit)) {
      if (auto value = parse_number(text.substr(0, text.size() - unit.size()))) {
        return *value * scale;
      }
    }
  }
  return std::nullopt;
}

bool has_duration_unit(std::string_view text) {
  return !parse_number(text) && parse_duration(text);
}

std::string format_duration(double seconds) {
  for (const auto& [unit, scale] : kDurationUnits) {
    const double count = seconds / scale;
    if (std::fabs(count) >= 1.0 && count == std::round(count)) {
      return format_number(count) + std::string(unit);
    }
  }
  return format_number(seconds) + "s";
}

std::string format_number(double value) {
  std::array<char, 32> buffer{};
  std::snprintf(buffer.data(), buffer.size(), "%.6g", value);
  return buffer.data();
}

}  // namespace bw::config
