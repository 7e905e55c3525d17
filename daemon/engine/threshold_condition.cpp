#include "engine/threshold_condition.h"

#include <cassert>
#include <chrono>
#include <cmath>
#include <cstdio>

namespace bw::engine {
namespace {

core::Micros micros(double seconds) {
  return std::chrono::duration_cast<core::Micros>(std::chrono::duration<double>(seconds));
}

}  // namespace

std::string figure(double value, std::string_view unit) {
  char text[64];
  std::snprintf(text, sizeof text, "%.4g", value);
  std::string out = text;
  if (!unit.empty()) out += " " + std::string(unit);
  return out;
}

std::string duration_words(double seconds) {
  char text[48];
  if (seconds < 120) {
    std::snprintf(text, sizeof text, "%.3g s", seconds);
  } else if (seconds < 2 * 3600) {
    std::snprintf(text, sizeof text, "%.3g min", seconds / 60);
  } else {
    std::snprintf(text, sizeof text, "%.3g h", seconds / 3600);
  }
  return text;
}

ThresholdCondition::ThresholdCondition(LimitDirection direction, double limit, double deadband,
                                       double on_delay_s, double off_delay_s)
    : direction_(direction),
      limit_(limit),
      deadband_(deadband),
      on_delay_(micros(on_delay_s)),
      off_delay_(micros(off_delay_s)) {
  assert(deadband >= 0 && on_delay_s >= 0 && off_delay_s >= 0);
}

bool ThresholdCondition::update(bool active, double value, core::SensorTime now) {
  const bool high = direction_ == LimitDirection::high;
  const bool calls_for_change =
      active ? (high ? value < limit_ - deadband_ : value > limit_ + deadband_)
             : (high ? value > limit_ : value < limit_);
  if (!calls_for_change) {
    pending_since_.reset();
    return false;
  }
  if (!pending_since_) pending_since_ = now;
  if (now - *pending_since_ < delay(active)) return false;
  pending_since_.reset();
  return true;
}

std::optional<core::SensorTime> ThresholdCondition::deadline(bool active) const {
  if (!pending_since_) return std::nullopt;
  return *pending_since_ + delay(active);
}

std::string ThresholdCondition::describe(bool raising, double value, std::string_view unit) const {
  const bool high = direction_ == LimitDirection::high;
  if (raising) {
    std::string out =
        figure(value, unit) + (high ? " above" : " below") + " limit " + figure(limit_, unit);
    if (on_delay_.count() > 0) {
      out += " for " + duration_words(std::chrono::duration<double>(on_delay_).count());
    }
    return out;
  }
  return figure(value, unit) + ", back inside limit " + figure(limit_, unit) + " by the deadband " +
         figure(deadband_, unit);
}

bool ThresholdCondition::load(StateReader& in) {
  pending_since_ = in.get_optional_time();
  return in.ok();
}

}  // namespace bw::engine
