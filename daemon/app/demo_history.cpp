#include "app/demo_history.h"

#include <algorithm>
#include <cmath>
#include <cstdio>
#include <random>

namespace bw::app {
namespace {

constexpr int kDays = 4;
constexpr double kStepMinutes = 1.0;
constexpr double kBblPerFootWater = 20.143;  // 12 ft tank
constexpr double kBblPerFootSkim = 33.607;   // 15 ft 6 in tank

// Zero-mean Gaussian noise from a fixed seed (Box-Muller), the same on every platform.
class Noise {
 public:
  explicit Noise(std::uint64_t seed) : engine_(seed) {}
  double next(double sd) {
    const double u1 = (static_cast<double>(engine_() >> 11) + 0.5) * 0x1.0p-53;
    const double u2 = (static_cast<double>(engine_() >> 11) + 0.5) * 0x1.0p-53;
    return sd * std::sqrt(-2.0 * std::log(u1)) * std::cos(6.283185307179586 * u2);
  }

 private:
  std::mt19937_64 engine_;
};

// A water tank drained by an injection pump under on/off level control.
struct WaterTank {
  double level_ft;
  bool pump_on = false;
  void step(double inflow_bbl_h, double pump_capacity_bbl_h, double hours) {
    if (level_ft >= 12.0) pump_on = true;
    if (level_ft <= 6.0) pump_on = false;
    const double out = pump_on ? pump_capacity_bbl_h : 0.0;
    level_ft = std::max(0.0, level_ft + (inflow_bbl_h - out) * hours / kBblPerFootWater);
  }
};

// Truck unloading into the skim tank: one truck of 130 bbl every 70 minutes from 07:00 to
// 18:00, each over 20 minutes; on day 3 at 10:30 a second truck unloads alongside the first.
double truck_inflow(int day, double minute_of_day) {
  if (minute_of_day < 7 * 60 || minute_of_day >= 18 * 60) return 0.0;
  const double into_cycle = std::fmod(minute_of_day - 7 * 60, 70.0);
  double rate = into_cycle < 20.0 ? 130.0 * 3.0 : 0.0;  // 390 bbl/h while unloading
  if (day == 2 && minute_of_day >= 10.5 * 60 && minute_of_day < 10.5 * 60 + 20) rate += 390.0;
  return rate;
}

// Suction-filter clogging on tank 2's pump: capacity falls steadily from 200 to 40 bbl/h
// between day 2 00:00 and day 3 06:00, falling below the inflow on the second evening; it is
// restored when the crew changes the filter on day 3 at 06:00.
double tank2_pump_capacity(int day, double minute_of_day) {
  const double minute = day * 24 * 60.0 + minute_of_day;
  const double start = 24 * 60.0;
  const double change_out = (48 + 6) * 60.0;
  if (minute < start || minute >= change_out) return 200.0;
  return 200.0 - 160.0 * (minute - start) / (change_out - start);
}

}  // namespace

std::string make_demo_history() {
  Noise noise(20261202);
  double skim_level = 8.0;
  WaterTank tank1{.level_ft = 8.0};
  WaterTank tank2{.level_ft = 9.0};
  std::string csv = "time,DC4.SKIM.LEVEL,DC4.TK1.LEVEL,DC4.TK2.LEVEL\n";
  const double hours = kStepMinutes / 60.0;
  for (int day = 0; day < kDays; ++day) {
    for (int minute = 0; minute < 24 * 60; minute += static_cast<int>(kStepMinutes)) {
      // The skim tank drains slowly toward the water tanks above its 8 ft outlet; the gun
      // barrel adds a steady 70 bbl/h to each water tank.
      const double trucks = truck_inflow(day, minute);
      const double transfer = std::max(0.0, (skim_level - 8.0) * 15.0);
      skim_level += (trucks - transfer) * hours / kBblPerFootSkim;
      const double to_each_water_tank = transfer / 2.0 + 70.0;
      tank1.step(to_each_water_tank, 200.0, hours);
      tank2.step(to_each_water_tank, tank2_pump_capacity(day, minute), hours);
      char row[160];
      std::snprintf(row, sizeof row, "2026-03-%02d %02d:%02d:00,%.3f,%.3f,%.3f\n", 2 + day,
                    minute / 60, minute % 60, skim_level + noise.next(0.02),
                    tank1.level_ft + noise.next(0.02), tank2.level_ft + noise.next(0.02));
      csv += row;
    }
  }
  return csv;
}

}  // namespace bw::app
