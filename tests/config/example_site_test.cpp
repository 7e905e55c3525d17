// The shipped example site and the shipped tank_level template load and compile as documented.
#include <gtest/gtest.h>

#include <cmath>
#include <numbers>

#include "config/site_loader.h"
#include "spec_lookup.h"

namespace bw::config {
namespace {

using namespace bw::config::testing;
using engine::CusumSpec;
using engine::LimitCheckSpec;
using engine::LimitDirection;
using engine::Priority;
using engine::RateSpec;
using engine::StatisticalCheckSpec;
using engine::TimeToLimitCheckSpec;
using engine::TrendSpec;

const std::string kExampleSite = BRINEWATCH_SOURCE_DIR "/config-examples/dry-creek-swd4.yaml";
const std::string kShippedRules = BRINEWATCH_SOURCE_DIR "/rules";

class ExampleSite : public ::testing::Test {
 protected:
  void SetUp() override {
    result_ = load_site(kExampleSite);
    ASSERT_TRUE(result_.ok()) << dump(result_.diagnostics);
  }
  const engine::SiteSpec& site() const { return *result_.site; }
  LoadResult result_;
};

TEST_F(ExampleSite, LoadsWithNoDiagnostics) {
  EXPECT_TRUE(result_.diagnostics.empty());
  EXPECT_EQ(site().name, "Dry Creek SWD 4");
  EXPECT_EQ(site().time_zone, "America/Chicago");
  EXPECT_EQ(site().file, kExampleSite);
  ASSERT_EQ(site().assets.size(), 7u);  // three tanks, then the pump, compressor, well, gun barrel
  EXPECT_EQ(site().assets[0].name, "skim_tank");  // file order is kept
  EXPECT_EQ(site().assets[1].name, "water_tank_1");
  EXPECT_EQ(site().assets[2].name, "water_tank_2");
}

TEST_F(ExampleSite, AppliesParameterOverridesWhereTheyAreUsed) {
  const auto& tank1 = asset(site(), "water_tank_1");
  EXPECT_EQ(tank1.template_name, "tank_level");
  EXPECT_EQ(input(tank1, "level").tag, "DC4.TK1.LEVEL");
  const auto& high = check<LimitCheckSpec>(tank1, "level_high");
  EXPECT_EQ(high.of, "level");
  EXPECT_EQ(high.direction, LimitDirection::high);
  EXPECT_DOUBLE_EQ(high.limit, 17.5);    // override
  ASSERT_TRUE(high.deadband.has_value());
  EXPECT_DOUBLE_EQ(*high.deadband, 0.5);  // parameter default
  EXPECT_DOUBLE_EQ(check<TimeToLimitCheckSpec>(tank1, "overflow_ahead").limit, 17.5);

  const auto& skim = asset(site(), "skim_tank");
  EXPECT_DOUBLE_EQ(check<LimitCheckSpec>(skim, "level_high").limit, 21.0);
  EXPECT_DOUBLE_EQ(check<LimitCheckSpec>(skim, "level_low").limit, 2.0);
  EXPECT_EQ(check<LimitCheckSpec>(skim, "level_low").direction, LimitDirection::low);
  EXPECT_DOUBLE_EQ(skim.signals.at(0).gain, 33.607);
  EXPECT_DOUBLE_EQ(check<LimitCheckSpec>(skim, "fill_rate_high").limit, 500);
  EXPECT_EQ(check<LimitCheckSpec>(skim, "fill_rate_high").of, "fill_rate.per_hour");
}

TEST_F(ExampleSite, ConvertsDurationsToSeconds) {
  const auto& tank1 = asset(site(), "water_tank_1");
  EXPECT_DOUBLE_EQ(check<TimeToLimitCheckSpec>(tank1, "overflow_ahead").lead_time_s, 4 * 3600.0);
  EXPECT_DOUBLE_EQ(estimator<TrendSpec>(tank1, "level_trend").time_constant_s, 21600.0);  // "6h"
  EXPECT_DOUBLE_EQ(estimator<RateSpec>(tank1, "fill_rate").time_constant_s, 900.0);       // "15min"
  EXPECT_DOUBLE_EQ(input(tank1, "level").expected_interval_s, 60.0);                      // "1min"

  const auto& tank2 = asset(site(), "water_tank_2");
  EXPECT_DOUBLE_EQ(estimator<TrendSpec>(tank2, "level_trend").time_constant_s, 3 * 3600.0);
  EXPECT_DOUBLE_EQ(check<TimeToLimitCheckSpec>(tank2, "overflow_ahead").lead_time_s, 21600.0);
}

TEST_F(ExampleSite, ResolvesParameterReferencesInsideLists) {
  const auto& tank2 = asset(site(), "water_tank_2");
  const auto& level = input(tank2, "level");
  ASSERT_TRUE(level.range_low && level.range_high);
  EXPECT_DOUBLE_EQ(*level.range_low, 0.0);
  EXPECT_DOUBLE_EQ(*level.range_high, 25.0);  // [0, level_span]
}

TEST(TemplateBaselines, ResolveParameterReferencesAndKeepStructDefaults) {
  const auto result = load_site_from_string(
      "site: {name: Dry Creek SWD 4, time_zone: America/Chicago}\n"
      "assets:\n"
      "  tank_a: {template: test_vessel, tags: {level: DC4.TK1.LEVEL}}\n",
      "site.yaml", {BRINEWATCH_SOURCE_DIR "/tests/config/fixtures/rules"});
  ASSERT_TRUE(result.ok()) << dump(result.diagnostics);
  const auto& tank = asset(*result.site, "tank_a");
  const auto& shift = estimator<CusumSpec>(tank, "level_shift");
  EXPECT_DOUBLE_EQ(shift.k, 0.5);
  EXPECT_DOUBLE_EQ(shift.h, 5.0);
  EXPECT_DOUBLE_EQ(shift.head_start, 2.5);
  EXPECT_FALSE(shift.restart_after_signal);  // struct default
  EXPECT_FALSE(shift.baseline.target.has_value());
  EXPECT_DOUBLE_EQ(shift.baseline.learn_s, 21600.0);  // shift_learn: 6h
  EXPECT_EQ(check<StatisticalCheckSpec>(tank, "level_shift").estimator, "level_shift");
  EXPECT_EQ(find_named(tank.checks, "level_shift")->priority, Priority::low);
}

TEST_F(ExampleSite, RecordsWhereEachDefinitionWasWritten) {
  const auto& tank1 = asset(site(), "water_tank_1");
  EXPECT_EQ(tank1.where.file, kExampleSite);
  EXPECT_GT(tank1.where.line, 0);
  const auto* high = find_named(tank1.checks, "level_high");
  EXPECT_NE(high->where.file.find("rules/tank_level.yaml"), std::string::npos);
  EXPECT_GT(high->where.line, 0);
}

// Fact of the trade (REFERENCES.md, "Tanks and volumes"): a vertical cylinder holds
// (pi D^2 / 4) / 5.614583 bbl per foot (1 bbl = 5.614583 ft^3); for D = 12 ft that is 20.143.
TEST(TankLevelTemplate, DefaultBarrelsPerFootFitATwelveFootTank) {
  const auto result = load_site_from_string(
      "site: {name: Dry Creek SWD 4, time_zone: America/Chicago}\n"
      "assets:\n"
      "  water_tank_3: {template: tank_level, tags: {level: DC4.TK3.LEVEL}}\n",
      "inline.yaml", {kShippedRules});
  ASSERT_TRUE(result.ok()) << dump(result.diagnostics);
  const auto& tank = asset(*result.site, "water_tank_3");
  const auto* volume = find_named(tank.signals, "volume");
  ASSERT_NE(volume, nullptr);
  const double per_foot = std::numbers::pi * 12.0 * 12.0 / 4.0 / 5.614583;
  EXPECT_NEAR(volume->gain, per_foot, 0.0005);
  EXPECT_EQ(volume->operands, std::vector<std::string>{"level"});
  EXPECT_EQ(volume->unit, "bbl");
}

}  // namespace
}  // namespace bw::config
