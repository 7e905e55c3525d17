// Linear trend of a signal against time, with time to reach a limit.
//
// A WeightedLinearFit of value against x = seconds since the first admitted sample (an internal
// origin keeps x small, so microsecond timestamps keep their precision). With time_constant_s > 0
// the weight of everything already seen is multiplied by exp(-dt / tau) before each new sample,
// dt = seconds since the previous admitted sample, so old data fades with elapsed time, not with
// sample count; time_constant_s = 0 keeps every sample at full weight (ordinary least squares).
// A sample at the same time as the previous one is added without decay.
//
// primed(): at least 3 samples, positive spread in time (Sxx > 0) and more than 2 effective
// points (so the standard errors are defined). Slope and level_at() are NaN until two distinct
// times have been seen; time_to_limit() says not_enough_data until primed().
//
// time_to_limit(limit, now, side, z): when will the fitted line reach `limit`?
//   side = high: the limit is above the normal range (dP, pressure, level); low: below it.
//   already_beyond: the fitted level at `now` is at or past the limit (seconds = 0).
//   no_crossing:    the slope is zero or points away from the limit (seconds = +inf).
//   crossing:       seconds = time from `now` until the fitted line reaches the limit.
//                   seconds_early / seconds_late: the same for the lines of slope b + z se(b) and
//                   b - z se(b) (towards the limit: faster, slower) through the centre of the
//                   data (mean time, mean value), where the fitted line is best determined.
//                   Pivoting there, not at `now`, carries the slope's share of the uncertainty of
//                   the level at `now` (most of it, when extrapolating); the uncertainty of the
//                   mean value itself is left out, so the band covers a little less than its
//                   nominal level. seconds_early is 0 when the faster line is past the limit
//                   already; seconds_late = +inf when the slower slope does not point towards the
//                   limit. Always seconds_early <= seconds <= seconds_late.
//
// Units: value units; slope in value units per second; times in seconds.
// NaN/Inf values and samples earlier than the last admitted one are ignored and counted (gate()).
// O(1) per update, no allocation. Copyable; not thread-safe (one owner).
#pragma once

#include <cstdint>

#include "core/interval_cache.h"
#include "core/linear_fit.h"
#include "core/sample_gate.h"
#include "core/sensor_time.h"

namespace bw::core {

enum class LimitSide { high, low };

struct TimeToLimit {
  enum Status { crossing, no_crossing, already_beyond, not_enough_data };
  Status status = not_enough_data;
  double seconds = 0;        // central estimate, from `now`
  double seconds_early = 0;  // with the faster slope
  double seconds_late = 0;   // with the slower slope; +inf if it never reaches
};

class LinearTrend {
 public:
  // Plain snapshot for checkpointing: restore(state()) continues bit-identically.
  struct State {
    WeightedLinearFit::State fit;
    std::int64_t origin_us = 0;
    SampleGate::State gate;

    bool operator==(const State&) const = default;
  };

  // REQUIRES: time_constant_s >= 0 and finite.
  explicit LinearTrend(double time_constant_s);

  void update(double value, SensorTime t);

  bool primed() const;
  double slope_per_second() const { return fit_.slope(); }
  double slope_stderr_per_second() const { return fit_.slope_stderr(); }
  // Fitted value at time t (extrapolated beyond the data).
  double level_at(SensorTime t) const;
  // REQUIRES: z >= 0.
  TimeToLimit time_to_limit(double limit, SensorTime now, LimitSide side = LimitSide::high,
                            double z = 1.96) const;

  const WeightedLinearFit& fit() const { return fit_; }
  double time_constant_s() const { return time_constant_s_; }
  std::int64_t count() const { return gate_.accepted(); }
  const SampleGate& gate() const { return gate_; }

  // Back to the state before the first sample (counts included).
  void reset();

  State state() const;
  void restore(const State& state);

 private:
  double x_of(SensorTime t) const;

  double time_constant_s_;
  WeightedLinearFit fit_;
  SensorTime origin_{};
  IntervalCache decay_;
  SampleGate gate_;
};

}  // namespace bw::core
