// Records: facts worth keeping besides alerts, such as a filter change-out with its run life
// and throughput, or one day's injected volume and pressures for the well's injection report.
//
// An estimator that recognises an event (estimator_node.h: take_record) or a periodic record
// spec closes a record; the engine hands it to its sink after the alert transitions of the same
// sample. Fields keep the order in which the producer lists them; their names are stable wire
// names (the JSON keys of the records output), their units engineering units.
#pragma once

#include <optional>
#include <string>
#include <string_view>
#include <vector>

#include "core/sensor_time.h"

namespace bw::engine {

struct RecordField {
  std::string name;  // e.g. "run_life_h"
  double value = 0;
  std::string unit;  // e.g. "h"; empty for a count
};

// What a producer hands over; the engine adds site, asset and producer names.
struct RecordContent {
  std::string kind;  // what sort of record: "change_out", "daily_injection", ...
  core::SensorTime time;                     // when the event happened, or the period's end
  std::optional<core::SensorTime> period_start;  // for records that cover a period
  std::vector<RecordField> fields;
};

struct AssetRecord {
  std::string_view site;
  std::string_view asset;
  std::string_view source;  // the estimator or record spec that produced it
  RecordContent content;
};

}  // namespace bw::engine
