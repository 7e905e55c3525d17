// The shipped example site and the shipped tank_level template load and compile as documented.
#include <gtest/gtest.h>

#include <cmath>
#include <filesystem>
#include <numbers>
#include <set>
#include <string>

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
  // three tanks, then the pump, compressor, well, gun barrel, filters and a single signal
  ASSERT_EQ(site().assets.size(), 9u);
  EXPECT_EQ(site().assets[0].name, "skim_tank");  // file order is kept
  EXPECT_EQ(site().assets[1].name, "water_tank_1");
  EXPECT_EQ(site().assets[2].name, "water_tank_2");
}

// The example site is the reference an engineer copies from: it binds every shipped template.
TEST_F(ExampleSite, BindsEveryShippedTemplate) {
  std::set<std::string> bound;
  for (const auto& asset : site().assets) bound.insert(asset.template_name);
  for (const auto& file : std::filesystem::directory_iterator(kShippedRules)) {
    if (file.path().extension() != ".yaml") continue;
    EXPECT_TRUE(bound.contains(file.path().stem().string()))
        << "no asset of the example site uses rules/" << file.path().filename().string();
  }
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
  ASSERT_TRUE(skim.signals.at(0).strapping_table.has_value());  // the CSV beside the site
  EXPECT_DOUBLE_EQ(check<LimitCheckSpec>(skim, "fill_rate_high").limit, 500);
  EXPECT_EQ(check<LimitCheckSpec>(skim, "fill_rate_high").of, "fill_rate.per_hour");
}

TEST_F(ExampleSite, ConvertsDurationsToSeconds) {
  const auto& tank1 = asset(site(), "water_tank_1");
  EXPECT_DOUBLE_EQ(check<TimeToLimitCheckSpec>(tank1, "overflow_ahead").lead_time_s, 4 * 3600.0);
  EXPECT_DOUBLE_EQ(estimator<TrendSpec>(tank1, "level_trend").time_constant_s, 7200.0);   // "2h"
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

// The example skim tank's strapping table (invented) describes a 15.5 ft inside diameter tank on a
// 1.5 ft deep cone bottom with gauge zero at the apex. Every row must match the geometry, rounded
// to 0.01 bbl as written: a cone of liquid holds pi r^2 h / 3 with r = R h / H, a cylinder
// pi R^2 h (geometry facts), and 1 bbl = 9702 / 1728 ft^3 (REFERENCES.md "Tanks and volumes").
TEST_F(ExampleSite, SkimTankStrappingTableFollowsTheConeBottomGeometry) {
  const auto& volume = *find_named(asset(site(), "skim_tank").signals, "volume");
  ASSERT_TRUE(volume.strapping_table.has_value());
  const auto& points = volume.strapping_table->points();
  ASSERT_GE(points.size(), 20u);
  EXPECT_EQ(points.front().level_ft, 0.0);
  EXPECT_EQ(points.back().level_ft, 24.0);
  const double r = 15.5 / 2;
  const double cone_depth = 1.5;
  const double ft3_per_bbl = 9702.0 / 1728.0;
  for (const auto& p : points) {
    const double h = p.level_ft;
    const double ft3 = h <= cone_depth
                           ? std::numbers::pi * r * r * h * h * h / (3 * cone_depth * cone_depth)
                           : std::numbers::pi * r * r * (cone_depth / 3 + (h - cone_depth));
    EXPECT_NEAR(p.volume_bbl, ft3 / ft3_per_bbl, 0.005 + 1e-9) << "level " << h << " ft";
  }
}

TEST_F(ExampleSite, GunBarrelTakesItsDiameter) {
  const auto& gun_barrel = asset(site(), "gun_barrel");
  for (const char* name : {"volume", "water_volume"}) {
    const auto* signal = find_named(gun_barrel.signals, name);
    ASSERT_NE(signal, nullptr) << name;
    EXPECT_EQ(signal->op, engine::SignalOp::tank_volume);
    EXPECT_EQ(signal->diameter_ft, 15.5);
    EXPECT_FALSE(signal->strapping_table.has_value());
  }
}

// Fact of the trade (REFERENCES.md, "Tanks and volumes"): a vertical cylinder holds
// (pi D^2 / 4) / 5.614583 bbl per foot (1 bbl = 5.614583 ft^3); for D = 12 ft that is 20.143.
TEST(TankLevelTemplate, DefaultDiameterIsATwelveFootTank) {
  const auto result = load_site_from_string(
      "site: {name: Dry Creek SWD 4, time_zone: America/Chicago}\n"
      "assets:\n"
      "  water_tank_3: {template: tank_level, tags: {level: DC4.TK3.LEVEL}}\n",
      "inline.yaml", {kShippedRules});
  ASSERT_TRUE(result.ok()) << dump(result.diagnostics);
  const auto& tank = asset(*result.site, "water_tank_3");
  const auto* volume = find_named(tank.signals, "volume");
  ASSERT_NE(volume, nullptr);
  EXPECT_EQ(volume->op, engine::SignalOp::tank_volume);
  ASSERT_TRUE(volume->diameter_ft.has_value());
  const double per_foot = std::numbers::pi * *volume->diameter_ft * *volume->diameter_ft / 4.0 /
                          5.614583;
  EXPECT_NEAR(per_foot, 20.143, 0.0005);
  EXPECT_FALSE(volume->strapping_table.has_value());
  EXPECT_EQ(volume->operands, std::vector<std::string>{"level"});
  EXPECT_EQ(volume->unit, "bbl");
}

}  // namespace
}  // namespace bw::config
