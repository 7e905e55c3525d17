// One replay: load a site, stream a history file through the engine (with the crew's commands
// at their times, and optionally with durable state), write every alert transition (and every
// record, when asked), print a summary. Shared by the replay and demo verbs.
#pragma once

#include <filesystem>
#include <string>
#include <vector>

#include "engine/alert.h"

namespace bw::app {

struct ReplayRequest {
  std::filesystem::path config;
  std::filesystem::path input;
  std::filesystem::path alerts = "-";  // "-" = standard output
  bool strict = false;
  std::vector<std::string> ignore_columns;
  std::vector<std::filesystem::path> rule_dirs;
  std::filesystem::path commands;   // optional commands file (see commands_file.h)
  std::filesystem::path notifications;  // optional: what the crews would be told (JSON Lines)
  std::filesystem::path records;        // optional: records closed (JSON Lines, io/record_log.h)
  std::filesystem::path state_dir;  // optional: restore from and save to this state store
  double checkpoint_every_s = 3600;  // event time between commits when state_dir is set
  engine::AlertSink* also_to = nullptr;  // optional second receiver of every transition
};

// Returns the exit status (see verbs.h). The summary goes to stdout, or to stderr when the
// alerts themselves go to stdout; progress goes to stderr on long files.
//
// With a state store, the replay resumes: inputs (samples and commands) at or before the
// stored position are skipped, the alerts file is appended to, and state is committed every
// checkpoint_every_s of event time and at the end. Rows must then be in time order across tags
// (wide files always are); the summary counts rows that are not.
int replay(const ReplayRequest& request);

}  // namespace bw::app
