// Test support: portable seeded noise and sample times for estimator tests.
//
// NormalSource draws standard normal values with the Box-Muller transform on std::mt19937_64,
// whose output sequence is fixed by the C++ standard, so a seed gives the same values with any
// standard library (std::normal_distribution is implementation-defined).
#pragma once

#include <cmath>
#include <cstdint>
#include <numbers>
#include <random>

#include "core/sensor_time.h"

namespace bw::test {

class NormalSource {
 public:
  explicit NormalSource(std::uint64_t seed) : engine_(seed) {}

  double operator()() {
    if (has_spare_) {
      has_spare_ = false;
      return spare_;
    }
    // 1 - u lies in (0, 1], so the logarithm is finite.
    const double radius = std::sqrt(-2.0 * std::log(1.0 - uniform()));
    const double angle = 2.0 * std::numbers::pi * uniform();
    spare_ = radius * std::sin(angle);
    has_spare_ = true;
    return radius * std::cos(angle);
  }

  // Uniform on [0, 1) with 53 random bits.
  double uniform() { return static_cast<double>(engine_() >> 11) * 0x1.0p-53; }

 private:
  std::mt19937_64 engine_;
  bool has_spare_ = false;
  double spare_ = 0;
};

// A sample time `seconds` after an arbitrary fixed epoch (2023-11-14), rounded to the microsecond.
inline core::SensorTime at(double seconds) {
  constexpr std::int64_t kEpochUs = 1'700'000'000'000'000;
  return core::SensorTime(core::Micros(kEpochUs + std::llround(seconds * 1e6)));
}

}  // namespace bw::test
