// The site health roll-up as the JSON the live daemon publishes: every field, written out by
// hand here, and the nulls for an idle site.
#include "io/site_health_json.h"

#include <gtest/gtest.h>

#include <string>
#include <vector>

#include "engine/engine.h"

namespace bw::io {
namespace {

using engine::AlertState;
using engine::Priority;

core::SensorTime epoch_seconds(std::int64_t s) {
  return core::SensorTime(core::Micros(s * 1'000'000));
}

TEST(SiteHealthJson, WritesEveryFigureOfTheSiteAndEachAsset) {
  const auto raised = epoch_seconds(1772344980);  // 2026-03-01T06:03:00Z
  const std::vector<std::string> names = {"tank_a", "pump_1"};
  const std::vector<engine::AlertView> alerts = {
      {"tank_a", "level_high", AlertState::unacknowledged, Priority::high, raised},
      {"tank_a", "level_low", AlertState::shelved, Priority::low, raised},
      {engine::Engine::kDaemonAsset, "state_store_reset", AlertState::returned_unacknowledged,
       Priority::high, raised},
  };
  const auto health = engine::roll_up_site("Test Flats SWD 1", names, alerts);
  const std::string expected =
      R"({"time":"2026-03-01T06:10:00.000Z","site":"Test Flats SWD 1","status":"visit soon",)"
      R"("worst_active_priority":"high",)"
      R"("unacknowledged":{"low":0,"medium":0,"high":1,"urgent":0},)"
      R"("acknowledged":{"low":0,"medium":0,"high":0,"urgent":0},)"
      R"("to_review":{"low":0,"medium":0,"high":1,"urgent":0},)"
      R"("shelved":1,"suppressed_by_design":0,"out_of_service":0,)"
      R"("oldest_unacknowledged":"2026-03-01T06:03:00.000Z","assets":[)"
      R"({"asset":"tank_a","status":"visit soon","worst_active_priority":"high",)"
      R"("unacknowledged":{"low":0,"medium":0,"high":1,"urgent":0},)"
      R"("acknowledged":{"low":0,"medium":0,"high":0,"urgent":0},)"
      R"("to_review":{"low":0,"medium":0,"high":0,"urgent":0},)"
      R"("shelved":1,"suppressed_by_design":0,"out_of_service":0,)"
      R"("oldest_unacknowledged":"2026-03-01T06:03:00.000Z"},)"
      R"({"asset":"pump_1","status":"normal","worst_active_priority":null,)"
      R"("unacknowledged":{"low":0,"medium":0,"high":0,"urgent":0},)"
      R"("acknowledged":{"low":0,"medium":0,"high":0,"urgent":0},)"
      R"("to_review":{"low":0,"medium":0,"high":0,"urgent":0},)"
      R"("shelved":0,"suppressed_by_design":0,"out_of_service":0,)"
      R"("oldest_unacknowledged":null},)"
      R"({"asset":"brinewatch","status":"attention","worst_active_priority":null,)"
      R"("unacknowledged":{"low":0,"medium":0,"high":0,"urgent":0},)"
      R"("acknowledged":{"low":0,"medium":0,"high":0,"urgent":0},)"
      R"("to_review":{"low":0,"medium":0,"high":1,"urgent":0},)"
      R"("shelved":0,"suppressed_by_design":0,"out_of_service":0,)"
      R"("oldest_unacknowledged":"2026-03-01T06:03:00.000Z"}]})";
  EXPECT_EQ(site_health_to_json(health, epoch_seconds(1772345400) /* 06:10:00Z */), expected);
}

}  // namespace
}  // namespace bw::io
