#include "io/history_csv.h"

#include <gtest/gtest.h>

#include <string>
#include <vector>

#include "sample_collector.h"

namespace bw::io {
namespace {

using engine::Quality;
using testing::CollectedSample;
using testing::SampleCollector;
using testing::utc;

const std::string kFixtures = BRINEWATCH_SOURCE_DIR "/tests/io/fixtures/";

void expect_samples(const std::vector<CollectedSample>& got,
                    const std::vector<CollectedSample>& want) {
  ASSERT_EQ(got.size(), want.size());
  for (std::size_t i = 0; i < want.size(); ++i) {
    SCOPED_TRACE("sample " + std::to_string(i));
    EXPECT_EQ(got[i].tag, want[i].tag);
    EXPECT_EQ(got[i].time, want[i].time);
    EXPECT_EQ(got[i].value, want[i].value);
    EXPECT_EQ(got[i].quality, want[i].quality);
  }
}

Result<HistoryStats> read_text(const std::string& text, SampleCollector& out,
                               HistoryOptions options = {}) {
  return read_history_text(text, "test.csv", options, out);
}

TEST(HistoryCsv, LongFormFileWithQualityWordsAndNumbers) {
  SampleCollector out;
  const auto stats = read_history(kFixtures + "dry_creek_long.csv", {}, out);
  ASSERT_TRUE(stats.ok()) << stats.error().message;
  EXPECT_EQ(stats->layout, HistoryLayout::long_form);
  EXPECT_EQ(stats->separator, ',');
  EXPECT_TRUE(stats->has_quality_column);
  EXPECT_EQ(stats->lines, 8u);
  EXPECT_EQ(stats->samples, 7u);
  EXPECT_EQ(stats->rejected, 0u);
  EXPECT_EQ(stats->local_times, 0u);
  EXPECT_EQ(stats->tags, (std::vector<std::string>{"DC4.TK101.LEVEL_FT", "DC4.FLT201.DP_PSI",
                                                   "DC4.P301.MOTOR_AMPS"}));
  // Quality numbers: 192 = 0xC0 is good, 86 = 0x56 has top bits 01, uncertain (OPC DA quality
  // byte, from memory). 1772344804 epoch seconds = 2026-03-01T06:00:04Z (std::chrono calendar).
  expect_samples(
      out.samples,
      {
          {"DC4.TK101.LEVEL_FT", utc(2026, 3, 1, 6), 12.25, Quality::good},
          {"DC4.FLT201.DP_PSI", utc(2026, 3, 1, 6), 8.5, Quality::good},
          {"DC4.TK101.LEVEL_FT", utc(2026, 3, 1, 6, 0, 1), 12.3, Quality::good},
          {"DC4.P301.MOTOR_AMPS", utc(2026, 3, 1, 6, 0, 1), 61.5, Quality::good},
          {"DC4.FLT201.DP_PSI", utc(2026, 3, 1, 6, 0, 2, 500000), 8.75, Quality::uncertain},
          {"DC4.P301.MOTOR_AMPS", utc(2026, 3, 1, 6, 0, 3), -0.5, Quality::bad},
          {"DC4.TK101.LEVEL_FT", utc(2026, 3, 1, 6, 0, 4), 12.0, Quality::uncertain},
      });
}

// BOM, ';', CRLF, quoted header, an ignored label column, empty cells, no final newline, local
// times in America/Chicago across both daylight-saving changes of 2026.
TEST(HistoryCsv, WideFormFileInLocalTime) {
  SampleCollector out;
  HistoryOptions options;
  options.time_zone = "America/Chicago";
  options.ignore_columns = {"class"};
  const auto stats = read_history(kFixtures + "dry_creek_wide.csv", options, out);
  ASSERT_TRUE(stats.ok()) << stats.error().message;
  EXPECT_EQ(stats->layout, HistoryLayout::wide_form);
  EXPECT_EQ(stats->separator, ';');
  EXPECT_EQ(stats->tags, (std::vector<std::string>{"DC4 TK101 level ft", "DC4 FLT201 dP psi"}));
  EXPECT_EQ(stats->ignored_columns, (std::vector<std::string>{"class"}));
  EXPECT_EQ(stats->lines, 5u);
  EXPECT_EQ(stats->rejected, 0u);
  EXPECT_EQ(stats->local_times, 4u);
  EXPECT_EQ(stats->nonexistent_local_times, 1u);
  EXPECT_EQ(stats->ambiguous_local_times, 1u);
  // Offsets (common practice): CST is UTC-6, CDT UTC-5. 02:30 on 2026-03-08 does not exist and
  // moves forward to 03:30 CDT; 01:30 on 2026-11-01 is read as the earlier, CDT instant.
  const std::string level = "DC4 TK101 level ft";
  const std::string dp = "DC4 FLT201 dP psi";
  expect_samples(out.samples, {
                                  {level, utc(2026, 3, 8, 7, 59, 59), 12.5, Quality::good},
                                  {dp, utc(2026, 3, 8, 7, 59, 59), 8.25, Quality::good},
                                  {dp, utc(2026, 3, 8, 8, 30), 8.5, Quality::good},
                                  {level, utc(2026, 3, 8, 8, 45), 12.75, Quality::good},
                                  {level, utc(2026, 11, 1, 6, 30), 13, Quality::good},
                                  {dp, utc(2026, 11, 1, 6, 30), 9, Quality::good},
                              });
  const std::string summary = describe(stats.value(), "dry_creek_wide.csv");
  EXPECT_NE(summary.find("times without offset were read as America/Chicago"), std::string::npos)
      << summary;
}

// The same table written every way the reader must accept gives the same samples.
TEST(HistoryCsv, SeparatorsLineEndsBomAndFinalNewlineDoNotChangeTheSamples) {
  const std::vector<std::vector<std::string>> rows = {
      {"\"time\"", "\"DC4.TK101.LEVEL_FT\"", "\"DC4.P301.MOTOR_AMPS\""},
      {"2026-03-01T06:00:00Z", "12.5", ""},
      {"2026-03-01T06:00:01Z", "", "61.5"},
      {"2026-03-01T06:00:02Z", "12.75", "62"},
  };
  const std::vector<CollectedSample> want = {
      {"DC4.TK101.LEVEL_FT", utc(2026, 3, 1, 6, 0, 0), 12.5, Quality::good},
      {"DC4.P301.MOTOR_AMPS", utc(2026, 3, 1, 6, 0, 1), 61.5, Quality::good},
      {"DC4.TK101.LEVEL_FT", utc(2026, 3, 1, 6, 0, 2), 12.75, Quality::good},
      {"DC4.P301.MOTOR_AMPS", utc(2026, 3, 1, 6, 0, 2), 62, Quality::good},
  };
  for (const char separator : {',', ';'}) {
    for (const std::string line_end : {"\n", "\r\n"}) {
      for (const bool bom : {false, true}) {
        for (const bool final_newline : {false, true}) {
          std::string text = bom ? "\xEF\xBB\xBF" : "";
          for (std::size_t r = 0; r < rows.size(); ++r) {
            for (std::size_t c = 0; c < rows[r].size(); ++c) {
              text += (c > 0 ? std::string(1, separator) : "") + rows[r][c];
            }
            if (r + 1 < rows.size() || final_newline) text += line_end;
          }
          SCOPED_TRACE(text);
          SampleCollector out;
          const auto stats = read_text(text, out);
          ASSERT_TRUE(stats.ok()) << stats.error().message;
          EXPECT_EQ(stats->separator, separator);
          EXPECT_EQ(stats->layout, HistoryLayout::wide_form);
          EXPECT_EQ(stats->lines, 4u);
          EXPECT_EQ(stats->rejected, 0u);
          expect_samples(out.samples, want);
        }
      }
    }
  }
}

TEST(HistoryCsv, HeaderNamesAreCaseInsensitiveAndTimestampIsAccepted) {
  SampleCollector out;
  const auto stats = read_text("Value;TIMESTAMP;Tag\n1.5;2026-03-01T06:00:00Z;DC4.LT1\n", out);
  ASSERT_TRUE(stats.ok()) << stats.error().message;
  EXPECT_EQ(stats->layout, HistoryLayout::long_form);
  EXPECT_FALSE(stats->has_quality_column);
  expect_samples(out.samples, {{"DC4.LT1", utc(2026, 3, 1, 6), 1.5, Quality::good}});
}

TEST(HistoryCsv, QualityWordsAndNumbersMapToTheThreeQualities) {
  // Numbers: OPC DA quality word, low byte's top two bits 11 good, 01/10 uncertain, 00 bad
  // (from memory): 192 good, 216 good (local override), 0xC0 + 256 still good (high byte is
  // vendor bits), 64 and 128 uncertain, 0 and 24 (communication failure) bad.
  const std::vector<std::pair<std::string, Quality>> cases = {
      {"good", Quality::good},     {"Good", Quality::good},
      {"", Quality::good},         {"uncertain", Quality::uncertain},
      {"BAD", Quality::bad},       {"192", Quality::good},
      {"216", Quality::good},      {"448", Quality::good},
      {"255", Quality::good},      {"64", Quality::uncertain},
      {"128", Quality::uncertain}, {"191", Quality::uncertain},
      {"0", Quality::bad},         {"24", Quality::bad},
      {"63", Quality::bad},
  };
  std::string text = "time,tag,value,quality\n";
  for (std::size_t i = 0; i < cases.size(); ++i) {
    text += "2026-03-01T06:00:00Z,DC4.LT" + std::to_string(i) + ",1," + cases[i].first + "\n";
  }
  SampleCollector out;
  const auto stats = read_text(text, out);
  ASSERT_TRUE(stats.ok()) << stats.error().message;
  ASSERT_EQ(out.samples.size(), cases.size());
  for (std::size_t i = 0; i < cases.size(); ++i) {
    EXPECT_EQ(out.samples[i].quality, cases[i].second) << "quality '" << cases[i].first << "'";
  }
}

TEST(HistoryCsv, EqualTimesForOneTagAreAccepted) {
  SampleCollector out;
  const auto stats = read_text(
      "time,tag,value\n2026-03-01T06:00:00Z,DC4.LT1,1\n2026-03-01T06:00:00Z,DC4.LT1,2\n", out);
  ASSERT_TRUE(stats.ok());
  EXPECT_EQ(stats->samples, 2u);
  EXPECT_EQ(stats->rejected, 0u);
}

TEST(HistoryCsv, EachTagKeepsItsOwnOrderInTheLongForm) {
  // DC4.LT2 starts earlier than DC4.LT1's last sample: allowed, the check is per tag.
  SampleCollector out;
  const auto stats = read_text(
      "time,tag,value\n2026-03-01T06:00:10Z,DC4.LT1,1\n2026-03-01T06:00:00Z,DC4.LT2,2\n", out);
  ASSERT_TRUE(stats.ok());
  EXPECT_EQ(stats->samples, 2u);
}

TEST(HistoryCsv, BlankLinesAreSkippedAndCounted) {
  SampleCollector out;
  const auto stats =
      read_text("time,tag,value\r\n\r\n2026-03-01T06:00:00Z,DC4.LT1,1\r\n  \r\n\r\n", out);
  ASSERT_TRUE(stats.ok());
  EXPECT_EQ(stats->samples, 1u);
  EXPECT_EQ(stats->blank_lines, 3u);
  EXPECT_EQ(stats->rejected, 0u);
}

TEST(HistoryCsv, UnrecognisableHeadersAreErrorsThatSayWhy) {
  const std::vector<std::pair<std::string, std::string>> cases = {
      {"", "empty file"},
      {"\xEF\xBB\xBF", "empty file"},
      {"time\n1\n", "separated by ',' or ';'"},
      {"when,tag,value\n", "no column named time"},
      {"time,,value\n", "column 2 has no name"},
      {"time,LT1,lt1\n", "appears twice"},
      {"time,anomaly\n", "no tag columns"},
  };
  for (const auto& [text, reason] : cases) {
    SampleCollector out;
    HistoryOptions options;
    options.ignore_columns = {"anomaly"};
    const auto stats = read_text(text, out, options);
    ASSERT_FALSE(stats.ok()) << text;
    EXPECT_NE(stats.error().message.find(reason), std::string::npos) << stats.error().message;
    EXPECT_NE(stats.error().message.find("test.csv"), std::string::npos) << stats.error().message;
  }
}

TEST(HistoryCsv, UnknownTimeZoneAndMissingFileAreErrors) {
  SampleCollector out;
  HistoryOptions options;
  options.time_zone = "Dry/Creek";
  const auto bad_zone = read_text("time,tag,value\n", out, options);
  ASSERT_FALSE(bad_zone.ok());
  EXPECT_NE(bad_zone.error().message.find("Dry/Creek"), std::string::npos);

  const auto missing = read_history(kFixtures + "no_such_file.csv", {}, out);
  ASSERT_FALSE(missing.ok());
  EXPECT_NE(missing.error().message.find("no_such_file.csv"), std::string::npos);

  const auto directory = read_history(kFixtures, {}, out);
  ASSERT_FALSE(directory.ok());
  EXPECT_NE(directory.error().message.find("not a regular file"), std::string::npos);
}

}  // namespace
}  // namespace bw::io
