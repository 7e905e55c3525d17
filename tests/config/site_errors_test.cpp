// Bad configuration gives the right file:line:col and message, and every error is reported.
#include <gtest/gtest.h>

#include <string>
#include <vector>

#include "config/site_loader.h"
#include "spec_lookup.h"

namespace bw::config {
namespace {

using testing::dump;

const std::string kFixtures = BRINEWATCH_SOURCE_DIR "/tests/config/fixtures";
const std::string kGoodRules = kFixtures + "/rules";
const std::string kBadRules = kFixtures + "/bad_rules";
constexpr const char* kLabel = "site.yaml";

LoadResult load(const std::string& assets) {
  return load_site_from_string(
      "site: {name: Dry Creek SWD 4, time_zone: America/Chicago}\n"  // line 1
      "assets:\n" +                                                  // line 2
          assets,                                                    // line 3 on
      kLabel, {kGoodRules, kBadRules});
}

// Asserts there is exactly one diagnostic and it is at file:line:col with this message.
void expect_only(const LoadResult& result, const std::string& file, int line, int column,
                 const std::string& message) {
  EXPECT_FALSE(result.ok());
  EXPECT_FALSE(result.site.has_value());
  ASSERT_EQ(result.diagnostics.size(), 1u) << dump(result.diagnostics);
  const Diagnostic& d = result.diagnostics[0];
  EXPECT_EQ(d.file, file);
  EXPECT_EQ(d.line, line);
  EXPECT_EQ(d.column, column);
  EXPECT_EQ(d.message, message);
}

TEST(TemplateErrors, UnknownKeySuggestsTheNearestValidKey) {
  const auto result = load("  tank_a: {template: typo_key, tags: {level: DC4.TK1.LEVEL}}\n");
  expect_only(result, kBadRules + "/typo_key.yaml", 6, 41,
              "estimator 'level_trend': unknown key 'time_constnt'; did you mean "
              "'time_constant'?");
}

TEST(TemplateErrors, WrongTypeSaysWhatWasExpected) {
  const auto result = load("  tank_a: {template: wrong_type, tags: {level: DC4.TK1.LEVEL}}\n");
  expect_only(result, kBadRules + "/wrong_type.yaml", 8, 9,
              "estimator 'level_mean': key 'of': expected a non-empty text, got a list");
}

TEST(TemplateErrors, OutOfBoundsValueGivesTheBounds) {
  const auto result = load("  tank_a: {template: out_of_bounds, tags: {level: DC4.TK1.LEVEL}}\n");
  expect_only(result, kBadRules + "/out_of_bounds.yaml", 6, 54,
              "estimator 'level_chart': key 'lambda': must be in (0, 1], got 1.5");
}

// The level default (5 % of span, common practice) cannot be worked out without a range.
TEST(TemplateErrors, MeasurementDefaultDeadbandNeedsARange) {
  const auto result = load("  tank_a: {template: no_range, tags: {level: DC4.TK1.LEVEL}}\n");
  expect_only(result, kBadRules + "/no_range.yaml", 6, 3,
              "check 'level_high': the default deadband of a level input (5 % of span) needs a "
              "range, but 'level' declares none; give input 'level' a range or give 'deadband'");
}

TEST(TemplateErrors, ReferenceToNoParameterSuggestsTheNearest) {
  const auto result = load("  tank_a: {template: bad_reference, tags: {level: DC4.TK1.LEVEL}}\n");
  expect_only(result, kBadRules + "/bad_reference.yaml", 8, 47,
              "check 'level_high': key 'limit': 'hig_level' names no parameter of template "
              "'bad_reference'; did you mean 'high_level'?");
}

TEST(TemplateErrors, DuplicateNameAndCycleComeFromTheAssetAnalysis) {
  const auto result = load("  tank_a: {template: tangled, tags: {level: DC4.TK1.LEVEL}}\n");
  ASSERT_EQ(result.diagnostics.size(), 2u) << dump(result.diagnostics);
  const std::string file = kBadRules + "/tangled.yaml";
  EXPECT_EQ(result.diagnostics[0].file, file);
  EXPECT_EQ(result.diagnostics[0].line, 6);
  EXPECT_EQ(result.diagnostics[0].column, 3);
  EXPECT_EQ(result.diagnostics[0].message, "name 'level' is defined twice in asset 'tank_a'");
  EXPECT_EQ(result.diagnostics[1].file, file);
  EXPECT_EQ(result.diagnostics[1].line, 7);
  EXPECT_EQ(result.diagnostics[1].column, 3);
  EXPECT_EQ(result.diagnostics[1].message, "'up' depends on itself through a cycle");
}

TEST(TemplateErrors, ATemplateErrorIsReportedOnceHoweverManyAssetsUseIt) {
  const auto result = load(
      "  tank_a: {template: out_of_bounds, tags: {level: DC4.TK1.LEVEL}}\n"
      "  tank_b: {template: out_of_bounds, tags: {level: DC4.TK2.LEVEL}}\n");
  EXPECT_EQ(result.diagnostics.size(), 1u) << dump(result.diagnostics);
}

TEST(SiteErrors, UnknownTemplateSuggestsTheNearest) {
  const auto result = load("  tank_a: {template: test_vesel, tags: {level: DC4.TK1.LEVEL}}\n");
  expect_only(result, kLabel, 3, 22,
              "asset 'tank_a': key 'template': no template 'test_vesel' in " + kGoodRules + ", " +
                  kBadRules + "; did you mean 'test_vessel'?");
}

TEST(SiteErrors, UnknownTagRoleSuggestsTheNearest) {
  const auto result = load("  tank_a: {template: test_vessel, tags: {levl: DC4.TK1.LEVEL}}\n");
  expect_only(result, kLabel, 3, 42,
              "asset 'tank_a': template 'test_vessel' has no input role 'levl'; did you mean "
              "'level'?");
}

TEST(SiteErrors, UnboundRequiredInputIsReportedAtTheAsset) {
  const auto result = load("  tank_a: {template: test_vessel, tags: {inflow: DC4.TK1.INFLOW}}\n");
  expect_only(result, kLabel, 3, 3,
              "required input 'level' of asset 'tank_a' is not bound to a tag");
}

TEST(SiteErrors, OverrideOfUnknownParameterSuggestsTheNearest) {
  const auto result = load(
      "  tank_a:\n"
      "    template: test_vessel\n"
      "    tags: {level: DC4.TK1.LEVEL}\n"
      "    parameters: {hihg_level: 12}\n");
  expect_only(result, kLabel, 6, 18,
              "asset 'tank_a': template 'test_vessel' has no parameter 'hihg_level'; did you "
              "mean 'high_level'?");
}

TEST(SiteErrors, OverrideOutsideTheParameterBoundsIsRefused) {
  const auto result = load(
      "  tank_a:\n"
      "    template: test_vessel\n"
      "    tags: {level: DC4.TK1.LEVEL}\n"
      "    parameters: {high_level: 31}\n");
  expect_only(result, kLabel, 6, 30,
              "asset 'tank_a': parameter 'high_level': must be in [0, 30], got 31");
}

TEST(SiteErrors, DurationIsRefusedForAParameterThatIsNotInSeconds) {
  const auto result = load(
      "  tank_a:\n"
      "    template: test_vessel\n"
      "    tags: {level: DC4.TK1.LEVEL}\n"
      "    parameters: {high_level: 6h}\n");
  expect_only(result, kLabel, 6, 30,
              "asset 'tank_a': parameter 'high_level': expected a number or a parameter name, "
              "got '6h'");
}

TEST(SiteErrors, UnknownAssetKeySuggestsTheNearest) {
  const auto result = load(
      "  tank_a:\n"
      "    template: test_vessel\n"
      "    tag: {level: DC4.TK1.LEVEL}\n");
  expect_only(result, kLabel, 5, 5, "asset 'tank_a': unknown key 'tag'; did you mean 'tags'?");
}

TEST(SiteErrors, AssetWrittenTwiceIsReported) {
  const auto result = load(
      "  tank_a: {template: test_vessel, tags: {level: DC4.TK1.LEVEL}}\n"
      "  tank_a: {template: test_vessel, tags: {level: DC4.TK2.LEVEL}}\n");
  expect_only(result, kLabel, 4, 3, "assets: key 'tank_a' is written twice (first at line 3)");
}

TEST(SiteErrors, AssetNameMustBeAnIdentifier) {
  const auto result = load("  tank-a: {template: test_vessel, tags: {level: DC4.TK1.LEVEL}}\n");
  expect_only(result, kLabel, 3, 3,
              "asset 'tank-a': an asset name must be letters, digits and '_', not starting with "
              "a digit");
}

TEST(SiteErrors, UnknownTimeZoneSuggestsTheNearest) {
  const auto result = load_site_from_string(
      "site: {name: Dry Creek SWD 4, time_zone: America/Chicgo}\n"
      "assets:\n"
      "  tank_a: {template: test_vessel, tags: {level: DC4.TK1.LEVEL}}\n",
      kLabel, {kGoodRules});
  expect_only(result, kLabel, 1, 42,
              "site: key 'time_zone': 'America/Chicgo' is not a time zone name known to the "
              "system time zone database; did you mean 'America/Chicago'?");
}

TEST(SiteErrors, SyntaxErrorGivesThePositionTheParserReports) {
  const std::string file = kFixtures + "/syntax_error.yaml";
  const auto result = load_site(file, {kGoodRules});
  ASSERT_EQ(result.diagnostics.size(), 1u) << dump(result.diagnostics);
  const Diagnostic& d = result.diagnostics[0];
  EXPECT_EQ(d.file, file);
  EXPECT_EQ(d.line, 7);    // the line indented by 3 spaces under a 4-space block
  EXPECT_EQ(d.column, 4);  // where the stray key starts
  EXPECT_EQ(d.message.rfind("YAML syntax error: ", 0), 0u) << d.message;
  EXPECT_EQ(d.source_line, "   tags: {level: DC4.TK1.LEVEL}");
}

TEST(SiteErrors, TabIndentationIsASyntaxError) {
  const auto result = load_site_from_string(
      "site: {name: Dry Creek SWD 4, time_zone: America/Chicago}\n"
      "assets:\n"
      "\ttank_a: {template: test_vessel}\n",
      kLabel, {kGoodRules});
  ASSERT_EQ(result.diagnostics.size(), 1u) << dump(result.diagnostics);
  EXPECT_EQ(result.diagnostics[0].line, 3);
  EXPECT_EQ(result.diagnostics[0].message.rfind("YAML syntax error: ", 0), 0u);
}

TEST(SiteErrors, ReportsAllThreeErrorsOfAFileAndNothingElse) {
  const std::string file = kFixtures + "/three_errors.yaml";
  const auto result = load_site(file);
  ASSERT_EQ(result.diagnostics.size(), 3u) << dump(result.diagnostics);
  EXPECT_FALSE(result.site.has_value());
  const auto& zone = result.diagnostics[0];
  EXPECT_EQ(zone.file, file);
  EXPECT_EQ(zone.line, 4);
  EXPECT_EQ(zone.column, 14);
  EXPECT_NE(zone.message.find("'America/Chicgo' is not a time zone"), std::string::npos);
  const auto& role = result.diagnostics[1];
  EXPECT_EQ(role.line, 9);
  EXPECT_EQ(role.column, 12);
  EXPECT_NE(role.message.find("no input role 'levl'; did you mean 'level'?"), std::string::npos);
  const auto& bound = result.diagnostics[2];
  EXPECT_EQ(bound.line, 13);
  EXPECT_EQ(bound.column, 30);
  EXPECT_EQ(bound.message,
            "asset 'water_tank_2': parameter 'high_level': must be in [0, 30], got -3");
}

TEST(SiteErrors, UnreadableFileNamesTheFileAndTheReason) {
  const std::string file = kFixtures + "/no_such_site.yaml";
  const auto result = load_site(file);
  ASSERT_EQ(result.diagnostics.size(), 1u);
  EXPECT_EQ(result.diagnostics[0].file, file);
  EXPECT_EQ(result.diagnostics[0].line, 0);
  EXPECT_EQ(result.diagnostics[0].message, "cannot open '" + file + "': No such file or directory");
}

TEST(SiteLoading, ATagMayFeedSeveralAssetsAndRoles) {
  const auto result = load(
      "  tank_a: {template: test_vessel, tags: {level: DC4.TK1.LEVEL, inflow: DC4.TK1.LEVEL}}\n"
      "  tank_b: {template: test_vessel, tags: {level: DC4.TK1.LEVEL}}\n");
  ASSERT_TRUE(result.ok()) << dump(result.diagnostics);
  const auto& a = testing::asset(*result.site, "tank_a");
  const auto& b = testing::asset(*result.site, "tank_b");
  EXPECT_EQ(testing::input(a, "inflow").tag, "DC4.TK1.LEVEL");
  EXPECT_EQ(testing::input(b, "level").tag, "DC4.TK1.LEVEL");
  EXPECT_EQ(testing::input(b, "inflow").tag, "");  // optional and unbound
}

TEST(SiteLoading, DurationOverrideOfASecondsParameterIsConverted) {
  const auto result = load(
      "  tank_a:\n"
      "    template: test_vessel\n"
      "    tags: {level: DC4.TK1.LEVEL}\n"
      "    parameters: {memory: 1.5d}\n");
  ASSERT_TRUE(result.ok()) << dump(result.diagnostics);
  const auto& a = testing::asset(*result.site, "tank_a");
  EXPECT_DOUBLE_EQ(testing::estimator<engine::TrendSpec>(a, "level_trend").time_constant_s,
                   1.5 * 86400);
  // Priority not written: the struct default.
  EXPECT_EQ(testing::find_named(a.checks, "overflow_ahead")->priority, engine::Priority::medium);
}

}  // namespace
}  // namespace bw::config
