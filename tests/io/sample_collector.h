// A SampleVisitor for tests: keeps a copy of every sample it is given, in order.
#pragma once

#include <chrono>
#include <cstdio>
#include <string>
#include <vector>

#include "core/sensor_time.h"
#include "engine/sample.h"
#include "io/history_csv.h"

namespace bw::io::testing {

struct CollectedSample {
  std::string tag;
  core::SensorTime time;
  double value = 0;
  engine::Quality quality = engine::Quality::good;
};

class SampleCollector final : public SampleVisitor {
 public:
  void on_sample(const engine::Sample& s) override {
    samples.push_back({std::string(s.tag), s.time, s.value, s.quality});
  }
  std::vector<CollectedSample> samples;
};

// An instant written with the standard library's calendar, independent of the parser under test.
inline core::SensorTime utc(int y, unsigned mo, unsigned d, int h = 0, int mi = 0, int s = 0,
                            int us = 0) {
  using namespace std::chrono;
  return sys_days(year(y) / month(mo) / day(d)) + hours(h) + minutes(mi) + seconds(s) +
         microseconds(us);
}

inline core::SensorTime from_micros(long long micros) {
  return core::SensorTime(core::Micros(micros));
}

// "YYYY-MM-DD hh:mm:ss" of an instant's UTC fields, written with the standard library's
// calendar; tests append an offset or read it as a local time.
inline std::string civil_text(std::chrono::sys_seconds t) {
  using namespace std::chrono;
  const auto day = floor<days>(t);
  const year_month_day ymd(day);
  const hh_mm_ss hms(t - day);
  char text[32];
  std::snprintf(text, sizeof text, "%04d-%02u-%02u %02d:%02d:%02d", static_cast<int>(ymd.year()),
                static_cast<unsigned>(ymd.month()), static_cast<unsigned>(ymd.day()),
                static_cast<int>(hms.hours().count()), static_cast<int>(hms.minutes().count()),
                static_cast<int>(hms.seconds().count()));
  return text;
}

}  // namespace bw::io::testing
