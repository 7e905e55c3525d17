#include "core/filter_life.h"

#include <algorithm>
#include <cassert>
#include <cmath>

namespace bw::core {
namespace {

std::int64_t micros_of(SensorTime t) { return t.time_since_epoch().count(); }
SensorTime time_of(std::int64_t us) { return SensorTime(Micros(us)); }

}  // namespace

FilterLife::FilterLife(Options options) : options_(options), reference_(options.memory_s) {
  assert(options.memory_s > 0);
  assert(options.drop_fraction > 0 && options.drop_fraction < 1);
  assert(options.confirm_s > 0);
  assert(options.stop_gap_s > 0);
  assert(options.flow_time_unit_s > 0);
}

void FilterLife::accumulate(double dt_s, bool stopped, double flow) {
  if (!stopped) {
    Accumulated& into = candidate_open_ ? candidate_ : life_;
    into.online_s += dt_s;
    into.throughput += std::max(last_flow_, 0.0) * dt_s / options_.flow_time_unit_s;
  }
  last_flow_ = flow;
}

std::optional<FilterLife::ChangeOut> FilterLife::update(double normalised_dp, double flow,
                                                        SensorTime t) {
  const SensorTime previous = gate_.last_time();  // meaningful once a sample was admitted
  const auto admission = gate_.admit(std::isfinite(normalised_dp) && std::isfinite(flow), t);
  if (!admission.accepted) return std::nullopt;
  if (admission.first) {
    life_start_ = t;
    last_flow_ = flow;
    reference_.update(normalised_dp, t);
    return std::nullopt;
  }
  const bool stopped = admission.dt_s >= options_.stop_gap_s;

  if (!candidate_open_) {
    const double threshold = (1.0 - options_.drop_fraction) * reference_.mean();
    if (!(normalised_dp < threshold)) {
      accumulate(admission.dt_s, stopped, flow);
      reference_.update(normalised_dp, t);
      return std::nullopt;
    }
    candidate_open_ = true;
    candidate_threshold_ = threshold;
    candidate_before_ = reference_.mean();
    open_candidate(admission.dt_s, stopped, flow, normalised_dp, t, previous);
    return std::nullopt;
  }
  if (stopped) {
    // A stop inside the candidate: what came before it was the shutdown (dP and flow fall
    // together, but their samples arrive apart); the candidate starts again after the stop.
    life_.online_s += candidate_.online_s;
    life_.throughput += candidate_.throughput;
    open_candidate(admission.dt_s, stopped, flow, normalised_dp, t, previous);
    return std::nullopt;
  }

  accumulate(admission.dt_s, stopped, flow);
  candidate_sum_ += normalised_dp;
  ++candidate_count_;
  if (seconds_between(candidate_start_, t) < options_.confirm_s) return std::nullopt;
  return judge_candidate(t);
}

void FilterLife::open_candidate(double dt_s, bool stopped, double flow, double normalised_dp,
                                SensorTime t, SensorTime previous) {
  assert(candidate_open_);
  candidate_after_stop_ = stopped;
  candidate_start_ = t;
  last_before_candidate_ = previous;
  candidate_ = {};
  // The interval up to the candidate's first value belongs to the old element.
  const bool was_open = candidate_open_;
  candidate_open_ = false;
  accumulate(dt_s, stopped, flow);
  candidate_open_ = was_open;
  candidate_sum_ = normalised_dp;
  candidate_count_ = 1;
}

std::optional<FilterLife::ChangeOut> FilterLife::judge_candidate(SensorTime t) {
  assert(candidate_open_ && candidate_count_ > 0);
  candidate_open_ = false;
  const double mean = candidate_sum_ / static_cast<double>(candidate_count_);
  if (!(mean < candidate_threshold_)) {  // noise: the element carries on
    life_.online_s += candidate_.online_s;
    life_.throughput += candidate_.throughput;
    candidate_ = {};
    return std::nullopt;
  }
  // The reference restarts at the level after the drop.
  reference_.reset();
  reference_.update(mean, t);
  if (candidate_after_stop_ || !options_.stop_required) {
    ChangeOut closed{.time = candidate_start_,
                     .life_start = life_start_,
                     .life_end = last_before_candidate_,
                     .life_complete = life_complete_,
                     .online_s = life_.online_s,
                     .throughput = life_.throughput,
                     .level_before = candidate_before_,
                     .level_after = mean};
    life_ = candidate_;
    candidate_ = {};
    life_start_ = candidate_start_;
    life_complete_ = true;
    unexplained_drop_ = false;
    ++change_outs_;
    return closed;
  }
  life_.online_s += candidate_.online_s;
  life_.throughput += candidate_.throughput;
  candidate_ = {};
  unexplained_drop_ = true;
  return std::nullopt;
}

double FilterLife::days_in_service(SensorTime now) const {
  if (gate_.accepted() == 0) return 0;
  return seconds_between(life_start_, now) / 86400.0;
}

FilterLife::State FilterLife::state() const {
  return State{.reference = reference_.state(),
               .life_start_us = micros_of(life_start_),
               .life_complete = life_complete_,
               .life = life_,
               .candidate_open = candidate_open_,
               .candidate_after_stop = candidate_after_stop_,
               .candidate_start_us = micros_of(candidate_start_),
               .last_before_candidate_us = micros_of(last_before_candidate_),
               .candidate_threshold = candidate_threshold_,
               .candidate_before = candidate_before_,
               .candidate_sum = candidate_sum_,
               .candidate_count = candidate_count_,
               .candidate = candidate_,
               .last_flow = last_flow_,
               .unexplained_drop = unexplained_drop_,
               .change_outs = change_outs_,
               .gate = gate_.state()};
}

void FilterLife::restore(const State& s) {
  reference_.restore(s.reference);
  life_start_ = time_of(s.life_start_us);
  life_complete_ = s.life_complete;
  life_ = s.life;
  candidate_open_ = s.candidate_open;
  candidate_after_stop_ = s.candidate_after_stop;
  candidate_start_ = time_of(s.candidate_start_us);
  last_before_candidate_ = time_of(s.last_before_candidate_us);
  candidate_threshold_ = s.candidate_threshold;
  candidate_before_ = s.candidate_before;
  candidate_sum_ = s.candidate_sum;
  candidate_count_ = s.candidate_count;
  candidate_ = s.candidate;
  last_flow_ = s.last_flow;
  unexplained_drop_ = s.unexplained_drop;
  change_outs_ = s.change_outs;
  gate_.restore(s.gate);
}

}  // namespace bw::core
