#include "core/linear_fit.h"

#include <gtest/gtest.h>

#include <cmath>
#include <vector>

#include "test_random.h"

namespace bw::core {
namespace {

TEST(WeightedLinearFit, EmptyFitHasNoStatistics) {
  const WeightedLinearFit fit;
  EXPECT_TRUE(std::isnan(fit.slope()));
  EXPECT_TRUE(std::isnan(fit.residual_variance()));
  EXPECT_EQ(fit.effective_count(), 0.0);
  EXPECT_EQ(fit.count(), 0);
}

TEST(WeightedLinearFit, OnePointHasNoSlope) {
  WeightedLinearFit fit;
  fit.add(3, 4);
  EXPECT_TRUE(std::isnan(fit.slope()));
  EXPECT_EQ(fit.mean_y(), 4.0);
}

TEST(WeightedLinearFit, PointsOnALineGiveThatLineExactly) {
  WeightedLinearFit fit;
  for (int i = 0; i < 10; ++i) fit.add(i, 2 - 0.5 * i);
  EXPECT_NEAR(fit.slope(), -0.5, 1e-15);
  EXPECT_NEAR(fit.intercept(), 2.0, 1e-14);
  EXPECT_NEAR(fit.residual_variance(), 0.0, 1e-28);
  EXPECT_NEAR(fit.r_squared(), 1.0, 1e-15);
}

// Textbook OLS formulas (common practice), computed two-pass from the raw data.
TEST(WeightedLinearFit, EqualWeightsGiveTheTextbookOlsStatistics) {
  test::NormalSource noise(12);
  std::vector<double> xs;
  std::vector<double> ys;
  WeightedLinearFit fit;
  for (int i = 0; i < 50; ++i) {
    xs.push_back(10 * noise.uniform());
    ys.push_back(1.5 + 0.8 * xs.back() + noise());
    fit.add(xs.back(), ys.back());
  }
  const double n = 50;
  double mx = 0;
  double my = 0;
  for (int i = 0; i < 50; ++i) {
    mx += xs[i] / n;
    my += ys[i] / n;
  }
  double sxx = 0;
  double sxy = 0;
  double syy = 0;
  for (int i = 0; i < 50; ++i) {
    sxx += (xs[i] - mx) * (xs[i] - mx);
    sxy += (xs[i] - mx) * (ys[i] - my);
    syy += (ys[i] - my) * (ys[i] - my);
  }
  const double b = sxy / sxx;
  const double s2 = (syy - b * sxy) / (n - 2);
  EXPECT_NEAR(fit.slope(), b, 1e-13);
  EXPECT_NEAR(fit.intercept(), my - b * mx, 1e-12);
  EXPECT_NEAR(fit.residual_variance(), s2, 1e-12);
  EXPECT_NEAR(fit.slope_stderr(), std::sqrt(s2 / sxx), 1e-13);
  EXPECT_NEAR(fit.intercept_stderr(), std::sqrt(s2 * (1 / n + mx * mx / sxx)), 1e-12);
  EXPECT_NEAR(fit.r_squared(), sxy * sxy / (sxx * syy), 1e-13);
  EXPECT_DOUBLE_EQ(fit.effective_count(), 50.0);
}

// Least squares is invariant to a shift of x (common practice); the centred updates must keep
// that true at x ~ 1e9, where raw sums of squares would lose every digit of the spread.
TEST(WeightedLinearFit, LargeOffsetInXKeepsPrecision) {
  test::NormalSource noise(2);
  WeightedLinearFit near_zero;
  WeightedLinearFit far;
  for (int i = 0; i < 1000; ++i) {
    const double y = 0.001 * i + 0.01 * noise();
    near_zero.add(i, y);
    far.add(1.7e9 + i, y);
  }
  EXPECT_NEAR(far.slope(), near_zero.slope(), 1e-9 * std::abs(near_zero.slope()));
  EXPECT_NEAR(far.slope_stderr(), near_zero.slope_stderr(), 1e-6 * near_zero.slope_stderr());
}

// Definition of exponential weighting: decaying by f before each point equals adding point i of n
// with weight f^(n-1-i).
TEST(WeightedLinearFit, DecayEqualsExplicitWeights) {
  test::NormalSource noise(6);
  const double f = 0.97;
  const int n = 200;
  WeightedLinearFit decayed;
  WeightedLinearFit weighted;
  for (int i = 0; i < n; ++i) {
    const double x = i + noise.uniform();
    const double y = 3 - 0.2 * x + noise();
    decayed.decay(f);
    decayed.add(x, y);
    weighted.add(x, y, std::pow(f, n - 1 - i));
  }
  EXPECT_NEAR(decayed.slope(), weighted.slope(), 1e-12);
  EXPECT_NEAR(decayed.intercept(), weighted.intercept(), 1e-10);
  EXPECT_NEAR(decayed.slope_stderr(), weighted.slope_stderr(), 1e-12);
  EXPECT_NEAR(decayed.residual_variance(), weighted.residual_variance(), 1e-10);
  // Effective count of geometric weights: (sum f^i)^2 / sum f^(2i) -> (1 + f) / (1 - f).
  const double expected = std::pow(1 - std::pow(f, n), 2) / (1 - f) / (1 - f) /
                          ((1 - std::pow(f, 2 * n)) / (1 - f * f));
  EXPECT_NEAR(decayed.effective_count(), expected, 1e-9);
}

// The header promises statistics that do not depend on the scale of the weights.
TEST(WeightedLinearFit, StatisticsDoNotDependOnTheScaleOfTheWeights) {
  test::NormalSource noise(7);
  WeightedLinearFit unit;
  WeightedLinearFit scaled;
  for (int i = 0; i < 40; ++i) {
    const double w = 0.5 + noise.uniform();
    const double x = i;
    const double y = 2 * x + noise();
    unit.add(x, y, w);
    scaled.add(x, y, 1000 * w);
  }
  EXPECT_NEAR(scaled.slope_stderr(), unit.slope_stderr(), 1e-12 * unit.slope_stderr());
  EXPECT_NEAR(scaled.intercept_stderr(), unit.intercept_stderr(), 1e-12 * unit.intercept_stderr());
  EXPECT_NEAR(scaled.residual_variance(), unit.residual_variance(),
              1e-12 * unit.residual_variance());
}

TEST(WeightedLinearFit, RestoreContinuesBitIdentically) {
  test::NormalSource noise(31);
  WeightedLinearFit original;
  for (int i = 0; i < 30; ++i) {
    original.decay(0.99);
    original.add(i, noise());
  }
  WeightedLinearFit restored;
  restored.restore(original.state());
  for (int i = 30; i < 60; ++i) {
    const double y = noise();
    original.decay(0.99);
    original.add(i, y);
    restored.decay(0.99);
    restored.add(i, y);
  }
  EXPECT_EQ(restored.state(), original.state());
}

}  // namespace
}  // namespace bw::core
