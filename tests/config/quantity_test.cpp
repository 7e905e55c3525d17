#include "config/quantity.h"

#include <gtest/gtest.h>

namespace bw::config {
namespace {

// Unit sizes are the SI definitions (1 min = 60 s, 1 h = 3600 s, 1 d = 86400 s), common practice.
TEST(ParseDuration, ConvertsEachUnitToSeconds) {
  EXPECT_EQ(parse_duration("90s"), 90.0);
  EXPECT_EQ(parse_duration("15min"), 900.0);
  EXPECT_EQ(parse_duration("6h"), 21600.0);
  EXPECT_EQ(parse_duration("1.5d"), 129600.0);
  EXPECT_EQ(parse_duration("1.5 d"), 129600.0);
}

TEST(ParseDuration, TakesAPlainNumberAsSeconds) {
  EXPECT_EQ(parse_duration("3600"), 3600.0);
  EXPECT_EQ(parse_duration("0.25"), 0.25);
}

TEST(ParseDuration, ParsesNegativeValuesAndLeavesBoundsToTheCaller) {
  EXPECT_EQ(parse_duration("-5min"), -300.0);
}

TEST(ParseDuration, RefusesUnknownUnitsAndJunk) {
  EXPECT_FALSE(parse_duration("6 hours"));
  EXPECT_FALSE(parse_duration("6hh"));
  EXPECT_FALSE(parse_duration("h"));
  EXPECT_FALSE(parse_duration(""));
  EXPECT_FALSE(parse_duration("forecast_memory"));
}

TEST(ParseNumber, AcceptsOnlyFiniteDecimals) {
  EXPECT_EQ(parse_number("20.143"), 20.143);
  EXPECT_EQ(parse_number("+2.5e3"), 2500.0);
  EXPECT_EQ(parse_number("-0.5"), -0.5);
  EXPECT_FALSE(parse_number("inf"));
  EXPECT_FALSE(parse_number("nan"));
  EXPECT_FALSE(parse_number("1e999"));  // overflows double
  EXPECT_FALSE(parse_number("12 ft"));
  EXPECT_FALSE(parse_number("6h"));
}

TEST(HasDurationUnit, IsTrueOnlyWhenAUnitIsWritten) {
  EXPECT_TRUE(has_duration_unit("6h"));
  EXPECT_FALSE(has_duration_unit("21600"));
  EXPECT_FALSE(has_duration_unit("six"));
}

TEST(FormatDuration, UsesTheLargestWholeUnit) {
  EXPECT_EQ(format_duration(21600), "6h");
  EXPECT_EQ(format_duration(90), "90s");
  EXPECT_EQ(format_duration(900), "15min");
  EXPECT_EQ(format_duration(129600), "36h");
  EXPECT_EQ(format_duration(172800), "2d");
  EXPECT_EQ(format_duration(0.5), "0.5s");
  EXPECT_EQ(format_duration(0), "0s");
}

TEST(FormatDuration, RoundTripsThroughParseDuration) {
  for (double seconds : {1.0, 59.0, 60.0, 3599.0, 3600.0, 86400.0, 90000.0}) {
    EXPECT_EQ(parse_duration(format_duration(seconds)), seconds) << seconds;
  }
}

}  // namespace
}  // namespace bw::config
