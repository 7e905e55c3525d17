#include "core/rls.h"

#include <cassert>
#include <cmath>

namespace bw::core {

Rls::Rls(const RlsParams& params)
    : params_(params),
      coefficients_(params.regressors, 0.0),
      covariance_(params.regressors * params.regressors, 0.0),
      gain_(params.regressors, 0.0),
      residual_(params.residual_time_constant_s) {
  assert(params.regressors >= 1);
  assert(params.forgetting > 0 && params.forgetting <= 1);
  assert(std::isfinite(params.nominal_interval_s) && params.nominal_interval_s >= 0);
  assert(std::isfinite(params.initial_covariance) && params.initial_covariance > 0);
  assert(params.max_covariance_trace >=
         static_cast<double>(params.regressors) * params.initial_covariance);
  const std::size_t n = params.regressors;
  for (std::size_t i = 0; i < n; ++i) covariance_[i * n + i] = params.initial_covariance;
}

double Rls::predict(std::span<const double> x) const {
  assert(x.size() == params_.regressors);
  double sum = 0;
  for (std::size_t i = 0; i < x.size(); ++i) sum += coefficients_[i] * x[i];
  return sum;
}

double Rls::covariance(std::size_t i, std::size_t j) const {
  assert(i < params_.regressors && j < params_.regressors);
  return covariance_[i * params_.regressors + j];
}

double Rls::forgetting_for(const SampleGate::Admission& in) {
  if (params_.nominal_interval_s == 0 || in.first) return params_.forgetting;
  return forgetting_.get(in.dt_s, [this](double dt) {
    return std::pow(params_.forgetting, dt / params_.nominal_interval_s);
  });
}

RlsStep Rls::update(std::span<const double> x, double y, SensorTime t) {
  assert(x.size() == params_.regressors);
  bool finite = std::isfinite(y);
  for (const double v : x) finite = finite && std::isfinite(v);
  const SampleGate::Admission in = gate_.admit(finite, t);
  if (!in.accepted) return {};

  const double prediction = predict(x);
  const double residual = y - prediction;
  residual_.update(residual * residual, t);
  if (!frozen_) absorb(x, residual, forgetting_for(in));
  return {prediction, residual, true};
}

void Rls::absorb(std::span<const double> x, double residual, double lambda) {
  const std::size_t n = params_.regressors;
  double* p = covariance_.data();
  double* px = gain_.data();
  double denominator = lambda;
  for (std::size_t i = 0; i < n; ++i) {
    double sum = 0;
    for (std::size_t j = 0; j < n; ++j) sum += p[i * n + j] * x[j];
    px[i] = sum;
    denominator += x[i] * sum;
  }
  assert(denominator > 0);
  // Multiplying by reciprocals saves n^2 divisions per update.
  const double gain_scale = 1 / denominator;
  const double inverse_lambda = 1 / lambda;
  for (std::size_t i = 0; i < n; ++i) coefficients_[i] += px[i] * gain_scale * residual;

  // P = (P - P x x' P / denominator) / lambda, one triangle computed and mirrored.
  double trace = 0;
  for (std::size_t i = 0; i < n; ++i) {
    const double gi = px[i] * gain_scale;
    for (std::size_t j = i; j < n; ++j) {
      const double v = (p[i * n + j] - gi * px[j]) * inverse_lambda;
      p[i * n + j] = v;
      p[j * n + i] = v;
    }
    trace += p[i * n + i];
  }
  if (trace > params_.max_covariance_trace) {
    const double scale = params_.max_covariance_trace / trace;
    for (double& v : covariance_) v *= scale;
  }
}

Rls::State Rls::state() const {
  return {coefficients_, covariance_, frozen_, residual_.state(), gate_.state()};
}

void Rls::restore(const State& state) {
  assert(state.coefficients.size() == coefficients_.size());
  assert(state.covariance.size() == covariance_.size());
  coefficients_ = state.coefficients;
  covariance_ = state.covariance;
  frozen_ = state.frozen;
  residual_.restore(state.residual);
  gate_.restore(state.gate);
}

}  // namespace bw::core
