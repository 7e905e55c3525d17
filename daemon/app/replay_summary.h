// The text a person reads after a replay: what was read, what was refused and why, what fired,
// and last the site's health roll-up as the history leaves it.
// Pure formatting of figures gathered elsewhere.
#pragma once

#include <optional>
#include <string>

#include "app/alert_tally.h"
#include "app/state_keeper.h"
#include "engine/engine.h"
#include "engine/site_health.h"
#include "io/history_csv.h"

namespace bw::app {

struct ReplayFigures {
  std::string input;
  std::string alerts_destination;
  std::string time_zone;
  const io::HistoryStats* history = nullptr;
  const engine::EngineCounters* engine = nullptr;
  const AlertTally* tally = nullptr;
  double wall_seconds = 0;
  std::string state;                      // describe_state_open(), or empty without a store
  std::uint64_t skipped_samples = 0;      // at or before the stored position
  std::uint64_t skipped_commands = 0;
  std::uint64_t out_of_time_order = 0;    // samples earlier than one already applied
  std::size_t commands_run = 0;
  std::size_t commands_after_end = 0;     // later than the last sample: not applied
  std::uint64_t notifications_sent = 0;
  std::uint64_t notifications_held = 0;
  std::string notifications_destination;  // empty: no notifications file asked for
  const engine::SiteHealth* site_health = nullptr;  // at the end of the history
  std::optional<core::SensorTime> last_event;       // the engine's clock at the end
  std::string records_destination;        // empty: no records file asked for
};

std::string format_replay_summary(const ReplayFigures& figures);

// One or two lines on what opening the state store found: created, resumed (position, scopes
// restored and reset), or a damaged file moved aside.
std::string describe_state_open(const StateKeeper::Opened& opened, const std::filesystem::path& dir);

}  // namespace bw::app
