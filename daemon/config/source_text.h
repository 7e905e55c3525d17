// The text of one configuration file, kept so that diagnostics can quote the offending line.
//
// A SourceText is immutable after construction. `label` is the name diagnostics print: the path
// the file was opened with, or any label a caller gives to text that came from elsewhere.
#pragma once

#include <filesystem>
#include <string>
#include <string_view>
#include <vector>

#include "config/diagnostic.h"
#include "core/result.h"

namespace bw::config {

class SourceText {
 public:
  SourceText(std::string label, std::string_view text);

  const std::string& label() const { return label_; }
  const std::string& text() const { return text_; }

  // The 1-based line without its line ending; empty when out of range.
  std::string_view line(int number) const;
  int line_count() const { return static_cast<int>(lines_.size()); }

  // A diagnostic at a 1-based position in this text, quoting the line.
  Diagnostic at(int line, int column, std::string message) const;

 private:
  std::string label_;
  std::string text_;
  std::vector<std::string_view> lines_;  // views into text_
};

// Reads a whole file. The error names the file and the operating system's reason.
Result<std::string> read_text_file(const std::filesystem::path& path);

}  // namespace bw::config
