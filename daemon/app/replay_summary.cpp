#include "app/replay_summary.h"

#include <algorithm>
#include <cassert>
#include <cstdio>

#include "app/site_health_text.h"
#include "core/utc_text.h"
#include "io/json_text.h"

namespace bw::app {
namespace {

std::string line(const char* pattern, auto... args) {
  char text[256];
  std::snprintf(text, sizeof text, pattern, args...);
  return std::string(text) + "\n";
}

}  // namespace

std::string format_replay_summary(const ReplayFigures& f) {
  assert(f.history && f.engine && f.tally);
  std::string out = io::describe(*f.history, f.input) + "\n";
  const auto& e = *f.engine;
  out += line("engine: %llu samples offered, %llu evaluated, %llu on unbound tags, %llu not good "
              "quality, %llu not finite",
              static_cast<unsigned long long>(e.samples),
              static_cast<unsigned long long>(e.evaluated),
              static_cast<unsigned long long>(e.unknown_tag),
              static_cast<unsigned long long>(e.not_good),
              static_cast<unsigned long long>(e.non_finite));
  if (!e.first_unknown_tags.empty()) {
    std::string names;
    for (const auto& tag : e.first_unknown_tags) names += (names.empty() ? "" : ", ") + tag;
    out += "  tags bound to no asset: " + names +
           (e.first_unknown_tags.size() == engine::Engine::kMaxListedUnknownTags ? ", ..." : "") +
           "\n";
  }
  if (f.commands_run > 0 || f.skipped_commands > 0 || f.commands_after_end > 0) {
    out += line("commands: %zu applied (%llu refused), %llu already applied before, %zu later "
                "than the last sample (not applied)",
                f.commands_run, static_cast<unsigned long long>(e.commands_refused),
                static_cast<unsigned long long>(f.skipped_commands), f.commands_after_end);
  }
  if (!f.state.empty()) out += f.state;
  if (f.skipped_samples > 0) {
    out += line("  %llu samples at or before the saved position were skipped",
                static_cast<unsigned long long>(f.skipped_samples));
  }
  if (f.out_of_time_order > 0) {
    out += line("  warning: %llu samples were earlier than samples already applied; a resumed "
                "replay needs rows in time order (sort the file by time)",
                static_cast<unsigned long long>(f.out_of_time_order));
  }
  out += line("alerts: %llu transitions written to %s",
              static_cast<unsigned long long>(e.transitions), f.alerts_destination.c_str());
  if (!f.tally->rows().empty()) {
    std::size_t asset_width = 5;
    std::size_t check_width = 5;
    for (const auto& [key, row] : f.tally->rows()) {
      asset_width = std::max(asset_width, key.first.size());
      check_width = std::max(check_width, key.second.size());
    }
    const int aw = static_cast<int>(asset_width);
    const int cw = static_cast<int>(check_width);
    out += line("  %-*s  %-*s  %7s  %7s", aw, "asset", cw, "check", "raised", "cleared");
    for (const auto& [key, row] : f.tally->rows()) {
      out += line("  %-*s  %-*s  %7llu  %7llu", aw, key.first.c_str(), cw, key.second.c_str(),
                  static_cast<unsigned long long>(row.raised),
                  static_cast<unsigned long long>(row.cleared));
    }
  }
  if (!f.notifications_destination.empty()) {
    out += line("notifications: %llu sent, %llu held back (chattering or flood), written to %s",
                static_cast<unsigned long long>(f.notifications_sent),
                static_cast<unsigned long long>(f.notifications_held),
                f.notifications_destination.c_str());
  }
  out += line("records: %llu closed%s%s", static_cast<unsigned long long>(e.records),
              f.records_destination.empty() ? " (not written: no --records file)"
                                            : ", written to ",
              f.records_destination.c_str());
  if (f.wall_seconds > 0) {
    out += line("time: %.2f s, %.2f million samples per second", f.wall_seconds,
                static_cast<double>(e.samples) / f.wall_seconds / 1e6);
  }
  if (f.site_health != nullptr) out += format_site_health(*f.site_health, f.last_event);
  return out;
}

std::string describe_state_open(const StateKeeper::Opened& opened, const std::filesystem::path& dir) {
  std::string out = "state: " + dir.string();
  if (opened.store.moved_aside) {
    out += ": the database was damaged (" + opened.store.problem + ") and moved to " +
           opened.store.moved_aside->string() + "; started afresh";
  } else if (opened.store.created) {
    out += ": new";
  } else {
    out += ": resumed";
    if (opened.position) out += " after " + core::format_utc(*opened.position, core::UtcPrecision::milliseconds);
    out += ", " + std::to_string(opened.restore.restored.size()) + " parts restored";
    if (!opened.restore.reset.empty()) {
      std::string names;
      for (const auto& scope : opened.restore.reset) names += (names.empty() ? "" : ", ") + scope;
      out += ", reset because their definition changed: " + names;
    }
  }
  if (opened.store.migrated_from > 0 && opened.store.migrated_from < opened.store.schema_version) {
    out += " (schema upgraded from version " + std::to_string(opened.store.migrated_from) + ")";
  }
  return out + "\n";
}

}  // namespace bw::app
