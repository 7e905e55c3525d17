#include "io/json_text.h"

#include <charconv>
#include <chrono>
#include <cmath>
#include <cstdio>

namespace bw::io {

void append_json_string(std::string& out, std::string_view text) {
  out.push_back('"');
  for (char c : text) {
    switch (c) {
      case '"':
        out += "\\\"";
        break;
      case '\\':
        out += "\\\\";
        break;
      case '\n':
        out += "\\n";
        break;
      case '\r':
        out += "\\r";
        break;
      case '\t':
        out += "\\t";
        break;
      default:
        if (static_cast<unsigned char>(c) < 0x20) {
          char escaped[8];
          std::snprintf(escaped, sizeof escaped, "\\u%04x", static_cast<unsigned>(c));
          out += escaped;
        } else {
          out.push_back(c);
        }
    }
  }
  out.push_back('"');
}

void append_json_number(std::string& out, double value) {
  if (!std::isfinite(value)) {
    out += "null";
    return;
  }
  char text[32];
  // Shortest form that reads back to the same double: deterministic across runs.
  auto [end, ec] = std::to_chars(text, text + sizeof text, value);
  out.append(text, end);
}

std::string format_utc(core::SensorTime t) {
  using namespace std::chrono;
  const auto millis = floor<milliseconds>(t);
  const auto day = floor<days>(millis);
  const year_month_day ymd{day};
  const hh_mm_ss<milliseconds> clock{millis - day};
  char text[40];
  std::snprintf(text, sizeof text, "%04d-%02u-%02uT%02d:%02d:%02d.%03dZ", static_cast<int>(ymd.year()),
                static_cast<unsigned>(ymd.month()), static_cast<unsigned>(ymd.day()),
                static_cast<int>(clock.hours().count()), static_cast<int>(clock.minutes().count()),
                static_cast<int>(clock.seconds().count()),
                static_cast<int>(clock.subseconds().count()));
  return text;
}

}  // namespace bw::io
