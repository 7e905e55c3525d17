#include "core/ewma.h"

#include <gtest/gtest.h>

#include <cmath>
#include <limits>
#include <vector>

#include "test_random.h"

namespace bw::core {
namespace {

using test::at;

constexpr double kNaN = std::numeric_limits<double>::quiet_NaN();
constexpr double kInf = std::numeric_limits<double>::infinity();

TEST(Ewma, BeforeFirstSampleIsEmptyAndNotPrimed) {
  const Ewma ewma(60);
  EXPECT_EQ(ewma.count(), 0);
  EXPECT_EQ(ewma.mean(), 0.0);
  EXPECT_EQ(ewma.variance(), 0.0);
  EXPECT_FALSE(ewma.primed());
}

TEST(Ewma, FirstSampleSetsMeanWithZeroVariance) {
  Ewma ewma(60);
  ewma.update(42.5, at(0));
  EXPECT_EQ(ewma.mean(), 42.5);
  EXPECT_EQ(ewma.variance(), 0.0);
  EXPECT_EQ(ewma.count(), 1);
}

TEST(Ewma, NonFiniteValuesAreIgnoredAndCounted) {
  Ewma clean(30);
  Ewma dirty(30);
  for (int i = 0; i < 20; ++i) {
    const double v = std::sin(i);
    clean.update(v, at(i));
    dirty.update(v, at(i));
    if (i % 7 == 3) dirty.update(i % 2 == 0 ? kNaN : -kInf, at(i + 0.5));
  }
  EXPECT_EQ(dirty.mean(), clean.mean());
  EXPECT_EQ(dirty.variance(), clean.variance());
  EXPECT_EQ(dirty.gate().non_finite(), 3);
  EXPECT_EQ(dirty.count(), clean.count());
}

TEST(Ewma, TimeGoingBackwardsIsIgnoredAndCounted) {
  Ewma ewma(30);
  ewma.update(1.0, at(100));
  ewma.update(2.0, at(110));
  const double mean = ewma.mean();
  ewma.update(1000.0, at(105));
  EXPECT_EQ(ewma.mean(), mean);
  EXPECT_EQ(ewma.gate().out_of_order(), 1);
  EXPECT_EQ(ewma.count(), 2);
}

TEST(Ewma, SampleAtTheSameTimeHasNoWeight) {
  Ewma ewma(30);
  ewma.update(1.0, at(0));
  ewma.update(5.0, at(0));
  EXPECT_EQ(ewma.mean(), 1.0);
  EXPECT_EQ(ewma.count(), 2);
}

// Closed form of a first-order lag (common practice): after x0, the same value x at dt and 2 dt
// moves the mean exactly as far as x once at 2 dt: x0 + (1 - exp(-2 dt / tau)) (x - x0).
TEST(Ewma, StepsOfDtThenDtEqualOneStepOfTwoDt) {
  const double tau = 40;
  const double dt = 7;
  Ewma two_steps(tau);
  two_steps.update(10.0, at(0));
  two_steps.update(20.0, at(dt));
  two_steps.update(20.0, at(2 * dt));
  Ewma one_step(tau);
  one_step.update(10.0, at(0));
  one_step.update(20.0, at(2 * dt));
  const double closed_form = 10.0 + (1 - std::exp(-2 * dt / tau)) * 10.0;
  EXPECT_NEAR(two_steps.mean(), closed_form, 1e-12);
  EXPECT_NEAR(one_step.mean(), closed_form, 1e-12);
}

// Closed form of the step response of a first-order lag (common practice): x + (x0 - x) e^(-T/tau)
// whatever the spacing of the samples that carried the step.
TEST(Ewma, StepResponseFollowsClosedFormUnderIrregularSpacing) {
  const double tau = 120;
  test::NormalSource noise(11);
  Ewma ewma(tau);
  ewma.update(3.0, at(0));
  double t = 0;
  while (t < 300) {
    t += 0.1 + 20 * noise.uniform();
    ewma.update(8.0, at(t));
  }
  const double elapsed = seconds_between(at(0), at(t));  // as rounded to the microsecond
  EXPECT_NEAR(ewma.mean(), 8.0 + (3.0 - 8.0) * std::exp(-elapsed / tau), 1e-12);
}

// Definition of the weighted mean and variance (common practice): the recursion must equal
// sum w_i (x_i - m)^2 / sum w_i with w_i = alpha_i prod_{j>i} (1 - alpha_j), computed two-pass.
TEST(Ewma, VarianceEqualsDirectWeightedVariance) {
  const double tau = 50;
  test::NormalSource noise(3);
  std::vector<double> values;
  std::vector<double> alphas;
  Ewma ewma(tau);
  double t = 0;
  SensorTime previous = at(0);
  for (int i = 0; i < 400; ++i) {
    t += 0.5 + 10 * noise.uniform();
    const SensorTime now = at(t);
    values.push_back(100 + 5 * noise());
    alphas.push_back(i == 0 ? 1.0 : 1 - std::exp(-seconds_between(previous, now) / tau));
    ewma.update(values.back(), now);
    previous = now;
  }
  std::vector<double> weights(values.size());
  double keep = 1;
  for (std::size_t i = values.size(); i-- > 0;) {
    weights[i] = alphas[i] * keep;
    keep *= 1 - alphas[i];
  }
  double sum_w = 0;
  double sum_wx = 0;
  for (std::size_t i = 0; i < values.size(); ++i) {
    sum_w += weights[i];
    sum_wx += weights[i] * values[i];
  }
  const double mean = sum_wx / sum_w;
  double sum_wd2 = 0;
  for (std::size_t i = 0; i < values.size(); ++i) {
    sum_wd2 += weights[i] * (values[i] - mean) * (values[i] - mean);
  }
  EXPECT_NEAR(ewma.mean(), mean, 1e-10);
  EXPECT_NEAR(ewma.variance(), sum_wd2 / sum_w, 1e-9 * sum_wd2 / sum_w);
}

TEST(Ewma, PrimedOnceOneTimeConstantHasPassed) {
  Ewma ewma(60);
  ewma.update(1.0, at(0));
  ewma.update(1.0, at(59));
  EXPECT_FALSE(ewma.primed());
  ewma.update(1.0, at(60));
  EXPECT_TRUE(ewma.primed());
}

TEST(Ewma, ResetForgetsEverything) {
  Ewma ewma(60);
  ewma.update(1.0, at(0));
  ewma.update(2.0, at(10));
  ewma.reset();
  EXPECT_EQ(ewma.count(), 0);
  ewma.update(7.0, at(5));  // earlier than before the reset: a first sample again
  EXPECT_EQ(ewma.mean(), 7.0);
}

TEST(Ewma, RestoreContinuesBitIdentically) {
  test::NormalSource noise(5);
  Ewma original(45);
  for (int i = 0; i < 100; ++i) original.update(noise(), at(1.5 * i));
  Ewma restored(45);
  restored.restore(original.state());
  for (int i = 100; i < 200; ++i) {
    const double v = noise();
    original.update(v, at(1.5 * i));
    restored.update(v, at(1.5 * i));
  }
  EXPECT_EQ(restored.state(), original.state());
  EXPECT_EQ(restored.mean(), original.mean());
  EXPECT_EQ(restored.variance(), original.variance());
}

}  // namespace
}  // namespace bw::core
