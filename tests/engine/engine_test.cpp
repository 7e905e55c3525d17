#include "engine/engine.h"

#include <gtest/gtest.h>

#include <cmath>
#include <random>

#include "test_sites.h"

namespace bw::engine {
namespace {

using testing::at_seconds;
using testing::level_asset;
using testing::RecordingSink;
using testing::site_with;

AssetSpec with_high_limit(double limit, double deadband) {
  AssetSpec asset = level_asset();
  asset.checks.push_back({.name = "level_high",
                          .kind = LimitCheckSpec{.of = "level",
                                                 .direction = LimitDirection::high,
                                                 .limit = limit,
                                                 .deadband = deadband},
                          .priority = Priority::high,
                          .message = "Tank level high"});
  return asset;
}

// Deadband behaviour is common practice in alarm management (ISA-18.2 / IEC 62682 call it
// deadband): once raised, an alert clears only when the value is back inside by the deadband.
TEST(Engine, HoveringAtTheLimitRaisesOnceAndDoesNotChatter) {
  Engine engine(site_with(with_high_limit(20.0, 0.5)));
  RecordingSink sink;
  for (int i = 0; i < 200; ++i) {
    const double v = 20.0 + ((i % 2) ? 0.1 : -0.1);  // 19.9, 20.1, 19.9, ...
    engine.process({"T.LEVEL", at_seconds(60.0 * i), v, Quality::good}, sink);
  }
  ASSERT_EQ(sink.recorded.size(), 1u);
  EXPECT_EQ(sink.recorded[0].event, AlertEvent::raised);
  EXPECT_DOUBLE_EQ(sink.recorded[0].time_s, 60.0);
  EXPECT_DOUBLE_EQ(sink.recorded[0].value, 20.1);
  EXPECT_NE(sink.recorded[0].message.find("Tank level high: 20.1 ft above limit 20 ft"),
            std::string::npos);

  engine.process({"T.LEVEL", at_seconds(60.0 * 200), 19.6, Quality::good}, sink);  // inside deadband
  EXPECT_EQ(sink.recorded.size(), 1u);
  engine.process({"T.LEVEL", at_seconds(60.0 * 201), 19.4, Quality::good}, sink);
  ASSERT_EQ(sink.recorded.size(), 2u);
  EXPECT_EQ(sink.recorded[1].event, AlertEvent::cleared);
}

TEST(Engine, LowLimitMirrorsTheHighOne) {
  AssetSpec asset = level_asset();
  asset.checks.push_back({.name = "level_low",
                          .kind = LimitCheckSpec{.of = "level", .direction = LimitDirection::low,
                                                 .limit = 2.0, .deadband = 0.5}});
  Engine engine(site_with(asset));
  RecordingSink sink;
  const double values[] = {3.0, 1.9, 2.2, 1.8, 2.4, 2.6};
  for (int i = 0; i < 6; ++i) engine.process({"T.LEVEL", at_seconds(i), values[i]}, sink);
  ASSERT_EQ(sink.recorded.size(), 2u);
  EXPECT_DOUBLE_EQ(sink.recorded[0].time_s, 1.0);
  EXPECT_EQ(sink.recorded[1].event, AlertEvent::cleared);
  EXPECT_DOUBLE_EQ(sink.recorded[1].time_s, 5.0);
}

// A tank filling at a constant rate reaches a level at (limit - level) / rate: plain
// arithmetic of a constant-rate fill (common practice). The trend of a clean ramp is exact, so
// the alert must come when the forecast first falls inside the lead time, and the forecast must
// name the true crossing time.
TEST(Engine, TimeToLimitWarnsOneLeadTimeBeforeAConstantRateFillCrossesTheLimit) {
  AssetSpec asset = level_asset();
  asset.estimators.push_back({.name = "trend", .kind = TrendSpec{.of = "level", .time_constant_s = 4 * 3600.0}});
  asset.checks.push_back({.name = "overflow_ahead",
                          .kind = TimeToLimitCheckSpec{.estimator = "trend", .limit = 20.0,
                                                       .lead_time_s = 6 * 3600.0},
                          .priority = Priority::high});
  Engine engine(site_with(asset));
  RecordingSink sink;
  const double rate_per_s = 0.5 / 3600.0;  // 0.5 ft/h from 10 ft: reaches 20 ft at 20 h
  for (int i = 0; i <= 24 * 60; ++i) {
    const double t = 60.0 * i;
    engine.process({"T.LEVEL", at_seconds(t), 10.0 + rate_per_s * t}, sink);
  }
  ASSERT_GE(sink.recorded.size(), 1u);
  const auto& raised = sink.recorded[0];
  EXPECT_EQ(raised.event, AlertEvent::raised);
  EXPECT_NEAR(raised.time_s, 14 * 3600.0, 60.0);
  ASSERT_TRUE(raised.forecast.has_value());
  EXPECT_NEAR(core::to_epoch_seconds(raised.forecast->crossing) - 1.7e9, 20 * 3600.0, 1.0);
  EXPECT_NE(raised.message.find("in about 6.0 h"), std::string::npos) << raised.message;
}

TEST(Engine, TimeToLimitStaysQuietWhenTheLevelFalls) {
  AssetSpec asset = level_asset();
  asset.estimators.push_back({.name = "trend", .kind = TrendSpec{.of = "level", .time_constant_s = 3600.0}});
  asset.checks.push_back({.name = "overflow_ahead",
                          .kind = TimeToLimitCheckSpec{.estimator = "trend", .limit = 20.0,
                                                       .lead_time_s = 6 * 3600.0}});
  Engine engine(site_with(asset));
  RecordingSink sink;
  for (int i = 0; i < 600; ++i) engine.process({"T.LEVEL", at_seconds(60.0 * i), 19.0 - 0.001 * i}, sink);
  EXPECT_TRUE(sink.recorded.empty());
}

// Standard normal draws by Box-Muller from a fixed-seed generator, identical on every platform.
class Noise {
 public:
  explicit Noise(std::uint64_t seed) : engine_(seed) {}
  double next() {
    const double u1 = (static_cast<double>(engine_() >> 11) + 0.5) * 0x1.0p-53;
    const double u2 = (static_cast<double>(engine_() >> 11) + 0.5) * 0x1.0p-53;
    return std::sqrt(-2.0 * std::log(u1)) * std::cos(6.283185307179586 * u2);
  }

 private:
  std::mt19937_64 engine_;
};

TEST(Engine, CusumCheckRaisesOnAShiftAfterLearningItsBaselineAndClearsAfter) {
  AssetSpec asset = level_asset();
  asset.estimators.push_back({.name = "shift",
                              .kind = CusumSpec{.of = "level", .k = 0.5, .h = 8.0, .max_sum = 12.0,
                                                .baseline = {.learn_s = 6 * 3600.0}}});
  asset.checks.push_back({.name = "level_shift", .kind = StatisticalCheckSpec{.estimator = "shift"}});
  Engine engine(site_with(asset));
  RecordingSink sink;
  Noise noise(7);
  int i = 0;
  auto feed = [&](int count, double mean) {
    for (int n = 0; n < count; ++n, ++i) {
      engine.process({"T.LEVEL", at_seconds(60.0 * i), mean + 0.2 * noise.next()}, sink);
    }
  };
  feed(60 * 9, 10.0);  // six hours of learning, three more in control
  EXPECT_TRUE(sink.recorded.empty()) << "no alert on stationary noise (seed 7)";
  feed(60, 10.4);  // a 2-sigma step for an hour
  ASSERT_EQ(sink.recorded.size(), 1u);
  EXPECT_EQ(sink.recorded[0].event, AlertEvent::raised);
  // Siegmund's approximation (REFERENCES.md; from memory) gives an ARL of about 6 samples at a
  // 2-sigma shift for k = 0.5, h = 8; a generous bound of 20 samples keeps this test about the
  // wiring, not the run-length distribution.
  EXPECT_LT(sink.recorded[0].time_s - 60.0 * 9 * 60, 20 * 60.0);
  feed(120, 10.0);
  ASSERT_EQ(sink.recorded.size(), 2u);
  EXPECT_EQ(sink.recorded[1].event, AlertEvent::cleared);
}

TEST(Engine, OneTagFeedsEveryAssetBoundToIt) {
  SiteSpec site = site_with(with_high_limit(5.0, 0.0));
  AssetSpec second = with_high_limit(7.0, 0.0);
  second.name = "tank_b";
  site.assets.push_back(second);
  Engine engine(std::move(site));
  RecordingSink sink;
  engine.process({"T.LEVEL", at_seconds(0), 8.0}, sink);
  ASSERT_EQ(sink.recorded.size(), 2u);
  EXPECT_EQ(sink.recorded[0].asset, "tank");
  EXPECT_EQ(sink.recorded[1].asset, "tank_b");
}

TEST(Engine, BadQualityRaisesTheDataQualityAlertInsteadOfTheProcessAlert) {
  Engine engine(site_with(with_high_limit(5.0, 0.0)));
  RecordingSink sink;
  engine.process({"OTHER", at_seconds(0), 9.0}, sink);
  engine.process({"OTHER", at_seconds(1), 9.0}, sink);
  engine.process({"T.LEVEL", at_seconds(2), 9.0, Quality::bad}, sink);
  engine.process({"T.LEVEL", at_seconds(3), 9.0, Quality::uncertain}, sink);
  engine.process({"T.LEVEL", at_seconds(4), NAN}, sink);
  ASSERT_EQ(sink.recorded.size(), 1u);
  EXPECT_EQ(sink.recorded[0].check, "level_quality");
  EXPECT_EQ(sink.recorded[0].event, AlertEvent::raised);
  const auto& c = engine.counters();
  EXPECT_EQ(c.samples, 5u);
  EXPECT_EQ(c.unknown_tag, 2u);
  EXPECT_EQ(c.not_good, 2u);
  EXPECT_EQ(c.non_finite, 1u);
  EXPECT_EQ(c.evaluated, 2u);  // the bad samples reach the asset, which holds its checks
  EXPECT_EQ(c.first_unknown_tags, std::vector<std::string>{"OTHER"});
  // A good sample clears the data-quality alert and lets the limit speak.
  engine.process({"T.LEVEL", at_seconds(5), 9.0}, sink);
  ASSERT_EQ(sink.recorded.size(), 3u);
  EXPECT_EQ(sink.recorded[1].check, "level_quality");
  EXPECT_EQ(sink.recorded[1].event, AlertEvent::cleared);
  EXPECT_EQ(sink.recorded[2].check, "level_high");
  EXPECT_EQ(sink.recorded[2].event, AlertEvent::raised);
}

TEST(Engine, DerivedSignalsHoldTheirOtherOperands) {
  AssetSpec asset = level_asset();
  asset.inputs.push_back({.role = "flow", .unit = "bbl/d", .tag = "T.FLOW"});
  asset.signals.push_back({.name = "per_flow", .unit = "ft/(bbl/d)", .op = SignalOp::ratio,
                           .operands = {"level", "flow"}, .exponent = 2.0});
  asset.checks.push_back({.name = "high", .kind = LimitCheckSpec{.of = "per_flow", .limit = 1.0}});
  Engine engine(site_with(asset));
  RecordingSink sink;
  engine.process({"T.LEVEL", at_seconds(0), 8.0}, sink);  // no flow yet: nothing computed
  engine.process({"T.FLOW", at_seconds(1), 4.0}, sink);   // 8 / 4^2 = 0.5
  engine.process({"T.FLOW", at_seconds(2), 2.0}, sink);   // 8 / 2^2 = 2 > 1
  ASSERT_EQ(sink.recorded.size(), 1u);
  EXPECT_DOUBLE_EQ(sink.recorded[0].value, 2.0);
  EXPECT_DOUBLE_EQ(sink.recorded[0].time_s, 2.0);
  engine.process({"T.FLOW", at_seconds(3), 0.0}, sink);  // not finite: not propagated
  EXPECT_EQ(sink.recorded.size(), 1u);
}

TEST(Engine, SameSamplesGiveTheSameTransitionsBitForBit) {
  AssetSpec asset = with_high_limit(10.5, 0.2);
  asset.estimators.push_back({.name = "trend", .kind = TrendSpec{.of = "level", .time_constant_s = 1800.0}});
  asset.checks.push_back({.name = "ahead", .kind = TimeToLimitCheckSpec{.estimator = "trend", .limit = 10.5,
                                                                        .lead_time_s = 3600.0}});
  auto run = [&]() {
    Engine engine(site_with(asset));
    RecordingSink sink;
    Noise noise(11);
    for (int i = 0; i < 5000; ++i) {
      const double v = 10.0 + 0.6 * std::sin(i / 300.0) + 0.05 * noise.next();
      engine.process({"T.LEVEL", at_seconds(30.0 * i), v}, sink);
    }
    return sink.recorded;
  };
  const auto first = run();
  const auto second = run();
  ASSERT_GT(first.size(), 4u);
  ASSERT_EQ(first.size(), second.size());
  for (std::size_t i = 0; i < first.size(); ++i) {
    EXPECT_EQ(first[i].time_s, second[i].time_s);
    EXPECT_EQ(first[i].value, second[i].value);
    EXPECT_EQ(first[i].message, second[i].message);
  }
}

}  // namespace
}  // namespace bw::engine

namespace bw::engine {
namespace {

// A stale tag is raised by time passing (the engine's clock moves with other tags' samples in
// replay), and its journal cause says so.
TEST(Engine, AStaleTagIsRaisedBySilenceAndClearedByTheNextSample) {
  AssetSpec asset = testing::level_asset();
  asset.inputs[0].expected_interval_s = 60;
  asset.inputs.push_back({.role = "flow", .unit = "bbl/d", .tag = "T.FLOW"});
  asset.checks.push_back({.name = "level_stale", .kind = StaleCheckSpec{.of = "level", .factor = 3}});
  Engine engine(testing::site_with(asset));
  testing::RecordingSink sink;
  engine.process({"T.LEVEL", testing::at_seconds(0), 5.0}, sink);
  for (int i = 1; i <= 10; ++i) engine.process({"T.FLOW", testing::at_seconds(60.0 * i), 100.0}, sink);
  ASSERT_EQ(sink.recorded.size(), 1u);
  EXPECT_EQ(sink.recorded[0].check, "level_stale");
  EXPECT_EQ(sink.recorded[0].cause, TransitionCause::silence);
  EXPECT_DOUBLE_EQ(sink.recorded[0].time_s, 180.0);  // three expected intervals after the last
  EXPECT_EQ(sink.recorded[0].to, AlertState::unacknowledged);
  engine.process({"T.LEVEL", testing::at_seconds(660), 5.0}, sink);
  ASSERT_EQ(sink.recorded.size(), 2u);
  EXPECT_EQ(sink.recorded[1].event, AlertEvent::cleared);
  EXPECT_EQ(sink.recorded[1].cause, TransitionCause::sample);
  EXPECT_EQ(sink.recorded[1].to, AlertState::returned_unacknowledged);
}

}  // namespace
}  // namespace bw::engine
