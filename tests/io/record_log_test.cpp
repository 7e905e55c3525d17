// Records as JSON Lines: the fields of the public format, null for a figure with no data, and a
// stable id. Parsed back with Python's json module (the standard library's parser, not ours) when
// python3 is present.
#include "io/record_log.h"

#include <gtest/gtest.h>

#include <cmath>
#include <filesystem>
#include <fstream>
#include <sstream>

#include "../engine/record_sites.h"

namespace bw::io {
namespace {

using engine::testing::kHour;
using engine::testing::kMonday;
using engine::testing::utc;

engine::AssetRecord sample_record(engine::RecordContent& content) {
  content.kind = "daily_injection";
  content.time = utc(kMonday + 31 * kHour);
  content.period_start = utc(kMonday + 7 * kHour);
  content.fields = {{"injected_volume", 2412.5, "bbl"},
                    {"max_tubing_pressure", NAN, "psi"},
                    {"covered_h", 23.5, "h"}};
  return {"Dry Creek SWD 4", "swd_well_1", "daily_injection", content};
}

TEST(RecordLog, WritesEveryFieldOfTheFormatInOrder) {
  engine::RecordContent content;
  const auto record = sample_record(content);
  const std::string json = record_to_json(record);
  EXPECT_EQ(json,
            "{\"time\":\"2026-03-03T07:00:00.000Z\",\"site\":\"Dry Creek SWD 4\","
            "\"asset\":\"swd_well_1\",\"source\":\"daily_injection\",\"kind\":\"daily_injection\","
            "\"period_start\":\"2026-03-02T07:00:00.000Z\",\"fields\":{"
            "\"injected_volume\":{\"value\":2412.5,\"unit\":\"bbl\"},"
            "\"max_tubing_pressure\":{\"value\":null,\"unit\":\"psi\"},"
            "\"covered_h\":{\"value\":23.5,\"unit\":\"h\"}},"
            "\"id\":\"" +
                record_id(record) + "\"}");
}

TEST(RecordLog, AnEventRecordHasNoPeriodStart) {
  engine::RecordContent content;
  auto record = sample_record(content);
  content.period_start.reset();
  content.kind = "change_out";
  record.content = content;
  EXPECT_NE(record_to_json(record).find("\"period_start\":null"), std::string::npos);
}

TEST(RecordLog, TheIdIsStableAndTellsRecordsApart) {
  engine::RecordContent content;
  const auto record = sample_record(content);
  EXPECT_EQ(record_id(record), record_id(record));
  EXPECT_EQ(record_id(record).size(), 16u);
  auto later = record;
  later.content.time += std::chrono::hours(24);
  EXPECT_NE(record_id(record), record_id(later));
  auto other_asset = record;
  other_asset.asset = "swd_well_2";
  EXPECT_NE(record_id(record), record_id(other_asset));
}

TEST(RecordLog, WritesOneLinePerRecordAndIgnoresTransitions) {
  const auto path = std::filesystem::temp_directory_path() / "brinewatch_record_log_test.jsonl";
  engine::RecordContent content;
  const auto record = sample_record(content);
  {
    auto log = RecordLog::open(path, AlertLog::Mode::truncate, AlertLog::Hold::until_flush);
    ASSERT_TRUE(log.ok());
    log.value()->on_transition(engine::AlertTransition{});
    log.value()->on_record(record);
    log.value()->on_record(record);
    EXPECT_TRUE(log.value()->flush());
    EXPECT_EQ(log.value()->written(), 2u);
  }
  std::ifstream in(path);
  std::string line;
  int lines = 0;
  while (std::getline(in, line)) {
    EXPECT_EQ(line, record_to_json(record));
    ++lines;
  }
  EXPECT_EQ(lines, 2);

  // The standard library's JSON parser reads it back (skipped without python3).
  if (std::system("python3 -c 'pass' >/dev/null 2>&1") == 0) {
    const std::string command =
        "python3 -c 'import json,sys\n"
        "for line in open(sys.argv[1]):\n"
        "    r = json.loads(line)\n"
        "    assert r[\"fields\"][\"injected_volume\"] == {\"value\": 2412.5, \"unit\": \"bbl\"}\n"
        "    assert r[\"fields\"][\"max_tubing_pressure\"][\"value\"] is None\n"
        "    assert list(r[\"fields\"]) == [\"injected_volume\", \"max_tubing_pressure\", "
        "\"covered_h\"]\n"
        "' " +
        path.string();
    EXPECT_EQ(std::system(command.c_str()), 0);
  }
  std::filesystem::remove(path);
}

}  // namespace
}  // namespace bw::io
