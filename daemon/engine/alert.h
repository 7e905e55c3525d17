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
#include "engine/alert_lifecycle.h"
#include "engine/asset_record.h"
#include "engine/site_model.h"

namespace bw::engine {

// What happened to an alert. Wire and disk value (the JSON "event" field and the journal use
// the names of to_string()): do not rename or renumber; add at the end.
enum class AlertEvent : std::uint8_t {
  raised,                // the condition became active
  cleared,               // the condition returned to normal
  acknowledged,
  shelved,
  unshelved,
  shelve_expired,
  suppressed,            // suppressed by design (a configured condition holds)
  unsuppressed,
  removed_from_service,
  returned_to_service,
  command_refused,       // a command changed nothing; the message says why
};

// Why a transition happened. Wire and disk value: do not rename or renumber.
enum class TransitionCause : std::uint8_t {
  sample,         // a sample of `tag`
  silence,        // time passed without a sample (stale tag)
  command,        // a person's command (who, source, reason)
  shelve_expiry,  // a shelve ran out
  restore,        // state restored at start-up
};

std::string_view to_string(AlertEvent event);
std::string_view to_string(TransitionCause cause);
std::string_view to_string(Priority priority);
// The priority named by to_string(), or none for any other text.
std::optional<Priority> priority_from_string(std::string_view name);

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
  AlertState from = AlertState::normal;
  AlertState to = AlertState::normal;
  TransitionCause cause = TransitionCause::sample;
  std::string_view who;     // commands: the person
  std::string_view reason;  // commands: free text
  std::string_view source;  // commands: where it came from, e.g. "mqtt:client-7"
};

// Receives what the engine produces, in order: alert transitions, and records (asset_record.h),
// each handed over after the transitions of the sample or time step that closed it. A receiver
// interested in transitions only keeps the default on_record. Called on the engine's thread.
class AlertSink {
 public:
  virtual ~AlertSink() = default;
  virtual void on_transition(const AlertTransition& transition) = 0;
  virtual void on_record(const AssetRecord& record) { (void)record; }
};

}  // namespace bw::engine
