// Reading strapping tables (tank level in ft -> volume in bbl) from configuration files.
//
// Three ways to write one:
//   - inline, in a site or a template: a list of [level, volume] pairs,
//       strapping_table: [[0, 0], [1.5, 27.7], [24, 750.1]]
//   - in a site, as a CSV file path relative to the site file: two columns, level (ft) then
//     volume (bbl), after one header line (any text that is not two numbers, e.g.
//     "level_ft,volume_bbl"); blank lines and lines starting with '#' are skipped;
//   - in a template signal, as the name of a table parameter (`strapping_table: strapping_table`).
// The points must make a core::StrappingTable (at least 2, levels strictly increasing, volumes
// never decreasing); every problem is reported at the offending pair or CSV line, with what was
// expected. Not thread-safe (appends to the caller's diagnostics).
#pragma once

#include <optional>
#include <string_view>
#include <vector>

#include "config/config_node.h"
#include "config/diagnostic.h"
#include "config/field_reader.h"
#include "core/tank_geometry.h"

namespace bw::config {

// A list of [level, volume] pairs.
std::optional<core::StrappingTable> read_inline_table(FieldReader& reader, const ConfigNode& list,
                                                      std::string_view what);

// The text of a CSV file; `label` names the file in diagnostics, which give the line.
std::optional<core::StrappingTable> read_table_csv_text(std::string_view label,
                                                        std::string_view text,
                                                        std::vector<Diagnostic>& diagnostics);

// A template's `strapping_table` key: an inline list, or the name of a table parameter of the
// reader's table values (a parameter holding no table leaves `out` empty).
void read_table_reference(FieldReader& reader, const ConfigNode& value, std::string_view what,
                          std::optional<core::StrappingTable>& out);

}  // namespace bw::config
