// Rule template checks that need no site: each rule of the schema refuses what it should.
#include "config/rule_template.h"

#include <gtest/gtest.h>

#include <variant>

#include "config/yaml_document.h"
#include "spec_lookup.h"

namespace bw::config {
namespace {

struct Compiled {
  std::optional<RuleTemplate> rule;
  engine::AssetSpec asset;
  engine::SensorHealthTuning health;
  std::vector<Diagnostic> diagnostics;
};

// Reads template text named `name` and instantiates it with its defaults.
Compiled compile(const std::string& text, const std::string& name = "probe") {
  Compiled out;
  const SourceText source(name + ".yaml", text);
  auto parsed = parse_yaml(source);
  if (auto* error = std::get_if<Diagnostic>(&parsed)) {
    out.diagnostics.push_back(*error);
    return out;
  }
  out.rule = read_template(std::get<ConfigNode>(parsed), source, name, out.diagnostics);
  if (out.rule) {
    out.asset.name = "asset_a";
    instantiate_template(*out.rule, source, default_values(*out.rule), default_tables(*out.rule),
                         out.asset, out.health, out.diagnostics);
  }
  return out;
}

const std::string kHeader =
    "template: probe\n"
    "description: test\n"
    "inputs:\n"
    "  level: {unit: ft}\n";

void expect_one(const Compiled& c, int line, int column, const std::string& message) {
  ASSERT_EQ(c.diagnostics.size(), 1u) << testing::dump(c.diagnostics);
  EXPECT_EQ(c.diagnostics[0].line, line);
  EXPECT_EQ(c.diagnostics[0].column, column);
  EXPECT_EQ(c.diagnostics[0].message, message);
}

TEST(RuleTemplate, EpisodeEndMustBeBelowItsStart) {
  const auto c = compile(kHeader +
                         "estimators:\n"
                         "  slug: {kind: episode, of: level, rate: level, start_above: 5, end_below: 6}\n");
  expect_one(c, 6, 76, "estimator 'slug': key 'end_below': must be below start_above (5), got 6");
}

TEST(RuleTemplate, RestartOnIsReadForEveryEstimatorKind) {
  const auto c = compile(kHeader +
                         "estimators:\n"
                         "  life: {kind: filter_life, of: level, flow: level, drop_fraction: 0.5}\n"
                         "  trend: {kind: trend, of: level, time_constant: 1h, restart_on: life}\n");
  ASSERT_TRUE(c.diagnostics.empty()) << testing::dump(c.diagnostics);
  ASSERT_EQ(c.asset.estimators.size(), 2u);
  EXPECT_EQ(c.asset.estimators[1].restart_on, "life");
  EXPECT_TRUE(std::holds_alternative<engine::FilterLifeSpec>(c.asset.estimators[0].kind));
}

TEST(RuleTemplate, DropFractionMustLieStrictlyBetweenZeroAndOne) {
  const auto c = compile(kHeader +
                         "estimators:\n"
                         "  life: {kind: filter_life, of: level, flow: level, drop_fraction: 1}\n");
  ASSERT_EQ(c.diagnostics.size(), 1u) << testing::dump(c.diagnostics);
  EXPECT_NE(c.diagnostics[0].message.find("drop_fraction"), std::string::npos)
      << c.diagnostics[0].message;
}

TEST(RuleTemplate, TemplateKeyMustEqualTheFileName) {
  const auto c = compile("template: other\ndescription: test\ninputs: {level: {unit: ft}}\n");
  expect_one(c, 1, 11,
             "template 'probe': key 'template' is 'other', but it must equal the file name "
             "without '.yaml' ('probe')");
}

TEST(RuleTemplate, MissingRequiredKeyIsNamed) {
  const auto c = compile(kHeader + "estimators:\n  level_mean: {kind: ewma, of: level}\n");
  expect_one(c, 6, 15, "estimator 'level_mean': missing required key 'time_constant'");
}

TEST(RuleTemplate, UnknownKindSuggestsTheNearest) {
  const auto c = compile(kHeader + "estimators:\n  level_mean: {kind: ewm, of: level}\n");
  expect_one(c, 6, 22,
             "estimator 'level_mean': key 'kind': expected one of ewma, cusum, ewma_chart, rls, "
             "trend, rate, hall, filter_life, episode, got 'ewm'; did you mean 'ewma'?");
}

TEST(RuleTemplate, HeadStartMustBeBelowTheDecisionInterval) {
  const auto c =
      compile(kHeader +
              "estimators:\n"
              "  shift: {kind: cusum, of: level, h: 4, head_start: 4, baseline: {learn: 1h}}\n");
  expect_one(c, 6, 53, "estimator 'shift': key 'head_start': must be below h (4)");
}

TEST(RuleTemplate, BaselineNeedsValuesOrTimeToLearnThem) {
  const auto c = compile(kHeader +
                         "estimators:\n"
                         "  shift: {kind: cusum, of: level, baseline: {target: 3}}\n");
  expect_one(c, 6, 45,
             "estimator 'shift': key 'baseline': give both 'target' and 'sigma', or a 'learn' "
             "time > 0 to learn what is missing from the first data");
}

TEST(RuleTemplate, NegativeDurationIsRefused) {
  const auto c =
      compile(kHeader + "estimators:\n  slope: {kind: trend, of: level, time_constant: -2h}\n");
  expect_one(c, 6, 50, "estimator 'slope': key 'time_constant': must be >= 0, got -7200");
}

TEST(RuleTemplate, ForgettingFactorMustBeInTheUnitInterval) {
  const auto c =
      compile(kHeader +
              "estimators:\n"
              "  model: {kind: rls, target: level, regressors: [level], forgetting: 0}\n");
  expect_one(c, 6, 70, "estimator 'model': key 'forgetting': must be in (0, 1], got 0");
}

TEST(RuleTemplate, DurationDefaultNeedsUnitSeconds) {
  const auto c =
      compile(kHeader + "parameters:\n  high: {default: 6h, unit: ft, description: x}\n");
  expect_one(c, 6, 19,
             "parameter 'high': key 'default': a duration such as '6h' needs unit 's', but the "
             "unit is 'ft'");
}

TEST(RuleTemplate, WrongTypeForAFlag) {
  const auto c = compile(
      "template: probe\ndescription: test\ninputs:\n  level: {unit: ft, required: maybe}\n");
  expect_one(c, 4, 31, "input 'level': key 'required': expected true or false, got 'maybe'");
}

TEST(RuleTemplate, ReadsEveryRlsKeyIntoTheSpec) {
  const auto c = compile(kHeader +
                         "parameters:\n"
                         "  memory: {default: 2d, unit: s, description: x}\n"
                         "estimators:\n"
                         "  model:\n"
                         "    kind: rls\n"
                         "    target: level\n"
                         "    regressors: [level, level]\n"
                         "    intercept: false\n"
                         "    forgetting: 0.999\n"
                         "    nominal_interval: 1min\n"
                         "    learn: memory\n"
                         "    initial_covariance: 100\n"
                         "    max_covariance_trace: 1e6\n"
                         "    residual_time_constant: 30min\n");
  ASSERT_TRUE(c.diagnostics.empty()) << testing::dump(c.diagnostics);
  const auto& rls = testing::estimator<engine::RlsSpec>(c.asset, "model");
  EXPECT_EQ(rls.target, "level");
  EXPECT_EQ(rls.regressors, (std::vector<std::string>{"level", "level"}));
  EXPECT_FALSE(rls.intercept);
  EXPECT_DOUBLE_EQ(rls.forgetting, 0.999);
  EXPECT_DOUBLE_EQ(rls.nominal_interval_s, 60);
  EXPECT_DOUBLE_EQ(rls.learn_s, 2 * 86400);
  EXPECT_DOUBLE_EQ(rls.initial_covariance, 100);
  EXPECT_DOUBLE_EQ(rls.max_covariance_trace, 1e6);
  EXPECT_DOUBLE_EQ(rls.residual_time_constant_s, 1800);
}

TEST(RuleTemplate, KeepsGoingAndReportsEveryBadKey) {
  const auto c = compile(kHeader +
                         "estimators:\n"
                         "  chart: {kind: ewma_chart, of: level, lambda: 0, width: -1, "
                         "baseline: {learn: 1h}, colour: red}\n");
  ASSERT_EQ(c.diagnostics.size(), 3u) << testing::dump(c.diagnostics);
}

TEST(RuleTemplate, ReadsMeasurementAndLimitDelays) {
  const auto c = compile(
      "template: probe\ndescription: test\n"
      "inputs:\n  level: {unit: ft, range: [0, 25], measurement: level}\n"
      "checks:\n"
      "  high: {kind: limit, of: level, limit: 18, deadband_percent: 4, on_delay: 2min, "
      "off_delay: 30s, latching: true, priority: urgent, message: x}\n");
  ASSERT_TRUE(c.diagnostics.empty()) << testing::dump(c.diagnostics);
  EXPECT_EQ(testing::input(c.asset, "level").measurement, engine::Measurement::level);
  const auto& high = testing::check<engine::LimitCheckSpec>(c.asset, "high");
  EXPECT_FALSE(high.deadband.has_value());
  EXPECT_EQ(high.deadband_percent, 4.0);
  EXPECT_EQ(high.on_delay_s, 120.0);
  EXPECT_EQ(high.off_delay_s, 30.0);
  EXPECT_TRUE(c.asset.checks[0].latching);
  EXPECT_EQ(c.asset.checks[0].priority, engine::Priority::urgent);
}

TEST(RuleTemplate, UnsetLimitSettingsStayUnsetForTheMeasurementDefaults) {
  const auto c =
      compile(kHeader + "checks:\n  high: {kind: limit, of: level, limit: 18, message: x}\n");
  ASSERT_TRUE(c.diagnostics.empty()) << testing::dump(c.diagnostics);
  const auto& high = testing::check<engine::LimitCheckSpec>(c.asset, "high");
  EXPECT_FALSE(high.deadband || high.deadband_percent || high.on_delay_s || high.off_delay_s);
  EXPECT_EQ(testing::input(c.asset, "level").measurement, engine::Measurement::other);
}

TEST(RuleTemplate, UnknownMeasurementSuggestsTheNearest) {
  const auto c = compile(
      "template: probe\ndescription: test\ninputs:\n  level: {unit: ft, measurement: presure}\n");
  expect_one(c, 4, 34,
             "input 'level': key 'measurement': expected one of level, pressure, flow, "
             "temperature, differential_pressure, current, other, got 'presure'; did you mean "
             "'pressure'?");
}

TEST(RuleTemplate, DeadbandInUnitsAndInPercentExcludeEachOther) {
  const auto c = compile(kHeader +
                         "checks:\n  high: {kind: limit, of: level, limit: 18, deadband: 1, "
                         "deadband_percent: 2, message: x}\n");
  expect_one(c, 6, 76,
             "check 'high': give the deadband either in engineering units ('deadband') or in "
             "percent of span ('deadband_percent'), not both");
}

TEST(RuleTemplate, UnknownCheckKeySuggestsTheNearest) {
  const auto c = compile(kHeader +
                         "checks:\n  high: {kind: limit, of: level, limit: 18, on_dealy: 1min, "
                         "message: x}\n");
  ASSERT_EQ(c.diagnostics.size(), 1u) << testing::dump(c.diagnostics);
  EXPECT_NE(c.diagnostics[0].message.find("'on_dealy'"), std::string::npos);
  EXPECT_NE(c.diagnostics[0].message.find("did you mean 'on_delay'?"), std::string::npos)
      << c.diagnostics[0].message;
}

TEST(RuleTemplate, ReadsEveryNewCheckKind) {
  const auto c = compile(
      "template: probe\ndescription: test\n"
      "inputs:\n"
      "  level: {unit: ft, expected_interval: 1min, range: [0, 25]}\n"
      "  loop: {unit: mA}\n"
      "  speed: {unit: Hz}\n"
      "checks:\n"
      "  filling: {kind: rate, of: level, direction: falling, limit: 2, horizon: 10min, "
      "deadband: 0.5, on_delay: 1min, message: x}\n"
      "  silent: {kind: stale, of: level, message: x}\n"
      "  stuck: {kind: flatline, of: level, tolerance: 0.01, window: 2h, message: x}\n"
      "  ranged: {kind: out_of_range, of: level, margin: 3, message: x}\n"
      "  failed: {kind: ne43, of: loop, suppressed_when: {of: speed, below: 5}, message: x}\n"
      "  other: {kind: ne43, of: loop, suppressed_when: {of: speed, above: 55}, message: x}\n");
  ASSERT_TRUE(c.diagnostics.empty()) << testing::dump(c.diagnostics);
  const auto& rate = testing::check<engine::RateCheckSpec>(c.asset, "filling");
  EXPECT_EQ(rate.direction, engine::RateDirection::falling);
  EXPECT_EQ(rate.limit, 2.0);
  EXPECT_EQ(rate.horizon_s, 600.0);
  EXPECT_EQ(rate.deadband, 0.5);
  EXPECT_EQ(rate.on_delay_s, 60.0);
  EXPECT_EQ(rate.off_delay_s, 0.0);
  EXPECT_EQ(testing::check<engine::StaleCheckSpec>(c.asset, "silent").factor, 3.0);  // default
  const auto& stuck = testing::check<engine::FlatlineCheckSpec>(c.asset, "stuck");
  EXPECT_EQ(stuck.tolerance, 0.01);
  EXPECT_EQ(stuck.window_s, 7200.0);
  EXPECT_EQ(testing::check<engine::OutOfRangeCheckSpec>(c.asset, "ranged").margin_percent, 3.0);
  const auto* failed = testing::find_named(c.asset.checks, "failed");
  ASSERT_TRUE(failed && failed->suppressed_when);
  EXPECT_EQ(failed->suppressed_when->of, "speed");
  EXPECT_EQ(failed->suppressed_when->when, engine::LimitDirection::low);
  EXPECT_EQ(failed->suppressed_when->threshold, 5.0);
  EXPECT_EQ(testing::find_named(c.asset.checks, "other")->suppressed_when->when,
            engine::LimitDirection::high);
}

TEST(RuleTemplate, SuppressionNeedsExactlyOneOfBelowAndAbove) {
  const auto c = compile(kHeader +
                         "checks:\n  high: {kind: limit, of: level, limit: 18, message: x, "
                         "suppressed_when: {of: level, below: 1, above: 3}}\n");
  expect_one(c, 6, 74,
             "check 'high': key 'suppressed_when': give exactly one of 'below' or 'above'");
}

TEST(RuleTemplate, RateLimitMustBePositive) {
  const auto c = compile(
      kHeader + "checks:\n  r: {kind: rate, of: level, limit: 0, horizon: 1h, message: x}\n");
  expect_one(c, 6, 37, "check 'r': key 'limit': must be > 0, got 0");
}

}  // namespace
}  // namespace bw::config
