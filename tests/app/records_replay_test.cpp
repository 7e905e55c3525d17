// Records through the replay verb: the disposal well template's daily injection record in
// --records FILE (one JSON object per line, local days of America/Chicago), counted in the
// summary, and the same file whether the replay runs at once or is split by a restart mid-day.
#include <gtest/gtest.h>

#include <ctime>
#include <filesystem>
#include <fstream>

#include "run_command.h"

namespace {

namespace fs = std::filesystem;
using bw::testing::lines_of;
using bw::testing::run_brinewatch;

constexpr std::time_t kFirst = 1772456400;  // 2026-03-02T13:00:00Z = 07:00 CST, a day start

std::string iso(std::time_t t) {
  std::tm tm{};
  gmtime_r(&t, &tm);
  char text[32];
  std::strftime(text, sizeof text, "%Y-%m-%dT%H:%M:%SZ", &tm);
  return text;
}

class RecordsReplay : public ::testing::Test {
 protected:
  void SetUp() override {
    dir_ = fs::temp_directory_path() /
           ("brinewatch_records_" + std::to_string(::getpid()) + "_" +
            ::testing::UnitTest::GetInstance()->current_test_info()->name());
    fs::remove_all(dir_);
    fs::create_directories(dir_);
    std::ofstream site(dir_ / "site.yaml");
    site << "site: {name: Dry Creek SWD 4, time_zone: America/Chicago}\n"
         << "rules: [" << BRINEWATCH_SOURCE_DIR << "/rules]\n"
         << "assets:\n"
         << "  disposal_well_1:\n"
         << "    template: disposal_well\n"
         << "    tags: {tubing_pressure: W1.TP, rate: W1.RATE, annulus_pressure: W1.ANN}\n";
  }
  void TearDown() override { fs::remove_all(dir_); }

  // Samples every 5 minutes from kFirst for `hours`; a steady 2400 bbl/d at 1500 psi, with the
  // annulus at 120 psi except a 10 min rise to 180 psi on the second day.
  fs::path history(const std::string& name, int from_step, int to_step) {
    const fs::path file = dir_ / name;
    std::ofstream out(file);
    out << "time,W1.TP,W1.RATE,W1.ANN\n";
    for (int step = from_step; step < to_step; ++step) {
      const bool rise = step >= 24 * 12 + 100 && step < 24 * 12 + 102;
      out << iso(kFirst + step * 300) << ",1500,2400," << (rise ? 180 : 120) << '\n';
    }
    return file;
  }

  fs::path dir_;
};

constexpr int kThreeDays = 3 * 24 * 12 + 1;  // the last sample closes the third day

TEST_F(RecordsReplay, WritesOneLinePerClosedDayAndCountsThem) {
  const auto input = history("history.csv", 0, kThreeDays);
  const auto result =
      run_brinewatch("replay --config " + (dir_ / "site.yaml").string() + " --input " +
                     input.string() + " --alerts " + (dir_ / "alerts.jsonl").string() +
                     " --records " + (dir_ / "records.jsonl").string());
  ASSERT_EQ(result.status, 0) << result.output;
  EXPECT_NE(result.output.find("records: 3 closed, written to"), std::string::npos)
      << result.output;
  const auto lines = lines_of(dir_ / "records.jsonl");
  ASSERT_EQ(lines.size(), 3u);
  EXPECT_NE(lines[0].find("\"time\":\"2026-03-03T13:00:00.000Z\""), std::string::npos) << lines[0];
  EXPECT_NE(lines[0].find("\"period_start\":\"2026-03-02T13:00:00.000Z\""), std::string::npos);
  EXPECT_NE(lines[0].find("\"asset\":\"disposal_well_1\",\"source\":\"daily_injection\","
                          "\"kind\":\"daily_injection\""),
            std::string::npos);
  EXPECT_NE(lines[0].find("\"injected_volume\":{\"value\":2400,\"unit\":\"bbl\"}"),
            std::string::npos)
      << lines[0];
  EXPECT_NE(lines[0].find("\"max_annulus_pressure\":{\"value\":120,\"unit\":\"psi\"}"),
            std::string::npos);
  EXPECT_NE(lines[1].find("\"max_annulus_pressure\":{\"value\":180,\"unit\":\"psi\"}"),
            std::string::npos)
      << lines[1];
  EXPECT_NE(lines[2].find("\"covered_h\":{\"value\":24,\"unit\":\"h\"}"), std::string::npos);
}

TEST_F(RecordsReplay, ARestartMidDayWritesTheSameRecords) {
  const auto whole = history("whole.csv", 0, kThreeDays);
  const std::string config = " --config " + (dir_ / "site.yaml").string();
  const auto one =
      run_brinewatch("replay" + config + " --input " + whole.string() + " --alerts " +
                     (dir_ / "a1.jsonl").string() + " --records " + (dir_ / "one.jsonl").string());
  ASSERT_EQ(one.status, 0) << one.output;

  const int cut = 24 * 12 + 12 * 12 + 7;  // day two, a little after 19:00 local
  const auto first = history("first.csv", 0, cut);
  const auto second = history("second.csv", cut, kThreeDays);
  const std::string state = " --state " + (dir_ / "state").string();
  const std::string outputs =
      " --alerts " + (dir_ / "a2.jsonl").string() + " --records " + (dir_ / "split.jsonl").string();
  const auto part1 =
      run_brinewatch("replay" + config + " --input " + first.string() + state + outputs);
  ASSERT_EQ(part1.status, 0) << part1.output;
  EXPECT_EQ(lines_of(dir_ / "split.jsonl").size(), 1u);
  const auto part2 =
      run_brinewatch("replay" + config + " --input " + second.string() + state + outputs);
  ASSERT_EQ(part2.status, 0) << part2.output;
  EXPECT_EQ(lines_of(dir_ / "split.jsonl"), lines_of(dir_ / "one.jsonl"));
}

}  // namespace
