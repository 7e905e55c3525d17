// What the MQTT payload decoders produce: samples with owned tag names, and counts of what they
// had to drop and why.
//
// Decoders never throw and never stop at a bad entry: each entry they cannot use is counted
// under exactly one Rejection and the rest of the message is still decoded.
//
// Thread safety: plain data; pure functions.
#pragma once

#include <array>
#include <cstddef>
#include <cstdint>
#include <optional>
#include <string>
#include <string_view>
#include <vector>

#include "core/sensor_time.h"
#include "engine/sample.h"

namespace bw::io::mqtt {

// One sample decoded from a payload. Unlike engine::Sample it owns its tag, because the payload
// buffer it came from does not outlive the decode call. `value` is finite unless `quality` is
// bad (a Sparkplug death gives NaN with bad quality).
struct DecodedSample {
  std::string tag;
  core::SensorTime time;
  double value = 0;
  engine::Quality quality = engine::Quality::good;

  // A view for the engine; valid while this DecodedSample lives and is not modified.
  engine::Sample view() const { return {tag, time, value, quality}; }
};

// Why an entry (a whole message, a batch element or a Sparkplug metric) was dropped. The names
// given by to_string are metric labels; keep them stable.
enum class Rejection : std::uint8_t {
  unparsable,         // not JSON / not a Sparkplug protobuf payload, or not one of the forms
  too_large,          // payload longer than DecodeLimits::max_payload_bytes
  not_finite,         // value is NaN or infinite (JSON text "nan", a Sparkplug float NaN)
  bad_time,           // time is neither ISO 8601 with an offset nor epoch seconds/milliseconds
  too_far_in_future,  // time more than max_future_s after the receive time
  too_far_in_past,    // time more than max_past_s before the receive time
  bad_quality,        // quality is not good/uncertain/bad or an integer 0-65535
  no_tag,             // no tag: none from the topic for a single value, or a batch entry without
  not_a_number,       // value missing, null, an object, or text that is not a number
  out_of_sequence,    // Sparkplug: seq broke continuity, or the node awaits a rebirth after that
  not_born,           // Sparkplug: data or death from a node/device with no current birth
  unknown_metric,     // Sparkplug: an alias or name the birth did not declare
};
inline constexpr std::size_t kRejectionKinds = 12;

std::string_view to_string(Rejection reason);

struct RejectionCounters {
  std::array<std::uint64_t, kRejectionKinds> by_reason{};
  std::uint64_t total = 0;

  void add(Rejection reason, std::uint64_t count = 1);
  std::uint64_t count(Rejection reason) const;
  RejectionCounters& operator+=(const RejectionCounters& other);
};

struct DecodeLimits {
  std::size_t max_payload_bytes = 256 * 1024;
  double max_future_s = 300;      // clocks of edge devices drift; a little is tolerated
  double max_past_s = 7 * 86400;  // older data is a replay job, not a live one
};

// The samples of one message and what was dropped from it.
struct DecodedBatch {
  std::vector<DecodedSample> samples;
  RejectionCounters rejected;
};

// too_far_in_future / too_far_in_past when `time` lies outside the window DecodeLimits allows
// around `received`; nullopt when it is inside (bounds included).
std::optional<Rejection> check_time_window(core::SensorTime time, core::SensorTime received,
                                           const DecodeLimits& limits);

}  // namespace bw::io::mqtt
