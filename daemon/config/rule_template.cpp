#include "config/rule_template.h"

#include <functional>

#include "config/health_block.h"
#include "config/quantity.h"

namespace bw::config {
namespace {

const std::vector<std::string_view> kTemplateTopKeys{
    "template", "description", "parameters", "inputs", "signals", "estimators", "checks",
    "records"};

// Calls `read` for every uniquely named entry of a section mapping ("inputs", "signals"...),
// with a label such as "signal 'volume'" for messages.
void for_each_named(FieldReader& reader, const ConfigNode* section, std::string_view section_name,
                    std::string_view item_name,
                    const std::function<void(const MapEntry&, const std::string&)>& read) {
  if (section == nullptr || section->kind == ConfigNode::Kind::null) return;
  const std::string what = "'" + std::string(section_name) + "'";
  if (!reader.expect_map(*section, what)) return;
  for (const MapEntry* entry : reader.unique_entries(*section, what)) {
    const std::string label = std::string(item_name) + " '" + entry->key + "'";
    if (!is_identifier(entry->key)) {
      reader.error(*entry, label +
                               ": a name must be letters, digits and '_', not starting "
                               "with a digit");
      continue;
    }
    if (reader.expect_map(entry->value, label)) read(*entry, label);
  }
}

engine::Where where_of(const SourceText& source, const MapEntry& entry) {
  return engine::Where{source.label(), entry.line, entry.column};
}

// The value of `key` if written, else the mapping: where to point for a cross-field error.
const ConfigNode& value_or_map(const ConfigNode& map, std::string_view key) {
  const ConfigNode* value = map.find(key);
  return value != nullptr ? *value : map;
}

// Cross-field rules that a single key's bounds cannot express. Kinds without such rules pass.
template <class Spec>
bool validate(FieldReader&, const ConfigNode&, const Spec&, std::string_view) {
  return true;
}

bool validate(FieldReader& reader, const ConfigNode& map, const engine::CusumSpec& spec,
              std::string_view what) {
  if (spec.head_start >= spec.h) {
    reader.error(
        value_or_map(map, "head_start"),
        std::string(what) + ": key 'head_start': must be below h (" + format_number(spec.h) + ")");
    return false;
  }
  if (spec.max_sum > 0 && spec.max_sum < spec.h) {
    reader.error(value_or_map(map, "max_sum"),
                 std::string(what) + ": key 'max_sum': must be 0 (no clamp) or at least h (" +
                     format_number(spec.h) + "), or the sums could never reach h");
    return false;
  }
  return true;
}

bool validate(FieldReader& reader, const ConfigNode& map, const engine::EpisodeSpec& spec,
              std::string_view what) {
  if (!(spec.end_below < spec.start_above)) {
    reader.error(value_or_map(map, "end_below"),
                 std::string(what) + ": key 'end_below': must be below start_above (" +
                     format_number(spec.start_above) + "), got " + format_number(spec.end_below));
    return false;
  }
  return true;
}

bool validate(FieldReader& reader, const ConfigNode& map, const engine::LimitCheckSpec& spec,
              std::string_view what) {
  if (spec.deadband && spec.deadband_percent) {
    reader.error(value_or_map(map, "deadband_percent"),
                 std::string(what) +
                     ": give the deadband either in engineering units ('deadband') or in percent "
                     "of span ('deadband_percent'), not both");
    return false;
  }
  return true;
}

// Each statistic of a record field takes only the keys it uses.
bool validate(FieldReader& reader, const ConfigNode& map, const engine::RecordFieldSpec& spec,
              std::string_view what) {
  const bool total = spec.stat == engine::RecordStat::total;
  const bool above = spec.stat == engine::RecordStat::time_above;
  struct Rule {
    std::string_view key;
    bool given;
    bool wanted;
    std::string_view why;
  };
  const std::array<Rule, 3> rules{{
      {"rate_per", spec.rate_per_s.has_value(), total,
       "the time unit of the rate, e.g. 1d for a rate in bbl/d"},
      {"unit", !spec.unit.empty(), total, "the unit of the total, e.g. bbl"},
      {"above", spec.above.has_value(), above, "the threshold the time is counted above"},
  }};
  bool ok = true;
  for (const Rule& rule : rules) {
    if (rule.wanted && !rule.given) {
      reader.error(map, std::string(what) + ": stat '" +
                            std::string(kRecordStatNames[static_cast<std::size_t>(spec.stat)].first) +
                            "' needs key '" + std::string(rule.key) + "' (" +
                            std::string(rule.why) + ")");
      ok = false;
    } else if (!rule.wanted && rule.given) {
      reader.error(*map.find(rule.key),
                   std::string(what) + ": key '" + std::string(rule.key) +
                       "' does not apply to stat '" +
                       std::string(kRecordStatNames[static_cast<std::size_t>(spec.stat)].first) +
                       "' (" + std::string(rule.why) + ")");
      ok = false;
    }
  }
  return ok;
}

// Reads one kind of a variant (estimator or check kind) from a mapping that also holds the
// section's common keys `common`.
template <class Variant, class Spec, std::size_t N>
std::optional<Variant> read_kind(FieldReader& reader, const ConfigNode& map,
                                 const std::array<Key<Spec>, N>& keys, std::string_view what,
                                 const std::vector<std::string_view>& common) {
  std::vector<std::string_view> allowed = allowed_keys(keys);
  allowed.insert(allowed.end(), common.begin(), common.end());
  reader.check_keys(map, allowed, what);
  Spec spec;
  if (!read_keys(reader, map, keys, spec, what) || !validate(reader, map, spec, what)) {
    return std::nullopt;
  }
  return Variant(std::move(spec));
}

template <class Variant>
struct KindReader {
  std::string_view name;
  std::optional<Variant> (*read)(FieldReader&, const ConfigNode&, std::string_view);
};

using EstimatorReader = KindReader<engine::EstimatorKind>;
using CheckReader = KindReader<engine::CheckKind>;

template <class Variant, auto& kKeys>
std::optional<Variant> read_kind_of(FieldReader& reader, const ConfigNode& map,
                                    std::string_view what) {
  if constexpr (std::is_same_v<Variant, engine::EstimatorKind>) {
    static const std::vector<std::string_view> common =
        allowed_keys(kEstimatorCommonKeys, {"kind"});
    return read_kind<Variant>(reader, map, kKeys, what, common);
  } else {
    static const std::vector<std::string_view> common = allowed_keys(kCheckCommonKeys, {"kind"});
    return read_kind<Variant>(reader, map, kKeys, what, common);
  }
}

const std::array<EstimatorReader, 9> kEstimatorReaders{{
    {"ewma", &read_kind_of<engine::EstimatorKind, kEwmaKeys>},
    {"cusum", &read_kind_of<engine::EstimatorKind, kCusumKeys>},
    {"ewma_chart", &read_kind_of<engine::EstimatorKind, kEwmaChartKeys>},
    {"rls", &read_kind_of<engine::EstimatorKind, kRlsKeys>},
    {"trend", &read_kind_of<engine::EstimatorKind, kTrendKeys>},
    {"rate", &read_kind_of<engine::EstimatorKind, kRateKeys>},
    {"hall", &read_kind_of<engine::EstimatorKind, kHallKeys>},
    {"filter_life", &read_kind_of<engine::EstimatorKind, kFilterLifeKeys>},
    {"episode", &read_kind_of<engine::EstimatorKind, kEpisodeKeys>},
}};

const std::array<CheckReader, 8> kCheckReaders{{
    {"limit", &read_kind_of<engine::CheckKind, kLimitCheckKeys>},
    {"statistical", &read_kind_of<engine::CheckKind, kStatisticalCheckKeys>},
    {"time_to_limit", &read_kind_of<engine::CheckKind, kTimeToLimitCheckKeys>},
    {"rate", &read_kind_of<engine::CheckKind, kRateCheckKeys>},
    {"stale", &read_kind_of<engine::CheckKind, kStaleCheckKeys>},
    {"flatline", &read_kind_of<engine::CheckKind, kFlatlineCheckKeys>},
    {"out_of_range", &read_kind_of<engine::CheckKind, kOutOfRangeCheckKeys>},
    {"ne43", &read_kind_of<engine::CheckKind, kNe43CheckKeys>},
}};

// Finds the reader named by the mapping's `kind` key and runs it.
template <class Variant, std::size_t N>
std::optional<Variant> read_by_kind(FieldReader& reader, const ConfigNode& map,
                                    const std::array<KindReader<Variant>, N>& readers,
                                    const std::string& what) {
  const ConfigNode* kind = reader.require(map, "kind", what);
  if (kind == nullptr) return std::nullopt;
  std::vector<std::string_view> names;
  for (const auto& r : readers) {
    if (kind->is_scalar() && kind->text == r.name) return r.read(reader, map, what);
    names.push_back(r.name);
  }
  std::string list;
  for (auto name : names) list += (list.empty() ? "" : ", ") + std::string(name);
  reader.error(*kind, what + ": key 'kind': expected one of " + list + ", got " +
                          FieldReader::describe(*kind) +
                          (kind->is_scalar() ? did_you_mean(kind->text, names) : ""));
  return std::nullopt;
}

// One entry of a section whose entries have a name, common keys and a `kind` (estimators,
// checks); nullopt (with diagnostics) when any of it is wrong.
template <class Spec, std::size_t NC, class Variant, std::size_t NR>
std::optional<Spec> read_kinded_entry(FieldReader& reader, const SourceText& source,
                                      const MapEntry& entry, const std::string& what,
                                      const std::array<Key<Spec>, NC>& common,
                                      const std::array<KindReader<Variant>, NR>& readers) {
  Spec spec;
  spec.name = entry.key;
  spec.where = where_of(source, entry);
  const bool common_ok = read_keys(reader, entry.value, common, spec, what);
  auto kind = read_by_kind(reader, entry.value, readers, what);
  if (!common_ok || !kind) return std::nullopt;
  spec.kind = std::move(*kind);
  return spec;
}

void read_parameter(FieldReader& reader, const MapEntry& entry, const std::string& what,
                    RuleTemplate& rule) {
  ParameterDecl decl;
  decl.name = entry.key;
  decl.where = where_of(reader.source(), entry);
  reader.check_keys(entry.value, allowed_keys(kParameterKeys), what);
  if (!read_keys(reader, entry.value, kParameterKeys, decl, what)) return;
  if (decl.kind == ParameterKind::table) {
    // A table has no sensible default for every tank, and no bounds.
    for (std::string_view key : {"default", "min", "max"}) {
      if (const ConfigNode* value = entry.value.find(key)) {
        reader.error(*value, what + ": key '" + std::string(key) +
                                 "': a table parameter takes none (it holds no table until a "
                                 "site gives one)");
        return;
      }
    }
    rule.parameters.push_back(std::move(decl));
    return;
  }
  const ConfigNode* value = reader.require(entry.value, "default", what);
  if (value == nullptr) return;
  if (has_duration_unit(value->text) && decl.unit != "s") {
    reader.error(*value, what + ": key 'default': a duration such as '" + value->text +
                             "' needs unit 's', but the unit is '" + decl.unit + "'");
    return;
  }
  const Bounds bounds{.min = decl.min, .max = decl.max};
  if (decl.min && decl.max && *decl.min > *decl.max) {
    reader.error(entry.value, what + ": min is above max");
    return;
  }
  if (!bounds.contains(decl.default_value)) {
    reader.error(*value, what + ": key 'default': must be " + bounds.describe() + ", got " +
                             format_number(decl.default_value));
    return;
  }
  rule.parameters.push_back(std::move(decl));
}

void read_record(FieldReader& reader, const SourceText& source, const MapEntry& entry,
                 const std::string& what, engine::AssetSpec& asset) {
  engine::RecordSpec record;
  record.name = entry.key;
  record.where = where_of(source, entry);
  reader.check_keys(entry.value, allowed_keys(kRecordKeys, {"fields"}), what);
  const std::size_t errors_before = reader.error_count();
  read_keys(reader, entry.value, kRecordKeys, record, what);
  const ConfigNode* fields = reader.require(entry.value, "fields", what);
  for_each_named(reader, fields, "fields", what + " field",
                 [&](const MapEntry& field_entry, const std::string& field_what) {
                   engine::RecordFieldSpec field;
                   field.name = field_entry.key;
                   field.where = where_of(source, field_entry);
                   reader.check_keys(field_entry.value, allowed_keys(kRecordFieldKeys), field_what);
                   if (read_keys(reader, field_entry.value, kRecordFieldKeys, field, field_what) &&
                       validate(reader, field_entry.value, field, field_what)) {
                     record.fields.push_back(std::move(field));
                   }
                 });
  if (fields != nullptr && (fields->kind == ConfigNode::Kind::null ||
                            (fields->is_map() && fields->entries.empty()))) {
    reader.error(*fields, what + ": key 'fields': list at least one field");
  }
  if (reader.error_count() == errors_before) asset.records.push_back(std::move(record));
}

}  // namespace

std::optional<RuleTemplate> read_template(const ConfigNode& document, const SourceText& source,
                                          std::string_view expected_name,
                                          std::vector<Diagnostic>& diagnostics) {
  FieldReader reader(source, diagnostics);
  const std::size_t errors_before = reader.error_count();
  const std::string what = "template '" + std::string(expected_name) + "'";
  if (!reader.expect_map(document, what)) return std::nullopt;
  reader.check_keys(document, kTemplateTopKeys, what);
  RuleTemplate rule;
  rule.document = document;
  if (const ConfigNode* name = reader.require(document, "template", what)) {
    if (auto text = reader.text(*name, what + ": key 'template'")) {
      if (*text != expected_name) {
        reader.error(*name, what + ": key 'template' is '" + *text +
                                "', but it must equal the file name without '.yaml' ('" +
                                std::string(expected_name) + "')");
      }
    }
  }
  rule.name = std::string(expected_name);
  if (const ConfigNode* description = reader.require(document, "description", what)) {
    rule.description = reader.text(*description, what + ": key 'description'").value_or("");
  }
  reader.require(document, "inputs", what);
  for_each_named(reader, document.find("parameters"), "parameters", "parameter",
                 [&](const MapEntry& entry, const std::string& label) {
                   read_parameter(reader, entry, label, rule);
                 });
  if (reader.error_count() != errors_before) return std::nullopt;
  return rule;
}

ParameterValues default_values(const RuleTemplate& rule) {
  ParameterValues values;
  for (const auto& p : rule.parameters) {
    if (p.kind == ParameterKind::number) values.emplace(p.name, p.default_value);
  }
  return values;
}

TableValues default_tables(const RuleTemplate& rule) {
  TableValues tables;
  for (const auto& p : rule.parameters) {
    if (p.kind == ParameterKind::table) tables.emplace(p.name, std::nullopt);
  }
  return tables;
}

void instantiate_template(const RuleTemplate& rule, const SourceText& source,
                          const ParameterValues& values, const TableValues& tables,
                          engine::AssetSpec& asset, engine::SensorHealthTuning& health,
                          std::vector<Diagnostic>& diagnostics) {
  FieldReader reader(source, diagnostics, values, "template '" + rule.name + "'", tables);
  const ConfigNode& doc = rule.document;

  for_each_named(reader, doc.find("inputs"), "inputs", "input",
                 [&](const MapEntry& entry, const std::string& what) {
                   engine::InputSpec input;
                   input.role = entry.key;
                   input.where = where_of(source, entry);
                   reader.check_keys(entry.value, allowed_keys(kInputKeys, {"health"}), what);
                   if (const ConfigNode* block = entry.value.find("health")) {
                     health[entry.key] = read_input_health(reader, *block, what + ": key 'health'");
                   }
                   if (read_keys(reader, entry.value, kInputKeys, input, what)) {
                     asset.inputs.push_back(std::move(input));
                   }
                 });

  for_each_named(reader, doc.find("signals"), "signals", "signal",
                 [&](const MapEntry& entry, const std::string& what) {
                   engine::SignalSpec signal;
                   signal.name = entry.key;
                   signal.where = where_of(source, entry);
                   reader.check_keys(entry.value, allowed_keys(kSignalKeys), what);
                   // Operand counts are checked by engine::analyse_asset().
                   if (read_keys(reader, entry.value, kSignalKeys, signal, what)) {
                     asset.signals.push_back(std::move(signal));
                   }
                 });

  for_each_named(
      reader, doc.find("estimators"), "estimators", "estimator",
      [&](const MapEntry& entry, const std::string& what) {
        auto estimator = read_kinded_entry<engine::EstimatorSpec>(
            reader, source, entry, what, kEstimatorCommonKeys, kEstimatorReaders);
        if (estimator) asset.estimators.push_back(std::move(*estimator));
      });

  for_each_named(reader, doc.find("checks"), "checks", "check",
                 [&](const MapEntry& entry, const std::string& what) {
                   auto check = read_kinded_entry<engine::CheckSpec>(
                       reader, source, entry, what, kCheckCommonKeys, kCheckReaders);
                   if (check) asset.checks.push_back(std::move(*check));
                 });

  for_each_named(reader, doc.find("records"), "records", "record",
                 [&](const MapEntry& entry, const std::string& what) {
                   read_record(reader, source, entry, what, asset);
                 });
}

}  // namespace bw::config
