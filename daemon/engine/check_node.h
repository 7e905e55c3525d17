// Runtime checks of one asset: each follows its source and decides when its alarm condition
// becomes active or clears.
//
// A check holds read-only views of the asset's value slots, estimator nodes and input times,
// which outlive it (all belong to the same AssetEvaluator and are never reallocated). The
// evaluator calls evaluate() when the check's source has a fresh value (a stale check: when its
// input was heard, whatever the quality), and expire() when deadline() has passed with no new
// data (an on-/off-delay ran out, an input fell silent). Both return an outcome only when the
// condition changes, so a value hovering inside the deadband produces nothing.
//
// Holding: while data a check depends on are bad or silent the evaluator calls none of these
// (except for stale checks, which are about silence itself) and calls cancel_pending() once, so
// nothing is raised or cleared on bad data and a delay starts again on good data.
//
// Checkpoints: save() writes the condition and everything evaluate() depends on; load() restores
// it so that the check continues exactly as an uninterrupted one, or returns false.
// Not thread-safe: owned by the engine's thread.
#pragma once

#include <memory>
#include <optional>
#include <string>

#include "core/sensor_time.h"
#include "engine/alert.h"
#include "engine/estimator_node.h"
#include "engine/site_model.h"
#include "engine/state_codec.h"

namespace bw::engine {

struct CheckOutcome {
  bool active = false;  // the condition's new state
  double value = 0;     // the watched value (for rate checks: the rate per hour)
  std::string detail;   // figures appended to the configured message
  std::optional<Forecast> forecast;
};

class CheckNode {
 public:
  virtual ~CheckNode() = default;

  virtual std::optional<CheckOutcome> evaluate(core::SensorTime now) = 0;
  // When the condition changes with no new data, if a change is pending.
  virtual std::optional<core::SensorTime> deadline() const { return std::nullopt; }
  // REQUIRES: deadline() is set and `at` is that deadline. Applies the pending change.
  virtual std::optional<CheckOutcome> expire(core::SensorTime /*at*/) { return std::nullopt; }
  virtual void cancel_pending() {}
  // False for the one kind that bad or silent data do not hold (stale).
  virtual bool held_by_bad_data() const { return true; }

  bool active() const { return active_; }
  void save(StateWriter& out) const;
  bool load(StateReader& in);

 protected:
  // Records a state change and returns it as an outcome.
  std::optional<CheckOutcome> change_to(bool active, double value, std::string detail,
                                        std::optional<Forecast> forecast = std::nullopt);

 private:
  virtual void save_more(StateWriter&) const {}
  virtual bool load_more(StateReader&) { return true; }

  bool active_ = false;
};

// What a check reads.
struct CheckSources {
  const double* value = nullptr;             // the watched slot; never null
  std::string_view unit;                     // of the watched slot
  // Statistical and time-to-limit checks: the holder of the estimator's node, which stays put
  // while the node itself is replaced when the estimator restarts (restart_on).
  const std::unique_ptr<EstimatorNode>* estimator = nullptr;
  const core::SensorTime* heard = nullptr;   // stale checks: when the input was last heard
};

// REQUIRES: analyse_asset(asset) found no problem, and `check` belongs to `asset`.
std::unique_ptr<CheckNode> make_check_node(const AssetSpec& asset, const CheckSpec& check,
                                           CheckSources sources);

}  // namespace bw::engine
