// `brinewatch state --dir DIR`: what a state store holds, for a person at the edge box, ending
// with the site's health roll-up. `brinewatch state --rank DIR...`: the sites of several stores
// in visit order, for the engineer who looks after many sites.
#include <cstdio>
#include <filesystem>
#include <limits>

#include "core/utc_text.h"
#include "app/option_parser.h"
#include "app/site_health_text.h"
#include "app/state_keeper.h"
#include "app/stored_site_health.h"
#include "app/verbs.h"
#include "io/json_text.h"
#include "io/state_store.h"

namespace bw::app {
namespace {

std::string time_text(std::int64_t us) {
  return core::format_utc(core::SensorTime(core::Micros(us)), core::UtcPrecision::milliseconds);
}

int usage_error(const char* message) {
  std::fprintf(stderr, "brinewatch state: %s\n", message);
  return 2;
}

// Reads each store's roll-up and prints the sites in visit order. A folder without a store is
// reported, not created.
int run_rank(const std::vector<std::string>& dirs) {
  std::vector<RankedSite> sites;
  for (const auto& dir : dirs) {
    RankedSite& site = sites.emplace_back(RankedSite{.dir = dir});
    if (!std::filesystem::exists(std::filesystem::path(dir) / io::StateStore::kFileName)) {
      site.problem = std::string("no state store here (") + io::StateStore::kFileName + ")";
      continue;
    }
    io::StoreOpenReport report;
    auto store = io::StateStore::open(dir, report);
    if (!store) {
      site.problem = store.error().message;
      continue;
    }
    if (report.moved_aside) {
      site.problem = "the database was damaged (" + report.problem + ") and was moved to " +
                     report.moved_aside->string();
      continue;
    }
    auto stored = site_health_of_store(*store.value());
    if (!stored) {
      site.problem = stored.error().message;
      continue;
    }
    site.health = std::move(stored.value().health);
    site.as_of = stored.value().as_of;
  }
  std::fputs(format_visit_order(sites).c_str(), stdout);
  for (const auto& site : sites) {
    if (!site.health) return 1;
  }
  return 0;
}

}  // namespace

int run_state(const Arguments& args) {
  std::string dir;
  std::string journal = "20";
  bool rank = false;
  std::vector<std::string> dirs;
  OptionParser parser("state");
  parser.value("dir", dir);
  parser.value("journal", journal);
  parser.flag("rank", rank);
  parser.positionals(dirs, 0, std::numeric_limits<std::size_t>::max());
  if (!parser.parse(args)) return 2;
  if (!dir.empty()) dirs.insert(dirs.begin(), dir);
  if (rank) {
    if (dirs.empty()) return usage_error("--rank needs one or more state folders");
    return run_rank(dirs);
  }
  if (dirs.size() != 1) {
    return usage_error(dirs.empty() ? "missing the state folder: --dir DIR"
                                    : "give one state folder, or --rank to order several");
  }
  dir = dirs.front();
  const std::size_t limit = std::strtoul(journal.c_str(), nullptr, 10);

  io::StoreOpenReport report;
  auto store = io::StateStore::open(dir, report);
  if (!store) {
    std::fprintf(stderr, "brinewatch state: %s\n", store.error().message.c_str());
    return 1;
  }
  if (report.moved_aside) {
    std::printf("the database was damaged (%s) and was moved to %s; a fresh one was made\n",
                report.problem.c_str(), report.moved_aside->c_str());
  }
  std::printf("store: %s (schema version %d)\n", store.value()->path().c_str(), report.schema_version);
  auto position = store.value()->meta(kPositionKey);
  auto last = store.value()->last_seq();
  auto checkpoints = store.value()->load_checkpoints();
  if (!position || !last || !checkpoints) {
    std::fprintf(stderr, "brinewatch state: cannot read the store\n");
    return 1;
  }
  if (position.value()) {
    std::printf("inputs applied up to: %s\n", time_text(std::stoll(*position.value())).c_str());
  }
  std::printf("journal entries: %lld\n", static_cast<long long>(last.value()));
  std::printf("checkpoints:\n");
  for (const auto& c : checkpoints.value()) {
    std::printf("  %-28s %8zu bytes  taken at %s  definition %s\n", c.scope.c_str(), c.state.size(),
                time_text(c.taken_at_us).c_str(), c.definition_hash.c_str());
  }
  const std::int64_t from = std::max<std::int64_t>(0, last.value() - static_cast<std::int64_t>(limit));
  auto entries = store.value()->read_journal(from, limit);
  if (!entries) {
    std::fprintf(stderr, "brinewatch state: %s\n", entries.error().message.c_str());
    return 1;
  }
  if (!entries.value().empty()) std::printf("last %zu journal entries:\n", entries.value().size());
  for (const auto& e : entries.value()) {
    std::printf("  #%-6lld %s  %s/%s  %s (%s -> %s, %s)  %s\n", static_cast<long long>(e.seq),
                time_text(e.time_us).c_str(), e.asset.c_str(), e.check.c_str(), e.event.c_str(),
                e.from_state.c_str(), e.to_state.c_str(), e.cause.c_str(), e.message.c_str());
  }
  auto stored = site_health_of_store(*store.value());
  if (stored) {
    std::fputs(format_site_health(stored.value().health, stored.value().as_of).c_str(), stdout);
  } else {
    std::printf("site health: not available: %s\n", stored.error().message.c_str());
  }
  return 0;
}

}  // namespace bw::app
