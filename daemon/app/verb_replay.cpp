#include <cstdio>

#include "app/option_parser.h"
#include "config/quantity.h"
#include "app/replay_run.h"
#include "app/verbs.h"

namespace bw::app {

int run_replay(const Arguments& args) {
  std::string config;
  std::string input;
  std::string alerts = "-";
  bool strict = false;
  std::vector<std::string> ignore_columns;
  std::vector<std::string> rule_dirs;
  std::string commands;
  std::string notifications;
  std::string records;
  std::string state_dir;
  std::string checkpoint_every = "1h";
  OptionParser parser("replay");
  parser.value("commands", commands);
  parser.value("notifications", notifications);
  parser.value("records", records);
  parser.value("state", state_dir);
  parser.value("checkpoint-every", checkpoint_every);
  parser.value("config", config, true);
  parser.value("input", input, true);
  parser.value("alerts", alerts);
  parser.flag("strict", strict);
  parser.values("ignore-column", ignore_columns);
  parser.values("rules", rule_dirs);
  if (!parser.parse(args)) return 2;
  const auto every = config::parse_duration(checkpoint_every);
  if (!every || *every <= 0) {
    std::fprintf(stderr,
                 "brinewatch replay: --checkpoint-every expects a positive duration such as 600, "
                 "10min or 1h, not '%s'\n",
                 checkpoint_every.c_str());
    return 2;
  }
  return replay({.config = config,
                 .input = input,
                 .alerts = alerts,
                 .strict = strict,
                 .ignore_columns = ignore_columns,
                 .rule_dirs = {rule_dirs.begin(), rule_dirs.end()},
                 .commands = commands,
                 .notifications = notifications,
                 .records = records,
                 .state_dir = state_dir,
                 .checkpoint_every_s = *every});
}

}  // namespace bw::app
