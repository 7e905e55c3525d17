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

void put(StateWriter& out, const core::LinearTrend::State& s) {
  out.put_double(s.fit.sum_w);
  out.put_double(s.fit.sum_w2);
  out.put_double(s.fit.mean_x);
  out.put_double(s.fit.mean_y);
  out.put_double(s.fit.sxx);
  out.put_double(s.fit.sxy);
  out.put_double(s.fit.syy);
  out.put_i64(s.fit.count);
  out.put_i64(s.origin_us);
  put(out, s.gate);
}

bool get(StateReader& in, core::LinearTrend::State& s) {
  s.fit.sum_w = in.get_double();
  s.fit.sum_w2 = in.get_double();
  s.fit.mean_x = in.get_double();
  s.fit.mean_y = in.get_double();
  s.fit.sxx = in.get_double();
  s.fit.sxy = in.get_double();
  s.fit.syy = in.get_double();
  s.fit.count = in.get_i64();
  s.origin_us = in.get_i64();
  return get(in, s.gate);
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

}  // namespace bw::engine
