// Recursive least squares with exponential forgetting: fits y ~ x . w for a fixed number of
// regressors, one sample at a time.
//
// Per admitted sample (x, y) with effective forgetting lambda:
//   prediction = x . w (a priori), residual e = y - prediction,
//   g = P x / (lambda + x' P x),  w += g e,  P = (P - g x' P) / lambda.
// Started from w = 0 and P = initial_covariance * I, after n samples w equals the batch solution
//   w_n = (sum lambda^(n-i) x_i x_i' + lambda^n / initial_covariance I)^-1 sum lambda^(n-i) x_i y_i
// so a large initial_covariance means a weak prior pulling w towards 0.
// Forgetting with irregular spacing: when nominal_interval_s > 0, lambda = forgetting^(dt /
// nominal_interval_s), dt = seconds since the previous admitted sample (a sample at the same time
// forgets nothing; the first sample forgets one nominal interval's worth). When
// nominal_interval_s = 0, lambda = forgetting on every update. Memory ~ 1 / (1 - forgetting)
// nominal intervals (or updates).
// Covariance bound: with forgetting and poor excitation P grows without limit in the directions
// the data does not excite (wind-up). Whenever trace(P) would exceed max_covariance_trace, P is
// scaled down so that its trace equals the bound; this keeps P positive definite and bounded at
// the cost of a slightly stronger prior in those directions. (Other published anti-wind-up
// schemes exist; this one is simple and sufficient for advisory models.)
// Symmetry: only one triangle of P is computed and mirrored, so P is exactly symmetric.
// Intercept: add a constant 1 regressor yourself.
// Frozen: coefficients and P stop changing; predictions, residuals and the residual variance are
// still computed.
// residual_variance(): exponentially weighted mean of the squared a priori residual (time
// constant residual_time_constant_s); the first residuals, made before the coefficients settle,
// inflate it for a few time constants.
//
// Units: x and y in the caller's units; w in y units per x unit; times in seconds.
// Before the first sample: coefficients are 0, predict() returns 0, residual_variance() is 0.
// A sample with NaN/Inf in y or any regressor, or earlier than the last admitted one, is ignored
// and counted (gate()); update() then returns accepted = false and changes nothing.
// O(n^2) per update with n regressors; all buffers are allocated at construction.
// Invariants: P symmetric, positive definite, trace(P) <= max_covariance_trace.
// Copyable; not thread-safe (one owner).
#pragma once

#include <cstddef>
#include <cstdint>
#include <span>
#include <vector>

#include "core/ewma.h"
#include "core/interval_cache.h"
#include "core/sample_gate.h"
#include "core/sensor_time.h"

namespace bw::core {

struct RlsParams {
  std::size_t regressors = 1;         // n >= 1, fixed for the life of the estimator
  double forgetting = 1;              // per nominal interval (or per update), 0 < forgetting <= 1
  double nominal_interval_s = 0;      // 0: forgetting applies once per update
  double initial_covariance = 1e4;    // P0 = initial_covariance * I, > 0
  double max_covariance_trace = 1e8;  // wind-up bound, >= n * initial_covariance
  double residual_time_constant_s = 3600;  // for residual_variance(), > 0
};

struct RlsStep {
  double prediction = 0;  // x . w before this sample's update
  double residual = 0;    // y - prediction
  bool accepted = false;
};

class Rls {
 public:
  // Plain snapshot for checkpointing: restore(state()) continues bit-identically.
  struct State {
    std::vector<double> coefficients;  // n values
    std::vector<double> covariance;    // n * n values, row-major
    bool frozen = false;
    Ewma::State residual;
    SampleGate::State gate;

    bool operator==(const State&) const = default;
  };

  // REQUIRES: params as documented above.
  explicit Rls(const RlsParams& params);

  // REQUIRES: x.size() == regressors.
  double predict(std::span<const double> x) const;
  // REQUIRES: x.size() == regressors.
  RlsStep update(std::span<const double> x, double y, SensorTime t);

  void freeze(bool frozen) { frozen_ = frozen; }
  bool frozen() const { return frozen_; }

  std::span<const double> coefficients() const { return coefficients_; }
  double covariance(std::size_t i, std::size_t j) const;
  double residual_variance() const { return residual_.mean(); }
  std::size_t regressors() const { return params_.regressors; }
  const RlsParams& params() const { return params_; }
  std::int64_t count() const { return gate_.accepted(); }
  const SampleGate& gate() const { return gate_; }

  State state() const;
  // REQUIRES: state taken from an Rls with the same number of regressors.
  void restore(const State& state);

 private:
  double forgetting_for(const SampleGate::Admission& in);
  void absorb(std::span<const double> x, double residual, double lambda);

  RlsParams params_;
  std::vector<double> coefficients_;
  std::vector<double> covariance_;  // row-major n x n
  std::vector<double> gain_;        // scratch: P x
  bool frozen_ = false;
  IntervalCache forgetting_;
  Ewma residual_;
  SampleGate gate_;
};

}  // namespace bw::core
