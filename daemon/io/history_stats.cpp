#include "io/history_stats.h"

#include <array>
#include <cassert>
#include <cstddef>
#include <string>

namespace bw::io {
namespace {

constexpr std::array<std::string_view, kRowProblemKinds> kProblemNames = {
    "bad_time",    "no_time_zone", "bad_value",         "not_finite",
    "bad_quality", "empty_tag",    "wrong_field_count", "time_backwards",
};

std::string count(std::size_t n, std::string_view noun) {
  return std::to_string(n) + " " + std::string(noun);
}

std::string separator_name(char separator) {
  return separator == '\t' ? std::string("tab") : "'" + std::string(1, separator) + "'";
}

}  // namespace

std::string_view problem_name(RowProblemKind kind) {
  const auto index = static_cast<std::size_t>(kind);
  assert(index < kProblemNames.size());
  return kProblemNames[index];
}

std::string describe(const HistoryStats& stats, std::string_view label) {
  std::string out(label);
  if (stats.layout == HistoryLayout::wide_form) {
    out += ": wide form (" + count(stats.tags.size(), "tag columns") + ")";
  } else {
    out += ": long form (" + count(stats.tags.size(), "tags") +
           (stats.has_quality_column ? ", with quality column)" : ")");
  }
  out += ", separator " + separator_name(stats.separator) + ", " + count(stats.lines, "lines") +
         ", " + count(stats.samples, "samples") + ", " + count(stats.rejected, "rejected");
  if (stats.blank_lines > 0) out += ", " + count(stats.blank_lines, "blank lines skipped");
  if (!stats.ignored_columns.empty()) {
    out += "; ignored columns:";
    for (const std::string& name : stats.ignored_columns) out += " " + name;
  }
  if (stats.local_times > 0) {
    out += "; times without offset were read as " + stats.time_zone + " (" +
           count(stats.local_times, "rows") + ", " +
           count(stats.ambiguous_local_times, "ambiguous (earlier instant taken)") + ", " +
           count(stats.nonexistent_local_times, "nonexistent (moved forward by the gap)") + ")";
  }
  if (stats.stopped_early) out += "; strict mode: stopped at the first bad row";
  for (const auto& [reason, n] : stats.rejected_by_reason) {
    out += "\n  rejected " + reason + ": " + std::to_string(n);
  }
  for (const RowProblem& p : stats.first_problems) {
    out += "\n  line " + std::to_string(p.line) + ": " + p.reason;
    if (!p.column.empty()) out += " in column " + p.column;
    out += ": '" + p.text + "'";
  }
  return out;
}

}  // namespace bw::io
