#include "engine/asset_signals.h"

#include <algorithm>
#include <cassert>
#include <cmath>

#include "core/tank_geometry.h"

namespace bw::engine {
namespace {

// Layout of save(); bump when it changes.
constexpr std::uint8_t kStateVersion = 1;

// The unit of an estimator output, given the unit of the signal it watches.
double apply(const SignalSpec& spec, const std::vector<double>& values,
             const std::vector<std::size_t>& slots) {
  double acc = values[slots[0]];
  switch (spec.op) {
    case SignalOp::linear:
      return spec.gain * acc + spec.offset;
    case SignalOp::sum:
      for (std::size_t i = 1; i < slots.size(); ++i) acc += values[slots[i]];
      return acc;
    case SignalOp::difference:
      for (std::size_t i = 1; i < slots.size(); ++i) acc -= values[slots[i]];
      return acc;
    case SignalOp::product:
      for (std::size_t i = 1; i < slots.size(); ++i) acc *= values[slots[i]];
      return acc;
    case SignalOp::gate:
      return values[slots[1]] > spec.above ? acc : NAN;
    case SignalOp::ratio: {
      const double denominator = values[slots[1]];
      if (spec.exponent != 1.0 && denominator <= 0) return NAN;
      return acc / std::pow(denominator / spec.reference, spec.exponent);
    }
    case SignalOp::tank_volume:
      if (spec.strapping_table) return spec.strapping_table->volume_at(acc).volume_bbl;
      return core::VerticalCylinder{.inside_diameter_ft = *spec.diameter_ft}.volume_bbl(acc);
  }
  return NAN;
}

}  // namespace

AssetSignals::AssetSignals(const AssetSpec& spec) : spec_(spec) {
  compile();
  build_plans();
}

std::size_t AssetSignals::slot_of(const std::string& name) const {
  auto it = std::find(slot_names_.begin(), slot_names_.end(), name);
  assert(it != slot_names_.end() && "analyse_asset() guarantees every reference resolves");
  return static_cast<std::size_t>(it - slot_names_.begin());
}

AssetSignals::EstimatorRef AssetSignals::estimator(const std::string& name) const {
  auto it = std::find_if(estimators_.begin(), estimators_.end(), [&](const EstimatorStep& s) {
    return spec_.estimators[s.spec_index].name == name;
  });
  assert(it != estimators_.end());
  return {&it->node, it->first_output_slot, it->input_slots[0]};
}

void AssetSignals::compile() {
  const AssetGraph graph = analyse_asset(spec_);
  assert(graph.ok());
  order_ = graph.order;
  for (const auto& input : spec_.inputs) {
    slot_names_.push_back(input.role);
    slot_units_.push_back(input.unit);
  }
  // Name every slot first, so that steps can resolve references in any order.
  for (const auto& signal : spec_.signals) {
    slot_names_.push_back(signal.name);
    slot_units_.push_back(signal.unit);
  }
  std::vector<std::size_t> estimator_first_slot(spec_.estimators.size());
  for (std::size_t e = 0; e < spec_.estimators.size(); ++e) {
    estimator_first_slot[e] = slot_names_.size();
    for (auto output : estimator_outputs(spec_.estimators[e].kind)) {
      slot_names_.push_back(spec_.estimators[e].name + "." + std::string(output));
      slot_units_.emplace_back();  // filled below, once input units are known
    }
  }
  std::size_t widest = 0;
  for (const GraphNode& node : graph.order) {
    if (node.kind == GraphNode::Kind::signal) {
      const auto& s = spec_.signals[node.index];
      SignalStep step{node.index, {}, slot_of(s.name)};
      for (const auto& operand : s.operands) step.operand_slots.push_back(slot_of(operand));
      signals_.push_back(std::move(step));
    } else {
      const auto& e = spec_.estimators[node.index];
      const auto outputs = estimator_outputs(e.kind);
      std::vector<std::size_t> input_slots;
      std::vector<std::string> input_units;
      for (const auto& name : estimator_inputs(e.kind)) {
        input_slots.push_back(slot_of(name));
        input_units.push_back(slot_units_[input_slots.back()]);
      }
      EstimatorStep step{node.index,
                         make_estimator_node(e.kind, input_units),
                         std::move(input_slots),
                         estimator_first_slot[node.index],
                         outputs.size(),
                         {}};
      for (std::size_t o = 0; o < outputs.size(); ++o) {
        slot_units_[step.first_output_slot + o] = estimator_output_unit(outputs[o], input_units);
      }
      widest = std::max(widest, step.input_slots.size());
      estimators_.push_back(std::move(step));
    }
  }
  for (auto& step : estimators_) {
    const std::string& name = spec_.estimators[step.spec_index].name;
    for (std::size_t d = 0; d < estimators_.size(); ++d) {
      if (spec_.estimators[estimators_[d].spec_index].restart_on == name) {
        step.restarts.push_back(d);
      }
    }
  }
  input_buffer_.resize(widest);
  values_.assign(slot_names_.size(), 0.0);
  has_value_.assign(slot_names_.size(), 0);
  fresh_pass_.assign(slot_names_.size(), 0);
}

std::vector<std::uint8_t> AssetSignals::reached_from(std::size_t input) const {
  std::vector<std::uint8_t> reached(slot_names_.size(), 0);
  reached[input] = 1;
  auto any_reached = [&](const std::vector<std::size_t>& slots) {
    return std::any_of(slots.begin(), slots.end(),
                       [&](std::size_t slot) { return reached[slot] != 0; });
  };
  std::size_t s = 0;
  std::size_t e = 0;
  // Unlike a plan, any input counts here: an RLS output depends on its regressors too.
  for (const GraphNode& node : order_) {
    if (node.kind == GraphNode::Kind::signal) {
      const auto& step = signals_[s++];
      if (any_reached(step.operand_slots)) reached[step.output_slot] = 1;
    } else {
      const auto& step = estimators_[e++];
      if (!any_reached(step.input_slots)) continue;
      for (std::size_t o = 0; o < step.output_count; ++o) reached[step.first_output_slot + o] = 1;
    }
  }
  return reached;
}

// For each input, the steps downstream of it that its samples trigger, in evaluation order.
void AssetSignals::build_plans() {
  plans_.resize(spec_.inputs.size());
  for (std::size_t input = 0; input < spec_.inputs.size(); ++input) {
    std::vector<std::uint8_t> reached(slot_names_.size(), 0);
    reached[input] = 1;
    std::size_t s = 0;
    std::size_t e = 0;
    // signals_ and estimators_ are each in graph order; walk them merged in that order.
    for (const GraphNode& node : order_) {
      if (node.kind == GraphNode::Kind::signal) {
        const auto& step = signals_[s];
        if (std::any_of(step.operand_slots.begin(), step.operand_slots.end(),
                        [&](std::size_t slot) { return reached[slot] != 0; })) {
          reached[step.output_slot] = 1;
          plans_[input].push_back({true, s});
        }
        ++s;
      } else {
        const auto& step = estimators_[e];
        if (reached[step.input_slots[0]]) {
          for (std::size_t o = 0; o < step.output_count; ++o) {
            reached[step.first_output_slot + o] = 1;
          }
          plans_[input].push_back({false, e});
        }
        ++e;
      }
    }
  }
}

void AssetSignals::compute_signal(const SignalStep& step) {
  bool any_fresh = false;
  for (std::size_t slot : step.operand_slots) {
    if (!has_value_[slot]) return;
    any_fresh = any_fresh || fresh(slot);
  }
  if (!any_fresh) return;
  const double v = apply(spec_.signals[step.spec_index], values_, step.operand_slots);
  if (!std::isfinite(v)) return;
  values_[step.output_slot] = v;
  has_value_[step.output_slot] = 1;
  fresh_pass_[step.output_slot] = pass_;
}

void AssetSignals::update_estimator(EstimatorStep& step, core::SensorTime t) {
  if (!fresh(step.input_slots[0])) return;
  for (std::size_t i = 0; i < step.input_slots.size(); ++i) {
    if (!has_value_[step.input_slots[i]]) return;
    input_buffer_[i] = values_[step.input_slots[i]];
  }
  const std::span<const double> in(input_buffer_.data(), step.input_slots.size());
  const std::span<double> out(&values_[step.first_output_slot], step.output_count);
  const bool written = step.node->update(in, t, out);
  if (auto record = step.node->take_record()) {
    records_.push_back({step.spec_index, std::move(*record)});
  }
  if (!written) return;
  for (std::size_t o = 0; o < step.output_count; ++o) {
    has_value_[step.first_output_slot + o] = 1;
    fresh_pass_[step.first_output_slot + o] = pass_;
  }
  if (step.node->restarts_dependents()) {
    for (std::size_t d : step.restarts) restart(estimators_[d]);
  }
}

void AssetSignals::restart(EstimatorStep& step) {
  std::vector<std::string> input_units;
  for (std::size_t slot : step.input_slots) input_units.push_back(slot_units_[slot]);
  step.node = make_estimator_node(spec_.estimators[step.spec_index].kind, input_units);
  for (std::size_t o = 0; o < step.output_count; ++o) has_value_[step.first_output_slot + o] = 0;
}

void AssetSignals::set_input(std::size_t input, double value, core::SensorTime t) {
  assert(input < spec_.inputs.size());
  assert(std::isfinite(value));
  ++pass_;
  values_[input] = value;
  has_value_[input] = 1;
  fresh_pass_[input] = pass_;
  for (const PlanEntry& entry : plans_[input]) {
    if (entry.is_signal) {
      compute_signal(signals_[entry.step]);
    } else {
      update_estimator(estimators_[entry.step], t);
    }
  }
}

void AssetSignals::save(StateWriter& out) const {
  out.put_u8(kStateVersion);
  out.put_u64(values_.size());
  out.put_u64(estimators_.size());
  for (std::size_t i = 0; i < values_.size(); ++i) {
    out.put_double(values_[i]);
    out.put_bool(has_value_[i] != 0);
  }
  for (const auto& step : estimators_) step.node->save(out);
}

bool AssetSignals::load(StateReader& in) {
  if (in.get_u8() != kStateVersion || in.get_u64() != values_.size() ||
      in.get_u64() != estimators_.size()) {
    in.fail();
    return false;
  }
  for (std::size_t i = 0; i < values_.size(); ++i) {
    values_[i] = in.get_double();
    has_value_[i] = in.get_bool() ? 1 : 0;
  }
  for (auto& step : estimators_) {
    if (!in.ok() || !step.node->load(in)) return false;
  }
  return in.ok();
}

}  // namespace bw::engine
