// End-to-end tests of the executable: the verbs as a person or a script calls them.
#include <gtest/gtest.h>

#include <cstdio>
#include <filesystem>
#include <fstream>
#include <sstream>
#include <string>

#include "run_command.h"

namespace {

namespace fs = std::filesystem;

using bw::testing::CommandResult;
using bw::testing::lines_of;

CommandResult run(const std::string& arguments) { return bw::testing::run_brinewatch(arguments); }

std::string fixture(const std::string& name) { return bw::testing::fixture_path(name); }

fs::path scratch(const std::string& name) { return bw::testing::scratch_dir("verbs") / name; }

// The tank_level template's level limits use the level defaults (common practice: 5 % of span
// deadband, 60 s on- and off-delay), so the raise falls due 60 s after the level first exceeds
// 15 ft, and the clear 60 s after it falls below 15 - 1.25 ft.
TEST(ReplayVerb, WritesOneJsonLinePerTransitionAndSummarises) {
  const fs::path alerts = scratch("alerts.jsonl");
  const CommandResult r = run("replay --config " + fixture("one-tank.yaml") + " --input " +
                              fixture("one-tank-long.csv") + " --alerts " + alerts.string());
  ASSERT_EQ(r.status, 0) << r.output;
  std::vector<std::string> lines;  // the level limit's transitions (the fill rate may fire too)
  for (const auto& line : lines_of(alerts)) {
    if (line.find(R"("check":"level_high")") != std::string::npos) lines.push_back(line);
  }
  ASSERT_EQ(lines.size(), 2u) << r.output;
  EXPECT_EQ(lines[0].rfind(R"({"time":"2026-03-01T06:03:00.000Z","site":"Test Flats SWD 1",)"
                           R"("asset":"tank_a","check":"level_high","event":"raised",)"
                           R"("priority":"high","value":15.2,"unit":"ft","tag":"TF1.TK1.LEVEL",)",
                           0),
            0u)
      << lines[0];
  EXPECT_NE(lines[0].find(R"("state":"unacknowledged","previous_state":"normal","cause":"sample")"),
            std::string::npos)
      << lines[0];
  EXPECT_NE(lines[1].find(R"("time":"2026-03-01T06:06:00.000Z")"), std::string::npos) << lines[1];
  EXPECT_NE(lines[1].find(R"("event":"cleared")"), std::string::npos);
  EXPECT_NE(lines[1].find(R"("state":"returned_unacknowledged")"), std::string::npos) << lines[1];
  // The summary names the rejected row and its line, the unbound tag, and the alert counts.
  EXPECT_NE(r.output.find("line 5"), std::string::npos) << r.output;
  EXPECT_NE(r.output.find("OTHER.TAG"), std::string::npos) << r.output;
  EXPECT_NE(r.output.find("level_high"), std::string::npos) << r.output;
}

TEST(ReplayVerb, StrictModeStopsAtTheFirstBadRowWithStatusOne) {
  const CommandResult r = run("replay --strict --config " + fixture("one-tank.yaml") + " --input " +
                    fixture("one-tank-long.csv") + " --alerts " + scratch("strict.jsonl").string());
  EXPECT_EQ(r.status, 1) << r.output;
  EXPECT_NE(r.output.find("--strict"), std::string::npos) << r.output;
}

TEST(ReplayVerb, RefusesAnUnknownOptionWithASuggestion) {
  const CommandResult r = run("replay --config x.yaml --input y.csv --alrets out.jsonl");
  EXPECT_EQ(r.status, 2);
  EXPECT_NE(r.output.find("unknown option '--alrets'; did you mean 'alerts'?"), std::string::npos)
      << r.output;
}

TEST(ReplayVerb, AMissingInputFileFailsWithStatusOneAndNamesIt) {
  const CommandResult r = run("replay --config " + fixture("one-tank.yaml") + " --input /nonexistent/h.csv");
  EXPECT_EQ(r.status, 1);
  EXPECT_NE(r.output.find("/nonexistent/h.csv"), std::string::npos) << r.output;
}

TEST(CheckVerb, PrintsTheCompiledGraphOfASoundSite) {
  const CommandResult r = run("check " + std::string(BRINEWATCH_SOURCE_DIR) + "/config-examples/dry-creek-swd4.yaml");
  ASSERT_EQ(r.status, 0) << r.output;
  for (const char* expected : {"water_tank_1", "water_tank_2", "skim_tank", "DC4.TK2.LEVEL", "overflow_ahead"}) {
    EXPECT_NE(r.output.find(expected), std::string::npos) << expected;
  }
}

TEST(CheckVerb, ReportsProblemsWithFileLineAndColumnAndStatusTwo) {
  const fs::path site = scratch("bad-site.yaml");
  std::ofstream(site) << "site:\n  name: X\n  time_zone: America/Chicago\nrules: ["
                      << BRINEWATCH_SOURCE_DIR << "/rules]\nassets:\n  t:\n    template: tank_level\n"
                      << "    tags: {levle: A}\n";
  const CommandResult r = run("check " + site.string());
  EXPECT_EQ(r.status, 2);
  EXPECT_NE(r.output.find(site.string() + ":8:"), std::string::npos) << r.output;
  EXPECT_NE(r.output.find("did you mean 'level'"), std::string::npos) << r.output;
}

// The demo's invented story: the clogging filter on water tank 2 must be forecast before the
// tank reaches its high level, and the double truck unloading must show as a fast fill.
TEST(DemoVerb, TellsTheInventedStoryInOrder) {
  const fs::path dir = scratch("demo");
  const CommandResult r = run("demo --dir " + dir.string());
  ASSERT_EQ(r.status, 0) << r.output;
  const auto lines = lines_of(dir / "alerts.jsonl");
  auto first = [&](const std::string& asset, const std::string& check) -> std::ptrdiff_t {
    for (std::size_t i = 0; i < lines.size(); ++i) {
      if (lines[i].find("\"asset\":\"" + asset + "\",\"check\":\"" + check + "\",\"event\":\"raised\"") !=
          std::string::npos) {
        return static_cast<std::ptrdiff_t>(i);
      }
    }
    return -1;
  };
  const auto forecast = first("water_tank_2", "overflow_ahead");
  const auto high = first("water_tank_2", "level_high");
  ASSERT_GE(forecast, 0) << r.output;
  ASSERT_GE(high, 0) << r.output;
  EXPECT_LT(forecast, high);
  EXPECT_GE(first("skim_tank", "fill_rate_high"), 0) << r.output;
  EXPECT_EQ(first("water_tank_1", "level_high"), -1) << "the healthy tank stays quiet";
  EXPECT_EQ(first("water_tank_1", "overflow_ahead"), -1) << "the healthy tank stays quiet";
}

}  // namespace
