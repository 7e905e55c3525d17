// A sample as the engine receives it: one value of one tag at one time.
//
// The tag is a view into the caller's buffer and is valid only for the duration of the call
// that receives the sample; the engine copies nothing of it but the value.
#pragma once

#include <cstdint>
#include <string_view>

#include "core/sensor_time.h"

namespace bw::engine {

// Quality of a sample, as reported by its source. Wire and disk value: do not renumber.
enum class Quality : std::uint8_t { good = 0, uncertain = 1, bad = 2 };

struct Sample {
  std::string_view tag;
  core::SensorTime time;
  double value = 0;
  Quality quality = Quality::good;
};

}  // namespace bw::engine
