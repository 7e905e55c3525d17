#include "core/trend.h"

#include <algorithm>
#include <cassert>
#include <cmath>
#include <limits>

namespace bw::core {

namespace {
constexpr double kInf = std::numeric_limits<double>::infinity();
}  // namespace

LinearTrend::LinearTrend(double time_constant_s) : time_constant_s_(time_constant_s) {
  assert(std::isfinite(time_constant_s) && time_constant_s >= 0);
}

double LinearTrend::x_of(SensorTime t) const { return seconds_between(origin_, t); }

void LinearTrend::update(double value, SensorTime t) {
  const SampleGate::Admission in = gate_.admit(std::isfinite(value), t);
  if (!in.accepted) return;
  if (in.first) origin_ = t;
  if (time_constant_s_ > 0 && in.dt_s > 0) {
    fit_.decay(decay_.get(in.dt_s, [this](double dt) { return std::exp(-dt / time_constant_s_); }));
  }
  fit_.add(x_of(t), value);
}

bool LinearTrend::primed() const {
  return fit_.count() >= 3 && fit_.sxx() > 0 && fit_.effective_count() > 2;
}

double LinearTrend::level_at(SensorTime t) const { return fit_.value_at(x_of(t)); }

TimeToLimit LinearTrend::time_to_limit(double limit, SensorTime now, LimitSide side,
                                       double z) const {
  assert(z >= 0);
  TimeToLimit out;
  if (!primed()) return out;
  // Mirror a low limit into a high one: distances and rates are then positive towards the limit.
  // Everything is measured from the data's centre (mean x, mean y), where the line is pinned best.
  const double towards = side == LimitSide::high ? 1.0 : -1.0;
  const double distance = towards * (limit - fit_.mean_y());
  const double rate = towards * fit_.slope();
  const double now_x = x_of(now) - fit_.mean_x();
  if (rate * now_x >= distance) {
    out.status = TimeToLimit::already_beyond;
    return out;
  }
  if (!(rate > 0)) {
    out.status = TimeToLimit::no_crossing;
    out.seconds = out.seconds_early = out.seconds_late = kInf;
    return out;
  }
  const double band = z * fit_.slope_stderr();
  const double slow = rate - band;
  out.status = TimeToLimit::crossing;
  out.seconds = distance / rate - now_x;
  out.seconds_early = std::clamp(distance / (rate + band) - now_x, 0.0, out.seconds);
  out.seconds_late = slow > 0 ? std::max(distance / slow - now_x, out.seconds) : kInf;
  return out;
}

void LinearTrend::reset() {
  fit_.reset();
  origin_ = SensorTime{};
  gate_.reset();
}

LinearTrend::State LinearTrend::state() const {
  return {fit_.state(), origin_.time_since_epoch().count(), gate_.state()};
}

void LinearTrend::restore(const State& state) {
  fit_.restore(state.fit);
  origin_ = SensorTime(Micros(state.origin_us));
  gate_.restore(state.gate);
}

}  // namespace bw::core
