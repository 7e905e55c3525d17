// Small hand-built sites for engine tests, and a sink that records transitions.
#pragma once

#include <chrono>
#include <string>
#include <vector>

#include "engine/alert.h"
#include "engine/site_model.h"

namespace bw::engine::testing {

inline core::SensorTime at_seconds(double s) { return core::sensor_time_from_seconds(1.7e9 + s); }

// One asset "tank" with input "level" bound to tag "T.LEVEL" (ft).
inline AssetSpec level_asset() {
  AssetSpec asset;
  asset.name = "tank";
  asset.template_name = "test";
  asset.inputs.push_back({.role = "level", .unit = "ft", .tag = "T.LEVEL"});
  return asset;
}

inline SiteSpec site_with(AssetSpec asset) {
  SiteSpec site;
  site.name = "Test Site";
  site.time_zone = "UTC";
  site.assets.push_back(std::move(asset));
  return site;
}

struct RecordedTransition {
  double time_s;
  std::string asset;
  std::string check;
  AlertEvent event;
  double value;
  std::string message;
  std::optional<Forecast> forecast;
  TransitionCause cause;
  AlertState to;
};

class RecordingSink final : public AlertSink {
 public:
  void on_transition(const AlertTransition& t) override {
    recorded.push_back({core::to_epoch_seconds(t.time) - 1.7e9, std::string(t.asset),
                        std::string(t.check), t.event, t.value, t.message, t.forecast, t.cause, t.to});
  }
  std::vector<RecordedTransition> recorded;
};

}  // namespace bw::engine::testing
