#include "core/linear_fit.h"

#include <algorithm>
#include <cassert>
#include <cmath>
#include <limits>

namespace bw::core {

namespace {
constexpr double kNaN = std::numeric_limits<double>::quiet_NaN();
}  // namespace

void WeightedLinearFit::add(double x, double y, double weight) {
  assert(std::isfinite(x) && std::isfinite(y) && std::isfinite(weight) && weight > 0);
  s_.sum_w += weight;
  s_.sum_w2 += weight * weight;
  ++s_.count;
  // Co-moments grow by w (x - old mean)(y - new mean): the weighted form of Welford's update.
  const double dx = x - s_.mean_x;
  const double dy = y - s_.mean_y;
  const double share = weight / s_.sum_w;
  s_.mean_x += share * dx;
  s_.mean_y += share * dy;
  s_.sxx += weight * dx * (x - s_.mean_x);
  s_.sxy += weight * dx * (y - s_.mean_y);
  s_.syy += weight * dy * (y - s_.mean_y);
}

void WeightedLinearFit::decay(double factor) {
  assert(factor > 0 && factor <= 1);
  s_.sum_w *= factor;
  s_.sum_w2 *= factor * factor;
  s_.sxx *= factor;
  s_.sxy *= factor;
  s_.syy *= factor;
}

double WeightedLinearFit::slope() const { return s_.sxx > 0 ? s_.sxy / s_.sxx : kNaN; }

double WeightedLinearFit::intercept() const { return value_at(0); }

double WeightedLinearFit::value_at(double x) const { return s_.mean_y + slope() * (x - s_.mean_x); }

double WeightedLinearFit::effective_count() const {
  return s_.sum_w2 > 0 ? s_.sum_w * s_.sum_w / s_.sum_w2 : 0;
}

double WeightedLinearFit::residual_variance() const {
  const double n_eff = effective_count();
  if (!(s_.sxx > 0) || n_eff <= 2) return kNaN;
  // Rounding can leave a perfect fit a hair below zero.
  const double sse = std::max(0.0, s_.syy - s_.sxy * s_.sxy / s_.sxx);
  return sse / (s_.sum_w * (1 - 2 / n_eff));
}

double WeightedLinearFit::slope_stderr() const {
  return std::sqrt(residual_variance() * s_.sum_w / (effective_count() * s_.sxx));
}

double WeightedLinearFit::intercept_stderr() const {
  const double leverage = 1 + s_.mean_x * s_.mean_x * s_.sum_w / s_.sxx;
  return std::sqrt(residual_variance() / effective_count() * leverage);
}

double WeightedLinearFit::r_squared() const {
  if (!(s_.sxx > 0) || !(s_.syy > 0)) return kNaN;
  return s_.sxy * s_.sxy / (s_.sxx * s_.syy);
}

}  // namespace bw::core
