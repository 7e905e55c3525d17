#include "config/template_library.h"

#include <algorithm>
#include <system_error>
#include <variant>

#include "config/field_reader.h"
#include "config/yaml_document.h"

namespace bw::config {

namespace fs = std::filesystem;

TemplateLibrary::TemplateLibrary(std::vector<fs::path> folders) : folders_(std::move(folders)) {}

const TemplateLibrary::Entry* TemplateLibrary::find(std::string_view name,
                                                    std::vector<Diagnostic>& diagnostics) {
  // Only identifiers, so that a template name can never walk out of the folders.
  if (!is_identifier(name)) return nullptr;
  if (auto it = entries_.find(name); it != entries_.end()) return it->second.get();
  for (const auto& folder : folders_) {
    const fs::path file = folder / (std::string(name) + ".yaml");
    std::error_code ec;
    if (!fs::is_regular_file(file, ec)) continue;
    const std::string label = file.lexically_normal().string();
    auto text = read_text_file(file);
    if (!text) {
      diagnostics.push_back(Diagnostic{label, 0, 0, text.error().message, {}});
      auto entry = std::make_unique<Entry>(Entry{SourceText(label, ""), std::nullopt});
      return entries_.emplace(std::string(name), std::move(entry)).first->second.get();
    }
    auto entry = std::make_unique<Entry>(Entry{SourceText(label, text.value()), std::nullopt});
    auto parsed = parse_yaml(entry->source);
    if (auto* error = std::get_if<Diagnostic>(&parsed)) {
      diagnostics.push_back(std::move(*error));
    } else {
      entry->rule = read_template(std::get<ConfigNode>(parsed), entry->source, name, diagnostics);
    }
    return entries_.emplace(std::string(name), std::move(entry)).first->second.get();
  }
  return nullptr;
}

std::vector<std::string> TemplateLibrary::available_names() const {
  std::vector<std::string> names;
  for (const auto& folder : folders_) {
    std::error_code ec;
    for (fs::directory_iterator it(folder, ec), end; !ec && it != end; it.increment(ec)) {
      if (it->path().extension() == ".yaml") names.push_back(it->path().stem().string());
    }
  }
  std::sort(names.begin(), names.end());
  names.erase(std::unique(names.begin(), names.end()), names.end());
  return names;
}

const SourceText* TemplateLibrary::source_for(std::string_view label) const {
  for (const auto& [name, entry] : entries_) {
    if (entry->source.label() == label) return &entry->source;
  }
  return nullptr;
}

}  // namespace bw::config
