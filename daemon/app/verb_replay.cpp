#include "app/option_parser.h"
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
  OptionParser parser("replay");
  parser.value("config", config, true);
  parser.value("input", input, true);
  parser.value("alerts", alerts);
  parser.flag("strict", strict);
  parser.values("ignore-column", ignore_columns);
  parser.values("rules", rule_dirs);
  if (!parser.parse(args)) return 2;
  return replay({.config = config,
                 .input = input,
                 .alerts = alerts,
                 .strict = strict,
                 .ignore_columns = ignore_columns,
                 .rule_dirs = {rule_dirs.begin(), rule_dirs.end()}});
}

}  // namespace bw::app
