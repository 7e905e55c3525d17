// Loads a site file and the rule templates it uses into an engine::SiteSpec.
//
// Site file schema (our own; see also rules/README.md):
//   site:                      required
//     name: Dry Creek SWD 4    required text
//     time_zone: America/Chicago   required; an IANA name known to the system time zone
//                              database (checked with date::locate_zone, which reads
//                              /usr/share/zoneinfo)
//   rules: [../rules]          optional list of template folders, relative to the site file
//   assets:                    required mapping; names are letters, digits and '_'
//     water_tank_1:
//       template: tank_level   required; the file <template>.yaml in a template folder
//       description: "..."     optional text
//       tags: {level: DC4.TK1.LEVEL}   role -> tag; roles must be inputs of the template; a tag
//                              may feed several assets and several roles
//       parameters: {high_level: 20.5} overrides of template parameters, within their min/max;
//                              a duration is allowed when the parameter's unit is "s"; a table
//                              parameter takes [[level, volume], ...] or the path of a CSV file
//                              relative to the site file (config/strapping_table_reader.h)
//       sensor_health: {level: {flatline: off}}   optional; per input role, the tuning of its
//                              default sensor-health checks (config/health_block.h), overlaid
//                              on the template's `health:` block of that input
//   live:                      optional; the broker, topics and state of `brinewatch run`
//                              (schema in live_spec.h, checks in live_section.h)
//
// Template folders are searched in this order: the site's `rules:` folders, then the folders
// passed by the caller; load_site() adds, only when neither gives any folder, the folder `rules`
// beside the site file's folder and then /usr/share/brinewatch/rules.
//
// Every asset is instantiated from its template with its parameter values, its tags bound, the
// default sensor-health checks of its bound inputs added (engine/sensor_health.h), and
// checked with engine::analyse_asset(); the analysis' problems become diagnostics. Loading keeps
// going past errors and reports all of them (each exactly once), with file, 1-based line and
// column, what was expected, and for unknown names the nearest valid one. The site is returned
// only when there is no diagnostic at all. Loading is not thread-safe with respect to the files
// it reads changing underneath; separate calls share nothing.
#pragma once

#include <filesystem>
#include <optional>
#include <string>
#include <string_view>
#include <vector>

#include "config/diagnostic.h"
#include "config/live_spec.h"
#include "config/site_description.h"  // describe_site(), the usual companion of a load
#include "engine/site_model.h"

namespace bw::config {

struct LoadResult {
  std::optional<engine::SiteSpec> site;  // set exactly when diagnostics is empty
  std::optional<LiveSpec> live;          // set when diagnostics is empty and the file has `live:`
  std::vector<Diagnostic> diagnostics;
  bool ok() const { return site.has_value() && diagnostics.empty(); }
};

LoadResult load_site(const std::filesystem::path& site_file,
                     std::vector<std::filesystem::path> extra_rule_dirs = {});

// Loads site text held in memory (tests, an embedded demo site). `file_label` is the name used
// in diagnostics and SiteSpec::file; relative `rules:` folders are resolved against its parent
// folder. Only `rules:` folders and `rule_dirs` are searched: no default folders.
LoadResult load_site_from_string(std::string_view yaml_text, std::string_view file_label,
                                 std::vector<std::filesystem::path> rule_dirs);

}  // namespace bw::config
