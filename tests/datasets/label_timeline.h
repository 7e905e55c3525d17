// The expert labels of one open-dataset file, read from the file's own label column, as a time
// line that answers "was this instant inside the labelled fault?".
//
// Times are the file's local times read as UTC (the evaluation sites use time zone Etc/UTC, so
// alert times and file times compare directly), in whole seconds since 1970 (fractions of a
// second are dropped; both datasets sample at 1 s on whole seconds).
//
// SKAB (';' separated): column `anomaly`, 1 = fault, 0 = normal. Each file has one contiguous
// fault window.
// 3W (',' separated): column `class`, 0 = normal; 102 / 106 = transient and 2 / 6 = steady state
// of the fault; empty = unlabelled (the rows between the normal period and the transient). The
// fault runs from the first transient row (the onset) to the end of the file.
#pragma once

#include <cstdint>
#include <filesystem>
#include <string_view>
#include <utility>
#include <vector>

#include "core/result.h"

namespace bw::datasets {

enum class Label { normal, fault, unlabelled };

struct LabelTimeline {
  std::vector<std::pair<std::int64_t, Label>> rows;  // (time, label) in file order
  std::int64_t start = 0;                            // time of the first row
  std::int64_t onset = 0;                            // time of the first fault row
  std::int64_t fault_end = 0;                        // time of the last fault row
  std::int64_t largest_step = 0;  // longest spacing between consecutive rows, seconds

  // The label of the last row at or before t (the first row's label before the file starts).
  Label label_at(std::int64_t t) const;
};

// "YYYY-MM-DD hh:mm:ss" with ' ' or 'T' between date and time; anything after the seconds (a
// fraction, 'Z') is ignored. Fails on anything else.
Result<std::int64_t> parse_time(std::string_view text);

Result<LabelTimeline> read_skab_labels(const std::filesystem::path& file);
Result<LabelTimeline> read_3w_labels(const std::filesystem::path& file);

}  // namespace bw::datasets
