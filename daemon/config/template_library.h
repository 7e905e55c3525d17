// Finds rule templates by name in an ordered list of folders and reads each file at most once.
//
// A template named N is the file N.yaml in the first folder that has one. A file that cannot be
// read, does not parse or fails read_template() is reported once, on the lookup that first
// reads it; later lookups return the same entry without a rule. Entries live as long as the
// library and never move, so references to their SourceText stay valid. Not thread-safe.
#pragma once

#include <filesystem>
#include <map>
#include <memory>
#include <optional>
#include <string>
#include <string_view>
#include <vector>

#include "config/diagnostic.h"
#include "config/rule_template.h"
#include "config/source_text.h"

namespace bw::config {

class TemplateLibrary {
 public:
  struct Entry {
    SourceText source;
    std::optional<RuleTemplate> rule;  // nothing when the file is unusable
  };

  explicit TemplateLibrary(std::vector<std::filesystem::path> folders);
  TemplateLibrary(const TemplateLibrary&) = delete;
  TemplateLibrary& operator=(const TemplateLibrary&) = delete;

  // nullptr when no folder has the template (or the name is not an identifier).
  const Entry* find(std::string_view name, std::vector<Diagnostic>& diagnostics);

  // Names of all templates in all folders, sorted, for suggestions.
  std::vector<std::string> available_names() const;

  // The text of a template file already read, by its label; nullptr if none.
  const SourceText* source_for(std::string_view label) const;

  const std::vector<std::filesystem::path>& folders() const { return folders_; }

 private:
  std::vector<std::filesystem::path> folders_;
  std::map<std::string, std::unique_ptr<Entry>, std::less<>> entries_;  // by template name
};

}  // namespace bw::config
