// Time to limit on a noisy ramp (constructed case, common practice for checking a forecast band):
// a filter differential pressure rising 0.5 psi/h from 8 psi, read every minute with 0.3 psi of
// gauge noise for 24 h, with a change-out limit of 25 psi. The true crossing is 10 h after the
// last sample (20 psi at 24 h, 5 psi to go at 0.5 psi/h). Over many noise seeds the band
// [seconds_early, seconds_late] must contain the true crossing nearly as often as its nominal 95 %
// (it leaves out the uncertainty of the mean level, here about 1/10 of the variance at the
// crossing), and the central estimate must be unbiased to within its spread.
#include <gtest/gtest.h>

#include <algorithm>
#include <cmath>
#include <cstdio>
#include <vector>

#include "../core/test_random.h"
#include "core/trend.h"

namespace bw::core {
namespace {

using test::at;

constexpr double kRatePerSecond = 0.5 / 3600;
constexpr double kHours = 24;
constexpr double kLimit = 25;
constexpr double kTrueSeconds = 10 * 3600;

TimeToLimit forecast(std::uint64_t seed) {
  test::NormalSource noise(seed);
  LinearTrend trend(0);
  const int samples = static_cast<int>(kHours * 60);
  for (int i = 0; i <= samples; ++i) {
    const double t = 60.0 * i;
    trend.update(8 + kRatePerSecond * t + 0.3 * noise(), at(t));
  }
  return trend.time_to_limit(kLimit, at(kHours * 3600));
}

TEST(TimeToLimitReference, BandBracketsTheTrueCrossingOnANoisyRamp) {
  const int seeds = 400;
  int covered = 0;
  std::vector<double> errors;
  for (int s = 0; s < seeds; ++s) {
    const TimeToLimit ttl = forecast(500 + static_cast<std::uint64_t>(s));
    ASSERT_EQ(ttl.status, TimeToLimit::crossing);
    ASSERT_LE(ttl.seconds_early, ttl.seconds);
    ASSERT_GE(ttl.seconds_late, ttl.seconds);
    if (ttl.seconds_early <= kTrueSeconds && kTrueSeconds <= ttl.seconds_late) ++covered;
    errors.push_back(ttl.seconds - kTrueSeconds);
  }
  std::sort(errors.begin(), errors.end());
  const double coverage = static_cast<double>(covered) / seeds;
  const double median_error_h = errors[errors.size() / 2] / 3600;
  std::printf("  band coverage %.3f over %d seeds, median error of the estimate %.3f h\n", coverage,
              seeds, median_error_h);
  // Expected about 0.94 (1.96 sd of the slope part out of a total sd ~5 % larger); the bounds
  // allow for 400 seeds (binomial sd ~0.012).
  EXPECT_GE(coverage, 0.90);
  EXPECT_LE(coverage, 0.98);
  EXPECT_LT(std::abs(median_error_h), 0.1);
}

}  // namespace
}  // namespace bw::core
