// Reads typed values out of a ConfigNode tree and reports every problem as a Diagnostic.
//
// A FieldReader belongs to one source file. Each read either returns a value or records one
// diagnostic at the offending node and returns nothing, so a caller can keep going and report
// all errors of a file in one pass. `what` arguments name the field for the message, e.g.
// "estimator 'level_shift': key 'k'"; messages then read "<what>: <reason>".
//
// Numeric fields may name a parameter instead of giving a number: the reader looks the name up
// in the parameter values it was given (engineering units; seconds for durations) and checks the
// bounds against the resolved value. A name that is no parameter is reported with the nearest
// parameter name, if one is close. Table parameters (strapping tables) are held apart, by name;
// config/strapping_table_reader.h resolves references to them.
//
// Not thread-safe (appends to the caller's diagnostic list).
#pragma once

#include <functional>
#include <map>
#include <optional>
#include <span>
#include <string>
#include <string_view>
#include <utility>
#include <vector>

#include "config/config_node.h"
#include "config/diagnostic.h"
#include "config/nearest_name.h"
#include "config/source_text.h"
#include "core/tank_geometry.h"

namespace bw::config {

// Parameter values by name: engineering units, seconds for durations.
using ParameterValues = std::map<std::string, double, std::less<>>;
// Table parameter values by name; an empty optional is a table parameter given no table.
using TableValues = std::map<std::string, std::optional<core::StrappingTable>, std::less<>>;

// Allowed interval for a number; an unset end is unbounded.
struct Bounds {
  std::optional<double> min = std::nullopt;
  bool min_open = false;  // true: min itself is not allowed
  std::optional<double> max = std::nullopt;
  bool max_open = false;

  bool contains(double value) const;
  std::string describe() const;  // e.g. ">= 0", "> 0", "in (0, 1]"
};

inline constexpr Bounds kAnyValue{};
inline constexpr Bounds kNonNegative{.min = 0.0};
inline constexpr Bounds kPositive{.min = 0.0, .min_open = true};
inline constexpr Bounds kUnitInterval{.min = 0.0, .min_open = true, .max = 1.0};

// Letters, digits and '_', not starting with a digit.
bool is_identifier(std::string_view name);

class FieldReader {
 public:
  // `parameter_scope` names where parameters come from, for messages ("template 'tank_level'").
  FieldReader(const SourceText& source, std::vector<Diagnostic>& diagnostics,
              ParameterValues parameters = {}, std::string parameter_scope = {},
              TableValues tables = {});

  const SourceText& source() const { return source_; }
  const std::string& parameter_scope() const { return parameter_scope_; }
  const TableValues& tables() const { return tables_; }
  std::size_t error_count() const { return diagnostics_.size(); }

  void error(int line, int column, std::string message);
  void error(const ConfigNode& at, std::string message) {
    error(at.line, at.column, std::move(message));
  }
  void error(const MapEntry& at, std::string message) {
    error(at.line, at.column, std::move(message));
  }

  // Records an error unless `node` is a mapping.
  bool expect_map(const ConfigNode& node, std::string_view what);

  // Reports keys not in `allowed` (suggesting the nearest) and keys written more than once.
  void check_keys(const ConfigNode& map, const std::vector<std::string_view>& allowed,
                  std::string_view what);

  // The entries of a mapping of names (assets, signals, tag bindings...) with every name written
  // once; repeats are reported and skipped. `what` names the mapping ("asset list").
  std::vector<const MapEntry*> unique_entries(const ConfigNode& map, std::string_view what);

  // The value of `key`, or an error at the mapping when it is missing.
  const ConfigNode* require(const ConfigNode& map, std::string_view key, std::string_view what);

  std::optional<double> number(const ConfigNode& value, std::string_view what, const Bounds& bounds,
                               bool duration);
  std::optional<bool> flag(const ConfigNode& value, std::string_view what);
  std::optional<std::string> text(const ConfigNode& value, std::string_view what);
  std::optional<std::vector<std::string>> text_list(const ConfigNode& value, std::string_view what);

  template <class E>
  std::optional<E> choice(const ConfigNode& value, std::string_view what,
                          std::span<const std::pair<std::string_view, E>> names) {
    std::vector<std::string_view> valid;
    for (const auto& [name, e] : names) {
      if (value.is_scalar() && value.text == name) return e;
      valid.push_back(name);
    }
    std::string list;
    for (auto name : valid) list += (list.empty() ? "" : ", ") + std::string(name);
    error(value, std::string(what) + ": expected one of " + list + ", got " + describe(value) +
                     (value.is_scalar() ? did_you_mean(value.text, valid) : ""));
    return std::nullopt;
  }

  // "'text'" for a scalar, else "a list" / "a mapping" / "nothing".
  static std::string describe(const ConfigNode& node);

 private:
  std::vector<const MapEntry*> report_repeats(const ConfigNode& map, std::string_view what);

  const SourceText& source_;
  std::vector<Diagnostic>& diagnostics_;
  ParameterValues parameters_;
  std::string parameter_scope_;
  TableValues tables_;
};

}  // namespace bw::config
