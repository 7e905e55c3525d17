// Recognises the header row of a history file: separator, layout and the role of each column.
//
// Rules (names compared without regard to ASCII case, after tidy_field):
// - the separator is ';' when the header has more ';' than ',' outside quotes, else ',';
// - the time column is the first column named "time", "timestamp" or "datetime";
// - columns named in `ignore_columns` are skipped;
// - if the remaining columns are exactly "tag" and "value", optionally with "quality" (any
//   order), the file is in the long form; otherwise every remaining column is a tag (wide form).
// A header fails when it has no separator, no time column, an unnamed or duplicated column, or
// (wide form) no tag column; the message says which and quotes the header.
//
// Thread safety: pure function.
#pragma once

#include <cstddef>
#include <string>
#include <string_view>
#include <vector>

#include "core/result.h"
#include "io/history_stats.h"

namespace bw::io {

struct WideColumn {
  std::size_t index = 0;  // field position in a row
  std::string tag;
};

struct HistoryHeader {
  HistoryLayout layout = HistoryLayout::long_form;
  char separator = ',';
  std::size_t field_count = 0;  // every data row must have exactly this many fields
  std::size_t time_index = 0;
  // Long form only.
  std::size_t tag_index = 0;
  std::size_t value_index = 0;
  bool has_quality = false;
  std::size_t quality_index = 0;
  // Wide form only, in column order.
  std::vector<WideColumn> tag_columns;
  // Header names that were skipped because the caller asked, as written in the file.
  std::vector<std::string> ignored;
};

// `line` is the first line without its line end and without a byte-order mark.
Result<HistoryHeader> parse_history_header(std::string_view line,
                                           const std::vector<std::string>& ignore_columns);

}  // namespace bw::io
