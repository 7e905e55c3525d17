#include "core/utc_text.h"

#include <chrono>
#include <cstdio>

namespace bw::core {

std::string format_utc(SensorTime t, UtcPrecision precision) {
  using namespace std::chrono;
  const auto millis = floor<milliseconds>(t);
  const auto day = floor<days>(millis);
  const year_month_day date{day};
  const hh_mm_ss<milliseconds> clock{millis - day};
  char text[40];
  const int n = std::snprintf(text, sizeof text, "%04d-%02u-%02uT%02d:%02d:%02d",
                              static_cast<int>(date.year()), static_cast<unsigned>(date.month()),
                              static_cast<unsigned>(date.day()),
                              static_cast<int>(clock.hours().count()),
                              static_cast<int>(clock.minutes().count()),
                              static_cast<int>(clock.seconds().count()));
  std::string out(text, static_cast<std::size_t>(n));
  if (precision == UtcPrecision::milliseconds) {
    std::snprintf(text, sizeof text, ".%03d", static_cast<int>(clock.subseconds().count()));
    out += text;
  }
  return out + "Z";
}

}  // namespace bw::core
