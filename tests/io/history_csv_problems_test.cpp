#include <gtest/gtest.h>

#include <map>
#include <string>
#include <vector>

#include "io/history_csv.h"
#include "sample_collector.h"

namespace bw::io {
namespace {

using testing::SampleCollector;
using testing::utc;

// One bad row of every kind, each on a known line (the header is line 1).
const std::string kLongFormWithProblems =
    "time,tag,value,quality\n"                      // 1
    "2026-03-01T06:00:00Z,DC4.LT1,1,good\n"         // 2  ok
    "2026-02-30T06:00:00Z,DC4.LT1,2,good\n"         // 3  bad_time
    "2026-03-01 06:00:01,DC4.LT1,3,good\n"          // 4  no_time_zone
    "2026-03-01T06:00:02Z,DC4.LT1,4.5kPa,good\n"    // 5  bad_value
    "2026-03-01T06:00:03Z,DC4.LT1,nan,good\n"       // 6  not_finite
    "2026-03-01T06:00:04Z,DC4.LT1,-inf,good\n"      // 7  not_finite
    "2026-03-01T06:00:05Z,DC4.LT1,6,fine\n"         // 8  bad_quality
    "2026-03-01T06:00:06Z,DC4.LT1,7,70000\n"        // 9  bad_quality
    "2026-03-01T06:00:07Z,,8,good\n"                // 10 empty_tag
    "2026-03-01T06:00:08Z,DC4.LT1,9\n"              // 11 wrong_field_count
    "2026-03-01T06:00:09Z,DC4.LT1,10,good,extra\n"  // 12 wrong_field_count
    "2026-03-01T05:59:59Z,DC4.LT1,11,good\n"        // 13 time_backwards
    "2026-03-01T06:00:10Z,DC4.LT1,1e999,good\n"     // 14 bad_value (out of range)
    "2026-03-01T06:00:11Z,DC4.LT1,12,good\n";       // 15 ok

TEST(HistoryCsvProblems, EveryReasonIsCountedWithItsLineNumber) {
  SampleCollector out;
  const auto stats = read_history_text(kLongFormWithProblems, "bad.csv", {}, out);
  ASSERT_TRUE(stats.ok()) << stats.error().message;
  EXPECT_EQ(stats->lines, 15u);
  EXPECT_EQ(stats->samples, 2u);
  EXPECT_EQ(stats->rejected, 12u);
  EXPECT_EQ(stats->rejected_by_reason, (std::map<std::string, std::size_t>{
                                           {"bad_time", 1},
                                           {"no_time_zone", 1},
                                           {"bad_value", 2},
                                           {"not_finite", 2},
                                           {"bad_quality", 2},
                                           {"empty_tag", 1},
                                           {"wrong_field_count", 2},
                                           {"time_backwards", 1},
                                       }));
  ASSERT_EQ(stats->first_problems.size(), 10u);  // the default max_reported_problems
  const std::vector<std::pair<std::size_t, std::string>> want = {
      {3, "bad_time"},           {4, "no_time_zone"},       {5, "bad_value"},   {6, "not_finite"},
      {7, "not_finite"},         {8, "bad_quality"},        {9, "bad_quality"}, {10, "empty_tag"},
      {11, "wrong_field_count"}, {12, "wrong_field_count"},
  };
  for (std::size_t i = 0; i < want.size(); ++i) {
    EXPECT_EQ(stats->first_problems[i].line, want[i].first) << i;
    EXPECT_EQ(stats->first_problems[i].reason, want[i].second) << i;
  }
  EXPECT_EQ(stats->first_problems[0].text, "2026-02-30T06:00:00Z");
  EXPECT_EQ(stats->first_problems[2].text, "4.5kPa");
  EXPECT_EQ(stats->first_problems[5].text, "fine");
  EXPECT_EQ(stats->first_problems[9].text, "2026-03-01T06:00:09Z,DC4.LT1,10,good,extra");
  ASSERT_EQ(out.samples.size(), 2u);
  EXPECT_EQ(out.samples[1].time, utc(2026, 3, 1, 6, 0, 11));
}

TEST(HistoryCsvProblems, ReportedProblemsAreCappedButAllAreCounted) {
  SampleCollector out;
  HistoryOptions options;
  options.max_reported_problems = 3;
  const auto stats = read_history_text(kLongFormWithProblems, "bad.csv", options, out);
  ASSERT_TRUE(stats.ok());
  EXPECT_EQ(stats->first_problems.size(), 3u);
  EXPECT_EQ(stats->rejected, 12u);
  const std::string summary = describe(stats.value(), "bad.csv");
  EXPECT_NE(summary.find("line 5: bad_value: '4.5kPa'"), std::string::npos) << summary;
}

TEST(HistoryCsvProblems, StrictModeStopsAtTheFirstBadRow) {
  SampleCollector out;
  HistoryOptions options;
  options.strict = true;
  const auto stats = read_history_text(kLongFormWithProblems, "bad.csv", options, out);
  ASSERT_TRUE(stats.ok());
  EXPECT_TRUE(stats->stopped_early);
  EXPECT_EQ(stats->samples, 1u);
  EXPECT_EQ(stats->rejected, 1u);
  EXPECT_EQ(stats->lines, 3u);
  ASSERT_EQ(stats->first_problems.size(), 1u);
  EXPECT_EQ(stats->first_problems[0].line, 3u);
  EXPECT_NE(describe(stats.value(), "bad.csv").find("strict"), std::string::npos);
}

TEST(HistoryCsvProblems, StrictModeReadsACleanFileToTheEnd) {
  SampleCollector out;
  HistoryOptions options;
  options.strict = true;
  const auto stats = read_history_text(
      "time,tag,value\n2026-03-01T06:00:00Z,DC4.LT1,1\n2026-03-01T06:00:01Z,DC4.LT1,2", "ok.csv",
      options, out);
  ASSERT_TRUE(stats.ok());
  EXPECT_FALSE(stats->stopped_early);
  EXPECT_EQ(stats->samples, 2u);
}

TEST(HistoryCsvProblems, WideFormBadCellRejectsOnlyThatCell) {
  SampleCollector out;
  const auto stats = read_history_text(
      "time;LT1;LT2;LT3\n"
      "2026-03-01T06:00:00Z;1;x;3\n"     // 2: LT2 bad, LT1 and LT3 kept
      "yesterday;1;2;3\n"                // 3: bad time, whole row
      "2026-03-01T06:00:01Z;1;2\n"       // 4: too few fields, whole row
      "2026-03-01T05:00:00Z;1;2;3\n"     // 5: earlier than row 2, whole row
      "2026-03-01T06:00:00Z;4;inf;6\n",  // 6: same time as row 2 is fine; LT2 not finite
      "wide.csv", {}, out);
  ASSERT_TRUE(stats.ok()) << stats.error().message;
  EXPECT_EQ(stats->samples, 4u);
  EXPECT_EQ(stats->rejected, 5u);
  ASSERT_EQ(stats->first_problems.size(), 5u);
  EXPECT_EQ(stats->first_problems[0].line, 2u);
  EXPECT_EQ(stats->first_problems[0].column, "LT2");
  EXPECT_EQ(stats->first_problems[0].reason, "bad_value");
  EXPECT_EQ(stats->first_problems[1].reason, "bad_time");
  EXPECT_EQ(stats->first_problems[2].reason, "wrong_field_count");
  EXPECT_EQ(stats->first_problems[3].reason, "time_backwards");
  EXPECT_EQ(stats->first_problems[3].line, 5u);
  EXPECT_EQ(stats->first_problems[4].reason, "not_finite");
  EXPECT_EQ(stats->first_problems[4].line, 6u);
  ASSERT_EQ(out.samples.size(), 4u);
  EXPECT_EQ(out.samples[0].tag, "LT1");
  EXPECT_EQ(out.samples[1].tag, "LT3");
  EXPECT_EQ(out.samples[2].value, 4);
  EXPECT_EQ(out.samples[3].value, 6);
}

TEST(HistoryCsvProblems, ProblemTextIsTruncatedAndControlBytesAreShown) {
  SampleCollector out;
  const std::string long_value(500, '7');
  const auto stats = read_history_text(
      "time,tag,value\n2026-03-01T06:00:00Z,DC4.LT1,1\x01" + long_value + "\n", "t.csv", {}, out);
  ASSERT_TRUE(stats.ok());
  ASSERT_EQ(stats->first_problems.size(), 1u);
  const std::string& text = stats->first_problems[0].text;
  EXPECT_EQ(text.size(), kMaxProblemText);
  EXPECT_EQ(text.substr(0, 3), "1?7");
}

}  // namespace
}  // namespace bw::io
