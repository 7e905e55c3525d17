// Parses YAML text into a ConfigNode tree. The only place that touches the YAML library.
//
// Syntax errors (bad indentation, tabs, unclosed brackets...) come back as one Diagnostic at the
// position the parser reports, quoting the line. An empty document gives a null node. Only the
// first document of a multi-document stream is read. Mapping keys must be plain values; a
// complex key is reported as an error. Thread-safe (no shared state).
#pragma once

#include <variant>

#include "config/config_node.h"
#include "config/diagnostic.h"
#include "config/source_text.h"

namespace bw::config {

std::variant<ConfigNode, Diagnostic> parse_yaml(const SourceText& source);

}  // namespace bw::config
