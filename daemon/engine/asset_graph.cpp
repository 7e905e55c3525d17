#include "engine/asset_graph.h"

#include <array>
#include <map>
#include <optional>
#include <set>

#include "core/overloaded.h"
#include "engine/check_settings.h"

namespace bw::engine {
namespace {

constexpr std::array<std::string_view, 2> kEwmaOutputs{"mean", "stddev"};
constexpr std::array<std::string_view, 2> kCusumOutputs{"upper", "lower"};
constexpr std::array<std::string_view, 3> kChartOutputs{"statistic", "upper_limit",
                                                        "lower_limit"};
constexpr std::array<std::string_view, 3> kRlsOutputs{"prediction", "residual",
                                                      "residual_percent"};
constexpr std::array<std::string_view, 2> kTrendOutputs{"level", "slope_per_hour"};
constexpr std::array<std::string_view, 1> kRateOutputs{"per_hour"};
constexpr std::array<std::string_view, 5> kHallOutputs{"integral", "volume", "slope", "injectivity",
                                                       "slope_change_percent"};
constexpr std::array<std::string_view, 6> kFilterLifeOutputs{
    "level", "online_hours", "throughput", "days_in_service", "unexplained_drop", "change_outs"};
constexpr std::array<std::string_view, 4> kEpisodeOutputs{"active", "change", "hours",
                                                          "peak_rate"};

// Resolves names to graph nodes and walks the graph depth first.
class Analyser {
 public:
  explicit Analyser(const AssetSpec& asset) : asset_(asset) {}

  AssetGraph run() {
    index_names();
    check_inputs_bound();
    check_operand_counts();
    check_tank_shapes();
    for (std::size_t i = 0; i < asset_.signals.size(); ++i) {
      visit({GraphNode::Kind::signal, i});
    }
    for (std::size_t i = 0; i < asset_.estimators.size(); ++i) {
      visit({GraphNode::Kind::estimator, i});
    }
    check_checks();
    check_records();
    return std::move(graph_);
  }

 private:
  enum class Mark : std::uint8_t { unvisited, in_progress, done };

  void problem(std::string message, const Where& where) {
    graph_.problems.push_back({std::move(message), where});
  }

  void define(const std::string& name, GraphNode node, const Where& where) {
    auto [it, inserted] = names_.emplace(name, node);
    if (!inserted) problem("name '" + name + "' is defined twice in asset '" + asset_.name + "'", where);
  }

  void index_names() {
    for (std::size_t i = 0; i < asset_.inputs.size(); ++i) {
      define(asset_.inputs[i].role, {GraphNode::Kind::input, i}, asset_.inputs[i].where);
    }
    for (std::size_t i = 0; i < asset_.signals.size(); ++i) {
      define(asset_.signals[i].name, {GraphNode::Kind::signal, i}, asset_.signals[i].where);
    }
    for (std::size_t i = 0; i < asset_.estimators.size(); ++i) {
      const auto& e = asset_.estimators[i];
      define(e.name, {GraphNode::Kind::estimator, i}, e.where);
    }
    marks_[static_cast<int>(GraphNode::Kind::signal)].assign(asset_.signals.size(), Mark::unvisited);
    marks_[static_cast<int>(GraphNode::Kind::estimator)].assign(asset_.estimators.size(),
                                                                Mark::unvisited);
  }

  void check_inputs_bound() {
    for (const auto& input : asset_.inputs) {
      if (input.required && input.tag.empty()) {
        problem("required input '" + input.role + "' of asset '" + asset_.name +
                    "' is not bound to a tag",
                asset_.where);
      }
    }
  }

  void check_operand_counts() {
    for (const auto& signal : asset_.signals) {
      const std::size_t n = signal.operands.size();
      const bool one = signal.op == SignalOp::linear || signal.op == SignalOp::tank_volume;
      const bool two = signal.op == SignalOp::ratio || signal.op == SignalOp::gate;
      if ((one && n != 1) || (two && n != 2) || (!one && !two && n < 2)) {
        problem("signal '" + signal.name + "' (" + std::string(signal_op_name(signal.op)) +
                    ") takes " + (one ? "exactly 1 operand" : two ? "exactly 2 operands" : "2 or more operands") +
                    ", not " + std::to_string(n),
                signal.where);
      }
    }
  }

  // A tank volume needs a shape; the shape keys mean nothing to the other operations.
  void check_tank_shapes() {
    for (const auto& signal : asset_.signals) {
      const bool has_shape = signal.diameter_ft.has_value() || signal.strapping_table.has_value();
      if (signal.op == SignalOp::tank_volume && !has_shape) {
        problem("signal '" + signal.name +
                    "' (tank_volume) needs the tank's 'diameter' (ft) or a 'strapping_table'",
                signal.where);
      } else if (signal.op != SignalOp::tank_volume && has_shape) {
        problem("signal '" + signal.name + "' (" + std::string(signal_op_name(signal.op)) +
                    "): 'diameter' and 'strapping_table' belong to op tank_volume only",
                signal.where);
      }
    }
  }

  // Resolves a signal reference: an input, a derived signal, or "<estimator>.<output>".
  std::optional<GraphNode> resolve_signal(const std::string& ref, const Where& where) {
    auto dot = ref.find('.');
    const std::string head = ref.substr(0, dot);
    auto it = names_.find(head);
    if (it == names_.end()) {
      problem("'" + ref + "' names no input, signal or estimator of asset '" + asset_.name + "'",
              where);
      return std::nullopt;
    }
    const GraphNode node = it->second;
    if (dot == std::string::npos) {
      if (node.kind == GraphNode::Kind::estimator) {
        problem("'" + ref + "' is an estimator; name one of its outputs, e.g. '" + ref + "." +
                    std::string(estimator_outputs(asset_.estimators[node.index].kind)[0]) + "'",
                where);
        return std::nullopt;
      }
      return node;
    }
    if (node.kind != GraphNode::Kind::estimator) {
      problem("'" + head + "' is not an estimator, so '" + ref + "' names nothing", where);
      return std::nullopt;
    }
    const std::string output = ref.substr(dot + 1);
    const auto& kind = asset_.estimators[node.index].kind;
    for (auto name : estimator_outputs(kind)) {
      if (name == output) return node;
    }
    std::string valid;
    for (auto name : estimator_outputs(kind)) valid += (valid.empty() ? "" : ", ") + std::string(name);
    problem("estimator '" + head + "' (" + std::string(estimator_kind_name(kind)) +
                ") has no output '" + output + "'; it has: " + valid,
            where);
    return std::nullopt;
  }

  // An estimator restarts on the events of another one, evaluated before it.
  std::optional<GraphNode> resolve_restart(const EstimatorSpec& estimator) {
    if (estimator.restart_on.empty()) return std::nullopt;
    auto it = names_.find(estimator.restart_on);
    if (it == names_.end() || it->second.kind != GraphNode::Kind::estimator) {
      problem("estimator '" + estimator.name + "': restart_on '" + estimator.restart_on +
                  "' names no estimator of asset '" + asset_.name + "'",
              estimator.where);
      return std::nullopt;
    }
    const auto& source = asset_.estimators[it->second.index];
    if (!std::holds_alternative<FilterLifeSpec>(source.kind)) {
      problem("estimator '" + estimator.name + "': restart_on '" + estimator.restart_on +
                  "' is a " + std::string(estimator_kind_name(source.kind)) +
                  ", which recognises no events to restart on; name a filter_life estimator",
              estimator.where);
      return std::nullopt;
    }
    return it->second;
  }

  std::vector<std::string> reads(GraphNode node) const {
    if (node.kind == GraphNode::Kind::signal) return asset_.signals[node.index].operands;
    return estimator_inputs(asset_.estimators[node.index].kind);
  }

  const Where& where_of(GraphNode node) const {
    return node.kind == GraphNode::Kind::signal ? asset_.signals[node.index].where
                                                : asset_.estimators[node.index].where;
  }

  const std::string& name_of(GraphNode node) const {
    return node.kind == GraphNode::Kind::signal ? asset_.signals[node.index].name
                                                : asset_.estimators[node.index].name;
  }

  void visit(GraphNode node) {
    if (node.kind == GraphNode::Kind::input) return;
    Mark& mark = marks_[static_cast<int>(node.kind)][node.index];
    if (mark == Mark::done) return;
    if (mark == Mark::in_progress) {
      problem("'" + name_of(node) + "' depends on itself through a cycle", where_of(node));
      return;
    }
    mark = Mark::in_progress;
    for (const auto& ref : reads(node)) {
      if (auto dep = resolve_signal(ref, where_of(node))) visit(*dep);
    }
    if (node.kind == GraphNode::Kind::estimator) {
      if (auto dep = resolve_restart(asset_.estimators[node.index])) visit(*dep);
    }
    marks_[static_cast<int>(node.kind)][node.index] = Mark::done;
    graph_.order.push_back(node);
  }

  // A check names a signal (limit, rate), an estimator of a fitting kind (statistical, time to
  // limit) or an input fit for it (data-quality checks); its name is its own.
  void check_checks() {
    std::set<std::string> names;
    for (const auto& check : asset_.checks) {
      if (!names.insert(check.name).second) {
        problem("check name '" + check.name + "' is used twice in asset '" + asset_.name + "'",
                check.where);
      }
      for (const auto& input : asset_.inputs) {
        if (check.name == quality_check_name(input.role)) {
          problem("check name '" + check.name + "' is taken by the data-quality check of input '" +
                      input.role + "'; choose another name",
                  check.where);
        }
      }
      std::visit(
          core::Overloaded{
              [&](const LimitCheckSpec& c) {
                if (!resolve_signal(c.of, check.where)) return;
                const auto settings = limit_settings(asset_, c);
                if (!settings) {
                  problem("check '" + check.name + "': " + settings.error().message, check.where);
                }
              },
              [&](const RateCheckSpec& c) { resolve_signal(c.of, check.where); },
              [&](const StatisticalCheckSpec& c) {
                require_estimator(check, c.estimator, {"cusum", "ewma_chart"});
              },
              [&](const TimeToLimitCheckSpec& c) {
                require_estimator(check, c.estimator, {"trend"});
              },
              [&](const StaleCheckSpec& c) {
                const InputSpec* input = require_input(check, c.of);
                if (input != nullptr && input->expected_interval_s <= 0) {
                  problem("check '" + check.name + "': input '" + c.of +
                              "' declares no expected_interval, so it cannot be judged stale",
                          check.where);
                }
              },
              [&](const FlatlineCheckSpec& c) { require_input(check, c.of); },
              [&](const OutOfRangeCheckSpec& c) {
                const InputSpec* input = require_input(check, c.of);
                if (input != nullptr && !(input->range_low && input->range_high)) {
                  problem("check '" + check.name + "': input '" + c.of +
                              "' declares no range to be out of",
                          check.where);
                }
              },
              [&](const Ne43CheckSpec& c) {
                const InputSpec* input = require_input(check, c.of);
                if (input != nullptr && input->unit != "mA") {
                  problem("check '" + check.name + "': input '" + c.of + "' is in '" + input->unit +
                              "', but NE 43 failure levels apply to a raw current "
                              "in 'mA'",
                          check.where);
                }
              },
          },
          check.kind);
      if (check.suppressed_when) resolve_signal(check.suppressed_when->of, check.where);
    }
  }

  // A record's name is its source on the wire, so it may not also name an estimator; its
  // fields name signals, and each statistic gets what it needs.
  void check_records() {
    std::set<std::string> names;
    for (const auto& record : asset_.records) {
      const std::string label = "record '" + record.name + "'";
      if (!names.insert(record.name).second) {
        problem("record name '" + record.name + "' is used twice in asset '" + asset_.name + "'",
                record.where);
      }
      auto it = names_.find(record.name);
      if (it != names_.end() && it->second.kind == GraphNode::Kind::estimator) {
        problem(label + " has the name of an estimator; records and estimators are told apart by "
                        "name, choose another",
                record.where);
      }
      if (record.fields.empty()) problem(label + " has no fields", record.where);
      if (record.day_start_s < 0 || record.day_start_s >= 86400) {
        problem(label + ": day_start must be at least 0 and below 24h", record.where);
      }
      std::set<std::string> fields;
      for (const auto& field : record.fields) {
        const std::string what = label + " field '" + field.name + "'";
        if (field.name == kCoveredHoursField) {
          problem(what + ": the name is taken by the hours the record covers; choose another",
                  field.where);
        }
        if (!fields.insert(field.name).second) problem(what + " is listed twice", field.where);
        resolve_signal(field.of, field.where);
        if (field.stat == RecordStat::total && !(field.rate_per_s && *field.rate_per_s > 0)) {
          problem(what + ": a total needs rate_per, the time unit of the rate", field.where);
        }
        if (field.stat == RecordStat::time_above && !field.above) {
          problem(what + ": time_above needs 'above', the threshold", field.where);
        }
      }
    }
  }

  // Data-quality checks watch an instrument: the signal they name must be an input.
  const InputSpec* require_input(const CheckSpec& check, const std::string& name) {
    const InputSpec* input = find_input(asset_, name);
    if (input == nullptr) {
      problem("check '" + check.name + "' watches '" + name +
                  "', which is not an input of asset '" + asset_.name +
                  "' (data-quality checks watch inputs)",
              check.where);
    }
    return input;
  }

  void require_estimator(const CheckSpec& check, const std::string& name,
                         std::initializer_list<std::string_view> kinds) {
    auto it = names_.find(name);
    if (it == names_.end() || it->second.kind != GraphNode::Kind::estimator) {
      problem("check '" + check.name + "' names estimator '" + name + "', which asset '" +
                  asset_.name + "' does not define",
              check.where);
      return;
    }
    const auto kind = estimator_kind_name(asset_.estimators[it->second.index].kind);
    std::string wanted;
    for (auto k : kinds) {
      if (k == kind) return;
      wanted += (wanted.empty() ? "" : " or ") + std::string(k);
    }
    problem("check '" + check.name + "' needs a " + wanted + " estimator, but '" + name +
                "' is a " + std::string(kind),
            check.where);
  }

  const AssetSpec& asset_;
  AssetGraph graph_;
  std::map<std::string, GraphNode> names_;
  std::array<std::vector<Mark>, 3> marks_;
};

}  // namespace

AssetGraph analyse_asset(const AssetSpec& asset) { return Analyser(asset).run(); }

std::string_view signal_op_name(SignalOp op) {
  switch (op) {
    case SignalOp::linear:
      return "linear";
    case SignalOp::sum:
      return "sum";
    case SignalOp::difference:
      return "difference";
    case SignalOp::product:
      return "product";
    case SignalOp::ratio:
      return "ratio";
    case SignalOp::gate:
      return "gate";
    case SignalOp::tank_volume:
      return "tank_volume";
  }
  return "unknown";
}

std::string estimator_output_unit(std::string_view output,
                                  const std::vector<std::string>& input_units) {
  const std::string& input_unit = input_units[0];
  if (output == "slope_per_hour" || output == "per_hour") return input_unit + "/h";
  if (output == "online_hours" || output == "hours") return "h";
  if (output == "days_in_service") return "d";
  if (output == "unexplained_drop" || output == "change_outs" || output == "active") return "";
  if (output == "throughput") return input_units[1].substr(0, input_units[1].find('/'));
  if (output == "peak_rate") return input_units[1];
  if (output == "residual_percent" || output == "slope_change_percent") return "%";
  if (output == "integral") return "psi*d";
  if (output == "volume") return "bbl";
  if (output == "slope") return "psi*d/bbl";
  if (output == "injectivity") return "bbl/d/psi";
  if (output == "upper" || output == "lower") return "sigma";
  return input_unit;
}

std::string_view estimator_kind_name(const EstimatorKind& kind) {
  return std::visit(core::Overloaded{
                        [](const EwmaSpec&) { return std::string_view("ewma"); },
                        [](const CusumSpec&) { return std::string_view("cusum"); },
                        [](const EwmaChartSpec&) { return std::string_view("ewma_chart"); },
                        [](const RlsSpec&) { return std::string_view("rls"); },
                        [](const TrendSpec&) { return std::string_view("trend"); },
                        [](const RateSpec&) { return std::string_view("rate"); },
                        [](const HallSpec&) { return std::string_view("hall"); },
                        [](const FilterLifeSpec&) { return std::string_view("filter_life"); },
                        [](const EpisodeSpec&) { return std::string_view("episode"); },
                    },
                    kind);
}

std::span<const std::string_view> estimator_outputs(const EstimatorKind& kind) {
  return std::visit(core::Overloaded{
                        [](const EwmaSpec&) { return std::span<const std::string_view>(kEwmaOutputs); },
                        [](const CusumSpec&) { return std::span<const std::string_view>(kCusumOutputs); },
                        [](const EwmaChartSpec&) { return std::span<const std::string_view>(kChartOutputs); },
                        [](const RlsSpec&) { return std::span<const std::string_view>(kRlsOutputs); },
                        [](const TrendSpec&) { return std::span<const std::string_view>(kTrendOutputs); },
                        [](const RateSpec&) { return std::span<const std::string_view>(kRateOutputs); },
                        [](const HallSpec&) { return std::span<const std::string_view>(kHallOutputs); },
                        [](const FilterLifeSpec&) { return std::span<const std::string_view>(kFilterLifeOutputs); },
                        [](const EpisodeSpec&) { return std::span<const std::string_view>(kEpisodeOutputs); },
                    },
                    kind);
}

std::vector<std::string> estimator_inputs(const EstimatorKind& kind) {
  return std::visit(core::Overloaded{
                        [](const RlsSpec& s) {
                          std::vector<std::string> all{s.target};
                          all.insert(all.end(), s.regressors.begin(), s.regressors.end());
                          return all;
                        },
                        [](const HallSpec& s) {
                          return std::vector<std::string>{s.injection_pressure, s.rate};
                        },
                        [](const FilterLifeSpec& s) { return std::vector<std::string>{s.of, s.flow}; },
                        [](const EpisodeSpec& s) { return std::vector<std::string>{s.of, s.rate}; },
                        [](const auto& s) { return std::vector<std::string>{s.of}; },
                    },
                    kind);
}

}  // namespace bw::engine
