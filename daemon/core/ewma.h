// Exponentially weighted moving mean and variance of an irregularly sampled signal.
//
// Time-constant form: each admitted sample x at time t moves the state with weight
//   alpha = 1 - exp(-dt / tau),  dt = seconds since the previous admitted sample,
// so the result depends on elapsed time, not on how many samples arrived: two samples of the same
// value dt apart move the mean exactly as one sample 2 dt after the start would. A sample at the
// same time as the previous one (dt = 0) has weight 0 and changes nothing but count().
// Variance is the incremental exponentially weighted form
//   diff = x - mean; incr = alpha diff; mean += incr; var = (1 - alpha)(var + diff incr),
// which equals the weighted variance sum w_i (x_i - mean)^2 / sum w_i of all samples seen, with the
// first sample carrying the weight of everything before it.
//
// Units: mean in the signal's units, variance in units squared, tau in seconds (> 0).
// Before the first sample: mean() and variance() are 0, primed() is false. The first admitted
// sample sets mean = value, variance = 0.
// primed(): at least one time constant has passed since the first sample, i.e. the first sample's
// weight has decayed below 1/e and the mean describes the signal rather than its first value.
// NaN/Inf values and samples earlier than the last admitted one are ignored and counted (gate()).
// O(1) per update, no allocation. Copyable; not thread-safe (one owner).
#pragma once

#include <cstdint>

#include "core/interval_cache.h"
#include "core/sample_gate.h"
#include "core/sensor_time.h"

namespace bw::core {

class Ewma {
 public:
  // Plain snapshot for checkpointing: restore(state()) continues bit-identically.
  struct State {
    double mean = 0;
    double variance = 0;
    double first_weight = 1;  // remaining weight of the first sample, for primed()
    SampleGate::State gate;

    bool operator==(const State&) const = default;
  };

  // REQUIRES: time_constant_s > 0 and finite.
  explicit Ewma(double time_constant_s);

  void update(double value, SensorTime t);

  double mean() const { return mean_; }
  double variance() const { return variance_; }
  double stddev() const;
  double time_constant_s() const { return time_constant_s_; }
  std::int64_t count() const { return gate_.accepted(); }
  bool primed() const;
  const SampleGate& gate() const { return gate_; }

  // Back to the state before the first sample (counts included).
  void reset();

  State state() const;
  void restore(const State& state);

 private:
  double time_constant_s_;
  double mean_ = 0;
  double variance_ = 0;
  double first_weight_ = 1;
  IntervalCache alpha_;
  SampleGate gate_;
};

}  // namespace bw::core
