#include "engine/baseline.h"

#include <cassert>

namespace bw::engine {

BaselineLearner::BaselineLearner(const BaselineSpec& spec) : spec_(spec) {
  if (spec_.target && spec_.sigma) {
    assert(*spec_.sigma > 0);
    target_ = *spec_.target;
    sigma_ = *spec_.sigma;
    ready_ = true;
  }
}

bool BaselineLearner::observe(double value, core::SensorTime t) {
  if (ready_) return true;
  if (!first_) first_ = t;
  learned_.add(value);
  if (core::seconds_between(*first_, t) >= spec_.learn_s) settle();
  return ready_;
}

void BaselineLearner::settle() {
  const double sigma = spec_.sigma.value_or(learned_.stddev());
  if (!(sigma > 0)) return;  // flat so far: keep learning
  target_ = spec_.target.value_or(learned_.mean());
  sigma_ = sigma;
  ready_ = true;
}

}  // namespace bw::engine
