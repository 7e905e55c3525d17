// Remembers the last value of a function of the sampling interval.
//
// Regularly sampled signals present the same interval again and again, and the exponential or
// power that turns an interval into a weight is the dearest part of an estimator update. get(dt, f)
// returns f(dt), calling f only when dt differs from the previous call's. The cache holds no
// estimator state: results are bit-identical with or without it, so checkpoints leave it out.
// Before the first call nothing is cached (NaN never equals an interval).
#pragma once

#include <limits>

namespace bw::core {

class IntervalCache {
 public:
  template <class F>
  double get(double dt, F f) {
    if (dt != dt_) {
      dt_ = dt;
      value_ = f(dt);
    }
    return value_;
  }

 private:
  double dt_ = std::numeric_limits<double>::quiet_NaN();
  double value_ = 0;
};

}  // namespace bw::core
