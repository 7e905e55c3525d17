// An alarm condition on a value against a limit, with a deadband and an on-delay and off-delay:
// the logic shared by limit checks and rate-of-change checks.
//
// Raising: the value must be beyond the limit (strictly) and stay beyond for the on-delay.
// Clearing: the value must be back inside the limit by the deadband (strictly) and stay there for
// the off-delay. A value between the two leaves the state as it is and cancels a pending change,
// so a value hovering at the limit raises at most once and never chatters. "Stays" is judged on
// the latest value held between samples: a change falls due at deadline() even when no sample
// arrives, and the owner applies it with expire().
//
// Before the first value: not active, nothing pending. The caller passes finite values only.
// Invariant: a pending change exists only while the latest value calls for it. Not thread-safe.
#pragma once

#include <optional>
#include <string>
#include <string_view>

#include "core/sensor_time.h"
#include "engine/site_model.h"
#include "engine/state_codec.h"

namespace bw::engine {

class ThresholdCondition {
 public:
  // REQUIRES: deadband >= 0, delays >= 0.
  ThresholdCondition(LimitDirection direction, double limit, double deadband, double on_delay_s,
                     double off_delay_s);

  // The latest value at `now`, with the present state `active`. Returns true when the state
  // should change now (to !active); the pending change is then consumed.
  bool update(bool active, double value, core::SensorTime now);

  // When a pending change falls due without a new value; none when nothing is pending.
  std::optional<core::SensorTime> deadline(bool active) const;
  // The pending change is applied by the owner: forget it.
  void consume() { pending_since_.reset(); }
  // The data became unusable: a pending change must start again on good data.
  void cancel() { pending_since_.reset(); }

  // "18.2 ft above limit 18 ft" / "17.4 ft, back inside limit 18 ft by the deadband 0.5 ft".
  std::string describe(bool raising, double value, std::string_view unit) const;

  void save(StateWriter& out) const { out.put_optional_time(pending_since_); }
  bool load(StateReader& in);

 private:
  core::Micros delay(bool active) const { return active ? off_delay_ : on_delay_; }

  LimitDirection direction_;
  double limit_;
  double deadband_;
  core::Micros on_delay_;
  core::Micros off_delay_;
  std::optional<core::SensorTime> pending_since_;
};

// A value with its unit for a person: "18.2 ft" (4 significant digits).
std::string figure(double value, std::string_view unit);
// A duration for a person: "45 s", "15 min", "2.5 h".
std::string duration_words(double seconds);

}  // namespace bw::engine
