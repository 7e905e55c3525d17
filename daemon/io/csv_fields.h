// Splitting one line of a delimited text file into fields, and tidying a field.
//
// Deliberately simple: the history files brinewatch reads never need separators or line breaks
// inside a field, so a double quote is only stripped from the two ends of a field; it does not
// protect a separator. All functions return views into the caller's line and never allocate.
//
// Thread safety: pure functions.
#pragma once

#include <cstddef>
#include <cstring>
#include <span>
#include <string_view>

namespace bw::io {

// Splits `line` at every `separator` into `out`. Returns the number of fields in the line, which
// may be larger than out.size(): only the first out.size() fields are stored, so a caller that
// passes one slot more than it expects can tell "too many" from "just right" without scanning
// twice. An empty line has one (empty) field.
inline std::size_t split_fields(std::string_view line, char separator,
                                std::span<std::string_view> out) {
  std::size_t count = 0;
  const char* p = line.data();
  const char* const end = p + line.size();
  while (true) {
    const void* hit = std::memchr(p, separator, static_cast<std::size_t>(end - p));
    const char* stop = hit != nullptr ? static_cast<const char*>(hit) : end;
    if (count < out.size()) out[count] = std::string_view(p, static_cast<std::size_t>(stop - p));
    ++count;
    if (stop == end) return count;
    p = stop + 1;
  }
}

// Removes ASCII spaces and tabs at both ends, then one pair of enclosing double quotes.
inline std::string_view tidy_field(std::string_view field) {
  constexpr std::string_view kBlank = " \t";
  const std::size_t first = field.find_first_not_of(kBlank);
  if (first == std::string_view::npos) return {};
  field = field.substr(first, field.find_last_not_of(kBlank) - first + 1);
  if (field.size() >= 2 && field.front() == '"' && field.back() == '"') {
    field = field.substr(1, field.size() - 2);
  }
  return field;
}

}  // namespace bw::io
