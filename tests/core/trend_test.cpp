#include "core/trend.h"

#include <gtest/gtest.h>

#include <cmath>
#include <limits>
#include <vector>

#include "test_random.h"

namespace bw::core {
namespace {

using test::at;

constexpr double kInf = std::numeric_limits<double>::infinity();

// 10 + 0.5 t for t = 0..100 s, exactly on a line.
LinearTrend exact_ramp(double slope = 0.5) {
  LinearTrend trend(0);
  for (int i = 0; i <= 100; ++i) trend.update(10 + slope * i, at(i));
  return trend;
}

TEST(LinearTrend, NotEnoughDataUntilThreeSpreadSamples) {
  LinearTrend trend(0);
  trend.update(1, at(0));
  trend.update(2, at(1));
  EXPECT_FALSE(trend.primed());
  EXPECT_EQ(trend.time_to_limit(10, at(1)).status, TimeToLimit::not_enough_data);
  trend.update(3, at(1));  // third sample, but only two distinct times: spread exists
  EXPECT_TRUE(trend.primed());
}

TEST(LinearTrend, SamplesAtOneTimeHaveNoSlope) {
  LinearTrend trend(0);
  for (int i = 0; i < 5; ++i) trend.update(i, at(7));
  EXPECT_FALSE(trend.primed());
  EXPECT_TRUE(std::isnan(trend.slope_per_second()));
}

// Straight-line arithmetic (common practice): from 60 at t = 100 s to 100 at 0.5/s takes 80 s.
TEST(LinearTrend, ExactRampCrossesWhenTheLineSays) {
  const LinearTrend trend = exact_ramp();
  EXPECT_NEAR(trend.slope_per_second(), 0.5, 1e-12);
  EXPECT_NEAR(trend.level_at(at(100)), 60.0, 1e-9);
  const TimeToLimit ttl = trend.time_to_limit(100, at(100));
  EXPECT_EQ(ttl.status, TimeToLimit::crossing);
  EXPECT_NEAR(ttl.seconds, 80.0, 1e-8);
  // A perfect fit has no slope uncertainty: the band collapses onto the estimate.
  EXPECT_NEAR(ttl.seconds_early, 80.0, 1e-6);
  EXPECT_NEAR(ttl.seconds_late, 80.0, 1e-6);
}

TEST(LinearTrend, NoCrossingWhenTheSlopePointsAwayFromTheLimit) {
  const LinearTrend falling = exact_ramp(-0.5);
  const TimeToLimit ttl = falling.time_to_limit(100, at(100), LimitSide::high);
  EXPECT_EQ(ttl.status, TimeToLimit::no_crossing);
  EXPECT_EQ(ttl.seconds, kInf);
  const LinearTrend rising = exact_ramp(0.5);
  EXPECT_EQ(rising.time_to_limit(-50, at(100), LimitSide::low).status, TimeToLimit::no_crossing);
}

TEST(LinearTrend, NoCrossingOnAFlatLine) {
  const LinearTrend flat = exact_ramp(0);
  EXPECT_EQ(flat.time_to_limit(100, at(100)).status, TimeToLimit::no_crossing);
}

TEST(LinearTrend, LowLimitIsReachedByAFallingTrend) {
  const LinearTrend falling = exact_ramp(-0.5);  // -40 at t = 100 s
  const TimeToLimit ttl = falling.time_to_limit(-50, at(100), LimitSide::low);
  EXPECT_EQ(ttl.status, TimeToLimit::crossing);
  EXPECT_NEAR(ttl.seconds, 20.0, 1e-8);
}

TEST(LinearTrend, AlreadyBeyondTheLimit) {
  const LinearTrend trend = exact_ramp();
  EXPECT_EQ(trend.time_to_limit(50, at(100)).status, TimeToLimit::already_beyond);
  EXPECT_EQ(trend.time_to_limit(70, at(100), LimitSide::low).status, TimeToLimit::already_beyond);
}

TEST(LinearTrend, SlowEndOfTheBandNeverReachesWhenTheSlopeIsUncertain) {
  test::NormalSource noise(1);
  LinearTrend trend(0);
  for (int i = 0; i < 30; ++i) trend.update(0.03 * i + noise(), at(i));
  // Preconditions of this case: a rising slope smaller than its 1.96 standard errors.
  ASSERT_GT(trend.slope_per_second(), 0);
  ASSERT_LT(trend.slope_per_second(), 1.96 * trend.slope_stderr_per_second());
  const TimeToLimit ttl = trend.time_to_limit(1000, at(30));
  ASSERT_EQ(ttl.status, TimeToLimit::crossing);
  EXPECT_EQ(ttl.seconds_late, kInf);
  EXPECT_LT(ttl.seconds_early, ttl.seconds);
}

// Definition of exponential forgetting over elapsed time: the trend equals a fit with explicit
// weights exp(-(t_n - t_i) / tau), for irregularly spaced samples.
TEST(LinearTrend, ForgettingWeighsSamplesByTheirAge) {
  const double tau = 300;
  test::NormalSource noise(13);
  LinearTrend trend(tau);
  std::vector<double> ts;
  std::vector<double> ys;
  double t = 0;
  for (int i = 0; i < 200; ++i) {
    t += 1 + 20 * noise.uniform();
    t = std::round(t * 1e6) / 1e6;  // what at() keeps
    ts.push_back(t);
    ys.push_back(5 + 0.01 * t + noise());
    trend.update(ys.back(), at(t));
  }
  WeightedLinearFit direct;
  for (std::size_t i = 0; i < ts.size(); ++i) {
    direct.add(ts[i] - ts[0], ys[i], std::exp(-(t - ts[i]) / tau));
  }
  EXPECT_NEAR(trend.slope_per_second(), direct.slope(), 1e-12);
  EXPECT_NEAR(trend.slope_stderr_per_second(), direct.slope_stderr(), 1e-12);
  EXPECT_NEAR(trend.level_at(at(t)), direct.value_at(t - ts[0]), 1e-9);
}

// A change of slope is followed within a few time constants (old data weighs e^-10 after 10 tau).
TEST(LinearTrend, FollowsAChangeOfSlope) {
  LinearTrend trend(50);
  for (int i = 0; i <= 1000; ++i) trend.update(i, at(i));
  for (int i = 1; i <= 500; ++i) trend.update(1000, at(1000 + i));
  EXPECT_NEAR(trend.slope_per_second(), 0.0, 1e-3);
}

// Microsecond timestamps near 2023 keep full precision thanks to the internal origin.
TEST(LinearTrend, LongRunsKeepSlopePrecision) {
  LinearTrend trend(0);
  for (int i = 0; i <= 1000; ++i) trend.update(3 + 2e-6 * 1000.0 * i, at(1000.0 * i));
  EXPECT_NEAR(trend.slope_per_second(), 2e-6, 1e-15);
}

TEST(LinearTrend, NonFiniteAndOutOfOrderSamplesAreIgnoredAndCounted) {
  LinearTrend clean(0);
  LinearTrend dirty(0);
  for (int i = 0; i < 10; ++i) {
    clean.update(i * i, at(i));
    dirty.update(i * i, at(i));
    dirty.update(std::numeric_limits<double>::quiet_NaN(), at(i + 0.5));
    dirty.update(-100, at(i - 0.5));
  }
  EXPECT_EQ(dirty.fit().state(), clean.fit().state());
  EXPECT_EQ(dirty.gate().non_finite(), 10);
  EXPECT_EQ(dirty.gate().out_of_order(), 10);
}

TEST(LinearTrend, RestoreContinuesBitIdentically) {
  test::NormalSource noise(41);
  LinearTrend original(600);
  for (int i = 0; i < 100; ++i) original.update(0.1 * i + noise(), at(5.0 * i));
  LinearTrend restored(600);
  restored.restore(original.state());
  for (int i = 100; i < 200; ++i) {
    const double v = 0.1 * i + noise();
    original.update(v, at(5.0 * i));
    restored.update(v, at(5.0 * i));
  }
  EXPECT_EQ(restored.state(), original.state());
  EXPECT_EQ(restored.level_at(at(2000)), original.level_at(at(2000)));
}

}  // namespace
}  // namespace bw::core
