// Streaming reader for history files (CSV) that replay feeds into the engine.
//
// Two layouts are recognised from the header row (see io/history_header.h for the rules):
//   long form:  time,tag,value[,quality]           one sample per row
//   wide form:  time,<tag>,<tag>,...               one row per time, one column per tag; an empty
//                                                  cell means "no sample of that tag in this row"
// Separator ',' or ';' (from the header), LF or CRLF line ends, an optional UTF-8 byte-order
// mark, a last line with or without a line end, double-quoted header names. Blank lines are
// skipped and counted.
//
// Fields:
// - time: ISO 8601 with or without an offset, or epoch seconds when the field is a plain number
//   (io/time_parse.h). A time without an offset is local time in options.time_zone, resolved by
//   io/local_time_zone.h (ambiguous -> earlier instant; nonexistent -> moved forward by the gap)
//   and counted in the stats; without a time zone such rows are rejected (no_time_zone).
// - value: a decimal number as std::from_chars reads it; NaN and infinities are rejected.
// - quality (long form, optional column): good / uncertain / bad in any case, or the numeric
//   quality word of OPC-style sources (0-65535), judged by the top two bits of its low byte:
//   11 good, 01 and 10 uncertain, 00 bad (i.e. low byte >= 192 good, 64-191 uncertain, < 64
//   bad). An empty field is good. Wide-form samples are always good.
//
// Order: samples must not go back in time. Long form: per tag, a sample earlier than that tag's
// previous accepted sample is rejected; an EQUAL time is accepted (historians with one-second
// resolution legitimately write two values in the same second). Wide form: all tags of a row
// share its time, so the check is per row against the previous accepted row.
//
// Bad rows are counted by reason, the first options.max_reported_problems are kept with their
// line numbers, and reading goes on; in the wide form a bad cell rejects only that cell, while a
// bad time or field count rejects the row. With options.strict, reading stops at the first
// problem and stats.stopped_early is set.
//
// Speed: the text is scanned in place (a file is memory-mapped); fields are views, numbers are
// parsed with std::from_chars and times by hand, and nothing is allocated per row except the
// first time a long-form tag is seen and for the few problems that are kept.
//
// Thread safety: each call is independent; the visitor is called on the caller's thread.
#pragma once

#include <cstddef>
#include <filesystem>
#include <string>
#include <string_view>
#include <vector>

#include "core/result.h"
#include "engine/sample.h"
#include "io/history_stats.h"

namespace bw::io {

struct HistoryOptions {
  std::string time_zone;                    // IANA name for times without an offset ("" = none)
  std::vector<std::string> ignore_columns;  // label columns to skip (e.g. "anomaly", "class")
  bool strict = false;                      // stop at the first bad row
  std::size_t max_reported_problems = 10;   // how many problems to keep in first_problems
};

class SampleVisitor {
 public:
  virtual ~SampleVisitor() = default;
  // `s.tag` is valid only during the call.
  virtual void on_sample(const engine::Sample& s) = 0;
};

// Reads the whole file, calling visitor.on_sample for each good sample in file order (row by
// row; within a wide row, left to right). Fails only when the file cannot be read, the time zone
// is unknown, or the file has no recognisable header; bad rows are reported in the stats.
Result<HistoryStats> read_history(const std::filesystem::path& file, const HistoryOptions& options,
                                  SampleVisitor& visitor);

// The same, from text in memory; `label` names it in error messages.
Result<HistoryStats> read_history_text(std::string_view text, std::string_view label,
                                       const HistoryOptions& options, SampleVisitor& visitor);

}  // namespace bw::io
