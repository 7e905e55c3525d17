#include <stdlib.h>

#include <cerrno>
#include <cstdio>
#include <cstring>
#include <filesystem>
#include <fstream>

#include "core/utc_text.h"
#include "app/demo_files.h"
#include "app/demo_history.h"
#include "app/option_parser.h"
#include "app/replay_run.h"
#include "app/verbs.h"
#include "engine/alert.h"
#include "io/json_text.h"

namespace bw::app {
namespace {

namespace fs = std::filesystem;

// Keeps each transition as one line of a table a person can read at a glance.
class TransitionTable final : public engine::AlertSink {
 public:
  void on_transition(const engine::AlertTransition& t) override {
    char row[512];
    std::snprintf(row, sizeof row, "  %s  %-13s %-15s %-8s %-7s %s\n",
                  core::format_utc(t.time, core::UtcPrecision::milliseconds).substr(0, 16).c_str(), std::string(t.asset).c_str(),
                  std::string(t.check).c_str(), std::string(engine::to_string(t.event)).c_str(),
                  std::string(engine::to_string(t.priority)).c_str(), t.message.c_str());
    text += row;
  }
  std::string text;
};

bool write_file(const fs::path& path, std::string_view text) {
  std::error_code ec;
  fs::create_directories(path.parent_path(), ec);
  std::ofstream out(path, std::ios::binary | std::ios::trunc);
  out.write(text.data(), static_cast<std::streamsize>(text.size()));
  out.close();
  if (!out) {
    std::fprintf(stderr, "brinewatch demo: cannot write %s: %s\n", path.c_str(), std::strerror(errno));
    return false;
  }
  return true;
}

}  // namespace

int run_demo(const Arguments& args) {
  std::string dir;
  OptionParser parser("demo");
  parser.value("dir", dir);
  if (!parser.parse(args)) return 2;
  if (dir.empty()) {
    char pattern[] = "/tmp/brinewatch-demo-XXXXXX";
    if (mkdtemp(pattern) == nullptr) {
      std::fprintf(stderr, "brinewatch demo: cannot make a temporary folder: %s\n", std::strerror(errno));
      return 1;
    }
    dir = pattern;
  }
  // The same layout as the source tree, so the site's "rules: [../rules]" finds the template.
  const fs::path root(dir);
  const fs::path site = root / "config-examples" / "dry-creek-swd4-tanks.yaml";
  const fs::path history = root / "history" / "dry-creek-swd4.csv";
  const fs::path alerts = root / "alerts.jsonl";
  if (!write_file(site, kDemoSiteYaml) ||
      !write_file(root / "rules" / "tank_level.yaml", kDemoRulesYaml) ||
      !write_file(history, make_demo_history())) {
    return 1;
  }
  std::printf("demo: an invented site and four days of invented history in %s\n\n", dir.c_str());
  TransitionTable table;
  const int status = replay({.config = site, .input = history, .alerts = alerts, .also_to = &table});
  if (status != 0) return status;
  std::printf("\nalert transitions (UTC; every one is also a JSON line in %s):\n", alerts.c_str());
  std::printf("  %-16s  %-13s %-15s %-8s %-7s %s\n", "time", "asset", "check", "event", "priority", "message");
  std::fputs(table.text.c_str(), stdout);
  std::printf("\nreplay it yourself, after editing the site or its template:\n"
              "  brinewatch replay --config %s --input %s --alerts %s\n",
              site.c_str(), history.c_str(), alerts.c_str());
  return 0;
}

}  // namespace bw::app
