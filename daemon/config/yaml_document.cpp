#include "config/yaml_document.h"

#include <yaml-cpp/yaml.h>

#include <optional>

namespace bw::config {
namespace {

struct ComplexKey {
  YAML::Mark mark;
};

void set_position(ConfigNode& out, const YAML::Mark& mark) {
  // yaml-cpp counts from 0 and uses -1 for "unknown".
  out.line = mark.line >= 0 ? mark.line + 1 : 0;
  out.column = mark.column >= 0 ? mark.column + 1 : 0;
}

ConfigNode convert(const YAML::Node& node) {
  ConfigNode out;
  set_position(out, node.Mark());
  switch (node.Type()) {
    case YAML::NodeType::Undefined:
    case YAML::NodeType::Null:
      out.kind = ConfigNode::Kind::null;
      break;
    case YAML::NodeType::Scalar:
      out.kind = ConfigNode::Kind::scalar;
      out.text = node.Scalar();
      break;
    case YAML::NodeType::Sequence:
      out.kind = ConfigNode::Kind::sequence;
      for (const auto& item : node) out.items.push_back(convert(item));
      break;
    case YAML::NodeType::Map:
      out.kind = ConfigNode::Kind::map;
      for (const auto& pair : node) {
        if (!pair.first.IsScalar()) throw ComplexKey{pair.first.Mark()};
        MapEntry entry;
        entry.key = pair.first.Scalar();
        ConfigNode key_position;
        set_position(key_position, pair.first.Mark());
        entry.line = key_position.line;
        entry.column = key_position.column;
        entry.value = convert(pair.second);
        // A key with no value ("key:") has no useful mark of its own: point at the key.
        if (entry.value.line == 0) {
          entry.value.line = entry.line;
          entry.value.column = entry.column;
        }
        out.entries.push_back(std::move(entry));
      }
      break;
  }
  return out;
}

Diagnostic at_mark(const SourceText& source, const YAML::Mark& mark, std::string message) {
  ConfigNode position;
  set_position(position, mark);
  return source.at(position.line, position.column, std::move(message));
}

}  // namespace

std::variant<ConfigNode, Diagnostic> parse_yaml(const SourceText& source) {
  try {
    return convert(YAML::Load(source.text()));
  } catch (const ComplexKey& e) {
    return at_mark(source, e.mark, "a mapping key must be a plain name, not a list or mapping");
  } catch (const YAML::Exception& e) {
    return at_mark(source, e.mark, "YAML syntax error: " + e.msg);
  }
}

}  // namespace bw::config
