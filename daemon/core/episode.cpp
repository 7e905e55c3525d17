#include "core/episode.h"

#include <algorithm>
#include <cassert>
#include <cmath>

namespace bw::core {

Episode::Episode(Options options) : options_(options) {
  assert(options.end_below < options.start_above);
  assert(options.end_after_s >= 0);
}

std::optional<Episode::Closed> Episode::update(double quantity, double rate, SensorTime t) {
  if (!gate_.admit(std::isfinite(quantity) && std::isfinite(rate), t).accepted) {
    return std::nullopt;
  }
  const bool low = rate < options_.end_below;
  if (!active_) {
    if (low) {
      armed_ = false;
      return std::nullopt;
    }
    if (!armed_) {
      armed_ = true;
      start_ = t;
      start_value_ = quantity;
      change_ = 0;
      peak_rate_ = rate;
      peak_value_ = quantity;
    }
    peak_rate_ = std::max(peak_rate_, rate);
    peak_value_ = std::max(peak_value_, quantity);
    change_ = quantity - start_value_;
    if (rate >= options_.start_above) {
      active_ = true;
      low_since_set_ = false;
    }
    return std::nullopt;
  }
  peak_value_ = std::max(peak_value_, quantity);
  change_ = quantity - start_value_;
  if (!low) {
    low_since_set_ = false;
    peak_rate_ = std::max(peak_rate_, rate);
    return std::nullopt;
  }
  if (!low_since_set_) {
    low_since_set_ = true;
    low_since_ = t;
  }
  if (seconds_between(low_since_, t) < options_.end_after_s) return std::nullopt;
  active_ = false;
  armed_ = false;
  change_ = peak_value_ - start_value_;
  return Closed{.start = start_, .end = low_since_, .change = change_, .peak_rate = peak_rate_};
}

double Episode::hours_active(SensorTime now) const {
  return active_ ? seconds_between(start_, now) / 3600.0 : 0.0;
}

Episode::State Episode::state() const {
  return State{.armed = armed_,
               .active = active_,
               .start_us = start_.time_since_epoch().count(),
               .start_value = start_value_,
               .change = change_,
               .peak_rate = peak_rate_,
               .peak_value = peak_value_,
               .low_since_set = low_since_set_,
               .low_since_us = low_since_.time_since_epoch().count(),
               .gate = gate_.state()};
}

void Episode::restore(const State& s) {
  armed_ = s.armed;
  active_ = s.active;
  start_ = SensorTime(Micros(s.start_us));
  start_value_ = s.start_value;
  change_ = s.change;
  peak_rate_ = s.peak_rate;
  peak_value_ = s.peak_value;
  low_since_set_ = s.low_since_set;
  low_since_ = SensorTime(Micros(s.low_since_us));
  gate_.restore(s.gate);
}

}  // namespace bw::core
