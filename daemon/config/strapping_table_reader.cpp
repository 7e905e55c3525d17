#include "config/strapping_table_reader.h"

#include <string>

#include "config/nearest_name.h"
#include "config/quantity.h"
#include "config/source_text.h"

namespace bw::config {
namespace {

std::string_view trim(std::string_view text) {
  const auto first = text.find_first_not_of(" \t\r");
  if (first == std::string_view::npos) return {};
  const auto last = text.find_last_not_of(" \t\r");
  return text.substr(first, last - first + 1);
}

// One CSV field: its text (trimmed) and its 1-based column in the line.
struct Field {
  std::string_view text;
  int column = 1;
};

std::vector<Field> split_fields(std::string_view line) {
  std::vector<Field> fields;
  std::size_t start = 0;
  while (true) {
    const std::size_t comma = line.find(',', start);
    const std::string_view raw = line.substr(
        start, comma == std::string_view::npos ? std::string_view::npos : comma - start);
    const std::string_view text = trim(raw);
    const std::size_t offset =
        text.empty() ? 0 : static_cast<std::size_t>(text.data() - raw.data());
    fields.push_back({text, static_cast<int>(start + offset + 1)});
    if (comma == std::string_view::npos) return fields;
    start = comma + 1;
  }
}

bool is_two_numbers(const std::vector<Field>& fields) {
  return fields.size() == 2 && parse_number(fields[0].text) && parse_number(fields[1].text);
}

constexpr std::string_view kColumns = "level (ft), volume (bbl)";

}  // namespace

std::optional<core::StrappingTable> read_inline_table(FieldReader& reader, const ConfigNode& list,
                                                      std::string_view what) {
  const std::string label(what);
  if (!list.is_sequence()) {
    reader.error(list, label + ": expected a list of [level, volume] pairs, got " +
                           FieldReader::describe(list));
    return std::nullopt;
  }
  std::vector<core::StrappingTable::Point> points;
  bool ok = true;
  for (std::size_t i = 0; i < list.items.size(); ++i) {
    const ConfigNode& pair = list.items[i];
    const std::string where = label + ": pair " + std::to_string(i + 1);
    if (!pair.is_sequence() || pair.items.size() != 2) {
      reader.error(
          pair,
          where + ": expected [level, volume], got " + FieldReader::describe(pair) +
              (pair.is_sequence() ? " of " + std::to_string(pair.items.size()) + " values" : ""));
      ok = false;
      continue;
    }
    auto level = reader.number(pair.items[0], where + " level (ft)", kAnyValue, false);
    auto volume = reader.number(pair.items[1], where + " volume (bbl)", kAnyValue, false);
    if (!level || !volume) {
      ok = false;
      continue;
    }
    points.push_back({*level, *volume});
  }
  if (!ok) return std::nullopt;
  if (auto problem = core::StrappingTable::find_problem(points)) {
    if (problem->point >= list.items.size()) {
      reader.error(list, label + ": expected at least 2 [level, volume] pairs, got " +
                             std::to_string(list.items.size()));
    } else {
      reader.error(list.items[problem->point],
                   label + ": pair " + std::to_string(problem->point + 1) + ": " + problem->reason);
    }
    return std::nullopt;
  }
  return core::StrappingTable::create(std::move(points)).value();
}

std::optional<core::StrappingTable> read_table_csv_text(std::string_view label,
                                                        std::string_view text,
                                                        std::vector<Diagnostic>& diagnostics) {
  const SourceText source{std::string(label), text};
  const std::size_t errors_before = diagnostics.size();
  auto error = [&](int line, int column, std::string message) {
    diagnostics.push_back(source.at(line, column, std::move(message)));
  };
  std::vector<core::StrappingTable::Point> points;
  std::vector<int> point_lines;
  bool header_seen = false;
  int last_line = 0;
  for (int number = 1; number <= source.line_count(); ++number) {
    const std::string_view line = trim(source.line(number));
    if (line.empty() || line.front() == '#') continue;
    last_line = number;
    const std::vector<Field> fields = split_fields(source.line(number));
    if (!header_seen) {
      header_seen = true;
      if (is_two_numbers(fields)) {
        error(number, 1,
              "strapping table: expected a header line naming the two columns (" +
                  std::string(kColumns) +
                  "), e.g. 'level_ft,volume_bbl', got numbers; add a "
                  "header so that the first row is not taken for one");
      } else if (fields.size() != 2) {
        error(number, 1,
              "strapping table: expected a header line with 2 columns (" + std::string(kColumns) +
                  "), got " + std::to_string(fields.size()));
      }
      continue;
    }
    if (fields.size() != 2) {
      error(number, 1,
            "strapping table: expected 2 columns (" + std::string(kColumns) + "), got " +
                std::to_string(fields.size()));
      continue;
    }
    auto level = parse_number(fields[0].text);
    auto volume = parse_number(fields[1].text);
    if (!level) {
      error(number, fields[0].column,
            "strapping table: column 1 (level, ft): expected a number, got '" +
                std::string(fields[0].text) + "'");
    }
    if (!volume) {
      error(number, fields[1].column,
            "strapping table: column 2 (volume, bbl): expected a number, got '" +
                std::string(fields[1].text) + "'");
    }
    if (!level || !volume) continue;
    points.push_back({*level, *volume});
    point_lines.push_back(number);
  }
  if (diagnostics.size() != errors_before) return std::nullopt;
  if (auto problem = core::StrappingTable::find_problem(points)) {
    if (problem->point >= points.size()) {
      error(last_line, 0,
            "strapping table: expected at least 2 rows of " + std::string(kColumns) +
                " after the header, got " + std::to_string(points.size()));
    } else {
      error(point_lines[problem->point], 1, "strapping table: " + problem->reason);
    }
    return std::nullopt;
  }
  return core::StrappingTable::create(std::move(points)).value();
}

void read_table_reference(FieldReader& reader, const ConfigNode& value, std::string_view what,
                          std::optional<core::StrappingTable>& out) {
  if (value.is_sequence()) {
    out = read_inline_table(reader, value, what);
    return;
  }
  const std::string label(what);
  if (!value.is_scalar()) {
    reader.error(value, label +
                            ": expected a table parameter name or a list of [level, volume] "
                            "pairs, got " +
                            FieldReader::describe(value));
    return;
  }
  auto table = reader.tables().find(value.text);
  if (table == reader.tables().end()) {
    std::vector<std::string_view> names;
    for (const auto& [name, t] : reader.tables()) names.push_back(name);
    const std::string scope =
        reader.parameter_scope().empty() ? "" : " of " + reader.parameter_scope();
    reader.error(value, label + ": '" + value.text + "' names no table parameter" + scope +
                            did_you_mean(value.text, names));
    return;
  }
  out = table->second;
}

}  // namespace bw::config
