#include "io/history_header.h"

#include <algorithm>
#include <array>
#include <optional>

#include "io/csv_fields.h"

namespace bw::io {
namespace {

constexpr std::array<std::string_view, 3> kTimeNames = {"time", "timestamp", "datetime"};

char lower(char c) { return (c >= 'A' && c <= 'Z') ? static_cast<char>(c - 'A' + 'a') : c; }

bool same_name(std::string_view a, std::string_view b) {
  return std::equal(a.begin(), a.end(), b.begin(), b.end(),
                    [](char x, char y) { return lower(x) == lower(y); });
}

bool is_one_of(std::string_view name, std::span<const std::string_view> names) {
  return std::any_of(names.begin(), names.end(),
                     [&](std::string_view n) { return same_name(name, n); });
}

char detect_separator(std::string_view line, std::size_t& count) {
  std::size_t commas = 0;
  std::size_t semicolons = 0;
  bool quoted = false;
  for (const char c : line) {
    if (c == '"') quoted = !quoted;
    if (quoted) continue;
    commas += c == ',' ? 1 : 0;
    semicolons += c == ';' ? 1 : 0;
  }
  count = std::max(commas, semicolons);
  return semicolons > commas ? ';' : ',';
}

Error header_error(std::string_view what, std::string_view line) {
  constexpr std::size_t kQuoted = 200;
  return Error{"no recognisable header: " + std::string(what) + " (header: '" +
               std::string(line.substr(0, kQuoted)) + "')"};
}

// Long form when the non-time, non-ignored columns are exactly tag, value[, quality].
bool assign_long_form(std::span<const std::string_view> names,
                      std::span<const std::size_t> candidates, HistoryHeader& header) {
  if (candidates.size() != 2 && candidates.size() != 3) return false;
  std::optional<std::size_t> tag, value, quality;
  for (const std::size_t i : candidates) {
    if (same_name(names[i], "tag") && !tag) {
      tag = i;
    } else if (same_name(names[i], "value") && !value) {
      value = i;
    } else if (same_name(names[i], "quality") && !quality) {
      quality = i;
    } else {
      return false;
    }
  }
  if (!tag || !value) return false;
  header.layout = HistoryLayout::long_form;
  header.tag_index = *tag;
  header.value_index = *value;
  header.has_quality = quality.has_value();
  header.quality_index = quality.value_or(0);
  return true;
}

}  // namespace

Result<HistoryHeader> parse_history_header(std::string_view line,
                                           const std::vector<std::string>& ignore_columns) {
  HistoryHeader header;
  std::size_t separators = 0;
  header.separator = detect_separator(line, separators);
  if (separators == 0) return header_error("expected columns separated by ',' or ';'", line);

  std::vector<std::string_view> names(separators + 1);
  header.field_count = split_fields(line, header.separator, names);
  names.resize(header.field_count);
  for (std::string_view& name : names) name = tidy_field(name);

  std::optional<std::size_t> time_index;
  std::vector<std::size_t> candidates;
  for (std::size_t i = 0; i < names.size(); ++i) {
    if (names[i].empty()) {
      return header_error("column " + std::to_string(i + 1) + " has no name", line);
    }
    for (std::size_t j = 0; j < i; ++j) {
      if (same_name(names[i], names[j])) {
        return header_error("column name '" + std::string(names[i]) + "' appears twice", line);
      }
    }
    const bool ignored = std::any_of(ignore_columns.begin(), ignore_columns.end(),
                                     [&](const std::string& n) { return same_name(names[i], n); });
    if (ignored) {
      header.ignored.emplace_back(names[i]);
    } else if (!time_index && is_one_of(names[i], kTimeNames)) {
      time_index = i;
    } else {
      candidates.push_back(i);
    }
  }
  if (!time_index) return header_error("no column named time, timestamp or datetime", line);
  header.time_index = *time_index;

  if (assign_long_form(names, candidates, header)) return header;
  if (candidates.empty()) return header_error("no tag columns besides the time", line);
  header.layout = HistoryLayout::wide_form;
  for (const std::size_t i : candidates) header.tag_columns.push_back({i, std::string(names[i])});
  return header;
}

}  // namespace bw::io
