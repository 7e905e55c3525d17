#include "label_timeline.h"

#include <algorithm>
#include <charconv>
#include <chrono>
#include <fstream>
#include <functional>
#include <iterator>
#include <optional>
#include <sstream>
#include <string>

namespace bw::datasets {
namespace {

std::vector<std::string_view> split(std::string_view line, char separator) {
  std::vector<std::string_view> fields;
  std::size_t from = 0;
  for (;;) {
    const std::size_t at = line.find(separator, from);
    fields.push_back(line.substr(from, at - from));
    if (at == std::string_view::npos) return fields;
    from = at + 1;
  }
}

bool read_int(std::string_view text, int& out) {
  const auto [end, ec] = std::from_chars(text.data(), text.data() + text.size(), out);
  return ec == std::errc() && end == text.data() + text.size();
}

// Reads the time column (the first) and `label_column` of every row; `to_label` maps the label
// text. The first fault row is the onset; the last is the end of the fault.
Result<LabelTimeline> read_labels(
    const std::filesystem::path& file, char separator, std::string_view label_column,
    const std::function<std::optional<Label>(std::string_view)>& to_label) {
  std::ifstream in(file, std::ios::binary);
  if (!in) return Error{"cannot open " + file.string()};
  std::stringstream buffer;
  buffer << in.rdbuf();
  const std::string text = buffer.str();
  std::istringstream lines(text);
  std::string line;
  std::getline(lines, line);
  if (!line.empty() && line.back() == '\r') line.pop_back();
  const auto header = split(line, separator);
  const auto column = std::find(header.begin(), header.end(), label_column);
  if (column == header.end()) {
    return Error{file.string() + ": no column '" + std::string(label_column) + "'"};
  }
  const auto index = static_cast<std::size_t>(column - header.begin());
  LabelTimeline timeline;
  bool seen_fault = false;
  for (int number = 2; std::getline(lines, line); ++number) {
    if (!line.empty() && line.back() == '\r') line.pop_back();
    if (line.empty()) continue;
    const auto fields = split(line, separator);
    const std::string where = file.string() + ":" + std::to_string(number);
    if (fields.size() != header.size()) return Error{where + ": wrong number of fields"};
    const auto parsed = parse_time(fields.front());
    if (!parsed) return Error{where + ": " + parsed.error().message};
    const std::int64_t time = parsed.value();
    const auto label = to_label(fields[index]);
    if (!label) return Error{where + ": unknown label '" + std::string(fields[index]) + "'"};
    if (!timeline.rows.empty()) {
      timeline.largest_step = std::max(timeline.largest_step, time - timeline.rows.back().first);
    }
    timeline.rows.emplace_back(time, *label);
    if (*label == Label::fault) {
      if (!seen_fault) timeline.onset = time;
      timeline.fault_end = time;
      seen_fault = true;
    }
  }
  if (timeline.rows.empty()) return Error{file.string() + ": no rows"};
  if (!seen_fault) return Error{file.string() + ": no fault rows"};
  timeline.start = timeline.rows.front().first;
  return timeline;
}

}  // namespace

Label LabelTimeline::label_at(std::int64_t t) const {
  auto after = std::upper_bound(rows.begin(), rows.end(), t,
                                [](std::int64_t v, const auto& row) { return v < row.first; });
  if (after == rows.begin()) return rows.front().second;
  return std::prev(after)->second;
}

Result<std::int64_t> parse_time(std::string_view text) {
  int year = 0, month = 0, day = 0, hour = 0, minute = 0, second = 0;
  const bool shaped = text.size() >= 19 && text[4] == '-' && text[7] == '-' &&
                      (text[10] == ' ' || text[10] == 'T') && text[13] == ':' && text[16] == ':';
  if (!shaped || !read_int(text.substr(0, 4), year) || !read_int(text.substr(5, 2), month) ||
      !read_int(text.substr(8, 2), day) || !read_int(text.substr(11, 2), hour) ||
      !read_int(text.substr(14, 2), minute) || !read_int(text.substr(17, 2), second)) {
    return Error{"not a time 'YYYY-MM-DD hh:mm:ss': '" + std::string(text) + "'"};
  }
  const std::chrono::year_month_day date{std::chrono::year{year},
                                         std::chrono::month{static_cast<unsigned>(month)},
                                         std::chrono::day{static_cast<unsigned>(day)}};
  if (!date.ok()) return Error{"no such date: '" + std::string(text) + "'"};
  const auto midnight = std::chrono::sys_days{date}.time_since_epoch();
  return std::chrono::duration_cast<std::chrono::seconds>(midnight).count() + hour * 3600 +
         minute * 60 + second;
}

Result<LabelTimeline> read_skab_labels(const std::filesystem::path& file) {
  return read_labels(file, ';', "anomaly", [](std::string_view v) -> std::optional<Label> {
    if (v == "1.0" || v == "1") return Label::fault;
    if (v == "0.0" || v == "0") return Label::normal;
    return std::nullopt;
  });
}

Result<LabelTimeline> read_3w_labels(const std::filesystem::path& file) {
  auto timeline = read_labels(file, ',', "class", [](std::string_view v) -> std::optional<Label> {
    if (v.empty()) return Label::unlabelled;
    if (v == "0") return Label::normal;
    if (v == "102" || v == "106" || v == "2" || v == "6") return Label::fault;
    return std::nullopt;
  });
  if (!timeline) return timeline;
  // The fault lasts from the onset to the end of the file (PROVENANCE: transient, then steady).
  timeline->fault_end = timeline->rows.back().first;
  return timeline;
}

}  // namespace bw::datasets
