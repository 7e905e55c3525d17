// Admission of samples into an estimator: the one place that decides which samples an estimator
// may use, and counts the ones it may not.
//
// Every estimator in core owns one SampleGate and asks it before touching its state:
//   - a sample whose value (or any regressor) is NaN or +/-Inf is refused and counted as
//     non-finite; the estimator's state is not touched, so one bad value never poisons it;
//   - a sample stamped earlier than the last admitted sample is refused and counted as out of
//     order (time going backwards); the state is not touched;
//   - a sample stamped at the same time as the last admitted one is admitted with dt = 0; each
//     estimator documents what a zero interval means for it.
// The first admitted sample has no interval (Admission::first is true, dt_s is 0).
//
// Invariant: last admitted time never decreases. Not thread-safe: owned by one estimator.
#pragma once

#include <cstdint>

#include "core/sensor_time.h"

namespace bw::core {

class SampleGate {
 public:
  // Plain snapshot for checkpointing; restore() continues exactly where state() left off.
  struct State {
    std::int64_t last_time_us = 0;
    std::int64_t accepted = 0;
    std::int64_t non_finite = 0;
    std::int64_t out_of_order = 0;

    bool operator==(const State&) const = default;
  };

  struct Admission {
    bool accepted = false;
    bool first = false;  // first admitted sample since construction or reset()
    double dt_s = 0;     // seconds since the previous admitted sample; 0 when first
  };

  // `finite` is the caller's verdict on the sample's value(s); `t` its timestamp.
  Admission admit(bool finite, SensorTime t) {
    if (!finite) {
      ++state_.non_finite;
      return {};
    }
    const std::int64_t t_us = t.time_since_epoch().count();
    if (state_.accepted > 0 && t_us < state_.last_time_us) {
      ++state_.out_of_order;
      return {};
    }
    const bool first = state_.accepted == 0;
    const double dt_s = first ? 0.0 : static_cast<double>(t_us - state_.last_time_us) * 1e-6;
    state_.last_time_us = t_us;
    ++state_.accepted;
    return {true, first, dt_s};
  }

  // Number of admitted samples since construction or reset().
  std::int64_t accepted() const { return state_.accepted; }
  // Samples refused because a value was NaN or infinite.
  std::int64_t non_finite() const { return state_.non_finite; }
  // Samples refused because their time was earlier than the last admitted sample.
  std::int64_t out_of_order() const { return state_.out_of_order; }
  // Time of the last admitted sample; meaningless while accepted() == 0.
  SensorTime last_time() const { return SensorTime(Micros(state_.last_time_us)); }

  // Forgets the last time and all counts: the next admitted sample is a first sample again.
  void reset() { state_ = State{}; }

  State state() const { return state_; }
  void restore(const State& state) { state_ = state; }

 private:
  State state_;
};

}  // namespace bw::core
