#include "io/time_parse.h"

#include <gtest/gtest.h>

#include <string>
#include <vector>

#include "reference_tool.h"
#include "sample_collector.h"

namespace bw::io {
namespace {

using testing::from_micros;
using testing::run_reference_tool;
using testing::utc;

// Texts with an offset (or Z) that both brinewatch and Python accept.
const std::vector<std::string> kTextsWithOffset = {
    "2026-03-01T06:00:00Z",
    "2026-03-01 06:00:00.250-06:00",
    "2026-03-01T06:00:00+0530",
    "2026-03-01T06:00:00-0930",
    "2026-03-01T06:00:00+06",
    "2026-03-01T06:00:00.000001Z",
    "2026-03-01T06:00:00.1234567+01:00",  // fraction beyond microseconds is truncated
    "2026-03-01T06:00:00,5Z",
    "2026-03-01T23:59:59.999999-23:59",
    "2024-02-29T12:00:00+13:45",
    "1969-12-31T23:59:59.5Z",
    "2000-01-01 00:00Z",
    "0001-01-01T00:00:00Z",
    "9999-12-31T23:59:59.999999Z",
};

TEST(TimeParse, InstantsWithOffsetMatchPythonFromisoformat) {
  BW_NEED_PYTHON_REFERENCE();
  // Reference: Python's datetime.fromisoformat (tests/tools/iso_time_reference.py), run now.
  const auto expected = run_reference_tool("iso_time_reference.py", {"UTC"}, [] {
    std::string input;
    for (const auto& text : kTextsWithOffset) input += text + "\n";
    return input;
  }());
  ASSERT_EQ(expected.size(), kTextsWithOffset.size());
  for (std::size_t i = 0; i < kTextsWithOffset.size(); ++i) {
    SCOPED_TRACE(kTextsWithOffset[i]);
    const auto parsed = parse_iso8601(kTextsWithOffset[i]);
    ASSERT_TRUE(parsed.has_value());
    ASSERT_TRUE(parsed->offset_minutes.has_value());
    EXPECT_EQ(std::to_string(to_sensor_time(*parsed).time_since_epoch().count()) + " offset",
              expected[i]);
  }
}

TEST(TimeParse, KeepsFieldsAndOffsetOfTheText) {
  const auto t = parse_iso8601("2026-03-01 06:07:08.250-06:00");
  ASSERT_TRUE(t.has_value());
  EXPECT_EQ(t->civil, (CivilTime{2026, 3, 1, 6, 7, 8, 250000}));
  EXPECT_EQ(t->offset_minutes, -360);
}

TEST(TimeParse, TimeWithoutOffsetIsLocal) {
  // Forms written by the SKAB and 3W exports (see ../shared/data/*/PROVENANCE.md).
  const auto skab = parse_iso8601("2020-03-09 10:14:33");
  const auto three_w = parse_iso8601("2018-02-06 18:29:17.000000");
  ASSERT_TRUE(skab.has_value());
  ASSERT_TRUE(three_w.has_value());
  EXPECT_FALSE(skab->offset_minutes.has_value());
  EXPECT_FALSE(three_w->offset_minutes.has_value());
  EXPECT_EQ(skab->civil, (CivilTime{2020, 3, 9, 10, 14, 33, 0}));
  EXPECT_EQ(three_w->civil, (CivilTime{2018, 2, 6, 18, 29, 17, 0}));
}

TEST(TimeParse, LowercaseSeparatorsAreAccepted) {
  // RFC 3339 section 5.6 allows lowercase "t" and "z" (from memory); Python 3.11 does not.
  const auto t = parse_iso8601("2026-03-01t06:00:00z");
  ASSERT_TRUE(t.has_value());
  EXPECT_EQ(to_sensor_time(*t), utc(2026, 3, 1, 6));
}

TEST(TimeParse, RejectsWhatPythonRejects) {
  BW_NEED_PYTHON_REFERENCE();
  const std::vector<std::string> texts = {
      "2026-02-29 00:00:00",        // not a leap year
      "2026-04-31 00:00:00",        // April has 30 days
      "2026-13-01 00:00:00",        // month 13
      "2026-03-01T24:00:00",        // hour 24
      "2026-03-01T06:60:00",        // minute 60
      "2026-03-01T06:00:60",        // leap second
      "2026-03-01T06:00:00+24:00",  // offset of a whole day
      "2026-03-01T06:00:00 ",       // trailing blank
      "2026-3-1 06:00:00",          // missing zero padding
      "",
      "tank level",
  };
  // Reference: Python's datetime.fromisoformat rejects each one (printed as "error").
  std::vector<std::string> args = {"UTC"};
  args.insert(args.end(), texts.begin(), texts.end());
  const auto expected = run_reference_tool("iso_time_reference.py", args);
  ASSERT_EQ(expected.size(), texts.size());
  for (std::size_t i = 0; i < texts.size(); ++i) {
    SCOPED_TRACE(texts[i]);
    EXPECT_EQ(expected[i], "error");
    EXPECT_FALSE(parse_iso8601(texts[i]).has_value());
  }
}

TEST(TimeParse, RejectsFormsNotWrittenByHistoryExports) {
  // Python 3.11 accepts these, brinewatch deliberately does not: a date alone (no time of
  // day), the basic format without separators, any character between date and time, a
  // fraction point with no digits, and more than nine fraction digits.
  for (const char* text : {"2026-03-01", "20260301T060000Z", "2026-03-01X06:00:00",
                           "2026-03-01T06:00:00.Z", "2026-03-01T06:00:00.1234567890Z"}) {
    SCOPED_TRACE(text);
    EXPECT_FALSE(parse_iso8601(text).has_value());
  }
}

TEST(TimeParse, EpochSecondsAgreeWithTheCalendar) {
  // 1772344800 s after 1970-01-01T00:00Z is 2026-03-01T06:00Z (std::chrono calendar).
  EXPECT_EQ(parse_epoch_seconds("1772344800"), utc(2026, 3, 1, 6));
  EXPECT_EQ(parse_epoch_seconds("1772344800.25"), utc(2026, 3, 1, 6, 0, 0, 250000));
  EXPECT_EQ(parse_epoch_seconds("1772344800.1234567"), utc(2026, 3, 1, 6, 0, 0, 123456));
  EXPECT_EQ(parse_epoch_seconds("0"), utc(1970, 1, 1));
  EXPECT_EQ(parse_epoch_seconds("-1.5"), from_micros(-1'500'000));
}

TEST(TimeParse, EpochSecondsRejectMalformedNumbers) {
  for (const char* text : {"", "-", ".", "1.", "1..2", "1-2", "--1", "1e9", "+1", " 1",
                           "1234567890123" /* 13 integer digits */}) {
    SCOPED_TRACE(text);
    EXPECT_FALSE(parse_epoch_seconds(text).has_value());
  }
}

TEST(TimeParse, PlainNumbersAreTakenAsEpochSeconds) {
  EXPECT_TRUE(looks_like_epoch_seconds("1772344800.25"));
  EXPECT_TRUE(looks_like_epoch_seconds("-12"));
  EXPECT_FALSE(looks_like_epoch_seconds("2026-03-01T06:00:00Z"));
  EXPECT_FALSE(looks_like_epoch_seconds(""));
}

}  // namespace
}  // namespace bw::io
