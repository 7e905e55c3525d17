#include "engine/core_state_codec.h"

namespace bw::engine {
namespace {

// Bounds a vector length read from a checkpoint: an RLS with more than this many regressors
// would be a damaged checkpoint, not a model.
constexpr std::uint64_t kMaxVectorLength = 1u << 16;

void put_vector(StateWriter& out, const std::vector<double>& v) {
  out.put_u64(v.size());
  for (double x : v) out.put_double(x);
}

bool get_vector(StateReader& in, std::vector<double>& v) {
  const std::uint64_t n = in.get_u64();
  if (!in.ok() || n > kMaxVectorLength) {
    in.fail();
    return false;
  }
  v.resize(n);
  for (double& x : v) x = in.get_double();
  return in.ok();
}

}  // namespace

void put(StateWriter& out, const core::SampleGate::State& s) {
  out.put_i64(s.last_time_us);
  out.put_i64(s.accepted);
  out.put_i64(s.non_finite);
  out.put_i64(s.out_of_order);
}

bool get(StateReader& in, core::SampleGate::State& s) {
  s.last_time_us = in.get_i64();
  s.accepted = in.get_i64();
  s.non_finite = in.get_i64();
  s.out_of_order = in.get_i64();
  return in.ok();
}

void put(StateWriter& out, const core::Ewma::State& s) {
  out.put_double(s.mean);
  out.put_double(s.variance);
  out.put_double(s.first_weight);
  put(out, s.gate);
}

bool get(StateReader& in, core::Ewma::State& s) {
  s.mean = in.get_double();
  s.variance = in.get_double();
  s.first_weight = in.get_double();
  return get(in, s.gate);
}

void put(StateWriter& out, const core::EwmaChart::State& s) {
  out.put_double(s.mu0);
  out.put_double(s.sigma);
  out.put_double(s.statistic);
  out.put_double(s.statistic_variance);
  put(out, s.gate);
}

bool get(StateReader& in, core::EwmaChart::State& s) {
  s.mu0 = in.get_double();
  s.sigma = in.get_double();
  s.statistic = in.get_double();
  s.statistic_variance = in.get_double();
  return get(in, s.gate);
}

void put(StateWriter& out, const core::Cusum::State& s) {
  out.put_double(s.target);
  out.put_double(s.sigma);
  out.put_double(s.upper);
  out.put_double(s.lower);
  put(out, s.gate);
}

bool get(StateReader& in, core::Cusum::State& s) {
  s.target = in.get_double();
  s.sigma = in.get_double();
  s.upper = in.get_double();
  s.lower = in.get_double();
  return get(in, s.gate);
}

void put(StateWriter& out, const core::Rls::State& s) {
  put_vector(out, s.coefficients);
  put_vector(out, s.covariance);
  out.put_bool(s.frozen);
  put(out, s.residual);
  put(out, s.gate);
}

bool get(StateReader& in, core::Rls::State& s) {
  if (!get_vector(in, s.coefficients) || !get_vector(in, s.covariance)) return false;
  s.frozen = in.get_bool();
  return get(in, s.residual) && get(in, s.gate);
}

void put(StateWriter& out, const core::WeightedLinearFit::State& s) {
  out.put_double(s.sum_w);
  out.put_double(s.sum_w2);
  out.put_double(s.mean_x);
  out.put_double(s.mean_y);
  out.put_double(s.sxx);
  out.put_double(s.sxy);
  out.put_double(s.syy);
  out.put_i64(s.count);
}

bool get(StateReader& in, core::WeightedLinearFit::State& s) {
  s.sum_w = in.get_double();
  s.sum_w2 = in.get_double();
  s.mean_x = in.get_double();
  s.mean_y = in.get_double();
  s.sxx = in.get_double();
  s.sxy = in.get_double();
  s.syy = in.get_double();
  s.count = in.get_i64();
  return in.ok();
}

void put(StateWriter& out, const core::LinearTrend::State& s) {
  put(out, s.fit);
  out.put_i64(s.origin_us);
  put(out, s.gate);
}

bool get(StateReader& in, core::LinearTrend::State& s) {
  if (!get(in, s.fit)) return false;
  s.origin_us = in.get_i64();
  return get(in, s.gate);
}

void put(StateWriter& out, const core::HallPlot::State& s) {
  out.put_double(s.integrals.integral_psi_day);
  out.put_double(s.integrals.volume_bbl);
  out.put_double(s.integrals.last_excess_psi);
  out.put_double(s.integrals.last_rate_bpd);
  out.put_i64(s.integrals.skipped_intervals);
  put(out, s.fit);
  put(out, s.gate);
}

bool get(StateReader& in, core::HallPlot::State& s) {
  s.integrals.integral_psi_day = in.get_double();
  s.integrals.volume_bbl = in.get_double();
  s.integrals.last_excess_psi = in.get_double();
  s.integrals.last_rate_bpd = in.get_double();
  s.integrals.skipped_intervals = in.get_i64();
  return get(in, s.fit) && get(in, s.gate);
}

void put(StateWriter& out, const core::RunningStats::State& s) {
  out.put_u64(s.count);
  out.put_double(s.mean);
  out.put_double(s.sum_squares);
}

bool get(StateReader& in, core::RunningStats::State& s) {
  s.count = in.get_u64();
  s.mean = in.get_double();
  s.sum_squares = in.get_double();
  return in.ok();
}

void put(StateWriter& out, const core::FilterLife::State& s) {
  put(out, s.reference);
  out.put_i64(s.life_start_us);
  out.put_bool(s.life_complete);
  out.put_double(s.life.online_s);
  out.put_double(s.life.throughput);
  out.put_bool(s.candidate_open);
  out.put_bool(s.candidate_after_stop);
  out.put_i64(s.candidate_start_us);
  out.put_i64(s.last_before_candidate_us);
  out.put_double(s.candidate_threshold);
  out.put_double(s.candidate_before);
  out.put_double(s.candidate_sum);
  out.put_i64(s.candidate_count);
  out.put_double(s.candidate.online_s);
  out.put_double(s.candidate.throughput);
  out.put_double(s.last_flow);
  out.put_bool(s.unexplained_drop);
  out.put_i64(s.change_outs);
  put(out, s.gate);
}

bool get(StateReader& in, core::FilterLife::State& s) {
  if (!get(in, s.reference)) return false;
  s.life_start_us = in.get_i64();
  s.life_complete = in.get_bool();
  s.life.online_s = in.get_double();
  s.life.throughput = in.get_double();
  s.candidate_open = in.get_bool();
  s.candidate_after_stop = in.get_bool();
  s.candidate_start_us = in.get_i64();
  s.last_before_candidate_us = in.get_i64();
  s.candidate_threshold = in.get_double();
  s.candidate_before = in.get_double();
  s.candidate_sum = in.get_double();
  s.candidate_count = in.get_i64();
  s.candidate.online_s = in.get_double();
  s.candidate.throughput = in.get_double();
  s.last_flow = in.get_double();
  s.unexplained_drop = in.get_bool();
  s.change_outs = in.get_i64();
  return get(in, s.gate);
}

void put(StateWriter& out, const core::Episode::State& s) {
  out.put_bool(s.armed);
  out.put_bool(s.active);
  out.put_i64(s.start_us);
  out.put_double(s.start_value);
  out.put_double(s.change);
  out.put_double(s.peak_rate);
  out.put_double(s.peak_value);
  out.put_bool(s.low_since_set);
  out.put_i64(s.low_since_us);
  put(out, s.gate);
}

bool get(StateReader& in, core::Episode::State& s) {
  s.armed = in.get_bool();
  s.active = in.get_bool();
  s.start_us = in.get_i64();
  s.start_value = in.get_double();
  s.change = in.get_double();
  s.peak_rate = in.get_double();
  s.peak_value = in.get_double();
  s.low_since_set = in.get_bool();
  s.low_since_us = in.get_i64();
  return get(in, s.gate);
}

}  // namespace bw::engine
