#include "core/ewma.h"

#include <cassert>
#include <cmath>

namespace bw::core {

namespace {
// The first sample counts as forgotten once its weight has fallen to 1/e: one time constant.
constexpr double kPrimedWeight = 0.36787944117144233;
}  // namespace

Ewma::Ewma(double time_constant_s) : time_constant_s_(time_constant_s) {
  assert(std::isfinite(time_constant_s) && time_constant_s > 0);
}

void Ewma::update(double value, SensorTime t) {
  const SampleGate::Admission in = gate_.admit(std::isfinite(value), t);
  if (!in.accepted) return;
  if (in.first) {
    mean_ = value;
    variance_ = 0;
    first_weight_ = 1;
    return;
  }
  // -expm1 keeps alpha accurate when dt is a tiny fraction of tau.
  const double alpha =
      alpha_.get(in.dt_s, [this](double dt) { return -std::expm1(-dt / time_constant_s_); });
  const double diff = value - mean_;
  const double incr = alpha * diff;
  mean_ += incr;
  variance_ = (1 - alpha) * (variance_ + diff * incr);
  first_weight_ *= 1 - alpha;
}

double Ewma::stddev() const { return std::sqrt(variance_); }

// The slack absorbs rounding in the product of (1 - alpha) when exactly one tau has passed.
bool Ewma::primed() const { return count() > 1 && first_weight_ <= kPrimedWeight * (1 + 1e-9); }

void Ewma::reset() {
  mean_ = 0;
  variance_ = 0;
  first_weight_ = 1;
  gate_.reset();
}

Ewma::State Ewma::state() const { return {mean_, variance_, first_weight_, gate_.state()}; }

void Ewma::restore(const State& state) {
  mean_ = state.mean;
  variance_ = state.variance;
  first_weight_ = state.first_weight;
  gate_.restore(state.gate);
}

}  // namespace bw::core
