// EWMA control chart (Roberts' exponentially weighted moving average chart) on a known in-control
// mean mu0 and standard deviation sigma.
//
// Statistic: z starts at mu0; each admitted sample x moves it by z += alpha (x - z), with
//   alpha = 1 - (1 - lambda)^(dt / nominal_interval_s)
// so that samples spaced exactly nominal_interval_s apart use alpha = lambda (the textbook chart,
// up to rounding) and irregular spacing gives a weight that depends on elapsed time only. The
// first sample after construction or restart() uses alpha = lambda. A sample at the same time as
// the previous one (dt = 0) has weight 0.
// Limits: mu0 +/- L sigma_z. The variance of z is tracked recursively,
//   var_z = (1 - alpha)^2 var_z + alpha^2 sigma^2,
// which is exact for independent samples with varying weights, gives the time-varying limits
// (i = 1: sigma_z = lambda sigma) and converges to lambda / (2 - lambda) sigma^2 for regular
// spacing. With time_varying_limits = false the asymptotic sigma_z = sigma sqrt(lambda/(2-lambda))
// is used from the first sample on.
// Signal: +1 when z > upper, -1 when z < lower (strictly outside), else 0.
//
// Units: mu0, sigma, statistic and limits in the signal's units; interval in seconds.
// Before the first sample: statistic() is mu0. NaN/Inf values and samples earlier than the last
// admitted one are ignored and counted (gate()); update() then reports the unchanged statistic
// with accepted = false.
// O(1) per update, no allocation. Copyable; not thread-safe (one owner).
#pragma once

#include <cstdint>

#include "core/interval_cache.h"
#include "core/sample_gate.h"
#include "core/sensor_time.h"

namespace bw::core {

struct EwmaChartParams {
  double lambda = 0.2;              // weight at the nominal interval, 0 < lambda <= 1
  double nominal_interval_s = 1;    // spacing at which alpha = lambda, > 0
  double width = 3;                 // L: limit half-width in units of sigma_z, > 0
  bool time_varying_limits = true;  // false: asymptotic limits from the first sample on
};

struct EwmaChartResult {
  double statistic = 0;
  double lower = 0;
  double upper = 0;
  int signal = 0;  // -1 below lower, 0 inside, +1 above upper
  bool accepted = false;
};

class EwmaChart {
 public:
  // Plain snapshot for checkpointing: restore(state()) continues bit-identically.
  struct State {
    double mu0 = 0;
    double sigma = 1;
    double statistic = 0;
    double statistic_variance = 0;
    SampleGate::State gate;

    bool operator==(const State&) const = default;
  };

  // REQUIRES: params as documented above; sigma > 0; all finite.
  EwmaChart(const EwmaChartParams& params, double mu0, double sigma);

  EwmaChartResult update(double value, SensorTime t);

  // New in-control mean and sigma; restarts the chart (the old statistic has no meaning against
  // a new baseline). REQUIRES: sigma > 0, both finite.
  void set_baseline(double mu0, double sigma);
  // Statistic back to mu0, variance to 0; the next sample is a first sample again.
  void restart();

  double statistic() const { return statistic_; }
  // Standard deviation of the statistic used for the current limits.
  double statistic_sigma() const;
  double mu0() const { return mu0_; }
  double sigma() const { return sigma_; }
  const EwmaChartParams& params() const { return params_; }
  std::int64_t count() const { return gate_.accepted(); }
  const SampleGate& gate() const { return gate_; }

  State state() const;
  void restore(const State& state);

 private:
  EwmaChartResult point(bool accepted) const;

  EwmaChartParams params_;
  double asymptotic_factor_;  // sqrt(lambda / (2 - lambda))
  double log_keep_;           // log(1 - lambda); -inf when lambda = 1
  double mu0_;
  double sigma_;
  double statistic_;
  double statistic_variance_ = 0;
  IntervalCache keep_;
  SampleGate gate_;
};

}  // namespace bw::core
