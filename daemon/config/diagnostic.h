// A configuration error with its position, and how it is shown to a person.
//
// Every diagnostic the loader produces names the file, the 1-based line and column of the
// offending text, and what was expected. `source_line` holds the offending line as written (no
// newline) so that a diagnostic can be printed without reopening the file; it is empty when the
// position is unknown (line 0) or the error concerns the file as a whole.
#pragma once

#include <string>

namespace bw::config {

struct Diagnostic {
  std::string file;
  int line = 0;    // 1-based; 0 = the file as a whole
  int column = 0;  // 1-based; 0 = the line as a whole
  std::string message;
  std::string source_line;

  friend bool operator==(const Diagnostic&, const Diagnostic&) = default;
};

// "file:line:col: message", then the source line and a caret under the column, e.g.
//   site.yaml:7:5: asset 'tank_1': key 'tag': unknown key; did you mean 'tags'?
//       tag: {level: DC4.TK1.LEVEL}
//       ^
// Without a position: "file: message". The result ends without a newline.
std::string format_diagnostic(const Diagnostic& diagnostic);

}  // namespace bw::config
