#include "core/utc_text.h"

#include <gtest/gtest.h>

namespace bw::core {
namespace {

// Expected texts from GNU date: `date -u -d @1700000000 +%FT%TZ`, `date -u -d @1709208000 +%FT%TZ`
// and `date -u -d @-1 +%FT%TZ` (1969-12-31T23:59:59Z).
TEST(UtcText, WritesIso8601InUtc) {
  EXPECT_EQ(format_utc(sensor_time_from_seconds(1700000000)), "2023-11-14T22:13:20Z");
  EXPECT_EQ(format_utc(sensor_time_from_seconds(1709208000.75)), "2024-02-29T12:00:00Z");
  EXPECT_EQ(format_utc(sensor_time_from_seconds(1709208000.75), UtcPrecision::milliseconds),
            "2024-02-29T12:00:00.750Z");
}

TEST(UtcText, RoundsTowardEarlierInstantsBefore1970) {
  EXPECT_EQ(format_utc(SensorTime(Micros(-1))), "1969-12-31T23:59:59Z");
  EXPECT_EQ(format_utc(SensorTime(Micros(-1)), UtcPrecision::milliseconds),
            "1969-12-31T23:59:59.999Z");
}

}  // namespace
}  // namespace bw::core
