// An episode: a stretch of time during which a rate of change runs high, with the change of the
// quantity over it. The oil pad of a water tank growing fast is an oil slug; the pad's growth
// over the episode is the slug's volume.
//
// Each update brings the quantity q (e.g. oil pad, bbl) and its smoothed rate r (e.g. bbl/h).
// Hysteresis on r with two thresholds, end_below < start_above:
//   - when r rises to end_below or above, the tracker is armed and remembers q as the possible
//     start (the smoothed rate crosses the lower threshold before the upper one, so the start is
//     taken nearer the slug's real onset);
//   - when r falls below end_below while armed and not in an episode, it disarms;
//   - when r reaches start_above while armed, the episode begins (at the armed moment);
//   - once in an episode, r below end_below for `end_after_s` seconds ends it, at the first of
//     those low values; r back at or above end_below before then continues it.
// change() is q minus q at the possible start while armed or in an episode; when the episode
// ends, its total is the largest q seen during it minus q at the start (an episode is a stretch
// of rise, and what comes after its peak, such as skimming the pad, is not part of it). The
// total is held until the tracker arms again; the closed episode (start, end, total, peak
// rate) is returned by the update that ends it.
//
// Invariants: end_below < start_above; times never go backwards (gate). O(1), no allocation.
// Copyable; not thread-safe (one owner).
#pragma once

#include <cstdint>
#include <optional>

#include "core/sample_gate.h"
#include "core/sensor_time.h"

namespace bw::core {

class Episode {
 public:
  struct Options {
    double start_above = 0;
    double end_below = 0;
    double end_after_s = 0;  // >= 0
  };

  struct Closed {
    SensorTime start;
    SensorTime end;
    double change = 0;
    double peak_rate = 0;
  };

  struct State {
    bool armed = false;
    bool active = false;
    std::int64_t start_us = 0;
    double start_value = 0;
    double change = 0;
    double peak_rate = 0;
    double peak_value = 0;
    bool low_since_set = false;
    std::int64_t low_since_us = 0;
    SampleGate::State gate;
    bool operator==(const State&) const = default;
  };

  // REQUIRES: options.end_below < options.start_above, end_after_s >= 0.
  explicit Episode(Options options);

  std::optional<Closed> update(double quantity, double rate, SensorTime t);

  bool active() const { return active_; }
  double change() const { return change_; }
  double peak_rate() const { return peak_rate_; }
  // Hours from the episode's start to `now` while active; 0 otherwise.
  double hours_active(SensorTime now) const;

  State state() const;
  void restore(const State& state);

 private:
  Options options_;
  bool armed_ = false;
  bool active_ = false;
  SensorTime start_{};
  double start_value_ = 0;
  double change_ = 0;
  double peak_rate_ = 0;
  double peak_value_ = 0;
  bool low_since_set_ = false;
  SensorTime low_since_{};
  SampleGate gate_;
};

}  // namespace bw::core
