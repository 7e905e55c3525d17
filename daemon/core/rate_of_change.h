// Smoothed rate of change of a signal: the slope of a LinearTrend with forgetting.
//
// The rate is the slope of an exponentially weighted straight-line fit over roughly the last
// time constant, so it is far less noisy than a difference of two samples and handles irregular
// spacing the same way LinearTrend does. All behaviour (first samples, NaN/Inf and out-of-order
// samples ignored and counted, primed()) is LinearTrend's; before primed() the rate may be NaN.
// Units: value units per second (per_second) or per hour (per_hour).
// O(1) per update, no allocation. Copyable; not thread-safe (one owner).
#pragma once

#include <cassert>

#include "core/sensor_time.h"
#include "core/trend.h"

namespace bw::core {

class RateOfChange {
 public:
  using State = LinearTrend::State;

  // REQUIRES: time_constant_s > 0 and finite.
  explicit RateOfChange(double time_constant_s) : trend_(time_constant_s) {
    assert(time_constant_s > 0);
  }

  void update(double value, SensorTime t) { trend_.update(value, t); }

  double per_second() const { return trend_.slope_per_second(); }
  double per_hour() const { return trend_.slope_per_second() * 3600.0; }
  bool primed() const { return trend_.primed(); }
  const LinearTrend& trend() const { return trend_; }

  void reset() { trend_.reset(); }
  State state() const { return trend_.state(); }
  void restore(const State& state) { trend_.restore(state); }

 private:
  LinearTrend trend_;
};

}  // namespace bw::core
