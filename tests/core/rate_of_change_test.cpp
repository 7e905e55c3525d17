#include "core/rate_of_change.h"

#include <gtest/gtest.h>

#include <limits>

#include "test_random.h"

namespace bw::core {
namespace {

using test::at;

TEST(RateOfChange, NotPrimedBeforeThreeSamples) {
  RateOfChange rate(600);
  rate.update(1, at(0));
  rate.update(2, at(10));
  EXPECT_FALSE(rate.primed());
  rate.update(3, at(20));
  EXPECT_TRUE(rate.primed());
}

// A tank filling at 2.5 ft/h (arithmetic: 2.5 / 3600 ft/s), sampled every 30 s with 0.05 ft of
// gauge noise: the smoothed rate lands within 4 standard errors of the slope.
TEST(RateOfChange, NoisyRampGivesItsRatePerHour) {
  test::NormalSource noise(9);
  RateOfChange rate(1800);
  for (int i = 0; i < 600; ++i) rate.update(4 + 2.5 / 3600 * 30 * i + 0.05 * noise(), at(30.0 * i));
  ASSERT_TRUE(rate.primed());
  const double stderr_per_hour = rate.trend().slope_stderr_per_second() * 3600;
  EXPECT_NEAR(rate.per_hour(), 2.5, 4 * stderr_per_hour);
  EXPECT_DOUBLE_EQ(rate.per_hour(), 3600 * rate.per_second());
}

TEST(RateOfChange, NonFiniteValuesAreIgnoredAndCounted) {
  RateOfChange rate(600);
  for (int i = 0; i < 5; ++i) rate.update(2.0 * i, at(i));
  rate.update(std::numeric_limits<double>::infinity(), at(6));
  EXPECT_NEAR(rate.per_second(), 2.0, 1e-12);
  EXPECT_EQ(rate.trend().gate().non_finite(), 1);
}

TEST(RateOfChange, RestoreContinuesBitIdentically) {
  test::NormalSource noise(19);
  RateOfChange original(900);
  for (int i = 0; i < 60; ++i) original.update(noise(), at(10.0 * i));
  RateOfChange restored(900);
  restored.restore(original.state());
  for (int i = 60; i < 120; ++i) {
    const double v = noise();
    original.update(v, at(10.0 * i));
    restored.update(v, at(10.0 * i));
  }
  EXPECT_EQ(restored.per_second(), original.per_second());
  EXPECT_EQ(restored.state(), original.state());
}

}  // namespace
}  // namespace bw::core
