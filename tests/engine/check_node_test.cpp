// Check kinds on hand-built sequences: limits with deadband and delays, measurement-type
// defaults, rate of change, flatline, out of range, NAMUR NE 43 failure levels, and the
// reference rules that the asset graph applies to them.
#include "engine/check_node.h"

#include <gtest/gtest.h>

#include <vector>

#include "engine/asset_graph.h"
#include "engine/check_settings.h"
#include "engine/threshold_condition.h"

namespace bw::engine {
namespace {

core::SensorTime at(double s) { return core::sensor_time_from_seconds(1.7e9 + s); }
double seconds_of(core::SensorTime t) { return core::to_epoch_seconds(t) - 1.7e9; }

// One asset with input "level" [ft], range [0, 25], and the given measurement type.
AssetSpec tank(Measurement measurement = Measurement::other) {
  AssetSpec asset;
  asset.name = "tank";
  asset.inputs.push_back({.role = "level",
                          .unit = "ft",
                          .tag = "T.LEVEL",
                          .range_low = 0.0,
                          .range_high = 25.0,
                          .measurement = measurement});
  return asset;
}

// A check node fed by hand: set `value`, call feed(t).
struct Probe {
  Probe(const AssetSpec& asset, CheckKind kind, std::string_view unit = "ft")
      : spec{.name = "probe", .kind = std::move(kind)},
        node(make_check_node(asset, spec, {.value = &value, .unit = unit})) {}

  std::optional<CheckOutcome> feed(double v, double t) {
    value = v;
    return node->evaluate(at(t));
  }

  CheckSpec spec;
  double value = 0;
  std::unique_ptr<CheckNode> node;
};

// Feeds (time, value) pairs; returns the times at which the condition changed, negative for a
// clear (-t), positive for a raise.
std::vector<double> run(Probe& probe, const std::vector<std::pair<double, double>>& samples) {
  std::vector<double> changes;
  for (auto [t, v] : samples) {
    if (auto outcome = probe.feed(v, t)) changes.push_back(outcome->active ? t : -t);
  }
  return changes;
}

// Deadband behaviour is common practice in alarm management: once raised, a limit alert clears
// only when the value is back inside by the deadband.
TEST(LimitCheck, HoveringAtTheLimitRaisesOnceAndDoesNotChatter) {
  Probe probe(tank(), LimitCheckSpec{.of = "level", .limit = 18.0, .deadband = 0.5});
  const auto changes = run(probe, {{0, 17.9},
                                   {10, 18.1},
                                   {20, 17.95},
                                   {30, 18.05},
                                   {40, 17.8},
                                   {50, 18.2},
                                   {60, 17.6},
                                   {70, 18.01},
                                   {80, 17.4},
                                   {90, 17.9}});
  EXPECT_EQ(changes, (std::vector<double>{10, -80}));
}

TEST(LimitCheck, LowLimitClearsAboveTheLimitPlusDeadband) {
  Probe probe(tank(),
              LimitCheckSpec{
                  .of = "level", .direction = LimitDirection::low, .limit = 2.0, .deadband = 0.5});
  EXPECT_EQ(run(probe, {{0, 2.1}, {10, 1.9}, {20, 2.4}, {30, 1.5}, {40, 2.6}}),
            (std::vector<double>{10, -40}));
}

// On-delay (common practice): a value must stay beyond the limit for the delay to raise. A value
// dipping in and out every 10 s with a 60 s on-delay never raises.
TEST(LimitCheck, OnDelayIgnoresExcursionsShorterThanTheDelay) {
  Probe probe(
      tank(),
      LimitCheckSpec{
          .of = "level", .limit = 18.0, .deadband = 0.0, .on_delay_s = 60.0, .off_delay_s = 0.0});
  std::vector<std::pair<double, double>> hovering;
  for (int i = 0; i < 30; ++i) hovering.push_back({10.0 * i, i % 2 == 0 ? 18.1 : 17.9});
  EXPECT_TRUE(run(probe, hovering).empty());
  EXPECT_FALSE(probe.node->deadline().has_value());  // the last value was inside
}

TEST(LimitCheck, OnDelayRaisesWhenTheValueStaysBeyond) {
  Probe probe(
      tank(),
      LimitCheckSpec{
          .of = "level", .limit = 18.0, .deadband = 0.0, .on_delay_s = 60.0, .off_delay_s = 0.0});
  EXPECT_FALSE(probe.feed(18.3, 100));
  ASSERT_TRUE(probe.node->deadline().has_value());
  EXPECT_DOUBLE_EQ(seconds_of(*probe.node->deadline()), 160.0);
  EXPECT_FALSE(probe.feed(18.4, 130));  // still beyond: the delay keeps its start
  EXPECT_DOUBLE_EQ(seconds_of(*probe.node->deadline()), 160.0);
  const auto raised = probe.feed(18.2, 160);
  ASSERT_TRUE(raised.has_value());
  EXPECT_TRUE(raised->active);
  EXPECT_EQ(raised->detail, "18.2 ft above limit 18 ft for 60 s");
}

// Off-delay (common practice): the value must stay back inside (by the deadband) for the delay.
TEST(LimitCheck, OffDelayNeedsTheValueToStayBackInside) {
  Probe probe(
      tank(),
      LimitCheckSpec{
          .of = "level", .limit = 18.0, .deadband = 0.5, .on_delay_s = 0.0, .off_delay_s = 30.0});
  EXPECT_EQ(run(probe, {{0, 18.5},     // raise at once
                        {10, 17.0},    // back inside: clear pending until 40
                        {20, 17.7},    // inside the limit but within the deadband: cancelled
                        {30, 17.2},    // pending again, until 60
                        {50, 17.3}}),  // not yet
            (std::vector<double>{0}));
  ASSERT_TRUE(probe.node->deadline().has_value());
  EXPECT_DOUBLE_EQ(seconds_of(*probe.node->deadline()), 60.0);
  const auto cleared = probe.node->expire(*probe.node->deadline());
  ASSERT_TRUE(cleared.has_value());
  EXPECT_FALSE(cleared->active);
  EXPECT_FALSE(probe.node->deadline().has_value());
}

TEST(LimitCheck, CancelledPendingChangeStartsAgain) {
  Probe probe(
      tank(),
      LimitCheckSpec{
          .of = "level", .limit = 18.0, .deadband = 0.0, .on_delay_s = 60.0, .off_delay_s = 0.0});
  EXPECT_FALSE(probe.feed(18.3, 0));
  probe.node->cancel_pending();  // what the evaluator does when the data turn bad
  EXPECT_FALSE(probe.node->deadline().has_value());
  EXPECT_FALSE(probe.feed(18.3, 70));  // the delay starts again at 70
  EXPECT_DOUBLE_EQ(seconds_of(*probe.node->deadline()), 130.0);
}

// A deadband in percent of span: 4 % of the 0-25 ft range is 1 ft (plain arithmetic).
TEST(LimitCheck, DeadbandInPercentOfSpan) {
  Probe probe(tank(), LimitCheckSpec{.of = "level", .limit = 18.0, .deadband_percent = 4.0});
  EXPECT_EQ(run(probe, {{0, 18.2}, {10, 17.1}, {20, 17.01}, {30, 16.99}}),
            (std::vector<double>{0, -30}));
}

struct DefaultsRow {
  Measurement measurement;
  double deadband;  // ft, for the 0-25 ft span
  double delay_s;
};

// Defaults by measurement type: common practice in alarm management, from memory (the widely
// published ISA-18.2 guidance tables): flow 5 %, 15 s; level 5 %, 60 s; pressure 2 %, 15 s;
// temperature 1 %, 60 s; differential pressure like pressure; current 2 %, 15 s (an assumption).
TEST(LimitSettings, DefaultsFollowTheMeasurementType) {
  const DefaultsRow rows[] = {
      {Measurement::flow, 1.25, 15},
      {Measurement::level, 1.25, 60},
      {Measurement::pressure, 0.5, 15},
      {Measurement::temperature, 0.25, 60},
      {Measurement::differential_pressure, 0.5, 15},
      {Measurement::current, 0.5, 15},
      {Measurement::other, 0.0, 0},
  };
  for (const auto& row : rows) {
    const auto settings = limit_settings(tank(row.measurement), {.of = "level", .limit = 18});
    ASSERT_TRUE(settings.ok()) << measurement_name(row.measurement);
    EXPECT_DOUBLE_EQ(settings->deadband, row.deadband) << measurement_name(row.measurement);
    EXPECT_DOUBLE_EQ(settings->on_delay_s, row.delay_s) << measurement_name(row.measurement);
    EXPECT_DOUBLE_EQ(settings->off_delay_s, row.delay_s) << measurement_name(row.measurement);
  }
}

TEST(LimitSettings, GivenValuesOverrideTheDefaults) {
  const auto settings = limit_settings(
      tank(Measurement::level),
      {.of = "level", .limit = 18, .deadband = 0.3, .on_delay_s = 5.0, .off_delay_s = 0.0});
  ASSERT_TRUE(settings.ok());
  EXPECT_DOUBLE_EQ(settings->deadband, 0.3);
  EXPECT_DOUBLE_EQ(settings->on_delay_s, 5.0);
  EXPECT_DOUBLE_EQ(settings->off_delay_s, 0.0);
}

// With the level defaults (60 s on-delay, 1.25 ft deadband) a brief excursion does not raise.
TEST(LimitCheck, MeasurementDefaultsApplyToTheNode) {
  Probe probe(tank(Measurement::level), LimitCheckSpec{.of = "level", .limit = 18.0});
  EXPECT_EQ(run(probe, {{0, 18.5},
                        {50, 18.6},
                        {55, 17.9},
                        {100, 18.5},
                        {160, 18.4},
                        {170, 17.0},
                        {240, 16.9},
                        {250, 16.7},
                        {310, 16.7}}),
            (std::vector<double>{160, -310}));
}

// The rate of a constant-rate fill is plain arithmetic (common practice): 0.5 ft every minute is
// 30 ft/h. The smoothed rate of an exact straight line is exact.
TEST(RateCheck, ConstantRateFillIsMeasuredInUnitsPerHour) {
  Probe rising(tank(), RateCheckSpec{.of = "level", .limit = 25.0, .horizon_s = 600.0});
  std::optional<CheckOutcome> raised;
  double raised_at = -1;
  for (int i = 0; i <= 30 && !raised; ++i) {
    raised = rising.feed(2.0 + 0.5 * i, 60.0 * i);
    raised_at = 60.0 * i;
  }
  ASSERT_TRUE(raised.has_value());
  EXPECT_TRUE(raised->active);
  EXPECT_NEAR(raised->value, 30.0, 1e-6);
  EXPECT_DOUBLE_EQ(raised_at, 600.0);  // the rate speaks after one horizon of data
  EXPECT_EQ(raised->detail, "rate of change 30 ft/h above limit 25 ft/h");

  Probe slower(tank(), RateCheckSpec{.of = "level", .limit = 35.0, .horizon_s = 600.0});
  for (int i = 0; i <= 30; ++i) EXPECT_FALSE(slower.feed(2.0 + 0.5 * i, 60.0 * i));
}

TEST(RateCheck, FallingDirectionWatchesTheNegativeRate) {
  Probe falling(tank(), RateCheckSpec{.of = "level",
                                      .direction = RateDirection::falling,
                                      .limit = 25.0,
                                      .horizon_s = 600.0,
                                      .deadband = 5.0});
  std::vector<std::pair<double, double>> draining;
  for (int i = 0; i <= 20; ++i) draining.push_back({60.0 * i, 20.0 - 0.5 * i});  // -30 ft/h
  const auto changes = run(falling, draining);
  EXPECT_EQ(changes, (std::vector<double>{600}));
  // Level then held still: the rate decays toward 0 and clears once above -25 + 5 = -20 ft/h.
  double cleared_at = -1;
  for (int i = 21; i <= 60 && cleared_at < 0; ++i) {
    if (auto outcome = falling.feed(10.0, 60.0 * i)) {
      EXPECT_FALSE(outcome->active);
      EXPECT_GT(outcome->value, -20.0);
      cleared_at = 60.0 * i;
    }
  }
  EXPECT_GT(cleared_at, 0);
}

// A stuck transmitter (common practice): a value within the tolerance for the whole window.
TEST(FlatlineCheck, StuckSequenceRaisesAfterTheWindow) {
  Probe probe(tank(), FlatlineCheckSpec{.of = "level", .tolerance = 0.01, .window_s = 3600});
  std::vector<std::pair<double, double>> stuck;
  for (int i = 0; i <= 70; ++i) stuck.push_back({60.0 * i, 12.30 + (i % 3) * 0.004});
  EXPECT_EQ(run(probe, stuck), (std::vector<double>{3600}));
  const auto moved = probe.feed(12.40, 71 * 60.0);
  ASSERT_TRUE(moved.has_value());
  EXPECT_FALSE(moved->active);
}

TEST(FlatlineCheck, SlowlyMovingSequenceNeverRaises) {
  Probe probe(tank(), FlatlineCheckSpec{.of = "level", .tolerance = 0.05, .window_s = 3600});
  std::vector<std::pair<double, double>> moving;
  for (int i = 0; i <= 300; ++i) moving.push_back({60.0 * i, 10.0 + 0.002 * i});  // 0.12 ft/h
  EXPECT_TRUE(run(probe, moving).empty());
}

TEST(OutOfRangeCheck, ValueOutsideTheInstrumentRange) {
  Probe probe(tank(), OutOfRangeCheckSpec{.of = "level"});
  EXPECT_EQ(run(probe, {{0, 25.0}, {10, 25.01}, {20, 24.0}, {30, 0.0}, {40, -0.1}, {50, 3.0}}),
            (std::vector<double>{10, -20, 40, -50}));
}

TEST(OutOfRangeCheck, MarginWidensTheRangeByPercentOfSpan) {
  Probe probe(tank(), OutOfRangeCheckSpec{.of = "level", .margin_percent = 2.0});  // 0.5 ft
  EXPECT_EQ(run(probe, {{0, 25.4}, {10, -0.4}, {20, 25.6}, {30, 25.4}, {40, -0.6}}),
            (std::vector<double>{20, -30, 40}));
}

AssetSpec loop_current() {
  AssetSpec asset;
  asset.name = "pump";
  asset.inputs.push_back({.role = "loop", .unit = "mA", .tag = "P.LOOP"});
  return asset;
}

struct Ne43Row {
  double milliamps;
  bool failure;
  const char* words;  // part of the detail when it is a failure
};

// NAMUR NE 43 (REFERENCES.md "Instruments"): failure at or below 3.6 mA or at or above 21.0 mA;
// 3.6-3.8 mA and 20.5-21.0 mA are outside the measurement range but not failure signals.
TEST(Ne43Check, FailureLevels) {
  const Ne43Row rows[] = {
      {3.59, true, "low failure"},
      {3.6, true, "low failure"},
      {3.7, false, ""},
      {12.0, false, ""},
      {20.9, false, ""},
      {21.0, true, "high failure"},
      {22.5, true, "high failure"},
  };
  for (const auto& row : rows) {
    Probe probe(loop_current(), Ne43CheckSpec{.of = "loop"}, "mA");
    const auto outcome = probe.feed(row.milliamps, 0);
    EXPECT_EQ(outcome.has_value(), row.failure) << row.milliamps;
    if (outcome) {
      EXPECT_TRUE(outcome->active);
      EXPECT_NE(outcome->detail.find(row.words), std::string::npos) << outcome->detail;
    }
  }
}

TEST(Ne43Check, ClearsWhenTheCurrentReturnsToAMeasuringLevel) {
  Probe probe(loop_current(), Ne43CheckSpec{.of = "loop"}, "mA");
  EXPECT_EQ(run(probe, {{0, 3.5}, {10, 3.7}, {20, 21.3}, {30, 20.6}}),
            (std::vector<double>{0, -10, 20, -30}));
}

TEST(CheckNode, SaveAndLoadContinueThePendingDelay) {
  const LimitCheckSpec spec{
      .of = "level", .limit = 18.0, .deadband = 0.5, .on_delay_s = 60.0, .off_delay_s = 0.0};
  Probe original(tank(), spec);
  EXPECT_FALSE(original.feed(18.4, 10));
  StateWriter out;
  original.node->save(out);
  Probe restored(tank(), spec);
  StateReader in(out.bytes());
  ASSERT_TRUE(restored.node->load(in));
  EXPECT_TRUE(in.finished());
  ASSERT_TRUE(restored.node->deadline().has_value());
  EXPECT_DOUBLE_EQ(seconds_of(*restored.node->deadline()), 70.0);
  EXPECT_TRUE(restored.feed(18.4, 70).has_value());
}

bool mentions(const AssetGraph& graph, const std::string& text) {
  for (const auto& p : graph.problems) {
    if (p.message.find(text) != std::string::npos) return true;
  }
  return false;
}

TEST(CheckReferences, DeadbandPercentNeedsAnInputWithARange) {
  AssetSpec asset = tank();
  asset.signals.push_back({.name = "volume", .unit = "bbl", .operands = {"level"}, .gain = 20});
  asset.checks.push_back(
      {.name = "big", .kind = LimitCheckSpec{.of = "volume", .limit = 1, .deadband_percent = 2}});
  EXPECT_TRUE(mentions(analyse_asset(asset), "'volume' is not an input (only inputs have ranges)"));

  AssetSpec no_range = tank(Measurement::level);
  no_range.inputs[0].range_low.reset();
  no_range.inputs[0].range_high.reset();
  no_range.checks.push_back({.name = "high", .kind = LimitCheckSpec{.of = "level", .limit = 1}});
  EXPECT_TRUE(mentions(analyse_asset(no_range),
                       "the default deadband of a level input (5 % of span) needs a range"));
}

TEST(CheckReferences, DataQualityChecksNeedFittingInputs) {
  AssetSpec asset = tank();
  asset.inputs[0].range_low.reset();
  asset.inputs[0].range_high.reset();
  asset.signals.push_back({.name = "volume", .unit = "bbl", .operands = {"level"}, .gain = 20});
  asset.checks.push_back({.name = "a", .kind = StaleCheckSpec{.of = "level"}});
  asset.checks.push_back({.name = "b", .kind = OutOfRangeCheckSpec{.of = "level"}});
  asset.checks.push_back({.name = "c", .kind = Ne43CheckSpec{.of = "level"}});
  asset.checks.push_back(
      {.name = "d", .kind = FlatlineCheckSpec{.of = "volume", .tolerance = 1, .window_s = 1}});
  asset.checks.push_back(
      {.name = "level_quality", .kind = LimitCheckSpec{.of = "level", .limit = 1}});
  const AssetGraph graph = analyse_asset(asset);
  EXPECT_EQ(graph.problems.size(), 5u);
  EXPECT_TRUE(mentions(graph, "declares no expected_interval"));
  EXPECT_TRUE(mentions(graph, "declares no range to be out of"));
  EXPECT_TRUE(mentions(graph, "NE 43 failure levels apply to a raw current in 'mA'"));
  EXPECT_TRUE(mentions(graph, "'volume', which is not an input"));
  EXPECT_TRUE(mentions(graph, "taken by the data-quality check of input 'level'"));
}

}  // namespace
}  // namespace bw::engine
