// libFuzzer entry point for the MQTT payload decoders (built only with clang; see CMakeLists.txt).
//
// The first byte of the input picks a topic; the rest is the payload. Every input goes to the
// JSON decoder and to a Sparkplug session that lives across inputs, so that births, data and
// deaths of earlier inputs shape how later ones are read. Aborts when a decoder breaks its
// promises: counters that do not add up, an empty tag, a non-finite value that is not bad, or
// more than one rebirth request for one message.
#include <array>
#include <cmath>
#include <cstddef>
#include <cstdint>
#include <cstdlib>
#include <numeric>
#include <string_view>
#include <vector>

#include "io/mqtt/json_samples.h"
#include "io/mqtt/sparkplug.h"

namespace {

using bw::io::mqtt::DecodedSample;
using bw::io::mqtt::RejectionCounters;

constexpr std::array<std::string_view, 8> kTopics = {
    "spBv1.0/DryCreek/NBIRTH/SWD4",   "spBv1.0/DryCreek/NDATA/SWD4",
    "spBv1.0/DryCreek/NDEATH/SWD4",   "spBv1.0/DryCreek/DBIRTH/SWD4/P1",
    "spBv1.0/DryCreek/DDATA/SWD4/P1", "spBv1.0/DryCreek/DDEATH/SWD4/P1",
    "spBv1.0/DryCreek/NDATA/SWD5",    "spBv1.0/STATE/host1"};

const bw::core::SensorTime kReceived{bw::core::Micros(1'772'344'805'000'000)};

void check(const std::vector<DecodedSample>& samples, const RejectionCounters& rejected) {
  if (std::accumulate(rejected.by_reason.begin(), rejected.by_reason.end(), std::uint64_t{0}) !=
      rejected.total) {
    std::abort();
  }
  for (const auto& s : samples) {
    if (s.tag.empty()) std::abort();
    if (!std::isfinite(s.value) && s.quality != bw::engine::Quality::bad) std::abort();
  }
}

}  // namespace

extern "C" int LLVMFuzzerTestOneInput(const std::uint8_t* data, std::size_t size) {
  if (size == 0) return 0;
  static bw::io::mqtt::SparkplugSession session;
  const std::string_view topic = kTopics[data[0] % kTopics.size()];
  const std::string_view payload(reinterpret_cast<const char*>(data + 1), size - 1);

  const auto batch = bw::io::mqtt::decode_json_samples("DC4.TK1.LEVEL", payload, kReceived);
  check(batch.samples, batch.rejected);
  if (batch.samples.empty() && batch.rejected.total == 0 &&
      payload.find_first_of("[{") == std::string_view::npos) {
    std::abort();  // only an empty batch may give neither a sample nor a rejection
  }

  const auto result = session.on_message(topic, payload, kReceived);
  check(result.samples, result.rejected);
  if (result.rebirth_requests.size() > 1) std::abort();
  return 0;
}
