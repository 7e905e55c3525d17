// Reads the sensor-health tuning of one input (engine/sensor_health.h), as written in a template
// input's `health:` block and in each role of a site asset's `sensor_health:` mapping:
//
//   health: off                       every default of the input off (`on`: all on)
//   health:
//     stale: {factor: 4}              a mapping tunes a kind (and switches it on)
//     flatline: off                   `off` / `on` switch one kind
//     out_of_range: {margin: 5, priority: medium}
//     ne43: on
//
// The keys of each kind are declared in config/schema.h (kStaleHealthKeys...). Unknown kinds and
// keys are reported with the nearest valid name; numbers may name template parameters when the
// reader has them. A kind with an error is left out of the result. Not thread-safe.
#pragma once

#include <string_view>

#include "config/config_node.h"
#include "config/field_reader.h"
#include "engine/sensor_health.h"

namespace bw::config {

engine::InputHealthTuning read_input_health(FieldReader& reader, const ConfigNode& value,
                                            std::string_view what);

}  // namespace bw::config
