// The JSON payload forms and every rejection reason (daemon/io/mqtt/json_samples.h).
#include "io/mqtt/json_samples.h"

#include <gtest/gtest.h>

#include <chrono>
#include <string>

namespace bw::io::mqtt {
namespace {

using engine::Quality;

// Instants written with the standard library's calendar, independent of the parser under test.
core::SensorTime utc(int y, unsigned mo, unsigned d, int h, int mi = 0, int s = 0, int us = 0) {
  using namespace std::chrono;
  return sys_days(year(y) / month(mo) / day(d)) + hours(h) + minutes(mi) + seconds(s) +
         microseconds(us);
}

const core::SensorTime kReceived = utc(2026, 3, 1, 6, 0, 5);
constexpr const char* kTopicTag = "DC4.TK1.LEVEL";

DecodedBatch decode(std::string_view payload, std::string_view topic_tag = kTopicTag) {
  return decode_json_samples(topic_tag, payload, kReceived);
}

// Decodes a payload that must give exactly one rejection, and returns its reason.
Rejection only_rejection(std::string_view payload) {
  const auto batch = decode(payload);
  EXPECT_TRUE(batch.samples.empty()) << payload;
  EXPECT_EQ(batch.rejected.total, 1u) << payload;
  for (std::size_t i = 0; i < kRejectionKinds; ++i) {
    if (batch.rejected.by_reason[i] == 1) return static_cast<Rejection>(i);
  }
  ADD_FAILURE() << "no single rejection for " << payload;
  return Rejection::unparsable;
}

TEST(JsonSamples, BareNumberTakesTopicTagAndReceiveTime) {
  const auto batch = decode("12.3");
  ASSERT_EQ(batch.samples.size(), 1u);
  EXPECT_EQ(batch.samples[0].tag, kTopicTag);
  EXPECT_EQ(batch.samples[0].time, kReceived);
  EXPECT_DOUBLE_EQ(batch.samples[0].value, 12.3);
  EXPECT_EQ(batch.samples[0].quality, Quality::good);
  EXPECT_EQ(batch.rejected.total, 0u);
}

TEST(JsonSamples, BareBooleanAndNumericTextAreValues) {
  EXPECT_DOUBLE_EQ(decode("true").samples.at(0).value, 1.0);
  EXPECT_DOUBLE_EQ(decode("false").samples.at(0).value, 0.0);
  EXPECT_DOUBLE_EQ(decode("\"-3e-2\"").samples.at(0).value, -0.03);
  EXPECT_DOUBLE_EQ(decode("-7").samples.at(0).value, -7.0);
}

TEST(JsonSamples, ObjectWithIsoTimeAndQualityWord) {
  const auto batch =
      decode(R"({"value": 12.5, "time": "2026-03-01T06:00:00Z", "quality": "uncertain"})");
  ASSERT_EQ(batch.samples.size(), 1u);
  EXPECT_EQ(batch.samples[0].tag, kTopicTag);
  EXPECT_EQ(batch.samples[0].time, utc(2026, 3, 1, 6));
  EXPECT_DOUBLE_EQ(batch.samples[0].value, 12.5);
  EXPECT_EQ(batch.samples[0].quality, Quality::uncertain);
}

TEST(JsonSamples, ObjectWithOffsetTimeIsConvertedToUtc) {
  const auto batch = decode(R"({"value": 1, "time": "2026-03-01T00:00:00.125-06:00"})");
  ASSERT_EQ(batch.samples.size(), 1u);
  EXPECT_EQ(batch.samples[0].time, utc(2026, 3, 1, 6, 0, 0, 125000));
}

TEST(JsonSamples, EpochSecondsAsNumberOrText) {
  // 1772344800 s after 1970-01-01 is 2026-03-01T06:00:00Z (checked with the standard calendar).
  const auto number = decode(R"({"value": 1, "time": 1772344800.25})");
  ASSERT_EQ(number.samples.size(), 1u);
  EXPECT_EQ(number.samples[0].time, utc(2026, 3, 1, 6, 0, 0, 250000));
  const auto text = decode(R"({"value": 1, "time": "1772344800.5"})");
  ASSERT_EQ(text.samples.size(), 1u);
  EXPECT_EQ(text.samples[0].time, utc(2026, 3, 1, 6, 0, 0, 500000));
}

TEST(JsonSamples, NumericQualityIsJudgedByItsTopBits) {
  // OPC-style quality word (common practice): low byte >= 192 good, 64-191 uncertain, < 64 bad.
  EXPECT_EQ(decode(R"({"value": 1, "quality": 192})").samples.at(0).quality, Quality::good);
  EXPECT_EQ(decode(R"({"value": 1, "quality": 64})").samples.at(0).quality, Quality::uncertain);
  EXPECT_EQ(decode(R"({"value": 1, "quality": 0})").samples.at(0).quality, Quality::bad);
  EXPECT_EQ(decode(R"({"value": 1, "quality": 216.0})").samples.at(0).quality, Quality::good);
  EXPECT_EQ(decode(R"({"value": 1, "quality": "BAD"})").samples.at(0).quality, Quality::bad);
}

TEST(JsonSamples, ObjectTagMemberOverridesTheTopic) {
  const auto batch = decode(R"({"tag": "DC4.TK2.LEVEL", "value": 3})");
  ASSERT_EQ(batch.samples.size(), 1u);
  EXPECT_EQ(batch.samples[0].tag, "DC4.TK2.LEVEL");
}

TEST(JsonSamples, ArrayBatchKeepsOrderAndOwnTags) {
  const auto batch = decode(R"([
      {"tag": "DC4.TK1.LEVEL", "value": 12.3, "time": "2026-03-01T06:00:00Z", "quality": "good"},
      {"tag": "DC4.F1.DP", "value": 8.5, "time": 1772344801},
      {"tag": "DC4.P1.AMPS", "value": 41, "quality": 192}])");
  ASSERT_EQ(batch.samples.size(), 3u);
  EXPECT_EQ(batch.samples[0].tag, "DC4.TK1.LEVEL");
  EXPECT_EQ(batch.samples[1].tag, "DC4.F1.DP");
  EXPECT_EQ(batch.samples[1].time, utc(2026, 3, 1, 6, 0, 1));
  EXPECT_EQ(batch.samples[2].tag, "DC4.P1.AMPS");
  EXPECT_EQ(batch.samples[2].time, kReceived);
  EXPECT_DOUBLE_EQ(batch.samples[2].value, 41.0);
  EXPECT_EQ(batch.rejected.total, 0u);
}

TEST(JsonSamples, MapBatchTakesValuesAndObjects) {
  const auto batch = decode(
      R"({"DC4.TK1.LEVEL": 12.3, "DC4.TK2.LEVEL": {"value": 4.1, "time": "2026-03-01T06:00:00Z"}})");
  ASSERT_EQ(batch.samples.size(), 2u);
  EXPECT_EQ(batch.samples[0].tag, "DC4.TK1.LEVEL");
  EXPECT_EQ(batch.samples[0].time, kReceived);
  EXPECT_EQ(batch.samples[1].tag, "DC4.TK2.LEVEL");
  EXPECT_DOUBLE_EQ(batch.samples[1].value, 4.1);
  EXPECT_EQ(batch.samples[1].time, utc(2026, 3, 1, 6));
}

TEST(JsonSamples, EmptyBatchesGiveNothing) {
  EXPECT_EQ(decode("[]").samples.size() + decode("[]").rejected.total, 0u);
  EXPECT_EQ(decode("{}").samples.size() + decode("{}").rejected.total, 0u);
}

TEST(JsonSamples, BatchKeepsGoodEntriesAndCountsBadOnes) {
  const auto batch = decode(R"([
      {"tag": "A", "value": 1},
      {"tag": "B", "value": "high"},
      {"value": 2},
      {"tag": "C", "value": 3, "time": "2026-03-01T06:00:00"},
      {"tag": "D", "value": 4, "quality": "grand"},
      7,
      {"tag": "E", "value": 5}])");
  ASSERT_EQ(batch.samples.size(), 2u);
  EXPECT_EQ(batch.samples[0].tag, "A");
  EXPECT_EQ(batch.samples[1].tag, "E");
  EXPECT_EQ(batch.rejected.total, 5u);
  EXPECT_EQ(batch.rejected.count(Rejection::not_a_number), 1u);
  EXPECT_EQ(batch.rejected.count(Rejection::no_tag), 1u);
  EXPECT_EQ(batch.rejected.count(Rejection::bad_time), 1u);
  EXPECT_EQ(batch.rejected.count(Rejection::bad_quality), 1u);
  EXPECT_EQ(batch.rejected.count(Rejection::unparsable), 1u);
}

TEST(JsonSamplesRejections, EachReasonIsCountedExactlyOnce) {
  EXPECT_EQ(only_rejection("{\"value\": 1"), Rejection::unparsable);
  EXPECT_EQ(only_rejection("12.3 garbage"), Rejection::unparsable);
  EXPECT_EQ(only_rejection(""), Rejection::unparsable);
  // RFC 8259 (from memory): JSON has no NaN or Infinity literals, so they are not JSON at all.
  EXPECT_EQ(only_rejection("NaN"), Rejection::unparsable);
  // A number beyond the range of double is refused by the JSON parser itself.
  EXPECT_EQ(only_rejection("1e999"), Rejection::unparsable);
  EXPECT_EQ(only_rejection(R"({"value": "nan"})"), Rejection::not_finite);
  EXPECT_EQ(only_rejection(R"({"value": "-inf"})"), Rejection::not_finite);
  EXPECT_EQ(only_rejection(R"({"value": 1, "time": "yesterday"})"), Rejection::bad_time);
  EXPECT_EQ(only_rejection(R"({"value": 1, "time": "2026-03-01T06:00:00"})"), Rejection::bad_time);
  EXPECT_EQ(only_rejection(R"({"value": 1, "time": null})"), Rejection::bad_time);
  EXPECT_EQ(only_rejection(R"({"value": 1, "time": 1e300})"), Rejection::bad_time);
  EXPECT_EQ(only_rejection(R"({"value": 1, "quality": "grand"})"), Rejection::bad_quality);
  EXPECT_EQ(only_rejection(R"({"value": 1, "quality": 65536})"), Rejection::bad_quality);
  EXPECT_EQ(only_rejection(R"({"value": 1, "quality": -1})"), Rejection::bad_quality);
  EXPECT_EQ(only_rejection(R"({"value": 1, "quality": 192.5})"), Rejection::bad_quality);
  EXPECT_EQ(only_rejection(R"({"value": 1, "quality": true})"), Rejection::bad_quality);
  EXPECT_EQ(only_rejection(R"([{"value": 1}])"), Rejection::no_tag);
  EXPECT_EQ(only_rejection(R"([{"tag": "", "value": 1}])"), Rejection::no_tag);
  EXPECT_EQ(only_rejection(R"([{"tag": 5, "value": 1}])"), Rejection::no_tag);
  EXPECT_EQ(only_rejection(R"({"value": null})"), Rejection::not_a_number);
  EXPECT_EQ(only_rejection(R"({"value": [1]})"), Rejection::not_a_number);
  EXPECT_EQ(only_rejection(R"({"value": "12.5 bar"})"), Rejection::not_a_number);
  EXPECT_EQ(only_rejection(R"({"DC4.TK1.LEVEL": {"time": 1772344800}})"), Rejection::not_a_number);
  EXPECT_EQ(only_rejection("null"), Rejection::not_a_number);
}

TEST(JsonSamplesRejections, BareValueWithoutTopicTagHasNoTag) {
  const auto batch = decode("12.3", "");
  EXPECT_TRUE(batch.samples.empty());
  EXPECT_EQ(batch.rejected.count(Rejection::no_tag), 1u);
}

TEST(JsonSamplesRejections, TimeWindowBoundsAreInclusive) {
  // The receive time is 06:00:05; the window is 300 s ahead and 7 days behind.
  const DecodeLimits limits;
  const auto at = [&](std::string_view time_text) {
    const std::string payload =
        std::string(R"({"value": 1, "time": ")") + std::string(time_text) + "\"}";
    return decode_json_samples(kTopicTag, payload, kReceived, limits);
  };
  EXPECT_EQ(at("2026-03-01T06:05:05Z").samples.size(), 1u);
  EXPECT_EQ(at("2026-03-01T06:05:05.000001Z").rejected.count(Rejection::too_far_in_future), 1u);
  EXPECT_EQ(at("2026-02-22T06:00:05Z").samples.size(), 1u);
  EXPECT_EQ(at("2026-02-22T06:00:04.999999Z").rejected.count(Rejection::too_far_in_past), 1u);
}

TEST(JsonSamplesRejections, EpochMillisecondsWhereSecondsBelongAreBadTime) {
  // A common mistake of publishers: milliseconds where seconds are expected. As seconds they
  // would lie some 54,000 years ahead, beyond any sensor time.
  EXPECT_EQ(only_rejection(R"({"value": 1, "time": 1772344800250})"), Rejection::bad_time);
  // Within the range of seconds but still ahead of the window.
  EXPECT_EQ(only_rejection(R"({"value": 1, "time": 1772348400})"), Rejection::too_far_in_future);
}

TEST(JsonSamplesRejections, PayloadOverTheLimitIsTooLarge) {
  DecodeLimits limits;
  limits.max_payload_bytes = 16;
  const auto batch = decode_json_samples(kTopicTag, R"({"value": 12.345678})", kReceived, limits);
  EXPECT_TRUE(batch.samples.empty());
  EXPECT_EQ(batch.rejected.count(Rejection::too_large), 1u);
  EXPECT_EQ(batch.rejected.total, 1u);
  EXPECT_EQ(decode_json_samples(kTopicTag, "12.5", kReceived, limits).samples.size(), 1u);
}

TEST(RejectionNames, AreDistinctAndStable) {
  EXPECT_EQ(to_string(Rejection::too_far_in_past), "too_far_in_past");
  EXPECT_EQ(to_string(Rejection::unknown_metric), "unknown_metric");
  for (std::size_t i = 0; i < kRejectionKinds; ++i) {
    for (std::size_t j = i + 1; j < kRejectionKinds; ++j) {
      EXPECT_NE(to_string(static_cast<Rejection>(i)), to_string(static_cast<Rejection>(j)));
    }
  }
}

}  // namespace
}  // namespace bw::io::mqtt
