// The in-control reference (target and sigma) of a statistical estimator.
//
// Values given in the configuration are used as they are. Missing ones are learned from the
// samples of the first `learn_s` seconds after the first sample (mean and sample standard
// deviation), then held for good. Until then ready() is false and the estimator stays silent.
// A learned sigma of zero (a flat stretch) is not usable: learning then continues until the
// data shows some spread, so a stuck transmitter never yields a zero-width baseline.
#pragma once

#include <optional>

#include "core/running_stats.h"
#include "core/sensor_time.h"
#include "engine/site_model.h"
#include "engine/state_codec.h"

namespace bw::engine {

class BaselineLearner {
 public:
  explicit BaselineLearner(const BaselineSpec& spec);

  // Feeds one finite value; returns ready().
  bool observe(double value, core::SensorTime t);

  bool ready() const { return ready_; }
  double target() const { return target_; }
  double sigma() const { return sigma_; }

  void save(StateWriter& out) const;
  bool load(StateReader& in);

 private:
  void settle();

  BaselineSpec spec_;
  core::RunningStats learned_;
  std::optional<core::SensorTime> first_;
  bool ready_ = false;
  double target_ = 0;
  double sigma_ = 0;
};

}  // namespace bw::engine
