// One asset at run time: its latest signal values, estimators and checks, evaluated in
// dependency order each time one of its inputs receives a good sample.
//
// Every named signal (input, derived signal, estimator output) has a value slot. A sample fills
// its input's slot and marks it fresh for this pass; then each downstream derived signal is
// recomputed if any operand is fresh (the others are held), each estimator is updated if its
// first input is fresh, and each check whose source became fresh is evaluated. A derived value
// that is not finite (division by zero, say) is not written and does not propagate.
//
// Invariants: the AssetSpec outlives the evaluator and passed analyse_asset() with no problems;
// slots and nodes are sized once at construction, so evaluation allocates nothing except the
// message of an alert transition. Not thread-safe: owned by the engine's thread.
#pragma once

#include <cstdint>
#include <memory>
#include <string_view>
#include <vector>

#include "core/sensor_time.h"
#include "engine/alert.h"
#include "engine/asset_graph.h"
#include "engine/check_node.h"
#include "engine/estimator_node.h"
#include "engine/site_model.h"

namespace bw::engine {

class AssetEvaluator {
 public:
  AssetEvaluator(const AssetSpec& spec, std::string_view site_name);
  AssetEvaluator(const AssetEvaluator&) = delete;
  AssetEvaluator& operator=(const AssetEvaluator&) = delete;

  // A good, finite sample of input `input_index` (index into spec().inputs).
  void on_input(std::size_t input_index, double value, core::SensorTime t, std::string_view tag,
                AlertSink& sink);

  const AssetSpec& spec() const { return spec_; }

 private:
  struct SignalStep {
    std::size_t spec_index;
    std::vector<std::size_t> operand_slots;
    std::size_t output_slot;
  };
  struct EstimatorStep {
    std::unique_ptr<EstimatorNode> node;
    std::vector<std::size_t> input_slots;
    std::size_t first_output_slot;
    std::size_t output_count;
  };
  struct CheckStep {
    std::unique_ptr<CheckNode> node;
    std::size_t spec_index;
    std::size_t trigger_slot;  // the slot whose freshness triggers evaluation
    std::size_t watched_slot;  // the signal whose value and unit the alert reports
  };
  // One entry of an input's evaluation plan: a signal or an estimator step.
  struct PlanEntry {
    bool is_signal;
    std::size_t step;
  };

  std::size_t slot_of(const std::string& name) const;
  void compile();
  void build_plans();
  bool fresh(std::size_t slot) const { return fresh_pass_[slot] == pass_; }
  void compute_signal(const SignalStep& step, core::SensorTime t);
  void update_estimator(EstimatorStep& step, core::SensorTime t);

  const AssetSpec& spec_;
  std::string_view site_name_;
  std::vector<GraphNode> order_;  // signals and estimators in evaluation order
  std::vector<std::string> slot_names_;
  std::vector<std::string> slot_units_;
  std::vector<double> values_;
  std::vector<std::uint8_t> has_value_;
  std::vector<std::uint64_t> fresh_pass_;
  std::uint64_t pass_ = 0;
  std::vector<SignalStep> signals_;
  std::vector<EstimatorStep> estimators_;
  std::vector<CheckStep> checks_;
  std::vector<std::vector<PlanEntry>> plans_;         // per input
  std::vector<std::vector<std::size_t>> check_plans_;  // per input: indices into checks_
  std::vector<double> input_buffer_;                   // estimator inputs, sized to the widest
};

}  // namespace bw::engine
