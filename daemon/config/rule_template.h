// Rule templates: one asset class per YAML file, instantiated once per asset of a site.
//
// read_template() checks a template's top level and its parameter declarations (identifier
// names; a number parameter's default is a number, or a duration when the unit is "s", and
// min <= default <= max; a table parameter has no default, min or max).
// instantiate_template() builds an asset's inputs, derived signals, estimators, checks and
// periodic records from
// the template with one set of parameter values, checking every key against the schema
// (config/schema.h): unknown keys (with a suggestion), wrong types, values out of bounds, missing
// required keys, parameter references to nothing, and operand counts of derived signals.
// Cross references between signals and estimators are left to engine::analyse_asset().
//
// Both report into the caller's diagnostic list and keep going after an error; what they
// return is complete only when they added no diagnostic. Not thread-safe.
#pragma once

#include <optional>
#include <string>
#include <string_view>
#include <vector>

#include "config/config_node.h"
#include "config/diagnostic.h"
#include "config/field_reader.h"
#include "config/schema.h"
#include "config/source_text.h"
#include "engine/sensor_health.h"
#include "engine/site_model.h"

namespace bw::config {

struct RuleTemplate {
  std::string name;
  std::string description;
  std::vector<ParameterDecl> parameters;
  ConfigNode document;  // the whole file, read again for each asset
};

std::optional<RuleTemplate> read_template(const ConfigNode& document, const SourceText& source,
                                          std::string_view expected_name,
                                          std::vector<Diagnostic>& diagnostics);

// The declared defaults of the number parameters by name.
ParameterValues default_values(const RuleTemplate& rule);

// Every table parameter by name, holding no table (their default).
TableValues default_tables(const RuleTemplate& rule);

// Appends the template's definitions to `asset` (whose name is used in messages), with the
// number parameters `values` and the table parameters `tables`, and the sensor-health tuning of
// its inputs' `health:` blocks (config/health_block.h) to `health`. The default sensor-health
// checks themselves are added by the site loader once tags are bound.
void instantiate_template(const RuleTemplate& rule, const SourceText& source,
                          const ParameterValues& values, const TableValues& tables,
                          engine::AssetSpec& asset, engine::SensorHealthTuning& health,
                          std::vector<Diagnostic>& diagnostics);

}  // namespace bw::config
