#include "config/site_loader.h"

#include <date/tz.h>

#include <algorithm>
#include <set>
#include <system_error>
#include <tuple>
#include <variant>

#include "config/field_reader.h"
#include "config/health_block.h"
#include "config/live_section.h"
#include "config/schema.h"
#include "config/source_text.h"
#include "config/strapping_table_reader.h"
#include "config/template_library.h"
#include "config/yaml_document.h"
#include "engine/asset_graph.h"
#include "engine/sensor_health.h"

namespace bw::config {
namespace {

namespace fs = std::filesystem;

const std::vector<std::string_view> kSiteTopKeys{"site", "rules", "assets", "live"};
const fs::path kSystemRuleFolder = "/usr/share/brinewatch/rules";

// The error message for an unknown time zone, or nothing when the zone is known.
std::optional<std::string> time_zone_problem(const std::string& name) {
  try {
    date::locate_zone(name);
    return std::nullopt;
  } catch (const std::exception&) {
    std::vector<std::string_view> known;
    for (const auto& zone : date::get_tzdb().zones) known.push_back(zone.name());
    return "'" + name + "' is not a time zone name known to the system time zone database" +
           did_you_mean(name, known);
  }
}

bool is_tag_name(std::string_view tag) {
  return !tag.empty() && std::none_of(tag.begin(), tag.end(), [](char c) {
    return static_cast<unsigned char>(c) <= ' ' || c == 0x7f;
  });
}

class SiteLoader {
 public:
  SiteLoader(SourceText source, fs::path base_folder)
      : source_(std::move(source)),
        base_folder_(std::move(base_folder)),
        reader_(source_, diagnostics_) {}

  LoadResult load(std::vector<fs::path> extra_folders, bool add_default_folders) {
    auto parsed = parse_yaml(source_);
    if (auto* error = std::get_if<Diagnostic>(&parsed)) {
      diagnostics_.push_back(std::move(*error));
      return finish(std::nullopt, std::nullopt);
    }
    const ConfigNode& top = std::get<ConfigNode>(parsed);
    if (!reader_.expect_map(top, "site file")) return finish(std::nullopt, std::nullopt);
    reader_.check_keys(top, kSiteTopKeys, "site file");

    engine::SiteSpec site;
    site.file = source_.label();
    read_site_header(top, site);

    std::vector<fs::path> folders = rule_folders(top.find("rules"));
    folders.insert(folders.end(), extra_folders.begin(), extra_folders.end());
    if (folders.empty() && add_default_folders) {
      folders = {base_folder_.parent_path() / "rules", kSystemRuleFolder};
    }
    library_.emplace(std::move(folders));

    if (const ConfigNode* assets = reader_.require(top, "assets", "site file")) {
      read_assets(*assets, site);
    }
    std::optional<LiveSpec> live;
    if (const ConfigNode* section = top.find("live")) {
      live = read_live_section(reader_, *section, site.name, base_folder_);
    }
    return finish(std::move(site), std::move(live));
  }

 private:
  void read_site_header(const ConfigNode& top, engine::SiteSpec& site) {
    const ConfigNode* header = reader_.require(top, "site", "site file");
    if (header == nullptr || !reader_.expect_map(*header, "site")) return;
    reader_.check_keys(*header, allowed_keys(kSiteKeys), "site");
    if (!read_keys(reader_, *header, kSiteKeys, site, "site")) return;
    if (auto problem = time_zone_problem(site.time_zone)) {
      reader_.error(*header->find("time_zone"), "site: key 'time_zone': " + *problem);
    }
  }

  std::vector<fs::path> rule_folders(const ConfigNode* rules) {
    std::vector<fs::path> folders;
    if (rules == nullptr) return folders;
    auto names = reader_.text_list(*rules, "site file: key 'rules'");
    if (!names) return folders;
    for (std::size_t i = 0; i < names->size(); ++i) {
      const fs::path folder = (base_folder_ / (*names)[i]).lexically_normal();
      std::error_code ec;
      if (!fs::is_directory(folder, ec)) {
        reader_.error(rules->items[i], "site file: key 'rules': folder '" + folder.string() +
                                           "' does not exist or is not a folder");
        continue;
      }
      folders.push_back(folder);
    }
    return folders;
  }

  void read_assets(const ConfigNode& assets, engine::SiteSpec& site) {
    if (!reader_.expect_map(assets, "assets")) return;
    if (assets.entries.empty()) reader_.error(assets, "assets: the site defines no asset");
    for (const MapEntry* entry : reader_.unique_entries(assets, "assets")) {
      const std::size_t errors_before = diagnostics_.size();
      engine::AssetSpec asset;
      asset.name = entry->key;
      asset.where = {source_.label(), entry->line, entry->column};
      const std::string what = "asset '" + entry->key + "'";
      if (!is_identifier(entry->key)) {
        reader_.error(*entry, what +
                                  ": an asset name must be letters, digits and '_', not "
                                  "starting with a digit");
        continue;
      }
      if (!read_asset(entry->value, what, asset)) continue;
      if (diagnostics_.size() == errors_before) analyse(asset);
      site.assets.push_back(std::move(asset));
    }
  }

  // Returns false when the asset could not be instantiated at all.
  bool read_asset(const ConfigNode& map, const std::string& what, engine::AssetSpec& asset) {
    if (!reader_.expect_map(map, what)) return false;
    reader_.check_keys(map, allowed_keys(kAssetKeys, {"tags", "parameters", "sensor_health"}),
                       what);
    if (!read_keys(reader_, map, kAssetKeys, asset, what)) return false;
    const ConfigNode& template_node = *map.find("template");
    const TemplateLibrary::Entry* entry = library_->find(asset.template_name, diagnostics_);
    if (entry == nullptr) {
      report_unknown_template(template_node, what, asset.template_name);
      return false;
    }
    if (!entry->rule) return false;  // reported when the template was read
    const RuleTemplate& rule = *entry->rule;
    ParameterValues values = default_values(rule);
    TableValues tables = default_tables(rule);
    read_parameters(map.find("parameters"), what, rule, values, tables);
    engine::SensorHealthTuning health;
    instantiate_template(rule, entry->source, values, tables, asset, health, diagnostics_);
    bind_tags(map.find("tags"), what, rule, asset);
    read_sensor_health(map.find("sensor_health"), what, rule, health);
    report(engine::add_sensor_health_checks(asset, health));
    return true;
  }

  // Input roles come from the template text, so a role whose definition has an error is still
  // known.
  static std::vector<std::string_view> template_roles(const RuleTemplate& rule) {
    std::vector<std::string_view> roles;
    if (const ConfigNode* inputs = rule.document.find("inputs")) {
      for (const auto& input : inputs->entries) roles.push_back(input.key);
    }
    return roles;
  }

  // The asset's `sensor_health: {<role>: <health block>}`, overlaid on the template's tuning.
  void read_sensor_health(const ConfigNode* section_node, const std::string& what,
                          const RuleTemplate& rule, engine::SensorHealthTuning& health) {
    if (section_node == nullptr) return;
    const std::string section = what + ": key 'sensor_health'";
    if (!reader_.expect_map(*section_node, section)) return;
    const std::vector<std::string_view> roles = template_roles(rule);
    for (const MapEntry* entry : reader_.unique_entries(*section_node, section)) {
      if (std::find(roles.begin(), roles.end(), entry->key) == roles.end()) {
        reader_.error(*entry, section + ": template '" + rule.name + "' has no input role '" +
                                  entry->key + "'" + did_you_mean(entry->key, roles));
        continue;
      }
      merge_tuning(health[entry->key], read_input_health(reader_, entry->value,
                                                         section + ": role '" + entry->key + "'"));
    }
  }

  void report_unknown_template(const ConfigNode& at, const std::string& what,
                               const std::string& name) {
    const auto names = library_->available_names();
    const std::vector<std::string_view> candidates(names.begin(), names.end());
    std::string searched;
    for (const auto& folder : library_->folders()) {
      searched += (searched.empty() ? "" : ", ") + folder.string();
    }
    reader_.error(at, what + ": key 'template': no template '" + name + "' in " +
                          (searched.empty() ? std::string("any folder (no template folder given)")
                                            : searched) +
                          did_you_mean(name, candidates));
  }

  // Overrides of the template's defaults in `values` and `tables`.
  void read_parameters(const ConfigNode* overrides, const std::string& what,
                       const RuleTemplate& rule, ParameterValues& values, TableValues& tables) {
    if (overrides == nullptr) return;
    const std::string section = what + ": key 'parameters'";
    if (!reader_.expect_map(*overrides, section)) return;
    std::vector<std::string_view> names;
    for (const auto& p : rule.parameters) names.push_back(p.name);
    for (const MapEntry* entry : reader_.unique_entries(*overrides, section)) {
      auto decl = std::find_if(rule.parameters.begin(), rule.parameters.end(),
                               [&](const ParameterDecl& p) { return p.name == entry->key; });
      if (decl == rule.parameters.end()) {
        reader_.error(*entry, what + ": template '" + rule.name + "' has no parameter '" +
                                  entry->key + "'" + did_you_mean(entry->key, names));
        continue;
      }
      const std::string label = what + ": parameter '" + entry->key + "'";
      if (decl->kind == ParameterKind::table) {
        if (auto table = read_table(entry->value, label)) tables[entry->key] = std::move(*table);
        continue;
      }
      const Bounds bounds{.min = decl->min, .max = decl->max};
      if (auto value = reader_.number(entry->value, label, bounds, decl->unit == "s")) {
        values[entry->key] = *value;
      }
    }
  }

  // A table parameter's value: [[level, volume], ...] or a CSV file relative to the site file.
  std::optional<core::StrappingTable> read_table(const ConfigNode& value,
                                                 const std::string& label) {
    if (value.is_sequence()) return read_inline_table(reader_, value, label);
    auto name = value.is_scalar() ? reader_.text(value, label) : std::nullopt;
    if (!name) {
      reader_.error(value, label +
                               ": expected a list of [level, volume] pairs or the path of a "
                               "CSV file (level ft, volume bbl), got " +
                               FieldReader::describe(value));
      return std::nullopt;
    }
    const fs::path path = (base_folder_ / *name).lexically_normal();
    auto text = read_text_file(path);
    if (!text) {
      reader_.error(value, label + ": cannot read the strapping table: " + text.error().message);
      return std::nullopt;
    }
    return read_table_csv_text(path.string(), text.value(), diagnostics_);
  }

  void bind_tags(const ConfigNode* tags, const std::string& what, const RuleTemplate& rule,
                 engine::AssetSpec& asset) {
    if (tags == nullptr) return;
    const std::string section = what + ": key 'tags'";
    if (!reader_.expect_map(*tags, section)) return;
    const std::vector<std::string_view> roles = template_roles(rule);
    for (const MapEntry* entry : reader_.unique_entries(*tags, section)) {
      if (std::find(roles.begin(), roles.end(), entry->key) == roles.end()) {
        reader_.error(*entry, what + ": template '" + rule.name + "' has no input role '" +
                                  entry->key + "'" + did_you_mean(entry->key, roles));
        continue;
      }
      auto tag = reader_.text(entry->value, section + ": role '" + entry->key + "'");
      if (!tag) continue;
      if (!is_tag_name(*tag)) {
        reader_.error(entry->value, section + ": role '" + entry->key + "': tag '" + *tag +
                                        "' must not contain spaces or control characters");
        continue;
      }
      for (auto& input : asset.inputs) {
        if (input.role == entry->key) input.tag = *tag;
      }
    }
  }

  void analyse(const engine::AssetSpec& asset) { report(engine::analyse_asset(asset).problems); }

  // Problems found by the engine, at the file (site or template) they point into.
  void report(const std::vector<engine::GraphProblem>& problems) {
    for (const auto& problem : problems) {
      const SourceText* text = problem.where.file == source_.label()
                                   ? &source_
                                   : library_->source_for(problem.where.file);
      if (text != nullptr) {
        diagnostics_.push_back(text->at(problem.where.line, problem.where.column, problem.message));
      } else {
        diagnostics_.push_back(
            {problem.where.file, problem.where.line, problem.where.column, problem.message, {}});
      }
    }
  }

  // A template error is found again for every asset that uses the template: keep the first.
  LoadResult finish(std::optional<engine::SiteSpec> site, std::optional<LiveSpec> live) {
    LoadResult result;
    std::set<std::tuple<std::string, int, int, std::string>> seen;
    for (auto& d : diagnostics_) {
      if (seen.emplace(d.file, d.line, d.column, d.message).second) {
        result.diagnostics.push_back(std::move(d));
      }
    }
    if (result.diagnostics.empty()) {
      result.site = std::move(site);
      result.live = std::move(live);
    }
    return result;
  }

  SourceText source_;
  fs::path base_folder_;
  std::vector<Diagnostic> diagnostics_;
  FieldReader reader_;
  std::optional<TemplateLibrary> library_;
};

}  // namespace

LoadResult load_site(const fs::path& site_file, std::vector<fs::path> extra_rule_dirs) {
  auto text = read_text_file(site_file);
  if (!text) {
    LoadResult result;
    result.diagnostics.push_back({site_file.string(), 0, 0, text.error().message, {}});
    return result;
  }
  // Relative rule folders are resolved against the site file's folder, wherever we run from.
  std::error_code ec;
  const fs::path absolute = fs::absolute(site_file, ec);
  SiteLoader loader(SourceText(site_file.string(), text.value()),
                    (ec ? site_file : absolute).parent_path());
  return loader.load(std::move(extra_rule_dirs), true);
}

LoadResult load_site_from_string(std::string_view yaml_text, std::string_view file_label,
                                 std::vector<fs::path> rule_dirs) {
  const fs::path label(file_label);
  SiteLoader loader(SourceText(std::string(file_label), yaml_text), label.parent_path());
  return loader.load(std::move(rule_dirs), false);
}

}  // namespace bw::config
