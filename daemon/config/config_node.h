// A parsed configuration document as a plain tree, independent of the YAML library.
//
// The YAML reader (yaml_document.h) builds this tree so that the rest of the loader never sees a
// YAML type. Every node remembers where it was written (1-based line and column, 0 when unknown).
// Mappings keep their keys in file order, including repeated keys, so that the loader can report
// a key written twice. Scalars keep their text exactly as written (without quotes).
#pragma once

#include <cstdint>
#include <string>
#include <string_view>
#include <vector>

namespace bw::config {

struct MapEntry;

struct ConfigNode {
  enum class Kind : std::uint8_t { null, scalar, sequence, map };

  Kind kind = Kind::null;
  std::string text;               // scalar text; empty otherwise
  std::vector<ConfigNode> items;  // sequence elements
  std::vector<MapEntry> entries;  // mapping entries in file order
  int line = 0;
  int column = 0;

  bool is_scalar() const { return kind == Kind::scalar; }
  bool is_sequence() const { return kind == Kind::sequence; }
  bool is_map() const { return kind == Kind::map; }

  // The value of the first entry named `key`, or nullptr.
  const ConfigNode* find(std::string_view key) const;
};

struct MapEntry {
  std::string key;
  int line = 0;  // where the key was written
  int column = 0;
  ConfigNode value;
};

// "a mapping", "a list", "a value" or "nothing": for messages that say what was found.
std::string_view kind_name(ConfigNode::Kind kind);

}  // namespace bw::config
