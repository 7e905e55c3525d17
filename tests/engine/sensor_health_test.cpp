// The default sensor-health checks at work: an asset built by hand gets them from
// add_sensor_health_checks() and an AssetEvaluator runs them. A stuck, silent, over-ranged or
// NE 43 failed stream raises its default; a healthy noisy stream (and a vessel at rest) stays
// quiet.
#include "engine/sensor_health.h"

#include <gtest/gtest.h>

#include <cmath>
#include <numbers>
#include <random>
#include <string>
#include <tuple>
#include <vector>

#include "engine/asset_evaluator.h"

namespace bw::engine {
namespace {

constexpr std::size_t kLevel = 0;  // ft, every 60 s, range 0-25
constexpr std::size_t kLoop = 1;   // mA, every 60 s, range 4-20 (a raw 4-20 mA loop)

core::SensorTime at(double s) { return core::sensor_time_from_seconds(1.7e9 + s); }

class Recorder final : public ConditionSink {
 public:
  void on_change(std::string_view, const ConditionChange& c) override {
    if (c.kind != ConditionChange::Kind::condition) return;
    changes.emplace_back(core::to_epoch_seconds(c.time) - 1.7e9, std::string(c.check), c.active);
    priorities.push_back(c.priority);
  }
  std::vector<std::tuple<double, std::string, bool>> changes;
  std::vector<Priority> priorities;
};

AssetSpec tank() {
  AssetSpec asset;
  asset.name = "tank";
  asset.inputs.push_back({.role = "level",
                          .unit = "ft",
                          .tag = "T.LEVEL",
                          .expected_interval_s = 60,
                          .range_low = 0,
                          .range_high = 25,
                          .measurement = Measurement::level});
  asset.inputs.push_back({.role = "loop",
                          .unit = "mA",
                          .tag = "T.LOOP",
                          .expected_interval_s = 60,
                          .range_low = 4,
                          .range_high = 20});
  const auto problems = add_sensor_health_checks(asset, {});
  EXPECT_TRUE(problems.empty());
  EXPECT_TRUE(analyse_asset(asset).ok());
  return asset;
}

// Feeds both inputs every minute from `from_s` to `to_s` (exclusive) with the given values.
template <class Level, class Loop>
void feed(AssetEvaluator& evaluator, Recorder& sink, double from_s, double to_s, Level level,
          Loop loop) {
  for (double t = from_s; t < to_s; t += 60) {
    evaluator.on_sample(kLevel, level(t), Quality::good, at(t), "T.LEVEL", sink);
    evaluator.on_sample(kLoop, loop(t), Quality::good, at(t), "T.LOOP", sink);
  }
}

// A transmitter read by an RTU: a value quantised to `step` (one count of its converter).
double counts(double value, double step) { return std::round(value / step) * step; }

TEST(SensorHealthDefaults, AreStaleOutOfRangeFlatlineOnBothAndNe43OnTheLoop) {
  const AssetSpec asset = tank();
  std::vector<std::string> names;
  for (const auto& c : asset.checks) names.push_back(c.name);
  EXPECT_EQ(names, (std::vector<std::string>{"level_stale", "level_flatline", "level_out_of_range",
                                             "loop_stale", "loop_flatline", "loop_out_of_range",
                                             "loop_ne43"}));
}

TEST(SensorHealthDefaults, HealthyNoisyStreamsAndAnEmptyTankStayQuietForTwoDays) {
  const AssetSpec asset = tank();
  AssetEvaluator evaluator(asset, "Dry Creek SWD 4");
  Recorder sink;
  std::mt19937 rng(5);
  std::normal_distribution<double> noise(0.0, 1.0);
  constexpr double kDay = 86400;
  // Level: filling and emptying over a day, 0.02 ft noise, read in 0.01 ft counts; the tank is
  // empty (exactly 0, the bottom of its range) for 8 h on the second day: at rest, not stuck.
  auto level = [&](double t) {
    if (t >= 1.2 * kDay && t < 1.2 * kDay + 8 * 3600) return 0.0;
    return counts(12 + 6 * std::sin(2 * std::numbers::pi * t / kDay) + 0.02 * noise(rng), 0.01);
  };
  // Loop: 12 mA with 0.005 mA noise, read in 0.001 mA counts.
  auto loop = [&](double) { return counts(12 + 0.005 * noise(rng), 0.001); };
  feed(evaluator, sink, 0, 2 * kDay, level, loop);
  EXPECT_TRUE(sink.changes.empty()) << std::get<1>(sink.changes.front());
}

TEST(SensorHealthDefaults, AStuckLevelRaisesFlatlineAfterSixHoursAndClearsWhenItMoves) {
  const AssetSpec asset = tank();
  AssetEvaluator evaluator(asset, "Dry Creek SWD 4");
  Recorder sink;
  auto loop = [](double t) { return 12 + 0.01 * std::sin(t / 600); };
  // A frozen RTU register: 12.34 ft, bit for bit, from t = 0 for 7 h, then live again.
  feed(
      evaluator, sink, 0, 7 * 3600, [](double) { return 12.34; }, loop);
  feed(
      evaluator, sink, 7 * 3600, 7 * 3600 + 120, [](double t) { return 12 + t / 1e5; }, loop);
  ASSERT_EQ(sink.changes.size(), 2u);
  // Window: max(6 h, 100 x 1 min) = 6 h, judged on the first sample 6 h after the window began.
  EXPECT_EQ(sink.changes[0], std::make_tuple(6 * 3600.0, std::string("level_flatline"), true));
  EXPECT_EQ(sink.priorities[0], Priority::medium);
  EXPECT_EQ(sink.changes[1], std::make_tuple(7 * 3600.0, std::string("level_flatline"), false));
}

TEST(SensorHealthDefaults, ASilentLoopRaisesStaleAfterThreeIntervals) {
  const AssetSpec asset = tank();
  AssetEvaluator evaluator(asset, "Dry Creek SWD 4");
  Recorder sink;
  auto level = [](double t) { return 10 + t / 1e4; };
  feed(evaluator, sink, 0, 600, level, [](double t) { return 12 + t / 1e4; });
  // From 600 s on only the level arrives; the loop was last heard at 540 s.
  for (double t = 600; t < 900; t += 60) {
    evaluator.on_sample(kLevel, level(t), Quality::good, at(t), "T.LEVEL", sink);
  }
  ASSERT_EQ(sink.changes.size(), 1u);
  EXPECT_EQ(sink.changes[0], std::make_tuple(540 + 3 * 60.0, std::string("loop_stale"), true));
  EXPECT_EQ(sink.priorities[0], Priority::medium);
}

TEST(SensorHealthDefaults, ALevelBeyondTwoPercentOfSpanRaisesOutOfRange) {
  const AssetSpec asset = tank();
  AssetEvaluator evaluator(asset, "Dry Creek SWD 4");
  Recorder sink;
  auto loop = [](double t) { return 12 + t / 1e5; };
  // 25 ft + 2 % of 25 ft = 25.5 ft: 25.4 is inside, 25.6 is over-ranged; -0.6 is under.
  feed(
      evaluator, sink, 0, 120, [](double t) { return 25 + t / 600; }, loop);  // 25, 25.1
  feed(
      evaluator, sink, 120, 180, [](double) { return 25.4; }, loop);
  EXPECT_TRUE(sink.changes.empty());
  feed(
      evaluator, sink, 180, 240, [](double) { return 25.6; }, loop);
  feed(
      evaluator, sink, 240, 300, [](double) { return 20.0; }, loop);
  feed(
      evaluator, sink, 300, 360, [](double) { return -0.6; }, loop);
  using Change = std::tuple<double, std::string, bool>;
  EXPECT_EQ(sink.changes, (std::vector<Change>{{180, "level_out_of_range", true},
                                               {240, "level_out_of_range", false},
                                               {300, "level_out_of_range", true}}));
  EXPECT_EQ(sink.priorities[0], Priority::low);
}

// NAMUR NE 43: measurement signals 3.8-20.5 mA; failure signals at or below 3.6 mA and at or
// above 21.0 mA; between them, neither (the standard's levels).
TEST(SensorHealthDefaults, ALoopAtAnNe43FailureLevelRaisesNe43AndOnlyThere) {
  const AssetSpec asset = tank();
  AssetEvaluator evaluator(asset, "Dry Creek SWD 4");
  Recorder sink;
  double t = 0;
  std::vector<std::tuple<double, bool>> ne43;  // (mA, ne43 active after it)
  bool active = false;
  for (double mA : {12.0, 3.8, 20.5, 3.61, 20.99, 3.6, 12.0, 21.0, 22.5, 12.0, 3.2}) {
    evaluator.on_sample(kLevel, 10 + t / 1e4, Quality::good, at(t), "T.LEVEL", sink);
    evaluator.on_sample(kLoop, mA, Quality::good, at(t), "T.LOOP", sink);
    for (std::size_t i = 0; i < sink.changes.size(); ++i) {
      if (std::get<1>(sink.changes[i]) == "loop_ne43" && std::get<0>(sink.changes[i]) == t) {
        active = std::get<2>(sink.changes[i]);
        EXPECT_EQ(sink.priorities[i], Priority::medium);
      }
    }
    ne43.emplace_back(mA, active);
    t += 60;
  }
  EXPECT_EQ(ne43, (std::vector<std::tuple<double, bool>>{{12.0, false},
                                                         {3.8, false},
                                                         {20.5, false},
                                                         {3.61, false},
                                                         {20.99, false},
                                                         {3.6, true},
                                                         {12.0, false},
                                                         {21.0, true},
                                                         {22.5, true},
                                                         {12.0, false},
                                                         {3.2, true}}));
}

TEST(SensorHealthDefaults, AnUnboundOptionalInputGetsNothing) {
  AssetSpec asset;
  asset.name = "tank";
  asset.inputs.push_back({.role = "inflow",
                          .unit = "mA",
                          .required = false,
                          .expected_interval_s = 60,
                          .range_low = 4,
                          .range_high = 20});
  EXPECT_TRUE(add_sensor_health_checks(asset, {}).empty());
  EXPECT_TRUE(asset.checks.empty());
}

}  // namespace
}  // namespace bw::engine
