// Replays a constructed history through `brinewatch replay` and reads back the alert events.
//
// A test builds a WideHistory (one row per time, one column per tag, the columns in the order
// given: within a row the engine receives the tags in that order; a NaN value is written as an
// empty cell, i.e. no sample of that tag in that row), writes a small site file that
// binds one asset to a shipped template, and gets every alert transition as an AlertEvent with
// its time in hours since the start of the history, and every record (records_of()). Used by
// the template tests only.
#pragma once

#include <gtest/gtest.h>

#include <algorithm>
#include <cmath>
#include <cstdio>
#include <cstdlib>
#include <ctime>
#include <filesystem>
#include <fstream>
#include <optional>
#include <string>
#include <vector>

#include "../app/run_command.h"

namespace bw::testing {

// The history starts at 2026-03-01T00:00:00Z.
inline constexpr std::time_t kHistoryStart = 1772323200;

class WideHistory {
 public:
  explicit WideHistory(std::vector<std::string> tags) : tags_(std::move(tags)) {}

  // REQUIRES: one value per tag (NaN: no sample of that tag), times not going back.
  void add_row(double seconds_from_start, const std::vector<double>& values) {
    rows_.push_back({seconds_from_start, values});
  }

  void write(const std::filesystem::path& file) const {
    std::ofstream out(file);
    out << "time";
    for (const auto& tag : tags_) out << ',' << tag;
    out << '\n';
    char line[64];
    for (const auto& row : rows_) {
      std::snprintf(line, sizeof line, "%.0f", static_cast<double>(kHistoryStart) + row.seconds);
      out << line;
      for (double v : row.values) {
        if (std::isnan(v)) {
          out << ',';
          continue;
        }
        std::snprintf(line, sizeof line, ",%.6g", v);
        out << line;
      }
      out << '\n';
    }
  }

 private:
  struct Row {
    double seconds;
    std::vector<double> values;
  };
  std::vector<std::string> tags_;
  std::vector<Row> rows_;
};

struct AlertEvent {
  std::string check;
  std::string event;  // raised, cleared, suppressed, ...
  double hours = 0;   // since the start of the history
};

inline std::string json_field(const std::string& line, const std::string& key) {
  const std::string marker = "\"" + key + "\":\"";
  const auto at = line.find(marker);
  if (at == std::string::npos) return {};
  const auto begin = at + marker.size();
  return line.substr(begin, line.find('"', begin) - begin);
}

// "2026-03-05T13:20:00.000Z" -> hours since kHistoryStart.
inline double hours_since_start(const std::string& iso) {
  std::tm tm{};
  if (std::sscanf(iso.c_str(), "%d-%d-%dT%d:%d:%d", &tm.tm_year, &tm.tm_mon, &tm.tm_mday,
                  &tm.tm_hour, &tm.tm_min, &tm.tm_sec) != 6) {
    ADD_FAILURE() << "unreadable time " << iso;
    return -1;
  }
  tm.tm_year -= 1900;
  tm.tm_mon -= 1;
  return static_cast<double>(timegm(&tm) - kHistoryStart) / 3600.0;
}

// A site file (invented site Dry Creek SWD 9) with one asset of a shipped template; `tags` and
// `parameters` are YAML flow mappings, e.g. "{level: DC9.TK1.LEVEL}".
inline std::string one_asset_site(const std::string& asset, const std::string& template_name,
                                  const std::string& tags, const std::string& parameters = "{}") {
  return std::string("site: {name: Dry Creek SWD 9, time_zone: America/Chicago}\n") +
         "rules: [" + BRINEWATCH_SOURCE_DIR + "/rules]\n" + "assets:\n  " + asset +
         ":\n    template: " + template_name + "\n    tags: " + tags +
         "\n    parameters: " + parameters + "\n";
}

inline std::filesystem::path history_dir(const std::string& name) {
  return scratch_dir("templates") / name;
}

// Writes `site_yaml` and `history` under a scratch folder named `name`, replays (alerts and
// records, see records_of()), and returns the alert events of asset `asset` in order.
inline std::vector<AlertEvent> replay_history(const std::string& name, const std::string& site_yaml,
                                              const WideHistory& history,
                                              const std::string& asset) {
  const auto dir = history_dir(name);
  std::filesystem::create_directories(dir);
  std::ofstream(dir / "site.yaml") << site_yaml;
  history.write(dir / "history.csv");
  const auto alerts = dir / "alerts.jsonl";
  const CommandResult r =
      run_brinewatch("replay --config " + (dir / "site.yaml").string() + " --input " +
                     (dir / "history.csv").string() + " --alerts " + alerts.string() +
                     " --records " + (dir / "records.jsonl").string());
  EXPECT_EQ(r.status, 0) << r.output;
  std::vector<AlertEvent> events;
  for (const auto& line : lines_of(alerts)) {
    if (json_field(line, "asset") != asset) continue;
    events.push_back({json_field(line, "check"), json_field(line, "event"),
                      hours_since_start(json_field(line, "time"))});
  }
  return events;
}

// One record of the replay (io/record_log.h): its source, kind, time and the raw JSON line.
struct RecordLine {
  std::string source;
  std::string kind;
  double hours = 0;  // since the start of the history
  std::string json;

  // The value of field `field`; nullopt when absent or null.
  std::optional<double> field(const std::string& field) const {
    const std::string marker = "\"" + field + "\":{\"value\":";
    const auto at = json.find(marker);
    if (at == std::string::npos) return std::nullopt;
    const char* begin = json.c_str() + at + marker.size();
    char* end = nullptr;
    const double value = std::strtod(begin, &end);
    if (end == begin) return std::nullopt;
    return value;
  }
};

// The records of asset `asset` written by the replay_history() call named `name`, in order.
inline std::vector<RecordLine> records_of(const std::string& name, const std::string& asset) {
  std::vector<RecordLine> records;
  for (const auto& line : lines_of(history_dir(name) / "records.jsonl")) {
    if (json_field(line, "asset") != asset) continue;
    records.push_back({json_field(line, "source"), json_field(line, "kind"),
                       hours_since_start(json_field(line, "time")), line});
  }
  return records;
}

// The first `raised` event of `check`, if any.
inline std::optional<double> first_raised(const std::vector<AlertEvent>& events,
                                          const std::string& check) {
  const auto it = std::find_if(events.begin(), events.end(), [&](const AlertEvent& e) {
    return e.check == check && e.event == "raised";
  });
  if (it == events.end()) return std::nullopt;
  return it->hours;
}

// The hours from `onset_h` to the first raise of `check`, checked to lie in [0, max_h]; nullopt
// (with a failure) when it never raised. `what` names the case in messages and the figures line.
inline std::optional<double> expect_raised_within(const std::vector<AlertEvent>& events,
                                                  const std::string& check, double onset_h,
                                                  double max_h, const std::string& what) {
  const auto raised = first_raised(events, check);
  EXPECT_TRUE(raised.has_value()) << what;
  if (!raised) return std::nullopt;
  const double delay_h = *raised - onset_h;
  std::printf("[ figures ] %s: raised %.2f h after onset\n", what.c_str(), delay_h);
  EXPECT_GE(delay_h, 0) << what << ": raised before the onset";
  EXPECT_LE(delay_h, max_h) << what;
  return delay_h;
}

// Every `raised` event, as "check@hours" for failure messages.
inline std::vector<std::string> raised_list(const std::vector<AlertEvent>& events) {
  std::vector<std::string> out;
  for (const auto& e : events) {
    if (e.event == "raised") out.push_back(e.check + "@" + std::to_string(e.hours) + "h");
  }
  return out;
}

}  // namespace bw::testing
