// Episode: a stretch of high rate and the change of the quantity over it (an oil slug).
//
// The oil pad histories are constructed from a mass balance (common practice for a gun-barrel
// tank: pad growth = oil arriving - oil skimmed): normal carry-over of 0.6 bbl/h and a slug of
// 30 bbl/h for one hour, so the slug brings 30 bbl (arithmetic: rate x duration). The rate fed
// to the tracker is the engine's own smoothed rate (core/rate_of_change.h, 10 min time constant),
// as in the water_tank template.
#include "core/episode.h"

#include <gtest/gtest.h>

#include <optional>
#include <vector>

#include "core/rate_of_change.h"
#include "test_random.h"

namespace bw::core {
namespace {

using test::at;

constexpr double kMinute = 60;

Episode::Options slug_options() {
  return Episode::Options{.start_above = 8, .end_below = 2, .end_after_s = 15 * kMinute};
}

struct Outcome {
  std::vector<Episode::Closed> closed;
  bool ever_active = false;
};

// Pad growth per minute from the normal carry-over, plus `slug_bph` between the given hours.
Outcome feed(Episode& episode, double hours, double slug_bph, double slug_from_h, double slug_hours,
         std::uint64_t seed) {
  test::NormalSource noise(seed);
  RateOfChange rate(10 * kMinute);
  Outcome run;
  double pad = 10;
  for (double t = 0; t <= hours * 3600; t += kMinute) {
    const double h = t / 3600;
    double inflow = 0.6;
    if (h >= slug_from_h && h < slug_from_h + slug_hours) inflow += slug_bph;
    pad += inflow * kMinute / 3600;
    const double reading = pad + 0.15 * noise();  // 0.005 ft gauge noise x 33.6 bbl/ft
    rate.update(reading, at(t));
    if (!rate.primed()) continue;
    if (auto c = episode.update(reading, rate.per_hour(), at(t))) run.closed.push_back(*c);
    run.ever_active = run.ever_active || episode.active();
  }
  return run;
}

TEST(Episode, SlugVolumeIsTheOilItBrought) {
  Episode episode(slug_options());
  const Outcome run = feed(episode, 8, 30, 3, 1, 21);
  ASSERT_EQ(run.closed.size(), 1u);
  const auto& slug = run.closed[0];
  // 30 bbl of slug plus the normal 0.6 bbl/h over the episode; the smoothed rate crosses the
  // lower threshold a few minutes after the onset, so up to about 2 bbl are missed at the start.
  const double hours = seconds_between(slug.start, slug.end) / 3600;
  EXPECT_NEAR(slug.change, 30 + 0.6 * hours, 2.0);
  EXPECT_LT(slug.change, 30 + 0.6 * hours + 0.5);
  EXPECT_GE(seconds_between(at(3 * 3600), slug.start), 0);
  EXPECT_LE(seconds_between(at(3 * 3600), slug.start), 10 * kMinute);
  EXPECT_NEAR(slug.peak_rate, 30.6, 3.0);
  EXPECT_DOUBLE_EQ(episode.change(), slug.change);  // held until the next episode arms
  std::printf("[ figures ] slug of 30 bbl measured as %.2f bbl over %.2f h\n", slug.change, hours);
}

TEST(Episode, NormalCarryOverStartsNothing) {
  Episode episode(slug_options());
  const Outcome run = feed(episode, 24, 0, 0, 0, 22);
  EXPECT_TRUE(run.closed.empty());
  EXPECT_FALSE(run.ever_active);
}

TEST(Episode, ARateBetweenTheThresholdsArmsButDoesNotStart) {
  Episode episode(slug_options());
  const Outcome run = feed(episode, 8, 4, 3, 1, 23);  // 4.6 bbl/h: above end_below, below start
  EXPECT_TRUE(run.closed.empty());
  EXPECT_FALSE(run.ever_active);
}

TEST(Episode, EndsOnlyAfterTheRateStaysLow) {
  Episode episode(Episode::Options{.start_above = 10, .end_below = 5, .end_after_s = 600});
  episode.update(0, 20, at(0));
  ASSERT_TRUE(episode.active());
  EXPECT_FALSE(episode.update(3, 1, at(60)));     // low from 60 s
  EXPECT_FALSE(episode.update(4, 6, at(120)));    // back up: continues
  EXPECT_FALSE(episode.update(5, 1, at(180)));    // low again from 180 s
  EXPECT_FALSE(episode.update(6, 1, at(779)));
  const auto closed = episode.update(7, 1, at(780));
  ASSERT_TRUE(closed.has_value());
  EXPECT_EQ(closed->start, at(0));
  EXPECT_EQ(closed->end, at(180));
  EXPECT_DOUBLE_EQ(closed->change, 7);  // the largest quantity during the episode
  EXPECT_DOUBLE_EQ(closed->peak_rate, 20);
  EXPECT_FALSE(episode.active());
}

// Skimming right after a slug takes the pad down while the smoothed rate is still falling: the
// slug's total is its peak, not what is left when the episode ends.
TEST(Episode, TotalIsThePeakRiseNotWhatRemainsAfterSkimming) {
  Episode episode(Episode::Options{.start_above = 10, .end_below = 5, .end_after_s = 600});
  episode.update(100, 20, at(0));
  episode.update(130, 25, at(3600));   // 30 bbl arrived
  episode.update(110, 1, at(3660));    // skimming began
  const auto closed = episode.update(90, -50, at(4260));
  ASSERT_TRUE(closed.has_value());
  EXPECT_DOUBLE_EQ(closed->change, 30);
}

TEST(Episode, RestoreContinuesBitForBit) {
  Episode a(slug_options());
  a.update(0, 3, at(0));
  a.update(1, 9, at(60));
  Episode b(slug_options());
  b.restore(a.state());
  EXPECT_EQ(b.state(), a.state());
  a.update(2, 1, at(120));
  b.update(2, 1, at(120));
  EXPECT_EQ(b.state(), a.state());
}

}  // namespace
}  // namespace bw::core
