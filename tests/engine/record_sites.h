// A disposal well with a daily injection record, and a sink that keeps records, for the tests of
// periodic records.
#pragma once

#include <gtest/gtest.h>

#include <optional>
#include <string>
#include <vector>

#include "engine/alert.h"
#include "engine/site_model.h"

namespace bw::engine::testing {

// 2026-03-02T00:00:00Z, a Monday far from any clock change.
inline constexpr double kMonday = 1772409600;
inline constexpr double kHour = 3600;

inline core::SensorTime utc(double epoch_seconds) {
  return core::sensor_time_from_seconds(epoch_seconds);
}

// Inputs rate (bbl/d, "W.RATE") and tubing_pressure (psi, "W.TP"), both expected every 5 min
// (silent after 15 min); record "daily_injection" from 07:00 with one field of each statistic.
inline AssetSpec well_with_daily_record(double day_start_s = 7 * kHour) {
  AssetSpec asset;
  asset.name = "well";
  asset.template_name = "test";
  asset.inputs.push_back(
      {.role = "rate", .unit = "bbl/d", .tag = "W.RATE", .expected_interval_s = 300});
  asset.inputs.push_back(
      {.role = "tubing_pressure", .unit = "psi", .tag = "W.TP", .expected_interval_s = 300});
  RecordSpec record{.name = "daily_injection", .day_start_s = day_start_s};
  record.fields.push_back({.name = "injected_volume",
                           .of = "rate",
                           .stat = RecordStat::total,
                           .rate_per_s = 86400,
                           .unit = "bbl"});
  record.fields.push_back(
      {.name = "max_tubing_pressure", .of = "tubing_pressure", .stat = RecordStat::max});
  record.fields.push_back({.name = "average_tubing_pressure",
                           .of = "tubing_pressure",
                           .stat = RecordStat::time_average});
  record.fields.push_back(
      {.name = "injecting_hours", .of = "rate", .stat = RecordStat::time_above, .above = 1});
  asset.records.push_back(record);
  return asset;
}

struct KeptRecord {
  std::string site, asset, source, kind;
  core::SensorTime time;
  std::optional<core::SensorTime> period_start;
  std::vector<RecordField> fields;

  double field(const std::string& name) const {
    for (const auto& f : fields) {
      if (f.name == name) return f.value;
    }
    ADD_FAILURE() << "no field " << name;
    return 0;
  }
  const std::string& unit(const std::string& name) const {
    for (const auto& f : fields) {
      if (f.name == name) return f.unit;
    }
    static const std::string none;
    return none;
  }
};

// Keeps every record, and the order of transitions ("T") and records ("R") in `events`.
class RecordKeeper final : public AlertSink {
 public:
  void on_transition(const AlertTransition& t) override {
    events += "T";
    (void)t;
  }
  void on_record(const AssetRecord& r) override {
    events += "R";
    records.push_back({std::string(r.site), std::string(r.asset), std::string(r.source),
                       r.content.kind, r.content.time, r.content.period_start, r.content.fields});
  }
  std::vector<KeptRecord> records;
  std::string events;
};

}  // namespace bw::engine::testing
