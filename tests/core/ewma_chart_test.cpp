#include "core/ewma_chart.h"

#include <gtest/gtest.h>

#include <cmath>
#include <limits>

#include "test_random.h"

namespace bw::core {
namespace {

using test::at;

EwmaChartParams regular(double lambda, double width, bool time_varying) {
  return {.lambda = lambda,
          .nominal_interval_s = 10,
          .width = width,
          .time_varying_limits = time_varying};
}

TEST(EwmaChart, StatisticStartsAtTheInControlMean) {
  const EwmaChart chart(regular(0.2, 3, true), 50, 2);
  EXPECT_EQ(chart.statistic(), 50.0);
  EXPECT_EQ(chart.count(), 0);
}

// Lucas & Saccucci (1990) limit formula (REFERENCES.md): at i = 1 the EWMA sigma is lambda sigma.
TEST(EwmaChart, FirstSampleUsesLambdaAndLimitsOfLambdaSigma) {
  EwmaChart chart(regular(0.25, 3, true), 50, 2);
  const EwmaChartResult r = chart.update(54, at(0));
  EXPECT_TRUE(r.accepted);
  EXPECT_DOUBLE_EQ(r.statistic, 51.0);
  EXPECT_DOUBLE_EQ(r.upper, 50 + 3 * 0.25 * 2);
  EXPECT_DOUBLE_EQ(r.lower, 50 - 3 * 0.25 * 2);
}

// Lucas & Saccucci (1990) limit formula (REFERENCES.md):
// sigma_z(i) = sigma sqrt(lambda / (2 - lambda) [1 - (1 - lambda)^(2i)]).
TEST(EwmaChart, TimeVaryingLimitsFollowTheClosedFormAtRegularSpacing) {
  const double lambda = 0.1;
  EwmaChart chart(regular(lambda, 2.814, true), 0, 1.5);
  for (int i = 1; i <= 60; ++i) {
    const EwmaChartResult r = chart.update(0.3, at(10.0 * i));
    const double sigma_z =
        1.5 * std::sqrt(lambda / (2 - lambda) * (1 - std::pow(1 - lambda, 2.0 * i)));
    EXPECT_NEAR(r.upper, 2.814 * sigma_z, 1e-12) << "i = " << i;
  }
  EXPECT_NEAR(chart.statistic_sigma(), 1.5 * std::sqrt(lambda / (2 - lambda)), 1e-5);
}

TEST(EwmaChart, FixedLimitsAreAsymptoticFromTheFirstSample) {
  EwmaChart chart(regular(0.2, 2.962, false), 10, 1);
  const EwmaChartResult r = chart.update(10, at(0));
  EXPECT_DOUBLE_EQ(r.upper, 10 + 2.962 * std::sqrt(0.2 / 1.8));
}

// Closed form of the EWMA weight over elapsed time: one sample after two nominal intervals moves
// the statistic as far as two samples of the same value one interval apart.
TEST(EwmaChart, WeightDependsOnElapsedTimeOnly) {
  EwmaChart dense(regular(0.3, 3, true), 0, 1);
  EwmaChart sparse(regular(0.3, 3, true), 0, 1);
  dense.update(1, at(0));
  sparse.update(1, at(0));
  dense.update(4, at(10));
  dense.update(4, at(20));
  sparse.update(4, at(20));
  EXPECT_NEAR(sparse.statistic(), dense.statistic(), 1e-12);
}

TEST(EwmaChart, SignalsAboveUpperAndBelowLower) {
  EwmaChart chart(regular(0.5, 3, true), 0, 1);
  EXPECT_EQ(chart.update(0.1, at(0)).signal, 0);
  EXPECT_EQ(chart.update(10, at(10)).signal, 1);
  chart.restart();
  EXPECT_EQ(chart.update(-10, at(20)).signal, -1);
}

TEST(EwmaChart, NonFiniteValueIsIgnoredAndCounted) {
  EwmaChart chart(regular(0.2, 3, true), 0, 1);
  chart.update(1, at(0));
  const double before = chart.statistic();
  const EwmaChartResult r = chart.update(std::numeric_limits<double>::quiet_NaN(), at(10));
  EXPECT_FALSE(r.accepted);
  EXPECT_EQ(r.statistic, before);
  EXPECT_EQ(chart.gate().non_finite(), 1);
}

TEST(EwmaChart, TimeGoingBackwardsIsIgnoredAndCounted) {
  EwmaChart chart(regular(0.2, 3, true), 0, 1);
  chart.update(1, at(100));
  const double before = chart.statistic();
  EXPECT_FALSE(chart.update(50, at(90)).accepted);
  EXPECT_EQ(chart.statistic(), before);
  EXPECT_EQ(chart.gate().out_of_order(), 1);
}

TEST(EwmaChart, SetBaselineRestartsAtTheNewMean) {
  EwmaChart chart(regular(0.2, 3, true), 0, 1);
  chart.update(3, at(0));
  chart.set_baseline(20, 4);
  EXPECT_EQ(chart.statistic(), 20.0);
  const EwmaChartResult r = chart.update(20, at(10));
  EXPECT_DOUBLE_EQ(r.upper, 20 + 3 * 0.2 * 4);  // first-sample limits again
}

TEST(EwmaChart, RestoreContinuesBitIdentically) {
  test::NormalSource noise(21);
  EwmaChart original(regular(0.1, 2.8, true), 5, 2);
  for (int i = 0; i < 50; ++i) original.update(5 + 2 * noise(), at(7.0 * i));
  EwmaChart restored(regular(0.1, 2.8, true), 0, 1);
  restored.restore(original.state());
  for (int i = 50; i < 120; ++i) {
    const double v = 5 + 2 * noise();
    const EwmaChartResult a = original.update(v, at(7.0 * i));
    const EwmaChartResult b = restored.update(v, at(7.0 * i));
    ASSERT_EQ(a.statistic, b.statistic);
    ASSERT_EQ(a.upper, b.upper);
  }
  EXPECT_EQ(restored.state(), original.state());
}

}  // namespace
}  // namespace bw::core
