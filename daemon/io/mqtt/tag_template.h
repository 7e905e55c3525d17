// Expanding a tag-name template: literal text with "{name}" placeholders.
//
// Shared by the topic rules (placeholders "{0}", "{1}", ..., "{topic}") and the Sparkplug
// session ("{group}", "{node}", "{device}", "{metric}"); each caller says what its names mean.
//
// Rules: "{" opens a placeholder that runs to the next "}"; there is no escape, so a template
// cannot produce a literal brace. A placeholder that expands to nothing also drops the separator
// that follows it when that separator is the character just written (or when nothing has been
// written yet), so "{group}/{device}/{metric}" with no device gives "g/m", not "g//m".
//
// Thread safety: pure functions.
#pragma once

#include <optional>
#include <string>
#include <string_view>

namespace bw::io::mqtt {

// Calls `lookup(name, out)` for each placeholder; lookup appends the value to `out` and returns
// false for a name it does not know. Returns the expansion, or nullopt when the template is
// malformed (unclosed or empty placeholder, stray '}') or lookup refused a name.
template <class Lookup>
std::optional<std::string> expand_tag_template(std::string_view text, Lookup&& lookup) {
  std::string out;
  out.reserve(text.size() + 32);
  std::size_t i = 0;
  while (i < text.size()) {
    const char c = text[i];
    if (c == '}') return std::nullopt;
    if (c != '{') {
      out.push_back(c);
      ++i;
      continue;
    }
    const std::size_t close = text.find('}', i + 1);
    if (close == std::string_view::npos || close == i + 1) return std::nullopt;
    const std::string_view name = text.substr(i + 1, close - i - 1);
    if (name.find('{') != std::string_view::npos) return std::nullopt;
    const std::size_t before = out.size();
    if (!lookup(name, out)) return std::nullopt;
    i = close + 1;
    const bool empty = out.size() == before;
    if (empty && i < text.size() && (out.empty() || out.back() == text[i])) ++i;
  }
  return out;
}

}  // namespace bw::io::mqtt
