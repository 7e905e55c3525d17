// Alert transitions: what the engine tells the outside world when a check changes state.
//
// A transition is produced on the sample that caused it and carries that sample's time, so the
// same samples give the same transitions, bit for bit, live or in replay. The strings are owned
// by the engine's compiled site and stay valid as long as the engine lives; `message` is built
// for this transition only.
#pragma once

#include <optional>
#include <string>
#include <string_view>

#include "core/sensor_time.h"
#include "engine/site_model.h"

namespace bw::engine {

// Wire value (the JSON "event" field uses the names below): do not rename.
enum class AlertEvent : std::uint8_t { raised, cleared };

std::string_view to_string(AlertEvent event);
std::string_view to_string(Priority priority);

// For checks that look ahead: when the trend is expected to reach the limit.
struct Forecast {
  core::SensorTime crossing;        // central estimate
  core::SensorTime crossing_early;  // band from the slope's uncertainty
  std::optional<core::SensorTime> crossing_late;  // none when the slow end never reaches it
  double limit = 0;
};

struct AlertTransition {
  core::SensorTime time;
  std::string_view site;
  std::string_view asset;
  std::string_view check;
  std::string_view tag;  // the tag whose sample caused the transition
  AlertEvent event = AlertEvent::raised;
  Priority priority = Priority::medium;
  double value = 0;  // the watched value at the transition, in its engineering unit
  std::string_view unit;
  std::string message;
  std::optional<Forecast> forecast;
};

// Receives transitions in the order the engine produces them. Called on the engine's thread.
class AlertSink {
 public:
  virtual ~AlertSink() = default;
  virtual void on_transition(const AlertTransition& transition) = 0;
};

}  // namespace bw::engine
