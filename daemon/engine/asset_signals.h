// The value slots of one asset and the evaluation of its derived signals and estimators, in
// dependency order, each time one of its inputs receives a usable value.
//
// Every named signal (input, derived signal, estimator output) has a value slot. set_input()
// starts a new pass: it fills the input's slot and marks it fresh for this pass; then each
// downstream derived signal is recomputed if any operand is fresh (the others are held), and
// each estimator is updated if its first input is fresh; an estimator whose update recognised an
// event (a filter change-out) restarts the estimators that name it in `restart_on`, which come
// later in the order, before they see the pass's values. A derived value that is not finite
// (division by zero, say) is not written and does not propagate. Slots hold no value before
// their first computation (has_value()).
//
// Records: after each estimator update the evaluator's estimator may hand over a record of an
// event it recognised (EstimatorNode::take_record); they wait in records() until the owner
// clears them. Nothing is allocated while no estimator has a record.
//
// Invariants: the AssetSpec outlives this object and passed analyse_asset() with no problems;
// slots and nodes are sized once at construction and never move, so pointers to slot values
// stay valid, and evaluation allocates nothing except when an event restarts an estimator. Not thread-safe: owned by the engine's thread.
#pragma once

#include <cstdint>
#include <memory>
#include <string>
#include <vector>

#include "core/sensor_time.h"
#include "engine/asset_graph.h"
#include "engine/estimator_node.h"
#include "engine/site_model.h"
#include "engine/state_codec.h"

namespace bw::engine {

class AssetSignals {
 public:
  explicit AssetSignals(const AssetSpec& spec);
  AssetSignals(const AssetSignals&) = delete;
  AssetSignals& operator=(const AssetSignals&) = delete;

  // Starts a pass in which no slot is fresh (a sample that brings no usable value).
  void begin_pass() { ++pass_; }
  // Starts a pass with a usable (good, finite) value of input `input` (index into spec inputs).
  void set_input(std::size_t input, double value, core::SensorTime t);

  // Slot of a signal name: an input role, a derived signal or "<estimator>.<output>".
  // REQUIRES: the name resolves (analyse_asset() guarantees it for the spec's references).
  std::size_t slot_of(const std::string& name) const;
  bool fresh(std::size_t slot) const { return fresh_pass_[slot] == pass_; }
  bool has_value(std::size_t slot) const { return has_value_[slot] != 0; }
  double value(std::size_t slot) const { return values_[slot]; }
  const double* value_pointer(std::size_t slot) const { return &values_[slot]; }
  const std::string& unit(std::size_t slot) const { return slot_units_[slot]; }

  struct EstimatorRef {
    const std::unique_ptr<EstimatorNode>* node;  // stays put; the node is replaced on restart
    std::size_t first_output_slot;
    std::size_t watched_slot;  // its first input
  };
  // REQUIRES: the asset defines an estimator of that name.
  EstimatorRef estimator(const std::string& name) const;

  // For each slot, whether a value of input `input` can change it.
  std::vector<std::uint8_t> reached_from(std::size_t input) const;

  struct EstimatorRecord {
    std::size_t estimator;  // index into the spec's estimators
    RecordContent content;
  };
  // Records handed over since clear_records(), in the order the estimators produced them.
  std::vector<EstimatorRecord>& records() { return records_; }
  void clear_records() { records_.clear(); }

  // Slot values and estimator states (not freshness, which lasts one pass).
  void save(StateWriter& out) const;
  bool load(StateReader& in);

 private:
  struct SignalStep {
    std::size_t spec_index;
    std::vector<std::size_t> operand_slots;
    std::size_t output_slot;
  };
  struct EstimatorStep {
    std::size_t spec_index;
    std::unique_ptr<EstimatorNode> node;
    std::vector<std::size_t> input_slots;
    std::size_t first_output_slot;
    std::size_t output_count;
    std::vector<std::size_t> restarts;  // estimators_ restarted by this one's events
  };
  // One entry of an input's evaluation plan: a signal or an estimator step.
  struct PlanEntry {
    bool is_signal;
    std::size_t step;
  };

  void compile();
  void build_plans();
  void compute_signal(const SignalStep& step);
  void update_estimator(EstimatorStep& step, core::SensorTime t);
  // Starts an estimator afresh: a new node, its outputs without a value.
  void restart(EstimatorStep& step);

  const AssetSpec& spec_;
  std::vector<GraphNode> order_;  // signals and estimators in evaluation order
  std::vector<std::string> slot_names_;
  std::vector<std::string> slot_units_;
  std::vector<double> values_;
  std::vector<std::uint8_t> has_value_;
  std::vector<std::uint64_t> fresh_pass_;
  std::uint64_t pass_ = 1;  // slots start at pass 0: nothing is fresh before the first pass
  std::vector<SignalStep> signals_;
  std::vector<EstimatorStep> estimators_;
  std::vector<std::vector<PlanEntry>> plans_;  // per input
  std::vector<double> input_buffer_;           // estimator inputs, sized to the widest
  std::vector<EstimatorRecord> records_;
};

}  // namespace bw::engine
