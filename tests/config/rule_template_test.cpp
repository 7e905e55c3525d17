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
    instantiate_template(*out.rule, source, default_values(*out.rule), out.asset, out.diagnostics);
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
             "trend, rate, got 'ewm'; did you mean 'ewma'?");
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

}  // namespace
}  // namespace bw::config
