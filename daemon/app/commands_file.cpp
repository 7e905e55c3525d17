#include "app/commands_file.h"

#include <algorithm>
#include <array>
#include <fstream>
#include <sstream>

#include "config/quantity.h"
#include "io/csv_fields.h"
#include "io/local_time_zone.h"
#include "io/time_field.h"

namespace bw::app {
namespace {

constexpr std::array<std::string_view, 7> kColumns = {"time", "command", "asset", "check",
                                                      "who",  "reason",  "duration"};
constexpr std::size_t kMaxReported = 10;

std::string strip_line_end(std::string line) {
  if (!line.empty() && line.back() == '\r') line.pop_back();
  return line;
}

}  // namespace

Result<std::vector<engine::AlertCommand>> read_commands_file(const std::filesystem::path& file,
                                                             const std::string& time_zone) {
  std::ifstream in(file, std::ios::binary);
  if (!in) return Error{"cannot read commands file " + file.string()};
  auto zone = io::LocalTimeZone::find(time_zone);
  if (!zone) return Error{zone.error().message};

  std::string header;
  if (!std::getline(in, header)) return Error{file.string() + ": empty file, expected a header"};
  header = strip_line_end(header);
  const char separator = header.find(';') != std::string::npos ? ';' : ',';
  std::array<std::string_view, kColumns.size() + 1> fields{};
  const std::size_t header_count = io::split_fields(header, separator, fields);
  bool header_ok = header_count == kColumns.size() || header_count == kColumns.size() - 1;
  for (std::size_t i = 0; header_ok && i < std::min(header_count, kColumns.size()); ++i) {
    header_ok = io::tidy_field(fields[i]) == kColumns[i];
  }
  if (!header_ok) {
    return Error{file.string() + ":1: expected the header time,command,asset,check,who,reason,duration"};
  }

  std::vector<engine::AlertCommand> commands;
  std::vector<std::string> problems;
  std::size_t line_number = 1;
  for (std::string line; std::getline(in, line);) {
    ++line_number;
    line = strip_line_end(line);
    if (io::tidy_field(line).empty()) continue;
    auto problem = [&](const std::string& what) {
      problems.push_back(file.string() + ":" + std::to_string(line_number) + ": " + what);
    };
    const std::size_t count = io::split_fields(line, separator, fields);
    if (count != header_count) {
      problem("expected " + std::to_string(header_count) + " fields, found " + std::to_string(count));
      continue;
    }
    auto field = [&](std::size_t i) { return std::string(io::tidy_field(fields[i])); };
    engine::AlertCommand command;
    std::optional<io::ConversionNote> note;
    if (io::parse_time_field(io::tidy_field(fields[0]), &zone.value(), command.issued, note)) {
      problem("time '" + field(0) + "' is not ISO 8601 or epoch seconds");
      continue;
    }
    const auto kind = engine::command_kind_from_string(field(1));
    if (!kind) {
      problem("command '" + field(1) +
              "' is not one of acknowledge, shelve, unshelve, remove_from_service, return_to_service");
      continue;
    }
    command.kind = *kind;
    command.asset = field(2);
    command.check = field(3);
    command.who = field(4);
    command.reason = field(5);
    command.source = std::string(kReplayCommandSource);
    if (command.asset.empty()) {
      problem("asset is empty");
      continue;
    }
    const std::string duration = header_count == kColumns.size() ? field(6) : std::string();
    if (command.kind == engine::AlertCommand::Kind::shelve) {
      const auto seconds = config::parse_duration(duration);
      if (!seconds) {
        problem("shelve needs a duration such as 3600, 90min or 4h, found '" + duration + "'");
        continue;
      }
      command.duration_s = *seconds;  // the alert book refuses non-positive ones, with a reason
    } else if (!duration.empty()) {
      problem("only shelve takes a duration");
      continue;
    }
    commands.push_back(std::move(command));
  }
  if (!problems.empty()) {
    std::string message = std::to_string(problems.size()) + " bad line" +
                          (problems.size() == 1 ? "" : "s") + " in the commands file:";
    for (std::size_t i = 0; i < std::min(problems.size(), kMaxReported); ++i) {
      message += "\n  " + problems[i];
    }
    return Error{message};
  }
  std::stable_sort(commands.begin(), commands.end(),
                   [](const auto& a, const auto& b) { return a.issued < b.issued; });
  return commands;
}

}  // namespace bw::app
