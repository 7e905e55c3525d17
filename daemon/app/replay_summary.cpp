#include "app/replay_summary.h"

#include <algorithm>
#include <cassert>
#include <cstdio>

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
  if (f.wall_seconds > 0) {
    out += line("time: %.2f s, %.2f million samples per second", f.wall_seconds,
                static_cast<double>(e.samples) / f.wall_seconds / 1e6);
  }
  return out;
}

}  // namespace bw::app
