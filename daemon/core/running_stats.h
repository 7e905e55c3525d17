// Mean and standard deviation of every value seen, with equal weights (Welford's update).
//
// Used to learn a baseline over a fixed stretch of healthy data. Numerically stable for long
// runs; O(1) per value, no allocation. Before the first value mean() is 0 and stddev() is 0;
// with one value stddev() is 0. Non-finite values must be filtered by the caller (asserted).
#pragma once

#include <cassert>
#include <cmath>
#include <cstdint>

namespace bw::core {

class RunningStats {
 public:
  // Plain snapshot for checkpointing: restore(state()) continues bit-identically.
  struct State {
    std::uint64_t count = 0;
    double mean = 0;
    double sum_squares = 0;
    bool operator==(const State&) const = default;
  };
  State state() const { return {count_, mean_, sum_squares_}; }
  void restore(const State& s) {
    count_ = s.count;
    mean_ = s.mean;
    sum_squares_ = s.sum_squares;
  }

  void add(double value) {
    assert(std::isfinite(value));
    ++count_;
    const double delta = value - mean_;
    mean_ += delta / static_cast<double>(count_);
    sum_squares_ += delta * (value - mean_);
  }

  std::uint64_t count() const { return count_; }
  double mean() const { return mean_; }
  // Sample standard deviation (n - 1 in the denominator).
  double stddev() const {
    return count_ > 1 ? std::sqrt(sum_squares_ / static_cast<double>(count_ - 1)) : 0.0;
  }

 private:
  std::uint64_t count_ = 0;
  double mean_ = 0;
  double sum_squares_ = 0;
};

}  // namespace bw::core
