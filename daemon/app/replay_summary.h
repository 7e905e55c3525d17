// The text a person reads after a replay: what was read, what was refused and why, what fired.
// Pure formatting of figures gathered elsewhere.
#pragma once

#include <string>

#include "app/alert_tally.h"
#include "engine/engine.h"
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
};

std::string format_replay_summary(const ReplayFigures& figures);

}  // namespace bw::app
