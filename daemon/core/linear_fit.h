// Exponentially weighted least-squares straight line y = a + b x, updated one point at a time.
//
// Keeps the sum of weights W, the sum of squared weights W2, the weighted means of x and y and the
// centred co-moments Sxx, Sxy, Syy, updated in the numerically stable centred (weighted Welford)
// form: no sums of raw squares, so large offsets in x or y do not cancel digits.
//   add(x, y, w): every point enters with weight w (default 1).
//   decay(f):     multiplies the weight of everything seen so far by f (0 < f <= 1); means are
//                 unchanged, W, Sxx, Sxy, Syy scale by f and W2 by f^2.
// With no decay the fit is ordinary least squares and reproduces the certified values of the NIST
// StRD linear regression datasets.
//
// Statistics (defined when the noted condition holds, NaN otherwise):
//   slope b = Sxy / Sxx, intercept a = mean_y - b mean_x            (Sxx > 0)
//   r_squared = Sxy^2 / (Sxx Syy)                                   (Sxx > 0, Syy > 0)
//   effective_count n_eff = W^2 / W2 (= number of points for equal weights)
//   residual_variance s^2 = SSE / (W (1 - 2 / n_eff)), SSE = Syy - Sxy^2 / Sxx   (n_eff > 2)
//   slope_stderr     = sqrt(s^2 W / (n_eff Sxx))
//   intercept_stderr = sqrt(s^2 / n_eff (1 + mean_x^2 W / Sxx))
// For equal weights these are the textbook OLS formulas (SSE / (n - 2), s^2 / Sxx, ...). For
// unequal (exponential) weights they treat the data as n_eff equally informative points: an
// approximation that is scale-free in the weights and good for the smooth weights used here.
//
// Before the first point every statistic is NaN and counts are 0.
// Inputs are taken as given: callers refuse NaN/Inf before calling add() (REQUIRES finite x, y,
// w > 0). O(1) per point, no allocation. Copyable; not thread-safe (one owner).
#pragma once

#include <cstdint>

namespace bw::core {

class WeightedLinearFit {
 public:
  // Plain snapshot for checkpointing: restore(state()) continues bit-identically.
  struct State {
    double sum_w = 0;
    double sum_w2 = 0;
    double mean_x = 0;
    double mean_y = 0;
    double sxx = 0;
    double sxy = 0;
    double syy = 0;
    std::int64_t count = 0;

    bool operator==(const State&) const = default;
  };

  void add(double x, double y, double weight = 1);
  void decay(double factor);

  double slope() const;
  double intercept() const;
  // Fitted value at x, computed about the means (more precise than intercept + slope * x).
  double value_at(double x) const;
  double residual_variance() const;
  double slope_stderr() const;
  double intercept_stderr() const;
  double r_squared() const;
  double effective_count() const;
  double mean_x() const { return s_.mean_x; }
  double mean_y() const { return s_.mean_y; }
  double sxx() const { return s_.sxx; }
  // Points added since construction or reset().
  std::int64_t count() const { return s_.count; }

  void reset() { s_ = State{}; }

  State state() const { return s_; }
  void restore(const State& state) { s_ = state; }

 private:
  State s_;
};

}  // namespace bw::core
