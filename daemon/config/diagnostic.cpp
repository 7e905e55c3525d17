#include "config/diagnostic.h"

namespace bw::config {

std::string format_diagnostic(const Diagnostic& d) {
  std::string out = d.file;
  if (d.line > 0) {
    out += ':' + std::to_string(d.line);
    if (d.column > 0) out += ':' + std::to_string(d.column);
  }
  out += ": " + d.message;
  if (d.line <= 0 || d.source_line.empty()) return out;
  out += "\n    " + d.source_line;
  if (d.column <= 0) return out;
  out += "\n    ";
  // Copy tabs so that the caret lines up however the terminal expands them.
  const auto before = static_cast<std::size_t>(d.column - 1);
  for (std::size_t i = 0; i < before; ++i) {
    out += i < d.source_line.size() && d.source_line[i] == '\t' ? '\t' : ' ';
  }
  out += '^';
  return out;
}

}  // namespace bw::config
