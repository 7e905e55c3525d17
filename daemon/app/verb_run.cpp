// `brinewatch run --config SITE.yaml`: the live daemon.
#include <spdlog/spdlog.h>

#include <cstdio>

#include "app/live_daemon.h"
#include "app/option_parser.h"
#include "app/verbs.h"
#include "app/version.h"
#include "config/site_loader.h"

namespace bw::app {

int run_live(const Arguments& args) {
  std::string config_file;
  std::vector<std::string> rule_dirs;
  OptionParser parser("run");
  parser.value("config", config_file, true);
  parser.values("rules", rule_dirs);
  if (!parser.parse(args)) return 2;
  auto loaded = config::load_site(config_file, {rule_dirs.begin(), rule_dirs.end()});
  for (const auto& diagnostic : loaded.diagnostics) {
    std::fprintf(stderr, "%s\n", config::format_diagnostic(diagnostic).c_str());
  }
  if (!loaded.ok()) return 2;
  if (!loaded.live) {
    std::fprintf(stderr,
                 "brinewatch run: %s has no 'live:' section; it names the broker, the topics to "
                 "read and the state folder (see config-examples/dry-creek-swd4.yaml)\n",
                 config_file.c_str());
    return 2;
  }
  spdlog::info("starting brinewatch {} with {}", kVersion, config_file);
  boost::asio::io_context io;
  auto daemon = LiveDaemon::create(std::move(*loaded.site), std::move(*loaded.live), io);
  if (!daemon) {
    std::fprintf(stderr, "brinewatch run: %s\n", daemon.error().message.c_str());
    return 1;
  }
  return daemon.value()->run();
}

}  // namespace bw::app
