#include "engine/asset_graph.h"

#include <gtest/gtest.h>

#include "test_sites.h"

namespace bw::engine {
namespace {

using testing::level_asset;

bool mentions(const AssetGraph& graph, const std::string& text) {
  for (const auto& p : graph.problems) {
    if (p.message.find(text) != std::string::npos) return true;
  }
  return false;
}

TEST(AssetGraph, OrdersEstimatorsAfterTheSignalsTheyRead) {
  AssetSpec asset = level_asset();
  // Listed out of order on purpose: the trend reads "volume", defined after it.
  asset.estimators.push_back({.name = "trend", .kind = TrendSpec{.of = "volume", .time_constant_s = 60}});
  asset.signals.push_back({.name = "volume", .op = SignalOp::linear, .operands = {"level"}, .gain = 20});
  asset.signals.push_back({.name = "slope_bbl", .op = SignalOp::linear, .operands = {"trend.slope_per_hour"}});
  const AssetGraph graph = analyse_asset(asset);
  ASSERT_TRUE(graph.ok()) << graph.problems[0].message;
  ASSERT_EQ(graph.order.size(), 3u);
  EXPECT_EQ(graph.order[0], (GraphNode{GraphNode::Kind::signal, 0}));
  EXPECT_EQ(graph.order[1], (GraphNode{GraphNode::Kind::estimator, 0}));
  EXPECT_EQ(graph.order[2], (GraphNode{GraphNode::Kind::signal, 1}));
}

TEST(AssetGraph, ReportsACycle) {
  AssetSpec asset = level_asset();
  asset.signals.push_back({.name = "a", .op = SignalOp::sum, .operands = {"level", "b"}});
  asset.signals.push_back({.name = "b", .op = SignalOp::linear, .operands = {"a"}});
  EXPECT_TRUE(mentions(analyse_asset(asset), "cycle"));
}

TEST(AssetGraph, ReportsReferencesToNothing) {
  AssetSpec asset = level_asset();
  asset.signals.push_back({.name = "a", .op = SignalOp::linear, .operands = {"levle"}});
  asset.estimators.push_back({.name = "e", .kind = EwmaSpec{.of = "level", .time_constant_s = 5}});
  asset.checks.push_back({.name = "c", .kind = LimitCheckSpec{.of = "e.median", .limit = 1}});
  const AssetGraph graph = analyse_asset(asset);
  EXPECT_TRUE(mentions(graph, "'levle' names no input"));
  EXPECT_TRUE(mentions(graph, "has no output 'median'; it has: mean, stddev"));
  EXPECT_EQ(graph.problems.size(), 2u);
}

TEST(AssetGraph, RequiresAnEstimatorOfTheRightKindForEachCheck) {
  AssetSpec asset = level_asset();
  asset.estimators.push_back({.name = "e", .kind = EwmaSpec{.of = "level", .time_constant_s = 5}});
  asset.checks.push_back({.name = "stat", .kind = StatisticalCheckSpec{.estimator = "e"}});
  asset.checks.push_back({.name = "ttl", .kind = TimeToLimitCheckSpec{.estimator = "nothing"}});
  const AssetGraph graph = analyse_asset(asset);
  EXPECT_TRUE(mentions(graph, "needs a cusum or ewma_chart estimator, but 'e' is a ewma"));
  EXPECT_TRUE(mentions(graph, "names estimator 'nothing'"));
}

TEST(AssetGraph, ReportsDuplicateNamesAndUnboundRequiredInputs) {
  AssetSpec asset = level_asset();
  asset.inputs[0].tag.clear();
  asset.signals.push_back({.name = "level", .op = SignalOp::linear, .operands = {"level"}});
  const AssetGraph graph = analyse_asset(asset);
  EXPECT_TRUE(mentions(graph, "defined twice"));
  EXPECT_TRUE(mentions(graph, "is not bound to a tag"));
}

TEST(AssetGraph, AnEstimatorNameAloneIsNotASignal) {
  AssetSpec asset = level_asset();
  asset.estimators.push_back({.name = "smooth", .kind = EwmaSpec{.of = "level", .time_constant_s = 5}});
  asset.checks.push_back({.name = "c", .kind = LimitCheckSpec{.of = "smooth", .limit = 1}});
  EXPECT_TRUE(mentions(analyse_asset(asset), "e.g. 'smooth.mean'"));
}

TEST(AssetGraph, RestartOnMustNameAFilterLifeEstimatorAndOrdersItFirst) {
  AssetSpec asset = level_asset();
  asset.estimators.push_back({.name = "trend",
                              .kind = TrendSpec{.of = "level", .time_constant_s = 60},
                              .restart_on = "life"});
  asset.estimators.push_back(
      {.name = "life", .kind = FilterLifeSpec{.of = "level", .flow = "level"}});
  const AssetGraph graph = analyse_asset(asset);
  ASSERT_TRUE(graph.ok()) << graph.problems[0].message;
  ASSERT_EQ(graph.order.size(), 2u);
  EXPECT_EQ(graph.order[0], (GraphNode{GraphNode::Kind::estimator, 1}));  // life before trend

  AssetSpec wrong = level_asset();
  wrong.estimators.push_back({.name = "smooth", .kind = EwmaSpec{.of = "level", .time_constant_s = 5}});
  wrong.estimators.push_back({.name = "trend",
                              .kind = TrendSpec{.of = "level", .time_constant_s = 60},
                              .restart_on = "smooth"});
  wrong.estimators.push_back({.name = "rate",
                              .kind = RateSpec{.of = "level", .time_constant_s = 60},
                              .restart_on = "nothing"});
  const AssetGraph bad = analyse_asset(wrong);
  EXPECT_TRUE(mentions(bad, "restart_on 'smooth' is a ewma, which recognises no events"));
  EXPECT_TRUE(mentions(bad, "restart_on 'nothing' names no estimator"));
}

TEST(AssetGraph, GateAndRatioTakeTwoOperands) {
  AssetSpec asset = level_asset();
  asset.signals.push_back({.name = "g", .op = SignalOp::gate, .operands = {"level"}});
  EXPECT_TRUE(mentions(analyse_asset(asset), "signal 'g' (gate) takes exactly 2 operands, not 1"));
}

}  // namespace
}  // namespace bw::engine

namespace bw::engine {
namespace {

TEST(AssetGraph, ChecksOperandCountsOfDerivedSignals) {
  AssetSpec asset = testing::level_asset();
  asset.signals.push_back({.name = "r", .op = SignalOp::ratio, .operands = {"level"}});
  asset.signals.push_back({.name = "g", .op = SignalOp::linear, .operands = {"level", "level"}});
  const AssetGraph graph = analyse_asset(asset);
  ASSERT_EQ(graph.problems.size(), 2u);
  EXPECT_NE(graph.problems[0].message.find("(ratio) takes exactly 2 operands, not 1"), std::string::npos);
  EXPECT_NE(graph.problems[1].message.find("(linear) takes exactly 1 operand, not 2"), std::string::npos);
}

}  // namespace
}  // namespace bw::engine
