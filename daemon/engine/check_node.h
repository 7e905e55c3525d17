// Runtime checks of one asset: each decides, after its source changed, whether its alert is
// raised or cleared.
//
// A check holds read-only views of the asset's value slots and estimator nodes, which outlive
// it (both belong to the same AssetEvaluator and are never reallocated). evaluate() returns an
// outcome only when the state changes, so a value hovering inside the deadband produces nothing.
// Not thread-safe: owned by the engine's thread.
#pragma once

#include <memory>
#include <optional>
#include <string>

#include "core/sensor_time.h"
#include "engine/alert.h"
#include "engine/estimator_node.h"
#include "engine/site_model.h"

namespace bw::engine {

struct CheckOutcome {
  AlertEvent event = AlertEvent::raised;
  double value = 0;     // the watched signal's value
  std::string detail;   // figures appended to the configured message
  std::optional<Forecast> forecast;
};

class CheckNode {
 public:
  virtual ~CheckNode() = default;
  virtual std::optional<CheckOutcome> evaluate(core::SensorTime now) = 0;
  bool active() const { return active_; }

 protected:
  // Records a state change and returns it as an outcome.
  std::optional<CheckOutcome> change_to(bool active, double value, std::string detail,
                                        std::optional<Forecast> forecast = std::nullopt);

 private:
  bool active_ = false;
};

// What a check reads: the watched value slot, and for estimator checks the estimator.
struct CheckSources {
  const double* value = nullptr;             // never null
  std::string_view unit;
  const EstimatorNode* estimator = nullptr;  // null for limit checks
};

std::unique_ptr<CheckNode> make_check_node(const CheckKind& spec, CheckSources sources);

}  // namespace bw::engine
