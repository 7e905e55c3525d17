#include "engine/baseline.h"

#include <cassert>

#include "engine/core_state_codec.h"

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

void BaselineLearner::save(StateWriter& out) const {
  put(out, learned_.state());
  out.put_optional_time(first_);
  out.put_bool(ready_);
  out.put_double(target_);
  out.put_double(sigma_);
}

bool BaselineLearner::load(StateReader& in) {
  core::RunningStats::State learned;
  if (!get(in, learned)) return false;
  learned_.restore(learned);
  first_ = in.get_optional_time();
  ready_ = in.get_bool();
  target_ = in.get_double();
  sigma_ = in.get_double();
  return in.ok();
}

void BaselineLearner::settle() {
  const double sigma = spec_.sigma.value_or(learned_.stddev());
  if (!(sigma > 0)) return;  // flat so far: keep learning
  target_ = spec_.target.value_or(learned_.mean());
  sigma_ = sigma;
  ready_ = true;
}

}  // namespace bw::engine
