// The asset evaluator's contract: every sample whatever its quality, time passing in advance(),
// stale tags on event time, suppression by design, holding on bad data, implicit data-quality
// checks, and checkpoints that continue exactly as an uninterrupted run.
#include "engine/asset_evaluator.h"

#include <gtest/gtest.h>

#include <cmath>
#include <set>
#include <string>
#include <tuple>
#include <vector>

namespace bw::engine {
namespace {

core::SensorTime at(double s) { return core::sensor_time_from_seconds(1.7e9 + s); }

struct Recorded {
  double time_s;
  std::string check;
  ConditionChange::Kind kind;
  bool active;
  double value;
  std::string unit;
  std::string tag;
  std::string detail;
  Priority priority;
  std::string message;
  bool has_forecast;
  bool operator==(const Recorded&) const = default;
};

std::ostream& operator<<(std::ostream& out, const Recorded& r) {
  return out << r.time_s << " " << r.check
             << (r.kind == ConditionChange::Kind::suppression ? " suppression " : " condition ")
             << (r.active ? "active" : "clear") << " " << r.value << " " << r.unit << " [" << r.tag
             << "] " << r.detail;
}

class Recorder final : public ConditionSink {
 public:
  void on_change(std::string_view asset, const ConditionChange& c) override {
    EXPECT_EQ(asset, "pump");
    changes.push_back({core::to_epoch_seconds(c.time) - 1.7e9, std::string(c.check), c.kind,
                       c.active, c.value, std::string(c.unit), std::string(c.tag), c.detail,
                       c.priority, std::string(c.message), c.forecast.has_value()});
  }
  // (time, check, active) of condition changes, for compact expectations.
  std::vector<std::tuple<double, std::string, bool>> conditions() const {
    std::vector<std::tuple<double, std::string, bool>> out;
    for (const auto& c : changes) {
      if (c.kind == ConditionChange::Kind::condition) out.emplace_back(c.time_s, c.check, c.active);
    }
    return out;
  }
  std::vector<Recorded> changes;
};

// A pump skid: motor current [A] (range 0-100, every 10 s), speed [Hz] (every 10 s), discharge
// pressure [psi] (range 0-2000, every 10 s).
constexpr std::size_t kCurrent = 0;
constexpr std::size_t kSpeed = 1;
constexpr std::size_t kPressure = 2;

AssetSpec pump() {
  AssetSpec asset;
  asset.name = "pump";
  asset.inputs.push_back({.role = "current",
                          .unit = "A",
                          .tag = "P.AMPS",
                          .expected_interval_s = 10,
                          .range_low = 0.0,
                          .range_high = 100.0});
  asset.inputs.push_back(
      {.role = "speed", .unit = "Hz", .tag = "P.SPEED", .expected_interval_s = 10});
  asset.inputs.push_back({.role = "pressure",
                          .unit = "psi",
                          .tag = "P.PRESS",
                          .expected_interval_s = 10,
                          .range_low = 0.0,
                          .range_high = 2000.0});
  return asset;
}

CheckSpec limit(std::string name, std::string of, double value, LimitDirection direction,
                double on_delay_s = 0, double off_delay_s = 0) {
  return {.name = std::move(name),
          .kind = LimitCheckSpec{.of = std::move(of),
                                 .direction = direction,
                                 .limit = value,
                                 .deadband = 0.0,
                                 .on_delay_s = on_delay_s,
                                 .off_delay_s = off_delay_s},
          .message = "limit"};
}

TEST(AssetEvaluator, ListsConfiguredChecksThenOneQualityCheckPerBoundInput) {
  AssetSpec asset = pump();
  asset.inputs.push_back({.role = "spare", .unit = "A", .required = false});  // not bound
  CheckSpec high = limit("current_high", "current", 80, LimitDirection::high);
  high.priority = Priority::urgent;
  high.latching = true;
  asset.checks.push_back(high);
  AssetEvaluator evaluator(asset, "Dry Creek SWD 4");
  const auto checks = evaluator.checks();
  ASSERT_EQ(checks.size(), 4u);
  EXPECT_EQ(checks[0].name, "current_high");
  EXPECT_EQ(checks[0].priority, Priority::urgent);
  EXPECT_TRUE(checks[0].latching);
  EXPECT_EQ(checks[1].name, "current_quality");
  EXPECT_EQ(checks[1].priority, Priority::low);
  EXPECT_FALSE(checks[1].latching);
  EXPECT_EQ(checks[2].name, "speed_quality");
  EXPECT_EQ(checks[3].name, "pressure_quality");
}

// An on-delay that runs out between samples falls due at its deadline, and the change carries
// the deadline's time whenever advance() is called after it (common practice: on-delay timer).
TEST(AssetEvaluator, DelayRunsOutBetweenSamplesAndCarriesItsDeadline) {
  AssetSpec asset = pump();
  asset.checks.push_back(limit("pressure_high", "pressure", 1500, LimitDirection::high, 25, 0));
  AssetEvaluator evaluator(asset, "Dry Creek SWD 4");
  Recorder sink;
  evaluator.on_sample(kPressure, 1520, Quality::good, at(0), "P.PRESS", sink);
  evaluator.advance(at(24), sink);
  EXPECT_TRUE(sink.changes.empty());
  evaluator.advance(at(29), sink);
  ASSERT_EQ(sink.changes.size(), 1u);
  EXPECT_EQ(sink.changes[0].time_s, 25.0);
  EXPECT_TRUE(sink.changes[0].active);
  EXPECT_EQ(sink.changes[0].tag, "P.PRESS");
  EXPECT_EQ(sink.changes[0].unit, "psi");
  EXPECT_EQ(sink.changes[0].value, 1520.0);
}

// Stale on event time: no current sample for 3 x 10 s while other tags keep arriving.
TEST(AssetEvaluator, StaleTagIsMeasuredOnEventTimeAndClearsOnTheNextSample) {
  AssetSpec asset = pump();
  asset.checks.push_back(
      {.name = "current_stale", .kind = StaleCheckSpec{.of = "current"}, .message = "no current"});
  AssetEvaluator evaluator(asset, "Dry Creek SWD 4");
  Recorder sink;
  evaluator.on_sample(kCurrent, 40, Quality::good, at(0), "P.AMPS", sink);
  for (int t = 5; t <= 95; t += 10) {
    evaluator.on_sample(kSpeed, 50, Quality::good, at(t), "P.SPEED", sink);
  }
  ASSERT_EQ(sink.changes.size(), 1u) << sink.changes.back();
  EXPECT_EQ(sink.changes[0].time_s, 30.0);  // 0 + 3 x 10 s, though noticed at 35
  EXPECT_EQ(sink.changes[0].check, "current_stale");
  EXPECT_TRUE(sink.changes[0].active);
  EXPECT_EQ(sink.changes[0].tag, "P.AMPS");  // the silent tag
  EXPECT_EQ(sink.changes[0].detail, "no sample for 30 s (expected every 10 s)");
  evaluator.on_sample(kCurrent, 41, Quality::good, at(100), "P.AMPS", sink);
  ASSERT_EQ(sink.changes.size(), 2u);
  EXPECT_EQ(sink.changes[1].time_s, 100.0);
  EXPECT_FALSE(sink.changes[1].active);
}

TEST(AssetEvaluator, InputNeverHeardIsStaleFromTheFirstMomentSeen) {
  AssetSpec asset = pump();
  asset.checks.push_back({.name = "current_stale",
                          .kind = StaleCheckSpec{.of = "current", .factor = 2},
                          .message = "no current"});
  AssetEvaluator evaluator(asset, "Dry Creek SWD 4");
  Recorder sink;
  evaluator.advance(at(100), sink);
  evaluator.advance(at(119), sink);
  EXPECT_TRUE(sink.changes.empty());
  evaluator.advance(at(120), sink);
  EXPECT_EQ(sink.conditions(),
            (std::vector<std::tuple<double, std::string, bool>>{{120.0, "current_stale", true}}));
}

// Suppression by design: low current is expected while the pump is stopped (speed below 5 Hz).
TEST(AssetEvaluator, SuppressionHidesConditionChangesAndReportsTheTruthWhenItEnds) {
  AssetSpec asset = pump();
  CheckSpec low = limit("current_low", "current", 10, LimitDirection::low);
  low.suppressed_when = SuppressionSpec{.of = "speed", .when = LimitDirection::low, .threshold = 5};
  asset.checks.push_back(low);
  AssetEvaluator evaluator(asset, "Dry Creek SWD 4");
  Recorder sink;
  evaluator.on_sample(kSpeed, 50, Quality::good, at(0), "P.SPEED", sink);
  evaluator.on_sample(kCurrent, 40, Quality::good, at(1), "P.AMPS", sink);
  EXPECT_TRUE(sink.changes.empty());
  evaluator.on_sample(kSpeed, 0, Quality::good, at(10), "P.SPEED", sink);  // pump stops
  evaluator.on_sample(kCurrent, 0.5, Quality::good, at(11), "P.AMPS", sink);
  ASSERT_EQ(sink.changes.size(), 1u);
  EXPECT_EQ(sink.changes[0].kind, ConditionChange::Kind::suppression);
  EXPECT_TRUE(sink.changes[0].active);
  EXPECT_EQ(sink.changes[0].detail, "speed 0 Hz below 5 Hz");
  // The pump starts but the current stays low: suppression ends, the true condition follows.
  evaluator.on_sample(kSpeed, 50, Quality::good, at(20), "P.SPEED", sink);
  ASSERT_EQ(sink.changes.size(), 3u);
  EXPECT_EQ(sink.changes[1].kind, ConditionChange::Kind::suppression);
  EXPECT_FALSE(sink.changes[1].active);
  EXPECT_EQ(sink.changes[2].kind, ConditionChange::Kind::condition);
  EXPECT_TRUE(sink.changes[2].active);
  EXPECT_EQ(sink.changes[2].time_s, 20.0);
  EXPECT_EQ(sink.changes[2].value, 0.5);
  evaluator.on_sample(kCurrent, 40, Quality::good, at(21), "P.AMPS", sink);
  ASSERT_EQ(sink.changes.size(), 4u);
  EXPECT_FALSE(sink.changes[3].active);
}

TEST(AssetEvaluator, ConditionThatClearedWhileSuppressedIsReportedClearAfterwards) {
  AssetSpec asset = pump();
  CheckSpec low = limit("current_low", "current", 10, LimitDirection::low);
  low.suppressed_when = SuppressionSpec{.of = "speed", .when = LimitDirection::low, .threshold = 5};
  asset.checks.push_back(low);
  AssetEvaluator evaluator(asset, "Dry Creek SWD 4");
  Recorder sink;
  evaluator.on_sample(kSpeed, 50, Quality::good, at(0), "P.SPEED", sink);
  evaluator.on_sample(kCurrent, 2, Quality::good, at(1), "P.AMPS", sink);    // raised
  evaluator.on_sample(kSpeed, 0, Quality::good, at(10), "P.SPEED", sink);    // suppressed
  evaluator.on_sample(kCurrent, 30, Quality::good, at(11), "P.AMPS", sink);  // clears, unreported
  evaluator.on_sample(kCurrent, 3, Quality::good, at(12), "P.AMPS", sink);   // raises, unreported
  evaluator.on_sample(kCurrent, 30, Quality::good, at(13), "P.AMPS", sink);  // clears, unreported
  evaluator.on_sample(kSpeed, 50, Quality::good, at(20), "P.SPEED", sink);   // ends
  EXPECT_EQ(sink.conditions(), (std::vector<std::tuple<double, std::string, bool>>{
                                   {1.0, "current_low", true}, {20.0, "current_low", false}}));
  ASSERT_EQ(sink.changes.size(), 4u);
  EXPECT_EQ(sink.changes[3].value, 30.0);
}

// Bad quality: the checks that depend on the input hold, and "<role>_quality" is raised.
TEST(AssetEvaluator, BadQualityHoldsDependentChecksAndRaisesTheQualityCheck) {
  AssetSpec asset = pump();
  asset.signals.push_back({.name = "power",
                           .unit = "kW",
                           .op = SignalOp::linear,
                           .operands = {"current"},
                           .gain = 0.8});
  asset.checks.push_back(limit("current_high", "current", 80, LimitDirection::high));
  asset.checks.push_back(limit("power_high", "power", 64, LimitDirection::high));
  asset.checks.push_back(limit("pressure_high", "pressure", 1500, LimitDirection::high));
  AssetEvaluator evaluator(asset, "Dry Creek SWD 4");
  Recorder sink;
  evaluator.on_sample(kCurrent, 50, Quality::good, at(0), "P.AMPS", sink);
  evaluator.on_sample(kCurrent, 99, Quality::bad, at(10), "P.AMPS", sink);
  evaluator.on_sample(kCurrent, NAN, Quality::good, at(20), "P.AMPS", sink);
  evaluator.on_sample(kPressure, 1600, Quality::good, at(21), "P.PRESS", sink);  // not held
  ASSERT_EQ(sink.changes.size(), 2u) << sink.changes.back();
  const Recorded& quality = sink.changes[0];
  EXPECT_EQ(quality.check, "current_quality");
  EXPECT_TRUE(quality.active);
  EXPECT_EQ(quality.priority, Priority::low);
  EXPECT_EQ(quality.message, "Bad quality from the instrument");
  EXPECT_EQ(quality.detail, "quality bad");
  EXPECT_EQ(quality.tag, "P.AMPS");
  EXPECT_EQ(quality.value, 50.0);  // the last good value
  EXPECT_EQ(sink.changes[1].check, "pressure_high");
  // A good sample clears the quality check; checks are evaluated on it again.
  evaluator.on_sample(kCurrent, 90, Quality::good, at(30), "P.AMPS", sink);
  EXPECT_EQ(sink.conditions(),
            (std::vector<std::tuple<double, std::string, bool>>{{10.0, "current_quality", true},
                                                                {21.0, "pressure_high", true},
                                                                {30.0, "current_quality", false},
                                                                {30.0, "current_high", true},
                                                                {30.0, "power_high", true}}));
}

TEST(AssetEvaluator, BadQualityDropsAPendingDelay) {
  AssetSpec asset = pump();
  asset.checks.push_back(limit("current_high", "current", 80, LimitDirection::high, 30, 0));
  AssetEvaluator evaluator(asset, "Dry Creek SWD 4");
  Recorder sink;
  evaluator.on_sample(kCurrent, 90, Quality::good, at(0), "P.AMPS", sink);
  evaluator.on_sample(kCurrent, 90, Quality::uncertain, at(10), "P.AMPS", sink);
  evaluator.advance(at(40), sink);  // the delay would have run out at 30
  evaluator.on_sample(kCurrent, 90, Quality::good, at(45), "P.AMPS", sink);  // starts again
  evaluator.advance(at(74), sink);
  evaluator.advance(at(80), sink);
  EXPECT_EQ(sink.conditions(),
            (std::vector<std::tuple<double, std::string, bool>>{{10.0, "current_quality", true},
                                                                {45.0, "current_quality", false},
                                                                {75.0, "current_high", true}}));
  EXPECT_EQ(sink.changes[0].detail, "quality uncertain");
}

// A silent input holds its dependents like bad quality: a delay does not run out on old data.
TEST(AssetEvaluator, SilentInputHoldsDependentChecks) {
  AssetSpec asset = pump();
  asset.checks.push_back(limit("current_high", "current", 80, LimitDirection::high, 60, 0));
  AssetEvaluator evaluator(asset, "Dry Creek SWD 4");
  Recorder sink;
  evaluator.on_sample(kCurrent, 90, Quality::good, at(0), "P.AMPS", sink);
  evaluator.advance(at(100), sink);  // silent from 30 (3 x 10 s): the delay due at 60 is dropped
  EXPECT_TRUE(sink.changes.empty());
  evaluator.on_sample(kCurrent, 90, Quality::good, at(100), "P.AMPS", sink);
  evaluator.on_sample(kCurrent, 90, Quality::good, at(110), "P.AMPS", sink);
  evaluator.on_sample(kCurrent, 90, Quality::good, at(120), "P.AMPS", sink);
  evaluator.on_sample(kCurrent, 90, Quality::good, at(130), "P.AMPS", sink);
  evaluator.on_sample(kCurrent, 90, Quality::good, at(140), "P.AMPS", sink);
  evaluator.on_sample(kCurrent, 90, Quality::good, at(150), "P.AMPS", sink);
  evaluator.on_sample(kCurrent, 90, Quality::good, at(160), "P.AMPS", sink);
  EXPECT_EQ(sink.conditions(),
            (std::vector<std::tuple<double, std::string, bool>>{{160.0, "current_high", true}}));
}

// Bad samples do not update estimators: a trend fed extra bad samples with wild values reports
// exactly what it reports without them.
TEST(AssetEvaluator, BadSamplesDoNotUpdateEstimators) {
  AssetSpec asset = pump();
  asset.estimators.push_back(
      {.name = "trend", .kind = TrendSpec{.of = "pressure", .time_constant_s = 600}});
  asset.checks.push_back(
      {.name = "pressure_ahead",
       .kind = TimeToLimitCheckSpec{.estimator = "trend", .limit = 1200, .lead_time_s = 3600},
       .message = "ahead"});
  AssetEvaluator clean(asset, "Dry Creek SWD 4");
  AssetEvaluator noisy(asset, "Dry Creek SWD 4");
  Recorder clean_sink;
  Recorder noisy_sink;
  for (int i = 0; i < 200; ++i) {
    const double t = 10.0 * i;
    clean.on_sample(kPressure, 1000 + 0.5 * i, Quality::good, at(t), "P.PRESS", clean_sink);
    noisy.on_sample(kPressure, 1000 + 0.5 * i, Quality::good, at(t), "P.PRESS", noisy_sink);
    noisy.on_sample(kPressure, 5000, Quality::bad, at(t + 5), "P.PRESS", noisy_sink);
  }
  std::vector<Recorded> noisy_trend;
  for (const auto& c : noisy_sink.changes) {
    if (c.check == "pressure_ahead") noisy_trend.push_back(c);
  }
  ASSERT_FALSE(clean_sink.changes.empty());  // the ramp of 180 psi/h reaches 1200 psi in time
  EXPECT_EQ(noisy_trend, clean_sink.changes);
}

// The asset used for checkpoint tests: every kind of state an evaluator keeps.
AssetSpec busy_pump() {
  AssetSpec asset = pump();
  asset.estimators.push_back(
      {.name = "trend", .kind = TrendSpec{.of = "pressure", .time_constant_s = 600}});
  asset.checks.push_back(limit("pressure_high", "pressure", 1100, LimitDirection::high, 40, 40));
  CheckSpec low = limit("current_low", "current", 20, LimitDirection::low, 15, 15);
  low.suppressed_when = SuppressionSpec{.of = "speed", .when = LimitDirection::low, .threshold = 5};
  asset.checks.push_back(low);
  asset.checks.push_back(
      {.name = "pressure_rising",
       .kind =
           RateCheckSpec{
               .of = "pressure", .limit = 150, .horizon_s = 300, .deadband = 20, .on_delay_s = 30},
       .message = "rising"});
  asset.checks.push_back(
      {.name = "speed_stale", .kind = StaleCheckSpec{.of = "speed"}, .message = "stale"});
  asset.checks.push_back(
      {.name = "current_stuck",
       .kind = FlatlineCheckSpec{.of = "current", .tolerance = 0.2, .window_s = 300},
       .message = "stuck"});
  asset.checks.push_back(
      {.name = "pressure_ahead",
       .kind = TimeToLimitCheckSpec{.estimator = "trend", .limit = 1400, .lead_time_s = 3600},
       .message = "ahead"});
  return asset;
}

// A deterministic day at the pump: pressure rises and falls, the pump stops and starts, the
// speed transmitter goes silent for a while and the current reads bad now and then.
void feed(AssetEvaluator& evaluator, Recorder& sink, int from, int to) {
  for (int i = from; i < to; ++i) {
    const double t = 10.0 * i;
    const double pressure = 1000 + 150 * std::sin(i / 40.0) + 0.3 * i;
    const bool running = (i / 70) % 3 != 2;
    const bool speed_silent = i > 300 && i < 320;
    const double current = running ? (i % 50 < 3 ? 15.0 : 40.0 + (i % 7) * 0.3) : 0.4;
    evaluator.advance(at(t), sink);
    evaluator.on_sample(kPressure, pressure, Quality::good, at(t), "P.PRESS", sink);
    if (!speed_silent) {
      evaluator.on_sample(kSpeed, running ? 50.0 : 0.0, Quality::good, at(t + 1), "P.SPEED", sink);
    }
    const Quality quality = i % 37 == 5 ? Quality::bad : Quality::good;
    evaluator.on_sample(kCurrent, current, quality, at(t + 2), "P.AMPS", sink);
  }
}

TEST(AssetEvaluator, RestoredCheckpointContinuesExactlyLikeAnUninterruptedRun) {
  const AssetSpec asset = busy_pump();
  AssetEvaluator whole(asset, "Dry Creek SWD 4");
  Recorder whole_sink;
  feed(whole, whole_sink, 0, 600);
  // Enough happens that the comparison means something.
  std::set<std::string> seen;
  for (const auto& c : whole_sink.changes) seen.insert(c.check);
  for (const auto& name : {"pressure_high", "current_low", "pressure_rising", "speed_stale",
                           "current_stuck", "pressure_ahead", "current_quality"}) {
    EXPECT_TRUE(seen.count(name)) << name;
  }

  // Splits fall while the pump is stopped (suppressed), while the speed is silent, and between.
  for (int split : {137, 175, 302, 310, 425, 580}) {
    AssetEvaluator first(asset, "Dry Creek SWD 4");
    Recorder sink;
    feed(first, sink, 0, split);
    StateWriter out;
    first.save(out);
    AssetEvaluator second(asset, "Dry Creek SWD 4");
    StateReader in(out.bytes());
    ASSERT_TRUE(second.load(in)) << split;
    EXPECT_TRUE(in.finished());
    feed(second, sink, split, 600);
    ASSERT_EQ(sink.changes.size(), whole_sink.changes.size()) << split;
    for (std::size_t k = 0; k < sink.changes.size(); ++k) {
      EXPECT_EQ(sink.changes[k], whole_sink.changes[k]) << "split " << split << ", change " << k;
    }
  }
}

TEST(AssetEvaluator, RefusesStateOfAnotherDefinitionOrDamagedState) {
  const AssetSpec asset = busy_pump();
  AssetEvaluator evaluator(asset, "Dry Creek SWD 4");
  Recorder sink;
  feed(evaluator, sink, 0, 50);
  StateWriter out;
  evaluator.save(out);

  AssetSpec fewer = busy_pump();
  fewer.checks.pop_back();
  AssetEvaluator other(fewer, "Dry Creek SWD 4");
  StateReader wrong_shape(out.bytes());
  EXPECT_FALSE(other.load(wrong_shape));

  AssetEvaluator same(asset, "Dry Creek SWD 4");
  StateReader truncated(std::string_view(out.bytes()).substr(0, out.bytes().size() - 3));
  EXPECT_FALSE(same.load(truncated));
}

}  // namespace
}  // namespace bw::engine
