#include "core/hall_integral.h"

#include <cassert>
#include <cmath>

namespace bw::core {

namespace {
constexpr double kSecondsPerDay = 86400;
}  // namespace

HallPlot::HallPlot(const Options& options) : options_(options) {
  assert(std::isfinite(options.window) && options.window >= 0);
  assert(std::isfinite(options.max_interval_s) && options.max_interval_s >= 0);
  assert(std::isnan(options.reference_pressure_psi) ||
         std::isfinite(options.reference_pressure_psi));
}

void HallPlot::update(double injection_psi, double rate_bpd, SensorTime t) {
  assert(!std::isnan(options_.reference_pressure_psi));
  update(injection_psi, options_.reference_pressure_psi, rate_bpd, t);
}

void HallPlot::update(double injection_psi, double reference_psi, double rate_bpd, SensorTime t) {
  const bool finite =
      std::isfinite(injection_psi) && std::isfinite(reference_psi) && std::isfinite(rate_bpd);
  const SampleGate::Admission in = gate_.admit(finite, t);
  if (!in.accepted) return;
  const double excess_psi = injection_psi - reference_psi;
  if (!in.first) integrate(in.dt_s, excess_psi, rate_bpd);
  s_.last_excess_psi = excess_psi;
  s_.last_rate_bpd = rate_bpd;
}

void HallPlot::integrate(double dt_s, double excess_psi, double rate_bpd) {
  const double dt_days = dt_s / kSecondsPerDay;
  const bool skip = options_.max_interval_s > 0 && dt_s > options_.max_interval_s;
  // Over a skipped interval the injected volume is unknown; only elapsed time can age the fit.
  const double d_volume = skip ? 0.0 : 0.5 * (s_.last_rate_bpd + rate_bpd) * dt_days;
  decay_by(options_.basis == WindowBasis::time ? dt_days : d_volume);
  if (skip) {
    ++s_.skipped_intervals;
    return;
  }
  s_.integral_psi_day += 0.5 * (s_.last_excess_psi + excess_psi) * dt_days;
  s_.volume_bbl += d_volume;
  if (d_volume > 0) fit_.add(s_.volume_bbl, s_.integral_psi_day);
}

void HallPlot::decay_by(double amount) {
  if (options_.window == 0 || !(amount > 0)) return;
  const double factor =
      decay_.get(amount, [this](double a) { return std::exp(-a / options_.window); });
  // After a gap of hundreds of windows the factor underflows: nothing of the old fit is left.
  if (factor > 0) {
    fit_.decay(factor);
  } else {
    fit_.reset();
  }
}

bool HallPlot::primed() const {
  return fit_.count() >= 3 && fit_.sxx() > 0 && fit_.effective_count() > 2;
}

void HallPlot::reset() {
  s_ = Integrals{};
  fit_.reset();
  gate_.reset();
}

HallPlot::State HallPlot::state() const { return {s_, fit_.state(), gate_.state()}; }

void HallPlot::restore(const State& state) {
  s_ = state.integrals;
  fit_.restore(state.fit);
  gate_.restore(state.gate);
}

}  // namespace bw::core
