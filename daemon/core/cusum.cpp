#include "core/cusum.h"

#include <algorithm>
#include <cassert>
#include <cmath>

namespace bw::core {

Cusum::Cusum(const CusumParams& params, double target, double sigma)
    : params_(params),
      target_(target),
      sigma_(sigma),
      upper_(params.head_start),
      lower_(params.head_start) {
  assert(std::isfinite(params.k) && params.k >= 0);
  assert(std::isfinite(params.h) && params.h > 0);
  assert(params.head_start >= 0 && params.head_start < params.h);
  assert(params.max_sum == 0 || params.max_sum > params.h);
  assert(std::isfinite(target) && std::isfinite(sigma) && sigma > 0);
}

CusumPoint Cusum::update(double value, SensorTime t) {
  if (!gate_.admit(std::isfinite(value), t).accepted) return {upper_, lower_, 0, false};
  const double z = (value - target_) / sigma_;
  upper_ = std::max(0.0, upper_ + z - params_.k);
  lower_ = std::max(0.0, lower_ - z - params_.k);
  if (params_.max_sum > 0) {
    upper_ = std::min(upper_, params_.max_sum);
    lower_ = std::min(lower_, params_.max_sum);
  }
  int signal = 0;
  if (upper_ > params_.h || lower_ > params_.h) signal = upper_ >= lower_ ? 1 : -1;
  const CusumPoint point{upper_, lower_, signal, true};
  if (signal != 0 && params_.restart_after_signal) {
    upper_ = params_.head_start;
    lower_ = params_.head_start;
  }
  return point;
}

void Cusum::set_baseline(double target, double sigma) {
  assert(std::isfinite(target) && std::isfinite(sigma) && sigma > 0);
  target_ = target;
  sigma_ = sigma;
  restart();
}

void Cusum::restart() {
  upper_ = params_.head_start;
  lower_ = params_.head_start;
  gate_.reset();
}

Cusum::State Cusum::state() const { return {target_, sigma_, upper_, lower_, gate_.state()}; }

void Cusum::restore(const State& state) {
  target_ = state.target;
  sigma_ = state.sigma;
  upper_ = state.upper;
  lower_ = state.lower;
  gate_.restore(state.gate);
}

}  // namespace bw::core
