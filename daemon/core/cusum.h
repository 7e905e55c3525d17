// Two-sided tabular CUSUM (Page's test) on standardised values z = (x - target) / sigma.
//
//   upper S+ = max(0, S+ + z - k)      lower S- = max(0, S- - z - k)
// Both sums are non-negative and in sigma units: S+ grows while the signal sits above
// target + k sigma, S- while it sits below target - k sigma. Multiply by sigma for data units.
// Signal: +1 when S+ exceeds h, -1 when S- exceeds h, "exceeds" meaning strictly greater (S > h);
// the tabulated run lengths of the two-sided scheme use this definition. If both exceed h (only
// possible when sums are held), the larger sum decides.
// Fast initial response: the sums start at head_start (0 = plain CUSUM) after construction,
// restart() and set_baseline().
// After a signal: with restart_after_signal both sums restart at head_start; otherwise they are
// held and keep accumulating, clamped at max_sum when max_sum > 0 (the clamp always applies).
//
// Spacing: a CUSUM accumulates per observation, not per second. Fed with unevenly spaced samples
// it weights dense stretches more than sparse ones; run it at the source's own pace (or on values
// resampled to a fixed interval) so that its run lengths mean what the tables say. Timestamps
// are used only to refuse samples that go back in time.
// NaN/Inf values and samples earlier than the last admitted one are ignored and counted (gate());
// update() then reports the unchanged sums with signal 0 and accepted = false.
// O(1) per update, no allocation. Copyable; not thread-safe (one owner).
#pragma once

#include <cstdint>

#include "core/sample_gate.h"
#include "core/sensor_time.h"

namespace bw::core {

struct CusumParams {
  double k = 0.5;         // reference value (allowance), sigma units, >= 0
  double h = 5;           // decision interval, sigma units, > 0
  double head_start = 0;  // fast-initial-response start value, sigma units, 0 <= head_start < h
  bool restart_after_signal = false;
  double max_sum = 0;  // clamp for held sums, sigma units; 0 = no clamp, else > h
};

struct CusumPoint {
  double upper = 0;  // S+, sigma units
  double lower = 0;  // S-, sigma units (non-negative)
  int signal = 0;    // +1 upward shift, -1 downward shift, 0 none
  bool accepted = false;
};

class Cusum {
 public:
  // Plain snapshot for checkpointing: restore(state()) continues bit-identically.
  struct State {
    double target = 0;
    double sigma = 1;
    double upper = 0;
    double lower = 0;
    SampleGate::State gate;

    bool operator==(const State&) const = default;
  };

  // REQUIRES: params as documented above; sigma > 0; all finite.
  Cusum(const CusumParams& params, double target, double sigma);

  CusumPoint update(double value, SensorTime t);

  // New target and sigma; restarts the sums (they were measured against the old baseline).
  // REQUIRES: sigma > 0, both finite.
  void set_baseline(double target, double sigma);
  // Sums back to head_start; counts and last time forgotten.
  void restart();

  double upper() const { return upper_; }
  double lower() const { return lower_; }
  double target() const { return target_; }
  double sigma() const { return sigma_; }
  const CusumParams& params() const { return params_; }
  std::int64_t count() const { return gate_.accepted(); }
  const SampleGate& gate() const { return gate_; }

  State state() const;
  void restore(const State& state);

 private:
  CusumParams params_;
  double target_;
  double sigma_;
  double upper_;
  double lower_;
  SampleGate gate_;
};

}  // namespace bw::core
