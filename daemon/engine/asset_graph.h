// The dependency graph of one asset: which signals and estimators feed which, in what order
// they are evaluated, and whether every reference is sound.
//
// analyse_asset() is pure and total: it never throws and reports every problem it finds, each
// with the location of the definition at fault: a duplicate name (of a signal, estimator or
// check, or a check taking the name of an input's data-quality check), a reference to nothing,
// a check naming the wrong kind of estimator, a cycle, an unbound required input, a derived
// signal with the wrong number of operands, a data-quality check on something that is not an
// input or on an input lacking what it needs (an expected interval for stale, a range for
// out-of-range, mA for NE 43), and limit settings that cannot be worked out (a percent-of-span
// deadband on a signal with no range), and periodic records that name no signal, reuse an
// estimator's name, or lack what a statistic needs. The configuration loader turns problems into
// diagnostics; the engine only accepts an asset whose analysis has none.
#pragma once

#include <cstddef>
#include <span>
#include <string>
#include <string_view>
#include <vector>

#include "engine/site_model.h"

namespace bw::engine {

struct GraphNode {
  enum class Kind : std::uint8_t { input, signal, estimator };
  Kind kind;
  std::size_t index;  // into AssetSpec::inputs, ::signals or ::estimators
  friend bool operator==(const GraphNode&, const GraphNode&) = default;
};

struct GraphProblem {
  std::string message;
  Where where;
};

struct AssetGraph {
  // Signals and estimators in an order where every node comes after all nodes it reads.
  std::vector<GraphNode> order;
  std::vector<GraphProblem> problems;
  bool ok() const { return problems.empty(); }
};

AssetGraph analyse_asset(const AssetSpec& asset);

// Operation names as written in rule templates ("linear", "sum", "difference", ...).
std::string_view signal_op_name(SignalOp op);

// Kind names as written in rule templates ("ewma", "cusum", "ewma_chart", "rls", "trend", "rate",
// "hall").
std::string_view estimator_kind_name(const EstimatorKind& kind);

// The outputs an estimator kind publishes as signals "<estimator>.<output>".
std::span<const std::string_view> estimator_outputs(const EstimatorKind& kind);

// The engineering unit of estimator output `output`, from the units of the estimator's inputs
// (estimator_inputs() order; at least one).
std::string estimator_output_unit(std::string_view output,
                                  const std::vector<std::string>& input_units);

// Signals an estimator reads, in the order it reads them (target first for rls; injection
// pressure, then rate, for hall).
std::vector<std::string> estimator_inputs(const EstimatorKind& kind);

}  // namespace bw::engine
