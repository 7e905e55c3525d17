// The site health roll-up as a person sees it: at the end of a replay's summary, in `brinewatch
// state`, and several sites' stores in visit order with `brinewatch state --rank`.
//
// The fixture history raises tank_a's level_high (priority high) at 06:03 and clears it at
// 06:06 (see replay_verb_test.cpp), so the alert ends returned unacknowledged: by the rule in
// engine/site_health.h an alert to review asks for "attention", whatever its priority.
#include <gtest/gtest.h>

#include <filesystem>
#include <fstream>
#include <string>

#include "run_command.h"

namespace {

namespace fs = std::filesystem;

using bw::testing::CommandResult;
using bw::testing::run_brinewatch;

fs::path scratch(const std::string& name) {
  const fs::path dir = bw::testing::scratch_dir("site-health") / name;
  fs::remove_all(dir);
  return dir;
}

// The lines from the one starting with `first` to the end.
std::string from_line(const std::string& text, const std::string& first) {
  const auto at = text.find("\n" + first);
  return at == std::string::npos ? std::string() : text.substr(at + 1);
}

// The line that starts (after indentation) with `start`.
std::string line_starting(const std::string& text, const std::string& start) {
  std::size_t at = 0;
  while (at < text.size()) {
    const auto end = text.find('\n', at);
    const std::string line = text.substr(at, end == std::string::npos ? end : end - at);
    if (line.find_first_not_of(' ') != std::string::npos &&
        line.compare(line.find_first_not_of(' '), start.size(), start) == 0) {
      return line;
    }
    if (end == std::string::npos) break;
    at = end + 1;
  }
  return {};
}

// A copy of the one-tank site under another name and high limit, so two stores hold two sites.
fs::path write_site(const fs::path& dir, const std::string& name, double high_level) {
  fs::create_directories(dir);
  const fs::path site = dir / "site.yaml";
  std::ofstream(site) << "site: {name: " << name << ", time_zone: UTC}\n"
                      << "rules: [" << BRINEWATCH_SOURCE_DIR << "/rules]\n"
                      << "assets:\n  tank_a:\n    template: tank_level\n"
                      << "    tags: {level: TF1.TK1.LEVEL}\n"
                      << "    parameters: {high_level: " << high_level << "}\n";
  return site;
}

CommandResult replay_into(const fs::path& site, const fs::path& state) {
  return run_brinewatch("replay --config " + site.string() + " --input " +
                        bw::testing::fixture_path("one-tank-long.csv") + " --alerts " +
                        (state.parent_path() / "alerts.jsonl").string() + " --state " +
                        state.string());
}

TEST(SiteHealthVerbs, AReplayEndsItsSummaryWithTheRollUp) {
  const fs::path dir = scratch("replay");
  fs::create_directories(dir);
  const CommandResult r =
      run_brinewatch("replay --config " + bw::testing::fixture_path("one-tank.yaml") + " --input " +
                     bw::testing::fixture_path("one-tank-long.csv") + " --alerts " +
                     (dir / "alerts.jsonl").string());
  ASSERT_EQ(r.status, 0) << r.output;
  const std::string health = from_line(r.output, "site health");
  ASSERT_FALSE(health.empty()) << r.output;
  EXPECT_EQ(health.substr(0, health.find('\n')),
            "site health as of 2026-03-01T06:07:00Z: attention (Test Flats SWD 1)");
  EXPECT_EQ(line_starting(health, "asset"),
            "  asset       status     unacknowledged  acknowledged  to review  set aside  oldest "
            "unacknowledged");
  const std::string tank = line_starting(health, "tank_a");
  EXPECT_NE(tank.find("attention"), std::string::npos) << tank;
  EXPECT_NE(tank.find("1 high"), std::string::npos) << "level_high to review: " << tank;
  EXPECT_NE(tank.find("2026-03-01T06:06:00Z"), std::string::npos)
      << "waiting since it cleared: " << tank;
  const std::string site = line_starting(health, "whole site");
  EXPECT_NE(site.find("attention"), std::string::npos) << site;
  EXPECT_EQ(health.find('\x1b'), std::string::npos) << "no colour codes";
}

TEST(SiteHealthVerbs, TheStateVerbPrintsTheRollUpOfAStore) {
  const fs::path dir = scratch("state");
  const fs::path site = write_site(dir, "Test Flats SWD 1", 15.0);
  const CommandResult replayed = replay_into(site, dir / "state");
  ASSERT_EQ(replayed.status, 0) << replayed.output;
  const CommandResult r = run_brinewatch("state --dir " + (dir / "state").string());
  ASSERT_EQ(r.status, 0) << r.output;
  const std::string health = from_line(r.output, "site health");
  EXPECT_EQ(health, from_line(replayed.output, "site health"))
      << "read back from the store without the site file, the roll-up is the replay's own";
  EXPECT_EQ(health.substr(0, health.find('\n')),
            "site health as of 2026-03-01T06:07:00Z: attention (Test Flats SWD 1)")
      << r.output;
  EXPECT_NE(line_starting(health, "tank_a").find("1 high"), std::string::npos) << health;
  EXPECT_NE(line_starting(health, "tank_a").find("2026-03-01T06:06:00Z"), std::string::npos)
      << "the store keeps since when: " << health;
}

// Three stores: a site whose level is still over its (lower) limit at the end, the fixture
// site with an alert to review, and a folder with no store; the first comes first.
TEST(SiteHealthVerbs, RankListsTheSitesInVisitOrderAndNamesWhatItCouldNotRead) {
  const fs::path dir = scratch("rank");
  const fs::path review = dir / "review";
  const fs::path over = dir / "over";
  ASSERT_EQ(replay_into(write_site(review, "Test Flats SWD 1", 15.0), review / "state").status, 0);
  ASSERT_EQ(replay_into(write_site(over, "Mesquite Draw SWD 7", 12.0), over / "state").status, 0);
  const fs::path empty = dir / "empty";
  fs::create_directories(empty);

  const CommandResult r = run_brinewatch("state --rank " + (review / "state").string() + " " +
                                         empty.string() + " " + (over / "state").string());
  EXPECT_EQ(r.status, 1) << "one folder could not be read: " << r.output;
  EXPECT_NE(r.output.find("visit order (2 sites):"), std::string::npos) << r.output;
  const std::string first = line_starting(r.output, "1 ");
  const std::string second = line_starting(r.output, "2 ");
  EXPECT_NE(first.find("Mesquite Draw SWD 7"), std::string::npos) << r.output;
  EXPECT_NE(first.find("visit soon"), std::string::npos) << first;
  EXPECT_NE(second.find("Test Flats SWD 1"), std::string::npos) << r.output;
  EXPECT_NE(second.find("attention"), std::string::npos) << second;
  EXPECT_NE(r.output.find("could not read " + empty.string() + ": no state store here"),
            std::string::npos)
      << r.output;
  EXPECT_FALSE(fs::exists(empty / "brinewatch-state.sqlite")) << "ranking creates nothing";
}

TEST(SiteHealthVerbs, StateRefusesSeveralFoldersWithoutRank) {
  const CommandResult r = run_brinewatch("state a b");
  EXPECT_EQ(r.status, 2);
  EXPECT_NE(r.output.find("give one state folder, or --rank to order several"), std::string::npos)
      << r.output;
}

}  // namespace
