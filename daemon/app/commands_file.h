// Reads the crew commands a replay applies at their times, so an engineer can see what a shelve
// or an acknowledgement would have done to the alerts.
//
// Format (our own; CSV with a header row, separator ',' or ';'):
//   time,command,asset,check,who,reason,duration
//   2026-03-04 06:10,acknowledge,water_tank_2,overflow_ahead,Dana Ortiz,on my way,
//   2026-03-04 06:12,shelve,skim_tank,fill_rate_high,Dana Ortiz,trucks double-booked,4h
// - time as in history files (ISO 8601 with offset, epoch seconds, or local time in the site's
//   zone); command one of acknowledge, shelve, unshelve, remove_from_service,
//   return_to_service; check empty for every alert of the asset; duration only for shelve
//   (seconds, or a number with s, min, h, d).
// Commands are returned sorted by time (stable), each with source "replay". A replay applies
// each one before the first sample at or after its time; commands later than the last sample
// lie outside the replayed history and are not applied. Every bad line is
// reported (file:line: what was expected) and the whole file is refused, since a replay with a
// half-read set of commands would mislead.
#pragma once

#include <filesystem>
#include <string>
#include <vector>

#include "core/result.h"
#include "engine/alert_command.h"

namespace bw::app {

inline constexpr std::string_view kReplayCommandSource = "replay";

Result<std::vector<engine::AlertCommand>> read_commands_file(const std::filesystem::path& file,
                                                             const std::string& time_zone);

}  // namespace bw::app
