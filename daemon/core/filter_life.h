// The life of a filter element (sock, bag or cartridge) between change-outs, read from its
// flow-normalised differential pressure.
//
// Fed only while the filter is on line (the caller leaves out samples taken at too little flow),
// each update brings the normalised dP and the flow. The tracker keeps:
//   - a reference level: the exponentially weighted mean of the normalised dP, time constant
//     `memory_s`, the element's recent loading;
//   - the element's run life since the last change-out (or since the first sample, when no
//     change-out has been seen yet): calendar time, on-line time, and throughput, the flow held
//     from each sample to the next and integrated over on-line intervals (flow in volume per
//     `flow_time_unit_s` seconds, e.g. 86400 for bbl/d). A gap of `stop_gap_s` or more between
//     two samples is a stop (the filter was off line, or the data were missing): it is not
//     counted as on-line time and nothing is integrated over it.
//
// Step drops. A value below (1 - drop_fraction) x reference opens a candidate drop; the reference
// is frozen while it is open. After `confirm_s` seconds the candidate is judged on the mean of
// its values: below that threshold, the drop is confirmed; otherwise it was noise and the
// candidate closes. A stop while a candidate is open starts it again after the stop (a filter
// being shut in shows low readings before its flow reads zero). A confirmed drop is
//   - a change-out when a stop lay just before the candidate's first value (a sock is changed with
//     the vessel isolated, common practice) or when `stop_required` is false (a bank swapped to a
//     clean vessel under flow): the element's life is closed as a ChangeOut, and a new life
//     starts at the candidate's first value, carrying the on-line time and throughput since then;
//   - otherwise a drop without a change-out (a torn element or a bypass): unexplained_drop()
//     stays true until the next change-out.
// Either way the reference restarts at the candidate's mean.
//
// Invariants: times never go backwards (out-of-order and non-finite samples are refused and
// counted by the gate); on-line time and throughput are non-negative. O(1) per update, no
// allocation. Copyable; not thread-safe (one owner).
#pragma once

#include <cstdint>
#include <optional>

#include "core/ewma.h"
#include "core/sample_gate.h"
#include "core/sensor_time.h"

namespace bw::core {

class FilterLife {
 public:
  struct Options {
    double memory_s = 7200;          // reference level time constant, > 0
    double drop_fraction = 0.4;      // in (0, 1)
    double confirm_s = 900;          // > 0
    double stop_gap_s = 600;         // > 0
    double flow_time_unit_s = 86400;  // > 0
    bool stop_required = true;
  };

  // A closed element life.
  struct ChangeOut {
    SensorTime time;             // the first on-line value of the new element
    SensorTime life_start;       // the first value of the old element's life
    SensorTime life_end;         // its last on-line value
    bool life_complete = false;  // false when the old life began at the first sample seen
    double online_s = 0;
    double throughput = 0;  // flow units x flow_time_unit_s
    double level_before = 0;
    double level_after = 0;
  };

  struct Accumulated {  // on-line time and throughput over a stretch of one element's life
    double online_s = 0;
    double throughput = 0;
    bool operator==(const Accumulated&) const = default;
  };

  // Plain snapshot for checkpointing: restore(state()) continues bit-identically.
  struct State {
    Ewma::State reference;
    std::int64_t life_start_us = 0;
    bool life_complete = false;
    Accumulated life;
    bool candidate_open = false;
    bool candidate_after_stop = false;
    std::int64_t candidate_start_us = 0;
    std::int64_t last_before_candidate_us = 0;
    double candidate_threshold = 0;
    double candidate_before = 0;
    double candidate_sum = 0;
    std::int64_t candidate_count = 0;
    Accumulated candidate;
    double last_flow = 0;
    bool unexplained_drop = false;
    std::int64_t change_outs = 0;
    SampleGate::State gate;
    bool operator==(const State&) const = default;
  };

  // REQUIRES: options as documented above.
  explicit FilterLife(Options options);

  // One on-line sample. Returns the closed life when this update confirmed a change-out.
  std::optional<ChangeOut> update(double normalised_dp, double flow, SensorTime t);

  double reference_level() const { return reference_.mean(); }
  bool has_reference() const { return reference_.count() > 0; }
  double online_hours() const { return (life_.online_s + candidate_.online_s) / 3600.0; }
  double throughput() const { return life_.throughput + candidate_.throughput; }
  // Calendar days from the start of the present element's life to `now`.
  double days_in_service(SensorTime now) const;
  bool unexplained_drop() const { return unexplained_drop_; }
  std::int64_t change_outs() const { return change_outs_; }
  const SampleGate& gate() const { return gate_; }

  State state() const;
  void restore(const State& state);

 private:
  void accumulate(double dt_s, bool stopped, double flow);
  // (Re)starts the open candidate at `t`; the interval before `t` counts for the old element.
  void open_candidate(double dt_s, bool stopped, double flow, double normalised_dp, SensorTime t,
                      SensorTime previous);
  std::optional<ChangeOut> judge_candidate(SensorTime t);

  Options options_;
  Ewma reference_;
  SensorTime life_start_{};
  bool life_complete_ = false;
  Accumulated life_;  // the element's life, without the open candidate's stretch
  bool candidate_open_ = false;
  bool candidate_after_stop_ = false;
  SensorTime candidate_start_{};
  SensorTime last_before_candidate_{};
  double candidate_threshold_ = 0;
  double candidate_before_ = 0;
  double candidate_sum_ = 0;
  std::int64_t candidate_count_ = 0;
  Accumulated candidate_;  // since the candidate's first value
  double last_flow_ = 0;
  bool unexplained_drop_ = false;
  std::int64_t change_outs_ = 0;
  SampleGate gate_;
};

}  // namespace bw::core
