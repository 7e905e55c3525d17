#include "core/running_stats.h"

#include <gtest/gtest.h>

#include <cmath>

namespace bw::core {
namespace {

// The classic textbook set {2, 4, 4, 4, 5, 5, 7, 9}: mean 5, population standard deviation 2,
// so the sample standard deviation is 2 * sqrt(8 / 7) (from memory; arithmetic checked).
TEST(RunningStats, MatchesTheTextbookExample) {
  RunningStats s;
  for (double v : {2.0, 4.0, 4.0, 4.0, 5.0, 5.0, 7.0, 9.0}) s.add(v);
  EXPECT_EQ(s.count(), 8u);
  EXPECT_DOUBLE_EQ(s.mean(), 5.0);
  EXPECT_NEAR(s.stddev(), 2.0 * std::sqrt(8.0 / 7.0), 1e-12);
}

// Shifting every value leaves the spread unchanged (a property of the variance); Welford's
// update keeps it to rounding even with a large offset, where the naive sum of squares fails.
TEST(RunningStats, StaysAccurateFarFromZero) {
  RunningStats s;
  for (double v : {2.0, 4.0, 4.0, 4.0, 5.0, 5.0, 7.0, 9.0}) s.add(1e9 + v);
  EXPECT_NEAR(s.stddev(), 2.0 * std::sqrt(8.0 / 7.0), 1e-6);
}

TEST(RunningStats, HasNoSpreadBeforeTwoValuesAndRestoresExactly) {
  RunningStats s;
  EXPECT_EQ(s.stddev(), 0.0);
  s.add(3.0);
  EXPECT_EQ(s.stddev(), 0.0);
  s.add(5.0);
  RunningStats copy;
  copy.restore(s.state());
  s.add(11.0);
  copy.add(11.0);
  EXPECT_EQ(s.state(), copy.state());
}

}  // namespace
}  // namespace bw::core
