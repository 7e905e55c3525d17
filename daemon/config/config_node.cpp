#include "config/config_node.h"

namespace bw::config {

const ConfigNode* ConfigNode::find(std::string_view key) const {
  for (const auto& entry : entries) {
    if (entry.key == key) return &entry.value;
  }
  return nullptr;
}

std::string_view kind_name(ConfigNode::Kind kind) {
  switch (kind) {
    case ConfigNode::Kind::null:
      return "nothing";
    case ConfigNode::Kind::scalar:
      return "a single value";
    case ConfigNode::Kind::sequence:
      return "a list";
    case ConfigNode::Kind::map:
      return "a mapping";
  }
  return "an unknown node";
}

}  // namespace bw::config
