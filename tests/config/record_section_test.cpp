// The `records:` section of a rule template: what it compiles to, and a clear message with the
// file and line for each mistake.
#include <gtest/gtest.h>

#include <filesystem>
#include <fstream>
#include <string>

#include "config/site_loader.h"
#include "spec_lookup.h"

namespace bw::config {
namespace {

namespace fs = std::filesystem;
using testing::dump;

constexpr const char* kWell = R"(template: well
description: A well with a daily record.
inputs:
  rate: {unit: bbl/d, expected_interval: 5min}
  tubing_pressure: {unit: psi, expected_interval: 5min}
records:
  daily_injection:
)";

// Loads a site with one asset of template "well", whose records section continues with `rest`.
LoadResult load_with(const std::string& rest) {
  const fs::path dir =
      fs::temp_directory_path() / ("brinewatch_records_rules_" + std::to_string(::getpid()));
  fs::create_directories(dir);
  std::ofstream(dir / "well.yaml") << kWell << rest;
  auto result = load_site_from_string(
      "site: {name: Dry Creek SWD 4, time_zone: America/Chicago}\n"
      "assets:\n"
      "  well_1: {template: well, tags: {rate: W.RATE, tubing_pressure: W.TP}}\n",
      "site.yaml", {dir.string()});
  fs::remove_all(dir);
  return result;
}

bool mentions(const LoadResult& result, const std::string& text) {
  for (const auto& d : result.diagnostics) {
    if (d.message.find(text) != std::string::npos) return true;
  }
  return false;
}

TEST(RecordSection, CompilesEveryKey) {
  const auto result = load_with(
      "    kind: daily\n"
      "    day_start: 7h\n"
      "    fields:\n"
      "      injected_volume: {of: rate, stat: total, rate_per: 1d, unit: bbl}\n"
      "      injecting_hours: {of: rate, stat: time_above, above: 1}\n"
      "      max_tubing_pressure: {of: tubing_pressure, stat: max}\n");
  ASSERT_TRUE(result.ok()) << dump(result.diagnostics);
  const auto& records = result.site->assets[0].records;
  ASSERT_EQ(records.size(), 1u);
  EXPECT_EQ(records[0].name, "daily_injection");
  EXPECT_EQ(records[0].period, engine::RecordPeriod::daily);
  EXPECT_DOUBLE_EQ(records[0].day_start_s, 7 * 3600);
  ASSERT_EQ(records[0].fields.size(), 3u);
  EXPECT_EQ(records[0].fields[0].stat, engine::RecordStat::total);
  EXPECT_DOUBLE_EQ(*records[0].fields[0].rate_per_s, 86400);
  EXPECT_EQ(records[0].fields[0].unit, "bbl");
  EXPECT_DOUBLE_EQ(*records[0].fields[1].above, 1);
  EXPECT_EQ(records[0].fields[2].of, "tubing_pressure");
}

TEST(RecordSection, AMisspeltKeySuggestsTheRightOne) {
  const auto result = load_with(
      "    kind: daily\n"
      "    fields:\n"
      "      max_tubing_pressure: {of: tubing_pressure, stats: max}\n");
  EXPECT_FALSE(result.ok());
  EXPECT_TRUE(mentions(result,
                       "record 'daily_injection' field 'max_tubing_pressure': unknown key "
                       "'stats'; did you mean 'stat'?"))
      << dump(result.diagnostics);
  ASSERT_FALSE(result.diagnostics.empty());
  EXPECT_EQ(result.diagnostics[0].line, 10);
}

TEST(RecordSection, ATotalNeedsItsRateUnitAndUnit) {
  const auto result = load_with(
      "    kind: daily\n"
      "    fields:\n"
      "      injected_volume: {of: rate, stat: total}\n");
  EXPECT_TRUE(mentions(result, "stat 'total' needs key 'rate_per'")) << dump(result.diagnostics);
  EXPECT_TRUE(mentions(result, "stat 'total' needs key 'unit'")) << dump(result.diagnostics);
}

TEST(RecordSection, AKeyOfAnotherStatIsRefused) {
  const auto result = load_with(
      "    kind: daily\n"
      "    fields:\n"
      "      max_tubing_pressure: {of: tubing_pressure, stat: max, unit: bar}\n");
  EXPECT_TRUE(mentions(result, "key 'unit' does not apply to stat 'max'"))
      << dump(result.diagnostics);
}

TEST(RecordSection, UnknownKindStatAndSignalAreNamed) {
  auto result = load_with(
      "    kind: weekly\n"
      "    fields:\n"
      "      max_tubing_pressure: {of: tubing_pressure, stat: max}\n");
  EXPECT_TRUE(mentions(result, "expected one of daily")) << dump(result.diagnostics);
  result = load_with(
      "    kind: daily\n"
      "    fields:\n"
      "      average_tubing_pressure: {of: tubing_pressure, stat: time_avrage}\n");
  EXPECT_TRUE(mentions(result, "did you mean 'time_average'")) << dump(result.diagnostics);
  result = load_with(
      "    kind: daily\n"
      "    fields:\n"
      "      max_casing_pressure: {of: casing_pressure, stat: max}\n");
  EXPECT_TRUE(mentions(result, "casing_pressure")) << dump(result.diagnostics);
  EXPECT_FALSE(result.ok());
}

TEST(RecordSection, DayStartMustBeWithinTheDayAndFieldsMustBeGiven) {
  auto result = load_with(
      "    kind: daily\n"
      "    day_start: 24h\n"
      "    fields:\n"
      "      max_tubing_pressure: {of: tubing_pressure, stat: max}\n");
  EXPECT_TRUE(mentions(result, "key 'day_start': must be")) << dump(result.diagnostics);
  result = load_with("    kind: daily\n    fields: {}\n");
  EXPECT_TRUE(mentions(result, "list at least one field")) << dump(result.diagnostics);
  result = load_with(
      "    kind: daily\n"
      "    fields:\n"
      "      covered_h: {of: rate, stat: max}\n");
  EXPECT_TRUE(mentions(result, "taken by the hours the record covers")) << dump(result.diagnostics);
}

}  // namespace
}  // namespace bw::config
