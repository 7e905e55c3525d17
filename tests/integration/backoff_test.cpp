// The reconnect delay schedule: exponential backoff with full jitter (common practice for
// clients reconnecting to a shared server: the ceiling doubles per failed attempt up to a cap,
// and the delay is drawn uniformly from [0, ceiling]).
#include "io/backoff.h"

#include <gtest/gtest.h>

#include <algorithm>
#include <vector>

namespace bw::io {
namespace {

TEST(BackoffCeiling, DoublesFromMinimumAndStopsAtMaximum) {
  // Doubling per attempt from the minimum, capped (common practice).
  const std::vector<double> expected = {0.5, 1, 2, 4, 8, 16, 30, 30};
  for (std::size_t attempt = 0; attempt < expected.size(); ++attempt) {
    EXPECT_DOUBLE_EQ(backoff_ceiling_s(static_cast<int>(attempt), 0.5, 30), expected[attempt])
        << "attempt " << attempt;
  }
}

TEST(BackoffCeiling, HugeAttemptCountsStayAtMaximum) {
  EXPECT_DOUBLE_EQ(backoff_ceiling_s(1000, 0.5, 30), 30);
  EXPECT_DOUBLE_EQ(backoff_ceiling_s(1 << 30, 1e-3, 5), 5);
}

TEST(ReconnectBackoff, EveryDelayLiesWithinZeroAndItsCeiling) {
  for (const std::uint64_t seed :
       std::vector<std::uint64_t>{1, 7, backoff_seed("dry-creek-swd4-edge")}) {
    ReconnectBackoff backoff(0.5, 30, seed);
    for (int attempt = 0; attempt < 200; ++attempt) {
      const double ceiling = backoff_ceiling_s(attempt, 0.5, 30);
      const double delay = backoff.next_delay_s();
      EXPECT_GE(delay, 0.0);
      EXPECT_LE(delay, ceiling) << "attempt " << attempt << " seed " << seed;
    }
  }
}

TEST(ReconnectBackoff, JitterIsUniformOverTheWholeInterval) {
  // Full jitter draws uniformly from [0, ceiling]: mean 0.5 of the ceiling, standard deviation
  // of the mean of n draws 1/sqrt(12 n) = 0.0029 for n = 10000 (properties of the uniform
  // distribution); 0.02 is about seven standard deviations.
  constexpr int kDraws = 10000;
  ReconnectBackoff backoff(1, 1, 42);  // min == max: the ceiling is 1 on every attempt
  double sum = 0;
  double smallest = 1;
  double largest = 0;
  for (int i = 0; i < kDraws; ++i) {
    const double u = backoff.next_delay_s();
    sum += u;
    smallest = std::min(smallest, u);
    largest = std::max(largest, u);
  }
  EXPECT_NEAR(sum / kDraws, 0.5, 0.02);
  EXPECT_LT(smallest, 0.01);
  EXPECT_GT(largest, 0.99);
}

TEST(ReconnectBackoff, SameSeedGivesSameScheduleOtherSeedDoesNot) {
  ReconnectBackoff first(0.5, 30, backoff_seed("dry-creek-swd4-edge"));
  ReconnectBackoff again(0.5, 30, backoff_seed("dry-creek-swd4-edge"));
  ReconnectBackoff other(0.5, 30, backoff_seed("dry-creek-swd4-spare"));
  int differences = 0;
  for (int i = 0; i < 20; ++i) {
    const double a = first.next_delay_s();
    EXPECT_EQ(a, again.next_delay_s());
    if (a != other.next_delay_s()) ++differences;
  }
  EXPECT_EQ(differences, 20);
}

TEST(ReconnectBackoff, ResetStartsAgainFromTheMinimum) {
  ReconnectBackoff backoff(0.5, 30, 3);
  for (int i = 0; i < 6; ++i) backoff.next_delay_s();
  EXPECT_EQ(backoff.attempt(), 6);
  backoff.reset();
  EXPECT_EQ(backoff.attempt(), 0);
  EXPECT_LE(backoff.next_delay_s(), 0.5);
}

TEST(BackoffSeed, IsFnv1a64) {
  // FNV-1a 64-bit test vectors of the algorithm's authors (offset basis for "", and the
  // published values for "a" and "foobar"; from memory).
  EXPECT_EQ(backoff_seed(""), 0xcbf29ce484222325ULL);
  EXPECT_EQ(backoff_seed("a"), 0xaf63dc4c8601ec8cULL);
  EXPECT_EQ(backoff_seed("foobar"), 0x85944171f73967e8ULL);
}

}  // namespace
}  // namespace bw::io
