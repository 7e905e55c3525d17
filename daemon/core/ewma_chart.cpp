#include "core/ewma_chart.h"

#include <cassert>
#include <cmath>

namespace bw::core {

EwmaChart::EwmaChart(const EwmaChartParams& params, double mu0, double sigma)
    : params_(params),
      asymptotic_factor_(std::sqrt(params.lambda / (2 - params.lambda))),
      log_keep_(std::log1p(-params.lambda)),
      mu0_(mu0),
      sigma_(sigma),
      statistic_(mu0) {
  assert(params.lambda > 0 && params.lambda <= 1);
  assert(std::isfinite(params.nominal_interval_s) && params.nominal_interval_s > 0);
  assert(std::isfinite(params.width) && params.width > 0);
  assert(std::isfinite(mu0) && std::isfinite(sigma) && sigma > 0);
}

EwmaChartResult EwmaChart::update(double value, SensorTime t) {
  const SampleGate::Admission in = gate_.admit(std::isfinite(value), t);
  if (!in.accepted) return point(false);
  // (1 - lambda)^(dt/nominal) through exp/log so that dt = 0 gives keep = 1 even for lambda = 1.
  const double keep = in.first ? 1 - params_.lambda : keep_.get(in.dt_s, [this](double dt) {
    return dt == 0 ? 1.0 : std::exp(log_keep_ * dt / params_.nominal_interval_s);
  });
  const double alpha = 1 - keep;
  statistic_ += alpha * (value - statistic_);
  statistic_variance_ = keep * keep * statistic_variance_ + alpha * alpha * sigma_ * sigma_;
  return point(true);
}

double EwmaChart::statistic_sigma() const {
  return params_.time_varying_limits ? std::sqrt(statistic_variance_) : asymptotic_factor_ * sigma_;
}

EwmaChartResult EwmaChart::point(bool accepted) const {
  const double half_width = params_.width * statistic_sigma();
  EwmaChartResult p;
  p.statistic = statistic_;
  p.lower = mu0_ - half_width;
  p.upper = mu0_ + half_width;
  p.signal = statistic_ > p.upper ? 1 : (statistic_ < p.lower ? -1 : 0);
  p.accepted = accepted;
  return p;
}

void EwmaChart::set_baseline(double mu0, double sigma) {
  assert(std::isfinite(mu0) && std::isfinite(sigma) && sigma > 0);
  mu0_ = mu0;
  sigma_ = sigma;
  restart();
}

void EwmaChart::restart() {
  statistic_ = mu0_;
  statistic_variance_ = 0;
  gate_.reset();
}

EwmaChart::State EwmaChart::state() const {
  return {mu0_, sigma_, statistic_, statistic_variance_, gate_.state()};
}

void EwmaChart::restore(const State& state) {
  mu0_ = state.mu0;
  sigma_ = state.sigma;
  statistic_ = state.statistic;
  statistic_variance_ = state.statistic_variance;
  gate_.restore(state.gate);
}

}  // namespace bw::core
