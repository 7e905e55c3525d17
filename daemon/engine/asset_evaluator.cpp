#include "engine/asset_evaluator.h"

#include <algorithm>
#include <cassert>
#include <cmath>

#include "core/overloaded.h"
#include "engine/asset_graph.h"

namespace bw::engine {
namespace {

// The unit of an estimator output, given the unit of the signal it watches.
std::string output_unit(std::string_view output, const std::string& input_unit) {
  if (output == "slope_per_hour" || output == "per_hour") return input_unit + "/h";
  if (output == "residual_percent") return "%";
  if (output == "upper" || output == "lower") return "sigma";
  return input_unit;
}

double apply(SignalOp op, const SignalSpec& spec, const std::vector<double>& values,
             const std::vector<std::size_t>& slots) {
  double acc = values[slots[0]];
  switch (op) {
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
    case SignalOp::ratio: {
      const double denominator = values[slots[1]];
      if (spec.exponent != 1.0 && denominator <= 0) return NAN;
      return acc / std::pow(denominator, spec.exponent);
    }
  }
  return NAN;
}

}  // namespace

AssetEvaluator::AssetEvaluator(const AssetSpec& spec, std::string_view site_name)
    : spec_(spec), site_name_(site_name) {
  compile();
  build_plans();
}

std::size_t AssetEvaluator::slot_of(const std::string& name) const {
  auto it = std::find(slot_names_.begin(), slot_names_.end(), name);
  assert(it != slot_names_.end() && "analyse_asset() guarantees every reference resolves");
  return static_cast<std::size_t>(it - slot_names_.begin());
}

void AssetEvaluator::compile() {
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
      EstimatorStep step{make_estimator_node(e.kind), {}, estimator_first_slot[node.index],
                         estimator_outputs(e.kind).size()};
      for (const auto& name : estimator_inputs(e.kind)) step.input_slots.push_back(slot_of(name));
      const auto outputs = estimator_outputs(e.kind);
      for (std::size_t o = 0; o < outputs.size(); ++o) {
        slot_units_[step.first_output_slot + o] =
            output_unit(outputs[o], slot_units_[step.input_slots[0]]);
      }
      widest = std::max(widest, step.input_slots.size());
      estimators_.push_back(std::move(step));
    }
  }
  input_buffer_.resize(widest);
  values_.assign(slot_names_.size(), 0.0);
  has_value_.assign(slot_names_.size(), 0);
  fresh_pass_.assign(slot_names_.size(), 0);

  for (std::size_t c = 0; c < spec_.checks.size(); ++c) {
    const auto& check = spec_.checks[c];
    auto estimator_step = [&](const std::string& name) -> const EstimatorStep& {
      auto it = std::find_if(spec_.estimators.begin(), spec_.estimators.end(),
                             [&](const EstimatorSpec& e) { return e.name == name; });
      const std::size_t first = estimator_first_slot[static_cast<std::size_t>(it - spec_.estimators.begin())];
      return *std::find_if(estimators_.begin(), estimators_.end(),
                           [&](const EstimatorStep& s) { return s.first_output_slot == first; });
    };
    std::size_t watched = 0;
    std::size_t trigger = 0;
    const EstimatorNode* node = nullptr;
    std::visit(core::Overloaded{
                   [&](const LimitCheckSpec& s) { watched = trigger = slot_of(s.of); },
                   [&](const auto& s) {
                     const EstimatorStep& step = estimator_step(s.estimator);
                     watched = step.input_slots[0];
                     trigger = step.first_output_slot;
                     node = step.node.get();
                   },
               },
               check.kind);
    checks_.push_back({make_check_node(check.kind, {.value = &values_[watched],
                                                    .unit = slot_units_[watched],
                                                    .estimator = node}),
                       c, trigger, watched});
  }
}

// For each input, the steps downstream of it (in evaluation order) and the checks they feed.
void AssetEvaluator::build_plans() {
  plans_.resize(spec_.inputs.size());
  check_plans_.resize(spec_.inputs.size());
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
                        [&](std::size_t slot) { return reached[slot]; })) {
          reached[step.output_slot] = 1;
          plans_[input].push_back({true, s});
        }
        ++s;
      } else {
        const auto& step = estimators_[e];
        if (reached[step.input_slots[0]]) {
          for (std::size_t o = 0; o < step.output_count; ++o) reached[step.first_output_slot + o] = 1;
          plans_[input].push_back({false, e});
        }
        ++e;
      }
    }
    for (std::size_t c = 0; c < checks_.size(); ++c) {
      if (reached[checks_[c].trigger_slot]) check_plans_[input].push_back(c);
    }
  }
}

void AssetEvaluator::compute_signal(const SignalStep& step, core::SensorTime) {
  bool any_fresh = false;
  for (std::size_t slot : step.operand_slots) {
    if (!has_value_[slot]) return;
    any_fresh = any_fresh || fresh(slot);
  }
  if (!any_fresh) return;
  const double v = apply(spec_.signals[step.spec_index].op, spec_.signals[step.spec_index],
                         values_, step.operand_slots);
  if (!std::isfinite(v)) return;
  values_[step.output_slot] = v;
  has_value_[step.output_slot] = 1;
  fresh_pass_[step.output_slot] = pass_;
}

void AssetEvaluator::update_estimator(EstimatorStep& step, core::SensorTime t) {
  if (!fresh(step.input_slots[0])) return;
  for (std::size_t i = 0; i < step.input_slots.size(); ++i) {
    if (!has_value_[step.input_slots[i]]) return;
    input_buffer_[i] = values_[step.input_slots[i]];
  }
  const std::span<const double> in(input_buffer_.data(), step.input_slots.size());
  const std::span<double> out(&values_[step.first_output_slot], step.output_count);
  if (!step.node->update(in, t, out)) return;
  for (std::size_t o = 0; o < step.output_count; ++o) {
    has_value_[step.first_output_slot + o] = 1;
    fresh_pass_[step.first_output_slot + o] = pass_;
  }
}

void AssetEvaluator::on_input(std::size_t input_index, double value, core::SensorTime t,
                              std::string_view tag, AlertSink& sink) {
  assert(input_index < spec_.inputs.size());
  assert(std::isfinite(value));
  ++pass_;
  values_[input_index] = value;
  has_value_[input_index] = 1;
  fresh_pass_[input_index] = pass_;
  for (const PlanEntry& entry : plans_[input_index]) {
    if (entry.is_signal) {
      compute_signal(signals_[entry.step], t);
    } else {
      update_estimator(estimators_[entry.step], t);
    }
  }
  for (std::size_t c : check_plans_[input_index]) {
    CheckStep& check = checks_[c];
    if (!fresh(check.trigger_slot)) continue;
    auto outcome = check.node->evaluate(t);
    if (!outcome) continue;
    const CheckSpec& spec = spec_.checks[check.spec_index];
    AlertTransition transition{
        .time = t,
        .site = site_name_,
        .asset = spec_.name,
        .check = spec.name,
        .tag = tag,
        .event = outcome->event,
        .priority = spec.priority,
        .value = outcome->value,
        .unit = slot_units_[check.watched_slot],
        .message = spec.message.empty() ? outcome->detail : spec.message + ": " + outcome->detail,
        .forecast = outcome->forecast,
    };
    sink.on_transition(transition);
  }
}

}  // namespace bw::engine
