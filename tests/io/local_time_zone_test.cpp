#include "io/local_time_zone.h"

#include <gtest/gtest.h>

#include <chrono>
#include <string>
#include <vector>

#include "reference_tool.h"
#include "sample_collector.h"

namespace bw::io {
namespace {

using testing::run_reference_tool;

std::string note_name(ConversionNote note) {
  switch (note) {
    case ConversionNote::unique:
      return "unique";
    case ConversionNote::ambiguous:
      return "ambiguous";
    case ConversionNote::nonexistent:
      return "nonexistent";
  }
  return "?";
}

// Converts every text (local, no offset) in `zone` with ONE LocalTimeZone, in order, so the
// cache is exercised the way a history file exercises it, and compares each instant and note
// with Python's zoneinfo (fold=0), computed now by tests/tools/iso_time_reference.py.
void expect_same_as_zoneinfo(const std::string& zone, const std::vector<std::string>& texts) {
  std::string input;
  for (const auto& text : texts) input += text + "\n";
  const auto expected = run_reference_tool("iso_time_reference.py", {zone}, input);
  ASSERT_EQ(expected.size(), texts.size());
  auto converter = LocalTimeZone::find(zone);
  ASSERT_TRUE(converter.ok()) << converter.error().message;
  int mismatches = 0;
  for (std::size_t i = 0; i < texts.size() && mismatches < 10; ++i) {
    const auto parsed = parse_iso8601(texts[i]);
    ASSERT_TRUE(parsed.has_value()) << texts[i];
    ConversionNote note{};
    const core::SensorTime got = converter->to_utc(parsed->civil, note);
    const std::string actual =
        std::to_string(got.time_since_epoch().count()) + " " + note_name(note);
    if (actual != expected[i]) {
      ++mismatches;
      ADD_FAILURE() << zone << " " << texts[i] << ": got " << actual << ", zoneinfo says "
                    << expected[i];
    }
  }
}

// Local wall-clock texts from `first` (inclusive) every `step` for `count` steps.
std::vector<std::string> wall_clock_sweep(std::chrono::sys_seconds first, std::chrono::seconds step,
                                          int count) {
  std::vector<std::string> texts;
  for (int i = 0; i < count; ++i) texts.push_back(testing::civil_text(first + i * step));
  return texts;
}

TEST(LocalTimeZone, ChicagoDaylightSavingEdgesMatchZoneinfo) {
  BW_NEED_PYTHON_REFERENCE();
  // US rules (common practice): clocks go 02:00 -> 03:00 on 2026-03-08 and 02:00 -> 01:00 on
  // 2026-11-01. 02:30 on the first day does not exist; 01:30 on the second happens twice.
  expect_same_as_zoneinfo(
      "America/Chicago",
      {"2026-01-15 12:00:00", "2026-03-08 01:59:59.999999", "2026-03-08 02:00:00",
       "2026-03-08 02:30:00", "2026-03-08 02:59:59.999999", "2026-03-08 03:00:00",
       "2026-07-04 12:00:00", "2026-11-01 00:59:59", "2026-11-01 01:00:00", "2026-11-01 01:30:00",
       "2026-11-01 01:59:59.999999", "2026-11-01 02:00:00", "2026-12-31 23:59:59"});
}

TEST(LocalTimeZone, NonexistentTimeMovesForwardAndAmbiguousTakesTheEarlierInstant) {
  auto chicago = LocalTimeZone::find("America/Chicago");
  ASSERT_TRUE(chicago.ok());
  ConversionNote note{};
  // 02:30 read with CST (-6) is 08:30Z, the same instant as 03:30 CDT (common practice: US
  // central time is UTC-6 in winter, UTC-5 in summer).
  EXPECT_EQ(chicago->to_utc(CivilTime{2026, 3, 8, 2, 30, 0, 0}, note),
            testing::utc(2026, 3, 8, 8, 30));
  EXPECT_EQ(note, ConversionNote::nonexistent);
  // The first 01:30 of 2026-11-01 is CDT (-5): 06:30Z.
  EXPECT_EQ(chicago->to_utc(CivilTime{2026, 11, 1, 1, 30, 0, 0}, note),
            testing::utc(2026, 11, 1, 6, 30));
  EXPECT_EQ(note, ConversionNote::ambiguous);
}

TEST(LocalTimeZone, YearLongSweepsMatchZoneinfo) {
  BW_NEED_PYTHON_REFERENCE();
  using namespace std::chrono;
  const sys_seconds start = sys_days(2026y / January / 1);
  // Every 10 minutes for a year: both Chicago changes, hitting the cache the way a file does.
  expect_same_as_zoneinfo("America/Chicago", wall_clock_sweep(start, minutes(10), 52560));
  // Lord Howe Island moves its clocks by 30 minutes; Sao Paulo changed at midnight in 2017-18
  // (the 3W dataset's era); Moscow had no changes in 2020 (SKAB); UTC never changes.
  expect_same_as_zoneinfo("Australia/Lord_Howe", wall_clock_sweep(start, minutes(5), 105120));
  expect_same_as_zoneinfo("America/Sao_Paulo",
                          wall_clock_sweep(sys_days(2017y / October / 1), minutes(15), 19000));
  expect_same_as_zoneinfo("Europe/Moscow",
                          wall_clock_sweep(sys_days(2020y / January / 1), hours(1), 8784));
  expect_same_as_zoneinfo("UTC", wall_clock_sweep(start, hours(7), 2000));
}

TEST(LocalTimeZone, BackwardJumpsGiveTheSameAnswersAsForwardOnes) {
  BW_NEED_PYTHON_REFERENCE();
  // Out-of-order times must not be answered from a stale cached stretch.
  expect_same_as_zoneinfo("America/Chicago",
                          {"2026-07-01 00:00:00", "2026-01-01 00:00:00", "2026-11-01 01:30:00",
                           "2026-07-01 00:00:00", "2026-03-08 02:30:00", "2026-03-08 03:00:00",
                           "2026-03-08 01:59:59", "2026-11-01 02:00:00", "2026-11-01 00:59:59"});
}

TEST(LocalTimeZone, UnknownZoneIsAnErrorNamingIt) {
  const auto zone = LocalTimeZone::find("America/Dry_Creek");
  ASSERT_FALSE(zone.ok());
  EXPECT_NE(zone.error().message.find("America/Dry_Creek"), std::string::npos);
}

}  // namespace
}  // namespace bw::io
