#include <cstdio>

#include "app/option_parser.h"
#include "app/verbs.h"
#include "config/site_loader.h"

namespace bw::app {

int run_check(const Arguments& args) {
  std::vector<std::string> files;
  std::vector<std::string> rule_dirs;
  OptionParser parser("check");
  parser.positionals(files, 1, 1);
  parser.values("rules", rule_dirs);
  if (!parser.parse(args)) return 2;
  const auto loaded = config::load_site(files[0], {rule_dirs.begin(), rule_dirs.end()});
  for (const auto& diagnostic : loaded.diagnostics) {
    std::fprintf(stderr, "%s\n", config::format_diagnostic(diagnostic).c_str());
  }
  if (!loaded.ok()) {
    std::fprintf(stderr, "%s: %zu problem%s found\n", files[0].c_str(), loaded.diagnostics.size(),
                 loaded.diagnostics.size() == 1 ? "" : "s");
    return 2;
  }
  std::fputs(config::describe_site(*loaded.site).c_str(), stdout);
  return 0;
}

}  // namespace bw::app
