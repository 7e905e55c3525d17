// What an asset's checks report to the engine: the alarm condition of one check changed, or its
// suppression by design changed. The engine turns these into alert lifecycle transitions.
//
// Views (check, unit, tag) point into the evaluator's compiled site and stay valid while the
// engine lives; `detail` is built for this change only.
#pragma once

#include <optional>
#include <string>
#include <string_view>

#include "core/sensor_time.h"
#include "engine/alert.h"
#include "engine/asset_record.h"
#include "engine/site_model.h"

namespace bw::engine {

struct ConditionChange {
  enum class Kind : std::uint8_t {
    condition,    // the check's alarm condition became active (active = true) or cleared
    suppression,  // the check's suppress-by-design condition began (active = true) or ended
  };
  Kind kind = Kind::condition;
  bool active = false;
  core::SensorTime time;
  std::string_view check;  // the check's name (configured, or implicit such as "level_quality")
  Priority priority = Priority::medium;
  std::string_view message;  // the configured message (implicit checks bring their own)
  double value = 0;          // the watched signal's value
  std::string_view unit;
  std::string_view tag;      // the tag whose sample (or silence) caused the change
  std::string detail;        // figures for a person
  std::optional<Forecast> forecast;
  TransitionCause cause = TransitionCause::sample;  // silence: a stale tag, time passing
};

// Receives the changes of one asset in the order they occur, and the records it closes (from
// an estimator that recognised an event, or a periodic record at its period's end), stamped with
// site, asset and source. Called on the engine's thread.
class ConditionSink {
 public:
  virtual ~ConditionSink() = default;
  virtual void on_change(std::string_view asset, const ConditionChange& change) = 0;
  virtual void on_record(AssetRecord record) { (void)record; }
};

}  // namespace bw::engine
