// What reading a history file found: its detected shape, counts, and the rows it had to reject.
//
// Filled in by read_history (io/history_csv.h). Plain data; copy freely.
#pragma once

#include <cstddef>
#include <map>
#include <string>
#include <string_view>
#include <vector>

namespace bw::io {

enum class HistoryLayout {
  long_form,  // one sample per row: time, tag, value[, quality]
  wide_form,  // one row per time, one column per tag
};

// Why a row (or, in the wide form, one cell) was rejected. The names are the keys of
// HistoryStats::rejected_by_reason and appear in summaries; keep them stable.
enum class RowProblemKind {
  bad_time,           // time field is neither ISO 8601 nor epoch seconds
  no_time_zone,       // local time (no offset) but the caller named no time zone
  bad_value,          // value is not a number (or out of the range of double)
  not_finite,         // value is NaN or infinite
  bad_quality,        // quality is not good/uncertain/bad or a number 0-65535
  empty_tag,          // long form: the tag field is empty
  wrong_field_count,  // the row has more or fewer fields than the header
  time_backwards,     // earlier than the previous accepted time (see history_csv.h)
};
inline constexpr std::size_t kRowProblemKinds = 8;

std::string_view problem_name(RowProblemKind kind);

struct RowProblem {
  std::size_t line = 0;  // 1-based line number in the file; the header is line 1
  std::string reason;    // problem_name() of the kind
  std::string column;    // wide form cell problems: the tag column; else empty
  std::string text;      // the offending field (the whole row for wrong_field_count and
                         // empty_tag), at most kMaxProblemText bytes, control bytes as '?'
};
inline constexpr std::size_t kMaxProblemText = 80;

struct HistoryStats {
  HistoryLayout layout = HistoryLayout::long_form;
  char separator = ',';
  bool has_quality_column = false;           // long form only
  std::vector<std::string> tags;             // wide form: the tag columns; long form: tags seen,
                                             // in order of first appearance
  std::vector<std::string> ignored_columns;  // header names skipped at the caller's request
  std::string time_zone;                     // the zone local times were read in ("" if none)

  std::size_t lines = 0;        // lines read, header included
  std::size_t blank_lines = 0;  // empty (or all-blank) lines, skipped without complaint
  std::size_t samples = 0;      // samples delivered to the visitor
  std::size_t rejected = 0;     // problems counted (rows; in the wide form, also single cells)
  std::map<std::string, std::size_t> rejected_by_reason;  // only reasons that occurred
  std::vector<RowProblem> first_problems;  // the first max_reported_problems, in file order

  std::size_t local_times = 0;              // rows whose time had no offset (read in time_zone)
  std::size_t ambiguous_local_times = 0;    // ... of which fell in a repeated hour
  std::size_t nonexistent_local_times = 0;  // ... of which fell in a skipped hour
  bool stopped_early = false;               // strict mode stopped at the first problem
};

// A few lines for a person: what was detected, what was read, what was rejected and why, e.g.
//   "plant.csv: wide form (4 tag columns), separator ';', 1148 lines, 4588 samples, 0 rejected;
//    times without offset were read as America/Chicago (1147 rows, 0 ambiguous, 0 nonexistent)"
std::string describe(const HistoryStats& stats, std::string_view label);

}  // namespace bw::io
