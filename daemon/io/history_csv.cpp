#include "io/history_csv.h"

#include <array>
#include <cstring>
#include <optional>
#include <unordered_map>
#include <utility>

#include "io/csv_fields.h"
#include "io/history_header.h"
#include "io/local_time_zone.h"
#include "io/mapped_file.h"
#include "io/sample_fields.h"
#include "io/time_field.h"
#include "io/time_parse.h"

namespace bw::io {
namespace {

constexpr std::string_view kByteOrderMark = "\xEF\xBB\xBF";

// Hands out the lines of a text, without their LF or CRLF, and counts them.
class LineCursor {
 public:
  explicit LineCursor(std::string_view text) : text_(text) {}

  bool next(std::string_view& line) {
    if (pos_ >= text_.size()) return false;
    const char* start = text_.data() + pos_;
    const std::size_t left = text_.size() - pos_;
    const void* newline = std::memchr(start, '\n', left);
    const std::size_t length =
        newline != nullptr ? static_cast<std::size_t>(static_cast<const char*>(newline) - start)
                           : left;
    line = std::string_view(start, length);
    if (!line.empty() && line.back() == '\r') line.remove_suffix(1);
    pos_ += length + 1;
    ++count_;
    return true;
  }

  std::size_t count() const { return count_; }

 private:
  std::string_view text_;
  std::size_t pos_ = 0;
  std::size_t count_ = 0;
};

bool is_blank(std::string_view line) {
  return line.find_first_not_of(" \t") == std::string_view::npos;
}

std::string printable(std::string_view text) {
  std::string out(text.substr(0, kMaxProblemText));
  for (char& c : out) {
    if (static_cast<unsigned char>(c) < 0x20 || c == 0x7f) c = '?';
  }
  return out;
}

struct TagHash {
  using is_transparent = void;
  std::size_t operator()(std::string_view s) const { return std::hash<std::string_view>{}(s); }
};

// Reads the data rows after the header. One object per read; owns nothing the caller sees but
// the stats it fills.
class RowReader {
 public:
  RowReader(const HistoryHeader& header, const HistoryOptions& options,
            std::optional<LocalTimeZone> zone, SampleVisitor& visitor, HistoryStats& stats)
      : header_(header),
        options_(options),
        zone_(std::move(zone)),
        visitor_(visitor),
        stats_(stats),
        fields_(header.field_count + 1) {}

  void read(LineCursor& lines) {
    std::string_view line;
    while (lines.next(line)) {
      if (is_blank(line)) {
        ++stats_.blank_lines;
        continue;
      }
      const bool go_on = header_.layout == HistoryLayout::long_form
                             ? read_long_row(line, lines.count())
                             : read_wide_row(line, lines.count());
      if (!go_on) break;
    }
    for (std::size_t i = 0; i < counts_.size(); ++i) {
      if (counts_[i] > 0) {
        stats_.rejected_by_reason[std::string(problem_name(static_cast<RowProblemKind>(i)))] =
            counts_[i];
      }
    }
  }

 private:
  // Each returns false when reading must stop (strict mode hit a problem).
  bool read_long_row(std::string_view line, std::size_t line_number) {
    if (split_fields(line, header_.separator, fields_) != header_.field_count) {
      return report(RowProblemKind::wrong_field_count, line_number, {}, line);
    }
    const std::string_view time_field = fields_[header_.time_index];
    core::SensorTime time;
    if (const auto problem = read_time(time_field, time)) {
      return report(*problem, line_number, {}, time_field);
    }
    const std::string_view tag = tidy_field(fields_[header_.tag_index]);
    if (tag.empty()) return report(RowProblemKind::empty_tag, line_number, {}, line);
    double value = 0;
    if (const auto problem = parse_sample_value(fields_[header_.value_index], value)) {
      return report(*problem, line_number, {}, fields_[header_.value_index]);
    }
    engine::Quality quality = engine::Quality::good;
    if (header_.has_quality) {
      const std::string_view field = fields_[header_.quality_index];
      if (const auto problem = parse_sample_quality(field, quality)) {
        return report(*problem, line_number, {}, field);
      }
    }
    core::SensorTime& last = last_time_of(tag, time);
    if (time < last) return report(RowProblemKind::time_backwards, line_number, {}, time_field);
    last = time;
    emit(engine::Sample{tag, time, value, quality});
    return true;
  }

  bool read_wide_row(std::string_view line, std::size_t line_number) {
    if (split_fields(line, header_.separator, fields_) != header_.field_count) {
      return report(RowProblemKind::wrong_field_count, line_number, {}, line);
    }
    const std::string_view time_field = fields_[header_.time_index];
    core::SensorTime time;
    if (const auto problem = read_time(time_field, time)) {
      return report(*problem, line_number, {}, time_field);
    }
    if (last_row_time_ && time < *last_row_time_) {
      return report(RowProblemKind::time_backwards, line_number, {}, time_field);
    }
    last_row_time_ = time;
    for (const WideColumn& column : header_.tag_columns) {
      const std::string_view cell = fields_[column.index];
      if (tidy_field(cell).empty()) continue;
      double value = 0;
      if (const auto problem = parse_sample_value(cell, value)) {
        if (!report(*problem, line_number, column.tag, cell)) return false;
        continue;
      }
      emit(engine::Sample{column.tag, time, value, engine::Quality::good});
    }
    return true;
  }

  // Long-form files usually write several tags per time, so the same time text comes many rows
  // in a row: reuse the last answer instead of parsing and converting again.
  std::optional<RowProblemKind> read_time(std::string_view field, core::SensorTime& out) {
    field = tidy_field(field);
    if (field == last_time_text_ && !last_time_text_.empty()) {
      count_local(last_time_note_);
      out = last_time_;
      return std::nullopt;
    }
    std::optional<ConversionNote> note;
    if (const auto problem = parse_time_field(field, zone_ ? &*zone_ : nullptr, out, note)) {
      return problem;
    }
    count_local(note);
    last_time_text_ = field;
    last_time_ = out;
    last_time_note_ = note;
    return std::nullopt;
  }

  void count_local(std::optional<ConversionNote> note) {
    if (!note) return;
    ++stats_.local_times;
    stats_.ambiguous_local_times += *note == ConversionNote::ambiguous ? 1 : 0;
    stats_.nonexistent_local_times += *note == ConversionNote::nonexistent ? 1 : 0;
  }

  // The previous accepted time of `tag`; a tag seen for the first time starts at `time`.
  core::SensorTime& last_time_of(std::string_view tag, core::SensorTime time) {
    if (last_tag_time_ != nullptr && tag == last_tag_) return *last_tag_time_;
    auto found = last_time_by_tag_.find(tag);
    if (found == last_time_by_tag_.end()) {
      found = last_time_by_tag_.emplace(std::string(tag), time).first;
      stats_.tags.emplace_back(tag);
    }
    last_tag_ = found->first;  // map keys and values never move, so the views stay valid
    last_tag_time_ = &found->second;
    return found->second;
  }

  void emit(const engine::Sample& sample) {
    visitor_.on_sample(sample);
    ++stats_.samples;
  }

  bool report(RowProblemKind kind, std::size_t line_number, std::string_view column,
              std::string_view text) {
    ++stats_.rejected;
    ++counts_[static_cast<std::size_t>(kind)];
    if (stats_.first_problems.size() < options_.max_reported_problems) {
      stats_.first_problems.push_back(RowProblem{line_number, std::string(problem_name(kind)),
                                                 std::string(column), printable(text)});
    }
    stats_.stopped_early = options_.strict;
    return !options_.strict;
  }

  const HistoryHeader& header_;
  const HistoryOptions& options_;
  std::optional<LocalTimeZone> zone_;
  SampleVisitor& visitor_;
  HistoryStats& stats_;
  std::vector<std::string_view> fields_;  // one slot more than the header, to see extra fields
  std::array<std::size_t, kRowProblemKinds> counts_{};

  std::string_view last_time_text_;
  core::SensorTime last_time_;
  std::optional<ConversionNote> last_time_note_;

  std::optional<core::SensorTime> last_row_time_;  // wide form
  std::unordered_map<std::string, core::SensorTime, TagHash, std::equal_to<>>
      last_time_by_tag_;  // long form
  std::string_view last_tag_;
  core::SensorTime* last_tag_time_ = nullptr;
};

}  // namespace

Result<HistoryStats> read_history_text(std::string_view text, std::string_view label,
                                       const HistoryOptions& options, SampleVisitor& visitor) {
  std::optional<LocalTimeZone> zone;
  if (!options.time_zone.empty()) {
    auto found = LocalTimeZone::find(options.time_zone);
    if (!found) return Error{std::string(label) + ": " + found.error().message};
    zone = std::move(found).value();
  }
  if (text.starts_with(kByteOrderMark)) text.remove_prefix(kByteOrderMark.size());
  LineCursor lines(text);
  std::string_view first_line;
  if (!lines.next(first_line)) {
    return Error{std::string(label) + ": empty file, expected a header row"};
  }
  const auto header = parse_history_header(first_line, options.ignore_columns);
  if (!header) return Error{std::string(label) + ": " + header.error().message};

  HistoryStats stats;
  stats.layout = header->layout;
  stats.separator = header->separator;
  stats.has_quality_column = header->has_quality;
  for (const WideColumn& column : header->tag_columns) stats.tags.push_back(column.tag);
  stats.ignored_columns = header->ignored;
  stats.time_zone = options.time_zone;
  RowReader(header.value(), options, std::move(zone), visitor, stats).read(lines);
  stats.lines = lines.count();
  return stats;
}

Result<HistoryStats> read_history(const std::filesystem::path& file, const HistoryOptions& options,
                                  SampleVisitor& visitor) {
  const auto mapped = MappedFile::open(file);
  if (!mapped) return mapped.error();
  return read_history_text(mapped->text(), file.string(), options, visitor);
}

}  // namespace bw::io
