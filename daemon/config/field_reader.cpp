#include "config/field_reader.h"

#include <cctype>

#include "config/quantity.h"

namespace bw::config {

bool Bounds::contains(double value) const {
  if (min && (min_open ? value <= *min : value < *min)) return false;
  if (max && (max_open ? value >= *max : value > *max)) return false;
  return true;
}

std::string Bounds::describe() const {
  if (min && max) {
    return "in " + std::string(min_open ? "(" : "[") + format_number(*min) + ", " +
           format_number(*max) + (max_open ? ")" : "]");
  }
  if (min) return (min_open ? "> " : ">= ") + format_number(*min);
  if (max) return (max_open ? "< " : "<= ") + format_number(*max);
  return "any number";
}

bool is_identifier(std::string_view name) {
  if (name.empty() || std::isdigit(static_cast<unsigned char>(name.front()))) return false;
  for (char c : name) {
    if (!std::isalnum(static_cast<unsigned char>(c)) && c != '_') return false;
  }
  return true;
}

FieldReader::FieldReader(const SourceText& source, std::vector<Diagnostic>& diagnostics,
                         ParameterValues parameters, std::string parameter_scope,
                         TableValues tables)
    : source_(source),
      diagnostics_(diagnostics),
      parameters_(std::move(parameters)),
      parameter_scope_(std::move(parameter_scope)),
      tables_(std::move(tables)) {}

void FieldReader::error(int line, int column, std::string message) {
  diagnostics_.push_back(source_.at(line, column, std::move(message)));
}

std::string FieldReader::describe(const ConfigNode& node) {
  if (node.is_scalar()) return "'" + node.text + "'";
  return std::string(kind_name(node.kind));
}

bool FieldReader::expect_map(const ConfigNode& node, std::string_view what) {
  if (node.is_map()) return true;
  error(node, std::string(what) + ": expected a mapping of keys, got " + describe(node));
  return false;
}

std::vector<const MapEntry*> FieldReader::report_repeats(const ConfigNode& map,
                                                         std::string_view what) {
  std::vector<const MapEntry*> unique;
  std::map<std::string_view, const MapEntry*> seen;
  for (const auto& entry : map.entries) {
    auto [it, inserted] = seen.emplace(entry.key, &entry);
    if (inserted) {
      unique.push_back(&entry);
    } else {
      error(entry, std::string(what) + ": key '" + entry.key +
                       "' is written twice (first at line " + std::to_string(it->second->line) +
                       ")");
    }
  }
  return unique;
}

void FieldReader::check_keys(const ConfigNode& map, const std::vector<std::string_view>& allowed,
                             std::string_view what) {
  for (const MapEntry* entry : report_repeats(map, what)) {
    bool known = false;
    for (auto name : allowed) known = known || name == entry->key;
    if (!known) {
      error(*entry, std::string(what) + ": unknown key '" + entry->key + "'" +
                        did_you_mean(entry->key, allowed));
    }
  }
}

std::vector<const MapEntry*> FieldReader::unique_entries(const ConfigNode& map,
                                                         std::string_view what) {
  return report_repeats(map, what);
}

const ConfigNode* FieldReader::require(const ConfigNode& map, std::string_view key,
                                       std::string_view what) {
  if (const ConfigNode* value = map.find(key)) return value;
  error(map, std::string(what) + ": missing required key '" + std::string(key) + "'");
  return nullptr;
}

std::optional<double> FieldReader::number(const ConfigNode& value, std::string_view what,
                                          const Bounds& bounds, bool duration) {
  const std::string_view expected =
      duration ? "a duration (seconds, or a number with unit s, min, h or d) or a parameter name"
               : "a number or a parameter name";
  if (!value.is_scalar()) {
    error(value,
          std::string(what) + ": expected " + std::string(expected) + ", got " + describe(value));
    return std::nullopt;
  }
  std::optional<double> result = duration ? parse_duration(value.text) : parse_number(value.text);
  std::string origin;
  if (!result) {
    auto parameter = parameters_.find(value.text);
    if (parameter != parameters_.end()) {
      result = parameter->second;
      origin = " (from parameter '" + value.text + "')";
    } else if (is_identifier(value.text)) {
      std::vector<std::string_view> names;
      for (const auto& [name, v] : parameters_) names.push_back(name);
      const std::string scope = parameter_scope_.empty() ? "" : " of " + parameter_scope_;
      error(value, std::string(what) + ": '" + value.text + "' names no parameter" + scope +
                       did_you_mean(value.text, names));
      return std::nullopt;
    } else {
      error(value,
            std::string(what) + ": expected " + std::string(expected) + ", got " + describe(value));
      return std::nullopt;
    }
  }
  if (!bounds.contains(*result)) {
    error(value, std::string(what) + ": must be " + bounds.describe() + ", got " +
                     format_number(*result) + origin);
    return std::nullopt;
  }
  return result;
}

std::optional<bool> FieldReader::flag(const ConfigNode& value, std::string_view what) {
  if (value.is_scalar() && value.text == "true") return true;
  if (value.is_scalar() && value.text == "false") return false;
  error(value, std::string(what) + ": expected true or false, got " + describe(value));
  return std::nullopt;
}

std::optional<std::string> FieldReader::text(const ConfigNode& value, std::string_view what) {
  if (value.is_scalar() && !value.text.empty()) return value.text;
  error(value, std::string(what) + ": expected a non-empty text, got " + describe(value));
  return std::nullopt;
}

std::optional<std::vector<std::string>> FieldReader::text_list(const ConfigNode& value,
                                                               std::string_view what) {
  if (!value.is_sequence() || value.items.empty()) {
    error(value,
          std::string(what) + ": expected a non-empty list such as [a, b], got " + describe(value));
    return std::nullopt;
  }
  std::vector<std::string> out;
  bool ok = true;
  for (const auto& item : value.items) {
    auto one = text(item, what);
    ok = ok && one.has_value();
    if (one) out.push_back(std::move(*one));
  }
  if (!ok) return std::nullopt;
  return out;
}

}  // namespace bw::config
