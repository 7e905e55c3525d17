// describe_site() tells a person every asset, tag binding, signal, estimator and check.
#include "config/site_description.h"

#include <gtest/gtest.h>

#include "config/site_loader.h"
#include "spec_lookup.h"

namespace bw::config {
namespace {

class ExampleSiteDescription : public ::testing::Test {
 protected:
  void SetUp() override {
    const auto result = load_site(BRINEWATCH_SOURCE_DIR "/config-examples/dry-creek-swd4.yaml");
    ASSERT_TRUE(result.ok()) << testing::dump(result.diagnostics);
    site_ = *result.site;
    text_ = describe_site(site_);
  }
  bool mentions(const std::string& part) const { return text_.find(part) != std::string::npos; }
  engine::SiteSpec site_;
  std::string text_;
};

TEST_F(ExampleSiteDescription, MentionsEveryAssetTagAndCheck) {
  EXPECT_TRUE(mentions("site Dry Creek SWD 4 (time zone America/Chicago), 9 assets")) << text_;
  ASSERT_EQ(site_.assets.size(), 9u);
  for (const auto& asset : site_.assets) {
    EXPECT_TRUE(mentions("asset " + asset.name + " (template " + asset.template_name + ")"))
        << asset.name;
    for (const auto& input : asset.inputs) {
      EXPECT_TRUE(mentions(input.tag + " -> " + input.role + " [" + input.unit + "]")) << input.tag;
    }
    for (const auto& check : asset.checks) {
      EXPECT_TRUE(mentions("check " + check.name + ": ")) << check.name;
    }
    for (const auto& record : asset.records) {
      EXPECT_TRUE(mentions("record " + record.name + ": daily")) << record.name;
    }
  }
}

TEST_F(ExampleSiteDescription, ShowsTheWellsDailyRecord) {
  EXPECT_TRUE(mentions("record daily_injection: daily, the day starting 7h after local midnight; "
                       "injected_volume = total of rate [bbl], "))
      << text_;
  EXPECT_TRUE(mentions("injecting_hours = time_above of rate above "));
}

TEST_F(ExampleSiteDescription, ShowsLimitsWithUnitsAndPriorities) {
  // The on-/off-delays come from the input's measurement type: 60 s for a level (common
  // practice, from memory; see engine/check_settings.h).
  EXPECT_TRUE(
      mentions("check level_high: limit on level, high 17.5 ft (deadband 0.5 ft, on-delay 1min, "
               "off-delay 1min), priority high"))
      << text_;
  // No deadband given: 5 % of the 0-25 ft span = 1.25 ft (common practice for level).
  EXPECT_TRUE(
      mentions("check level_high_high: limit on level, high 19.5 ft (deadband 1.25 ft, "
               "on-delay 1min, off-delay 1min), priority urgent"))
      << text_;
  EXPECT_TRUE(mentions("check level_stale: stale, when level has no sample for 3min (3 x 1min)"));
  EXPECT_TRUE(mentions("check fill_rate_high: limit on fill_rate.per_hour, high 500 bbl/h"));
  EXPECT_TRUE(
      mentions("check overflow_ahead: time to limit, when trend level_trend will reach "
               "17.5 ft within 4h, priority high"));
}

TEST_F(ExampleSiteDescription, ListsSignalsBeforeTheEstimatorsThatReadThem) {
  const auto tank = text_.find("asset water_tank_1");
  ASSERT_NE(tank, std::string::npos);
  const auto volume = text_.find("signal volume [bbl] = tank_volume(level), vertical cylinder 12 ft inside diameter", tank);
  const auto rate = text_.find("estimator fill_rate: rate of volume; time constant 15min", tank);
  ASSERT_NE(volume, std::string::npos) << text_;
  ASSERT_NE(rate, std::string::npos) << text_;
  EXPECT_LT(volume, rate);
  EXPECT_TRUE(mentions("estimator level_trend: trend of level; time constant 3h"));
}

TEST_F(ExampleSiteDescription, ShowsWhichShapeEachTankVolumeUses) {
  const auto skim = text_.find("asset skim_tank");
  ASSERT_NE(skim, std::string::npos);
  EXPECT_NE(text_.find("signal volume [bbl] = tank_volume(level), strapping table of 30 points, "
                       "0 to 24 ft (straight-line beyond)",
                       skim),
            std::string::npos)
      << text_;
  EXPECT_TRUE(mentions("signal water_volume [bbl] = tank_volume(interface_level), vertical "
                       "cylinder 15.5 ft inside diameter"))
      << text_;
}

TEST(SiteDescription, ShowsAnUnboundOptionalInput) {
  const auto result = load_site_from_string(
      "site: {name: Dry Creek SWD 4, time_zone: America/Chicago}\n"
      "assets:\n"
      "  tank_a: {template: test_vessel, tags: {level: DC4.TK1.LEVEL}}\n",
      "site.yaml", {BRINEWATCH_SOURCE_DIR "/tests/config/fixtures/rules"});
  ASSERT_TRUE(result.ok()) << testing::dump(result.diagnostics);
  const std::string text = describe_site(*result.site);
  EXPECT_NE(text.find("(inflow [bbl/d] not bound, optional)"), std::string::npos) << text;
  EXPECT_NE(text.find("1 asset, from site.yaml"), std::string::npos) << text;
}

}  // namespace
}  // namespace bw::config
