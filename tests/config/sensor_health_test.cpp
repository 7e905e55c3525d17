// The default sensor-health checks the loader adds to every bound input: which appear, which a
// check of the template replaces, how a template and a site tune or switch them off, and the
// errors (with file:line:col) for what cannot be tuned.
#include <gtest/gtest.h>

#include <string>
#include <variant>

#include "config/site_loader.h"
#include "engine/spec_fingerprint.h"
#include "spec_lookup.h"

namespace bw::config {
namespace {

using engine::FlatlineCheckSpec;
using engine::Ne43CheckSpec;
using engine::OutOfRangeCheckSpec;
using engine::Priority;
using engine::StaleCheckSpec;
using testing::dump;
using testing::find_named;

const std::string kFixtures = BRINEWATCH_SOURCE_DIR "/tests/config/fixtures";
const std::string kBadRules = kFixtures + "/bad_rules";
constexpr const char* kLabel = "site.yaml";

// Site text: lines 1-2 are the header, the asset starts on line 3, its extra keys on line 5.
LoadResult load_probe(const std::string& extra = "") {
  return load_site_from_string(
      "site: {name: Dry Creek SWD 4, time_zone: America/Chicago}\n"  // 1
      "assets:\n"                                                    // 2
      "  probe:\n"                                                   // 3
      "    template: health_probe\n"                                 // 4
          + extra +                                                  // 5 on
          "    tags: {level: DC4.TK1.LEVEL, loop: DC4.TK1.LOOP, speed: DC4.P1.HZ, "
          "gauge: DC4.TK1.GAUGE}\n",
      kLabel, {kFixtures + "/rules"});
}

const engine::AssetSpec& probe(const LoadResult& result) {
  return testing::asset(*result.site, "probe");
}

int count_named(const engine::AssetSpec& asset, const std::string& name) {
  int n = 0;
  for (const auto& c : asset.checks) n += c.name == name ? 1 : 0;
  return n;
}

TEST(SensorHealth, EveryBoundInputGetsTheDefaultsItsDeclarationCallsFor) {
  const auto result = load_probe();
  ASSERT_TRUE(result.ok()) << dump(result.diagnostics);
  const auto& asset = probe(result);

  // level: interval and range, not mA (its stale default is replaced: see the next test).
  const auto& level_range = testing::check<OutOfRangeCheckSpec>(asset, "level_out_of_range");
  EXPECT_EQ(level_range.of, "level");
  EXPECT_EQ(level_range.margin_percent, 2.0);
  EXPECT_EQ(find_named(asset.checks, "level_out_of_range")->priority, Priority::low);
  const auto& level_flat = testing::check<FlatlineCheckSpec>(asset, "level_flatline");
  EXPECT_EQ(level_flat.tolerance, 0.0);
  EXPECT_EQ(level_flat.window_s, 6 * 3600.0);  // max(6 h, 100 x 1 min)
  EXPECT_EQ(level_flat.at_rest_up_to, 0.0);    // the bottom of its range
  EXPECT_EQ(find_named(asset.checks, "level_flatline")->priority, Priority::medium);
  EXPECT_EQ(find_named(asset.checks, "level_ne43"), nullptr);

  // loop: a raw current polled every 5 min.
  EXPECT_EQ(testing::check<StaleCheckSpec>(asset, "loop_stale").factor, 3.0);
  EXPECT_EQ(find_named(asset.checks, "loop_stale")->priority, Priority::medium);
  EXPECT_EQ(testing::check<Ne43CheckSpec>(asset, "loop_ne43").of, "loop");
  EXPECT_EQ(find_named(asset.checks, "loop_ne43")->priority, Priority::medium);
  EXPECT_EQ(testing::check<FlatlineCheckSpec>(asset, "loop_flatline").window_s,
            100 * 300.0);  // 100 intervals of 5 min are longer than 6 h
  EXPECT_EQ(testing::check<OutOfRangeCheckSpec>(asset, "loop_out_of_range").of, "loop");

  // speed: neither interval nor range nor mA: only the flatline, with no resting value.
  EXPECT_EQ(find_named(asset.checks, "speed_stale"), nullptr);
  EXPECT_EQ(find_named(asset.checks, "speed_out_of_range"), nullptr);
  const auto& speed_flat = testing::check<FlatlineCheckSpec>(asset, "speed_flatline");
  EXPECT_EQ(speed_flat.window_s, 6 * 3600.0);
  EXPECT_FALSE(speed_flat.at_rest_up_to.has_value());

  // inflow: optional and unbound: nothing.
  for (const auto& c : asset.checks) EXPECT_EQ(c.name.rfind("inflow", 0), std::string::npos);

  // Messages name the input in plain words.
  EXPECT_NE(find_named(asset.checks, "loop_stale")->message.find("No loop reading"),
            std::string::npos);
}

TEST(SensorHealth, ACheckOfTheSameKindOnTheInputReplacesTheDefault) {
  const auto result = load_probe();
  ASSERT_TRUE(result.ok()) << dump(result.diagnostics);
  const auto& asset = probe(result);
  EXPECT_EQ(find_named(asset.checks, "level_stale"), nullptr);
  int stale_on_level = 0;
  for (const auto& c : asset.checks) {
    if (const auto* s = std::get_if<StaleCheckSpec>(&c.kind); s && s->of == "level") {
      ++stale_on_level;
    }
  }
  EXPECT_EQ(stale_on_level, 1);
  EXPECT_EQ(testing::check<StaleCheckSpec>(asset, "level_silent").factor, 5.0);
  EXPECT_EQ(count_named(asset, "level_silent"), 1);
}

TEST(SensorHealth, TheTemplateTunesAnInputThroughItsHealthBlock) {
  const auto result = load_probe();
  ASSERT_TRUE(result.ok()) << dump(result.diagnostics);
  const auto& asset = probe(result);
  const auto& flat = testing::check<FlatlineCheckSpec>(asset, "gauge_flatline");
  EXPECT_EQ(flat.window_s, 7200.0);  // the parameter loop_window
  EXPECT_EQ(flat.tolerance, 0.05);
  EXPECT_EQ(find_named(asset.checks, "gauge_flatline")->priority, Priority::low);
  EXPECT_EQ(find_named(asset.checks, "gauge_out_of_range"), nullptr);  // off in the template
  EXPECT_NE(find_named(asset.checks, "gauge_stale"), nullptr);
  EXPECT_NE(find_named(asset.checks, "gauge_ne43"), nullptr);
}

TEST(SensorHealth, TheSiteSwitchesOffOneKindOrAWholeInputAndOverridesSettings) {
  const auto result = load_probe(
      "    sensor_health:\n"
      "      level: {flatline: off}\n"
      "      loop: off\n"
      "      gauge: {flatline: {window: 30min}, out_of_range: on}\n");
  ASSERT_TRUE(result.ok()) << dump(result.diagnostics);
  const auto& asset = probe(result);
  EXPECT_EQ(find_named(asset.checks, "level_flatline"), nullptr);
  EXPECT_NE(find_named(asset.checks, "level_out_of_range"), nullptr);
  for (const char* name : {"loop_stale", "loop_flatline", "loop_ne43", "loop_out_of_range"}) {
    EXPECT_EQ(find_named(asset.checks, name), nullptr) << name;
  }
  // The site's window replaces the template's; the template's tolerance and priority stay.
  const auto& flat = testing::check<FlatlineCheckSpec>(asset, "gauge_flatline");
  EXPECT_EQ(flat.window_s, 1800.0);
  EXPECT_EQ(flat.tolerance, 0.05);
  EXPECT_EQ(find_named(asset.checks, "gauge_flatline")->priority, Priority::low);
  EXPECT_NE(find_named(asset.checks, "gauge_out_of_range"), nullptr);  // on again at the site
}

TEST(SensorHealth, DefaultsChangeTheFingerprintWhenTheyChangeWhatIsChecked) {
  const auto plain = load_probe();
  const auto no_flatline = load_probe("    sensor_health: {level: {flatline: off}}\n");
  const auto longer = load_probe("    sensor_health: {level: {flatline: {window: 12h}}}\n");
  const auto rest = load_probe("    sensor_health: {level: {flatline: {at_rest_up_to: 1}}}\n");
  ASSERT_TRUE(plain.ok() && no_flatline.ok() && longer.ok() && rest.ok());
  const std::string base = engine::fingerprint(probe(plain));
  EXPECT_NE(engine::fingerprint(probe(no_flatline)), base);
  EXPECT_NE(engine::fingerprint(probe(longer)), base);
  EXPECT_NE(engine::fingerprint(probe(rest)), base);
  EXPECT_EQ(engine::fingerprint(probe(load_probe())), base);
}

// Asserts exactly one diagnostic, at file:line:col, whose message contains `part`.
void expect_only(const LoadResult& result, const std::string& file, int line, int column,
                 const std::string& part) {
  EXPECT_FALSE(result.ok());
  ASSERT_EQ(result.diagnostics.size(), 1u) << dump(result.diagnostics);
  const Diagnostic& d = result.diagnostics[0];
  EXPECT_EQ(d.file, file);
  EXPECT_EQ(d.line, line);
  EXPECT_EQ(d.column, column);
  EXPECT_NE(d.message.find(part), std::string::npos) << d.message;
}

TEST(SensorHealthErrors, UnknownRoleSuggestsTheNearest) {
  const auto result = load_probe("    sensor_health: {levle: off}\n");
  expect_only(result, kLabel, 5, 21,
              "asset 'probe': key 'sensor_health': template 'health_probe' has no input role "
              "'levle'; did you mean 'level'?");
}

TEST(SensorHealthErrors, UnknownKindSuggestsTheNearest) {
  const auto result = load_probe("    sensor_health:\n      level: {flatlin: off}\n");
  expect_only(result, kLabel, 6, 15, "unknown key 'flatlin'; did you mean 'flatline'?");
}

TEST(SensorHealthErrors, UnknownSettingSuggestsTheNearest) {
  const auto result =
      load_probe("    sensor_health:\n      level:\n        flatline: {windw: 2h}\n");
  expect_only(result, kLabel, 7, 20, "unknown key 'windw'; did you mean 'window'?");
}

TEST(SensorHealthErrors, AValueThatIsNeitherASwitchNorSettings) {
  const auto result = load_probe("    sensor_health:\n      level: {stale: maybe}\n");
  expect_only(result, kLabel, 6, 22,
              "role 'level': 'stale': expected off, on, or a mapping of factor, priority, got "
              "'maybe'");
}

TEST(SensorHealthErrors, SettingsOutOfBounds) {
  const auto result =
      load_probe("    sensor_health:\n      level:\n        out_of_range: {margin: 150}\n");
  expect_only(result, kLabel, 7, 32, "key 'margin': must be in [0, 100], got 150");
}

TEST(SensorHealthErrors, TuningAKindThatDoesNotApplyToTheInput) {
  const auto result = load_probe("    sensor_health:\n      speed: {stale: {factor: 4}}\n");
  expect_only(result, kLabel, 6, 22,
              "sensor health of input 'speed': 'stale' does not apply, because the input "
              "declares no expected_interval");
  // Only saying "off" is never an error.
  EXPECT_TRUE(load_probe("    sensor_health: {speed: {stale: off, ne43: off}}\n").ok());
}

TEST(SensorHealthErrors, TuningADefaultThatTheTemplatesOwnCheckReplaces) {
  const auto result = load_probe("    sensor_health:\n      level: {stale: {factor: 4}}\n");
  expect_only(result, kLabel, 6, 22,
              "the asset has its own stale check 'level_silent' on it, which replaces the "
              "default; tune that check instead");
}

TEST(SensorHealthErrors, ACheckTakingTheNameOfADefault) {
  const auto result = load_site_from_string(
      "site: {name: Dry Creek SWD 4, time_zone: America/Chicago}\n"
      "assets:\n"
      "  pump: {template: health_clash, tags: {speed: DC4.P1.HZ}}\n",
      kLabel, {kBadRules});
  expect_only(result, kBadRules + "/health_clash.yaml", 7, 3,
              "check name 'speed_flatline' is taken by the default flatline check of input "
              "'speed'; choose another name, or switch the default off (health: {flatline: "
              "off})");
}

TEST(SensorHealthErrors, AMisspeltKeyInATemplatesHealthBlock) {
  const auto result = load_site_from_string(
      "site: {name: Dry Creek SWD 4, time_zone: America/Chicago}\n"
      "assets:\n"
      "  tank: {template: health_typo, tags: {level: DC4.TK1.LEVEL}}\n",
      kLabel, {kBadRules});
  expect_only(result, kBadRules + "/health_typo.yaml", 5, 57,
              "input 'level': key 'health': 'flatline': unknown key 'windw'; did you mean "
              "'window'?");
}

}  // namespace
}  // namespace bw::config
