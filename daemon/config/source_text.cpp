#include "config/source_text.h"

#include <cerrno>
#include <cstring>
#include <fstream>
#include <sstream>

namespace bw::config {

SourceText::SourceText(std::string label, std::string_view text)
    : label_(std::move(label)), text_(text) {
  std::string_view rest = text_;
  while (!rest.empty()) {
    const auto end = rest.find('\n');
    std::string_view line = rest.substr(0, end);
    if (!line.empty() && line.back() == '\r') line.remove_suffix(1);
    lines_.push_back(line);
    if (end == std::string_view::npos) break;
    rest.remove_prefix(end + 1);
  }
}

std::string_view SourceText::line(int number) const {
  if (number < 1 || static_cast<std::size_t>(number) > lines_.size()) return {};
  return lines_[static_cast<std::size_t>(number - 1)];
}

Diagnostic SourceText::at(int line_number, int column, std::string message) const {
  return Diagnostic{label_, line_number, column, std::move(message),
                    std::string(line(line_number))};
}

Result<std::string> read_text_file(const std::filesystem::path& path) {
  std::ifstream in(path, std::ios::binary);
  if (!in) {
    return Error{"cannot open '" + path.string() + "': " + std::strerror(errno)};
  }
  std::ostringstream text;
  text << in.rdbuf();
  if (in.bad()) {
    return Error{"cannot read '" + path.string() + "': " + std::strerror(errno)};
  }
  return text.str();
}

}  // namespace bw::config
