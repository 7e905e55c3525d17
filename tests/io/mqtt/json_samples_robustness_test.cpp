// Hostile input: garbage, huge, deeply nested and mutated payloads must be counted, never crash
// (daemon/io/mqtt/json_samples.h and sparkplug.h).
#include <gtest/gtest.h>

#include <cmath>
#include <cstdint>
#include <numeric>
#include <random>
#include <string>
#include <vector>

#include "io/mqtt/json_samples.h"
#include "io/mqtt/sparkplug.h"

namespace bw::io::mqtt {
namespace {

const core::SensorTime kReceived{core::Micros(1'772'344'805'000'000)};

// What every decode must promise, whatever the input.
void expect_consistent(const std::vector<DecodedSample>& samples,
                       const RejectionCounters& rejected) {
  EXPECT_EQ(std::accumulate(rejected.by_reason.begin(), rejected.by_reason.end(), std::uint64_t{0}),
            rejected.total);
  for (const auto& s : samples) {
    EXPECT_FALSE(s.tag.empty());
    if (s.quality != engine::Quality::bad) {
      EXPECT_TRUE(std::isfinite(s.value));
    }
  }
}

std::string random_bytes(std::mt19937& rng, std::size_t max_size) {
  std::uniform_int_distribution<std::size_t> size(0, max_size);
  std::uniform_int_distribution<int> byte(0, 255);
  std::string text(size(rng), '\0');
  for (char& c : text) c = static_cast<char>(byte(rng));
  return text;
}

// Flips, inserts and deletes a few bytes of a valid payload, so that decoding gets past the
// first character far more often than with pure noise.
std::string mutate(std::mt19937& rng, std::string text) {
  std::uniform_int_distribution<int> edits(1, 4);
  std::uniform_int_distribution<int> byte(0, 255);
  const std::string_view alphabet = "{}[]\",:0123456789.eE-+ntrufalsNI\\";
  for (int n = edits(rng); n > 0 && !text.empty(); --n) {
    std::uniform_int_distribution<std::size_t> pos(0, text.size() - 1);
    const std::size_t at = pos(rng);
    switch (rng() % 3) {
      case 0:
        text[at] = alphabet[rng() % alphabet.size()];
        break;
      case 1:
        text.insert(at, 1, static_cast<char>(byte(rng)));
        break;
      default:
        text.erase(at, 1);
        break;
    }
  }
  return text;
}

TEST(JsonSamplesRobustness, RandomBytesAreCountedNotCrashed) {
  std::mt19937 rng(20260301);  // seed fixed so a failure can be replayed
  std::uint64_t rejected = 0;
  constexpr int kPayloads = 4000;
  for (int i = 0; i < kPayloads; ++i) {
    const auto batch = decode_json_samples("DC4.TK1.LEVEL", random_bytes(rng, 200), kReceived);
    expect_consistent(batch.samples, batch.rejected);
    // Noise is not a batch, so it gives one sample or at least one rejection.
    EXPECT_GE(batch.samples.size() + batch.rejected.total, 1u);
    rejected += batch.rejected.total;
  }
  EXPECT_GE(rejected, kPayloads * 9 / 10u);
}

TEST(JsonSamplesRobustness, MutatedValidPayloadsKeepCountersConsistent) {
  const std::vector<std::string> seeds = {
      R"({"value": 12.5, "time": "2026-03-01T06:00:00Z", "quality": "uncertain"})",
      R"([{"tag": "A", "value": 1, "time": 1772344800.25, "quality": 192}, {"tag": "B", "value": 2}])",
      R"({"DC4.TK1.LEVEL": 12.3, "DC4.TK2.LEVEL": {"value": 4.1, "time": "1772344800"}})",
  };
  std::mt19937 rng(7);
  for (int i = 0; i < 6000; ++i) {
    const std::string payload = mutate(rng, seeds[i % seeds.size()]);
    const auto batch = decode_json_samples("DC4.TK1.LEVEL", payload, kReceived);
    expect_consistent(batch.samples, batch.rejected);
  }
}

TEST(JsonSamplesRobustness, DeepNestingIsRefusedQuickly) {
  const std::string deep(200'000, '[');
  const auto batch = decode_json_samples("T", deep, kReceived);
  EXPECT_EQ(batch.rejected.count(Rejection::unparsable), 1u);
  // Brackets inside strings do not count as nesting.
  const auto quoted = decode_json_samples("T", R"({"tag": "[[[[[[[[[[[[", "value": 1})", kReceived);
  EXPECT_EQ(quoted.samples.size(), 1u);
}

TEST(JsonSamplesRobustness, LargeBatchUpToTheLimitIsDecoded) {
  std::string payload = "[";
  constexpr int kEntries = 5000;
  for (int i = 0; i < kEntries; ++i) {
    payload += (i ? "," : "") + std::string(R"({"tag":"DC4.T)") + std::to_string(i) +
               R"(","value":)" + std::to_string(i) + "}";
  }
  payload += "]";
  ASSERT_LT(payload.size(), DecodeLimits{}.max_payload_bytes);
  const auto batch = decode_json_samples("", payload, kReceived);
  ASSERT_EQ(batch.samples.size(), static_cast<std::size_t>(kEntries));
  EXPECT_DOUBLE_EQ(batch.samples.back().value, kEntries - 1.0);
  const std::string huge(DecodeLimits{}.max_payload_bytes + 1, ' ');
  EXPECT_EQ(decode_json_samples("", huge, kReceived).rejected.count(Rejection::too_large), 1u);
}

TEST(SparkplugRobustness, RandomBytesOnEveryMessageTypeAreCounted) {
  const std::vector<std::string> topics = {
      "spBv1.0/DryCreek/NBIRTH/SWD4",    "spBv1.0/DryCreek/NDATA/SWD4",
      "spBv1.0/DryCreek/DBIRTH/SWD4/P1", "spBv1.0/DryCreek/DDATA/SWD4/P1",
      "spBv1.0/DryCreek/DDEATH/SWD4/P1", "spBv1.0/DryCreek/NDEATH/SWD4"};
  SparkplugSession session;
  std::mt19937 rng(11);
  for (int i = 0; i < 4000; ++i) {
    const auto result =
        session.on_message(topics[i % topics.size()], random_bytes(rng, 120), kReceived);
    expect_consistent(result.samples, result.rejected);
    EXPECT_LE(result.rebirth_requests.size(), 1u);
  }
}

}  // namespace
}  // namespace bw::io::mqtt
