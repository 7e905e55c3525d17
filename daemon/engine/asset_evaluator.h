// One asset at run time: its signals and estimators (AssetSignals), its checks, the implicit
// data-quality check of each bound input, and suppression by design; it reports every change of
// a check's condition or suppression to a ConditionSink.
//
// Samples. on_sample() takes every sample of a bound input, whatever its quality. A good, finite
// value updates the input's slot and everything downstream; then each check whose source became
// fresh is evaluated. A bad or uncertain sample (or a non-finite value) updates nothing: it
// raises "<role>_quality" (priority low) and holds every check that depends on the input,
// directly or through derived signals and estimators: such a check neither raises nor clears,
// and a pending on-/off-delay is dropped, until the input's data are usable again. The next good
// sample clears "<role>_quality". An input with an expected interval that has not been heard for
// the factor of its stale check (3 when it has none) times that interval is silent and holds its
// dependents the same way until its next sample.
//
// Time. Changes that no sample causes (an on-/off-delay running out, a stale check, an input
// falling silent) fall due at a deadline and are applied by advance(now) for every deadline
// <= now, in time order, each stamped with its deadline, not with `now`: replay (advance at each
// sample's event time) and live (advance from a wall-clock tick) report the same times.
// On a tie a check's deadline comes before an input's falling silent (the data were fresh until
// that moment). on_sample(t) first advances to t. Before the first call the evaluator has no notion
// of time; the first time it sees starts the silence clock of inputs never heard.
//
// Suppression. A check with `suppressed_when` reports a suppression change when its condition
// (the signal below / above the threshold, judged on each fresh value of that signal) begins or
// ends. While suppressed it keeps tracking its condition without reporting it; when suppression
// ends it reports its true condition if that differs from the last one reported.
//
// Records. Each periodic record of the spec accumulates the held values of its fields' signals
// (periodic_record.h); a field counts as usable while its signal has a value and every input it
// comes from is usable and not silent. A period closes at its end as a deadline like the others
// (after checks and inputs falling silent on a tie), so a quiet input does not keep a day open.
// Estimators' records of events (EstimatorNode::take_record) are reported after the sample's
// condition changes. Every record goes to ConditionSink::on_record stamped with site, asset and
// source (the estimator or record name); the common path, with no record, allocates nothing.
//
// Reports carry views into the AssetSpec and this evaluator (check names, units, tags), valid
// while both live. The implicit check reports the input's last good value (0 before any).
//
// Invariants: the AssetSpec outlives the evaluator and passed analyse_asset() with no problems;
// storage is sized at construction. Not thread-safe: owned by the engine's thread.
#pragma once

#include <cstdint>
#include <memory>
#include <optional>
#include <string>
#include <string_view>
#include <vector>

#include "core/sensor_time.h"
#include "engine/asset_signals.h"
#include "engine/check_node.h"
#include "engine/condition.h"
#include "engine/local_calendar.h"
#include "engine/periodic_record.h"
#include "engine/sample.h"
#include "engine/site_model.h"
#include "engine/state_codec.h"

namespace bw::engine {

class AssetEvaluator {
 public:
  static constexpr double kDefaultStaleFactor = 3.0;

  // `calendar` gives the local days of daily records; nullptr: days of UTC. It outlives this.
  AssetEvaluator(const AssetSpec& spec, std::string_view site_name,
                 LocalCalendar* calendar = nullptr);
  AssetEvaluator(const AssetEvaluator&) = delete;
  AssetEvaluator& operator=(const AssetEvaluator&) = delete;

  // Every sample of input `input_index` (index into spec().inputs), whatever its quality.
  void on_sample(std::size_t input_index, double value, Quality quality, core::SensorTime t,
                 std::string_view tag, ConditionSink& sink);

  // Time has passed without (or besides) samples: applies every deadline <= now.
  void advance(core::SensorTime now, ConditionSink& sink);

  struct CheckInfo {
    std::string_view name;
    Priority priority;
    bool latching;
  };
  // Every check this asset can report: configured ones in spec order, then the implicit
  // data-quality check of each bound input, in input order.
  std::vector<CheckInfo> checks() const;

  // Checkpoints: everything (slot values, estimators, checks, pending delays, suppression,
  // quality, silence). load() returns false when the state does not fit this definition or is
  // damaged; the evaluator is then in an unspecified state and must be rebuilt from its spec.
  void save(StateWriter& out) const;
  bool load(StateReader& in);

  const AssetSpec& spec() const { return spec_; }
  std::string_view site_name() const { return site_name_; }

 private:
  struct InputState {
    core::SensorTime heard{};  // last sample of any quality, or the first moment seen
    core::Micros silence{0};   // silent after this long unheard; 0 = never
    bool usable = true;        // the latest sample was good and finite (true before any)
    bool silent = false;
    std::string quality_check;  // "<role>_quality"; empty when the input is not bound
    bool quality_active = false;
  };
  struct CheckStep {
    std::unique_ptr<CheckNode> node;
    std::size_t spec_index = 0;
    std::size_t trigger_slot = 0;            // a fresh value here triggers evaluation
    std::optional<std::size_t> heard_input;  // stale checks: triggered by any sample of it
    std::string unit;
    std::string_view tag;             // reported for changes that no sample causes
    std::vector<std::size_t> inputs;  // inputs whose unusable or silent data hold the check
    std::optional<std::size_t> suppression_slot;
    bool reported = false;  // the condition as last reported
    bool suppressed = false;
    CheckOutcome last;  // the latest outcome, reported when suppression ends
  };

  struct RecordStep {
    PeriodicRecord record;
    std::vector<std::size_t> slots;                // per field: the signal's slot
    std::vector<std::vector<std::size_t>> inputs;  // per field: inputs the signal comes from
  };

  void compile();
  void compile_records();
  void start_clock(core::SensorTime t);
  void accumulate_records(core::SensorTime t);
  void hold_records();
  void report_estimator_records(ConditionSink& sink);
  // Scans every check and input for the earliest deadline still to come.
  void remember_next_due();
  bool held(const CheckStep& check) const;
  void hold_dependents(std::size_t input);
  void note_quality(std::size_t input, bool usable, double value, Quality quality,
                    core::SensorTime t, ConditionSink& sink);
  void update_suppression(CheckStep& check, core::SensorTime t, std::string_view tag,
                          ConditionSink& sink);
  void publish(CheckStep& check, CheckOutcome outcome, core::SensorTime t, std::string_view tag,
               ConditionSink& sink);
  void emit_condition(const CheckStep& check, core::SensorTime t, std::string_view tag,
                      ConditionSink& sink) const;

  const AssetSpec& spec_;
  std::string_view site_name_;
  AssetSignals signals_;
  std::optional<core::SensorTime> started_;
  std::vector<InputState> inputs_;
  std::vector<CheckStep> checks_;
  std::vector<std::vector<std::size_t>> check_plans_;  // per input: checks it can trigger
  UtcCalendar utc_calendar_;
  LocalCalendar& calendar_;
  std::vector<RecordStep> records_;
  // The earliest moment time-driven work falls due, valid while !deadlines_changed_: lets
  // advance() return at once on the many calls (one per sample of the site) with nothing due.
  std::optional<core::SensorTime> next_due_;
  bool deadlines_changed_ = true;
};

}  // namespace bw::engine
