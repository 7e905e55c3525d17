#include "core/cusum.h"

#include <gtest/gtest.h>

#include <limits>

#include "test_random.h"

namespace bw::core {
namespace {

using test::at;

TEST(Cusum, SumsStartAtTheHeadStart) {
  const Cusum plain(CusumParams{}, 0, 1);
  EXPECT_EQ(plain.upper(), 0.0);
  const Cusum fast(CusumParams{.k = 0.5, .h = 5, .head_start = 2.5}, 0, 1);
  EXPECT_EQ(fast.upper(), 2.5);
  EXPECT_EQ(fast.lower(), 2.5);
}

// Definition of the tabular CUSUM (NIST/SEMATECH e-Handbook 6.3.2.3), hand-worked:
// target 10, sigma 2, k 0.5. x = 13 -> z = 1.5: S+ = 1.0. x = 7 -> z = -1.5: S+ = 0, S- = 1.0.
// x = 6 -> z = -2: S- = 1 + 2 - 0.5 = 2.5.
TEST(Cusum, AccumulatesStandardisedDeviationsBeyondK) {
  Cusum cusum(CusumParams{.k = 0.5, .h = 5}, 10, 2);
  CusumPoint p = cusum.update(13, at(0));
  EXPECT_DOUBLE_EQ(p.upper, 1.0);
  EXPECT_DOUBLE_EQ(p.lower, 0.0);
  p = cusum.update(7, at(1));
  EXPECT_DOUBLE_EQ(p.upper, 0.0);
  EXPECT_DOUBLE_EQ(p.lower, 1.0);
  p = cusum.update(6, at(2));
  EXPECT_DOUBLE_EQ(p.lower, 2.5);
  EXPECT_EQ(p.signal, 0);
}

// "Exceeds h" (strictly greater), as in the NIST e-Handbook example and the Lucas-Crosier table.
TEST(Cusum, SignalsOnlyWhenASumExceedsH) {
  Cusum cusum(CusumParams{.k = 0.5, .h = 4}, 0, 1);
  EXPECT_EQ(cusum.update(4.5, at(0)).signal, 0);  // S+ = 4 exactly
  EXPECT_EQ(cusum.update(0.5 + 1e-9, at(1)).signal, 1);
}

TEST(Cusum, DownwardShiftSignalsMinusOne) {
  Cusum cusum(CusumParams{.k = 0.5, .h = 4}, 100, 5);
  int signal = 0;
  int n = 0;
  while (signal == 0 && n < 100) signal = cusum.update(90, at(n++)).signal;  // z = -2
  EXPECT_EQ(signal, -1);
  EXPECT_EQ(n, 3);  // 1.5, 3.0, 4.5 > 4
}

TEST(Cusum, RestartAfterSignalReturnsToHeadStart) {
  Cusum cusum(CusumParams{.k = 0.5, .h = 4, .head_start = 1, .restart_after_signal = true}, 0, 1);
  const CusumPoint p = cusum.update(6, at(0));  // 1 + 6 - 0.5 = 6.5 > 4
  EXPECT_EQ(p.signal, 1);
  EXPECT_DOUBLE_EQ(p.upper, 6.5);  // the point reports the sum that signalled
  EXPECT_EQ(cusum.upper(), 1.0);
  EXPECT_EQ(cusum.lower(), 1.0);
}

TEST(Cusum, HeldSumsKeepGrowingUpToTheClamp) {
  Cusum held(CusumParams{.k = 0.5, .h = 4}, 0, 1);
  Cusum clamped(CusumParams{.k = 0.5, .h = 4, .max_sum = 8}, 0, 1);
  for (int i = 0; i < 10; ++i) {
    held.update(3, at(i));
    clamped.update(3, at(i));
  }
  EXPECT_DOUBLE_EQ(held.upper(), 25.0);
  EXPECT_DOUBLE_EQ(clamped.upper(), 8.0);
  // A clamped sum comes back below h sooner once the shift ends.
  int steps = 0;
  while (clamped.update(-1, at(20 + steps)).signal != 0) ++steps;
  EXPECT_EQ(steps, 2);  // 8 -> 6.5 -> 5 -> 3.5
}

TEST(Cusum, NonFiniteValueIsIgnoredAndCounted) {
  Cusum cusum(CusumParams{}, 0, 1);
  cusum.update(2, at(0));
  const CusumPoint p = cusum.update(std::numeric_limits<double>::infinity(), at(1));
  EXPECT_FALSE(p.accepted);
  EXPECT_DOUBLE_EQ(cusum.upper(), 1.5);
  EXPECT_EQ(cusum.gate().non_finite(), 1);
}

TEST(Cusum, TimeGoingBackwardsIsIgnoredAndCounted) {
  Cusum cusum(CusumParams{}, 0, 1);
  cusum.update(2, at(10));
  EXPECT_FALSE(cusum.update(2, at(9)).accepted);
  EXPECT_DOUBLE_EQ(cusum.upper(), 1.5);
  EXPECT_EQ(cusum.gate().out_of_order(), 1);
}

TEST(Cusum, SetBaselineRestartsTheSums) {
  Cusum cusum(CusumParams{.k = 0.5, .h = 5, .head_start = 2}, 0, 1);
  cusum.update(3, at(0));
  cusum.set_baseline(50, 4);
  EXPECT_EQ(cusum.upper(), 2.0);
  EXPECT_DOUBLE_EQ(cusum.update(58, at(1)).upper, 2 + 2 - 0.5);
}

TEST(Cusum, RestoreContinuesBitIdentically) {
  test::NormalSource noise(8);
  Cusum original(CusumParams{.k = 0.5, .h = 5}, 3, 0.7);
  for (int i = 0; i < 80; ++i) original.update(3 + 0.7 * noise() + 0.2, at(i));
  Cusum restored(CusumParams{.k = 0.5, .h = 5}, 0, 1);
  restored.restore(original.state());
  for (int i = 80; i < 200; ++i) {
    const double v = 3 + 0.7 * noise() + 0.2;
    const CusumPoint a = original.update(v, at(i));
    const CusumPoint b = restored.update(v, at(i));
    ASSERT_EQ(a.upper, b.upper);
    ASSERT_EQ(a.lower, b.lower);
    ASSERT_EQ(a.signal, b.signal);
  }
  EXPECT_EQ(restored.state(), original.state());
}

}  // namespace
}  // namespace bw::core
