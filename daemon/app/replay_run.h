// One replay: load a site, stream a history file through the engine, write every alert
// transition, print a summary. Shared by the replay and demo verbs.
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
  engine::AlertSink* also_to = nullptr;  // optional second receiver of every transition
};

// Returns the exit status (see verbs.h). The summary goes to stdout, or to stderr when the
// alerts themselves go to stdout; progress goes to stderr on long files.
int replay(const ReplayRequest& request);

}  // namespace bw::app
