// Runtime estimators of one asset: each wraps a core estimator, reads its input signals from the
// asset's value slots and writes its outputs (see estimator_outputs() in asset_graph.h) back.
//
// The engine calls update() only when the estimator's first input (the watched signal, or the
// RLS target) has a fresh good value; other inputs are the latest held values. An estimator that
// learns a baseline produces no outputs until the baseline is learned; a trend or rate none until
// it has seen one time constant of data. Not thread-safe: owned by
// the engine's thread.
#pragma once

#include <memory>
#include <optional>
#include <span>
#include <string>

#include "core/sensor_time.h"
#include "core/trend.h"
#include "engine/asset_record.h"
#include "engine/site_model.h"
#include "engine/state_codec.h"

namespace bw::engine {

class EstimatorNode {
 public:
  virtual ~EstimatorNode() = default;

  // inputs: values in the order of estimator_inputs(); outputs: estimator_outputs() order.
  // Returns true when the outputs were written.
  virtual bool update(std::span<const double> inputs, core::SensorTime t,
                      std::span<double> outputs) = 0;

  // Checkpoints: save() writes everything update() depends on; load() restores it so that the
  // estimator continues bit for bit, or returns false (state of another shape: discard it).
  virtual void save(StateWriter& out) const = 0;
  virtual bool load(StateReader& in) = 0;

  // Statistical estimators: +1 / -1 while out of control high / low, else 0.
  virtual int signal() const { return 0; }
  // A short account of the statistic for an alert message, e.g. "upper sum 5.2 of 5".
  virtual std::string describe_signal() const { return {}; }

  // Estimators that recognise events (a filter change-out): the record of an event recognised
  // by the latest update(), handed over once; nullopt when there is none.
  virtual std::optional<RecordContent> take_record() { return std::nullopt; }
  // True right after the update() that recognised an event restarting the estimators that name
  // this one in `restart_on` (a filter change-out).
  virtual bool restarts_dependents() const { return false; }

  // Trend estimators: the forecast of reaching `limit` from `side`, when the trend is usable.
  virtual std::optional<core::TimeToLimit> time_to_limit(double /*limit*/, core::LimitSide /*side*/,
                                                         core::SensorTime /*now*/) const {
    return std::nullopt;
  }
};

// `input_units`: the engineering units of the inputs, in estimator_inputs() order (empty when
// unknown); records name their fields' units from them.
std::unique_ptr<EstimatorNode> make_estimator_node(const EstimatorKind& spec,
                                                   std::span<const std::string> input_units = {});

}  // namespace bw::engine
