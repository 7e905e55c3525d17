#include "config/health_block.h"

#include <optional>
#include <string>
#include <vector>

#include "config/schema.h"

namespace bw::config {
namespace {

using engine::HealthKind;

// `off` / `on`, or nothing when the node is something else.
std::optional<bool> switch_word(const ConfigNode& node) {
  if (!node.is_scalar()) return std::nullopt;
  if (node.text == "off") return false;
  if (node.text == "on") return true;
  return std::nullopt;
}

template <std::size_t N>
void read_settings(FieldReader& reader, const ConfigNode& map,
                   const std::array<Key<engine::HealthCheckTuning>, N>& keys, std::string_view what,
                   engine::HealthCheckTuning& out) {
  reader.check_keys(map, allowed_keys(keys), what);
  read_keys(reader, map, keys, out, what);
}

std::vector<std::string_view> setting_names(HealthKind kind) {
  switch (kind) {
    case HealthKind::stale:
      return allowed_keys(kStaleHealthKeys);
    case HealthKind::flatline:
      return allowed_keys(kFlatlineHealthKeys);
    case HealthKind::out_of_range:
      return allowed_keys(kOutOfRangeHealthKeys);
    case HealthKind::ne43:
      return allowed_keys(kNe43HealthKeys);
  }
  return {};
}

void read_kind_settings(FieldReader& reader, HealthKind kind, const ConfigNode& map,
                        std::string_view what, engine::HealthCheckTuning& out) {
  switch (kind) {
    case HealthKind::stale:
      return read_settings(reader, map, kStaleHealthKeys, what, out);
    case HealthKind::flatline:
      return read_settings(reader, map, kFlatlineHealthKeys, what, out);
    case HealthKind::out_of_range:
      return read_settings(reader, map, kOutOfRangeHealthKeys, what, out);
    case HealthKind::ne43:
      return read_settings(reader, map, kNe43HealthKeys, what, out);
  }
}

std::string joined(const std::vector<std::string_view>& names) {
  std::string text;
  for (auto name : names) text += (text.empty() ? "" : ", ") + std::string(name);
  return text;
}

}  // namespace

engine::InputHealthTuning read_input_health(FieldReader& reader, const ConfigNode& value,
                                            std::string_view what) {
  engine::InputHealthTuning out;
  auto where = [&](const ConfigNode& node) {
    return engine::Where{reader.source().label(), node.line, node.column};
  };
  if (const auto all = switch_word(value)) {
    for (HealthKind kind : engine::kHealthKinds) {
      out[kind].enabled = *all;
      out[kind].where = where(value);
    }
    return out;
  }
  std::vector<std::string_view> kinds;
  for (HealthKind kind : engine::kHealthKinds) kinds.push_back(engine::health_kind_name(kind));
  if (!value.is_map()) {
    reader.error(value, std::string(what) + ": expected off, on, or a mapping of " + joined(kinds) +
                            ", got " + FieldReader::describe(value));
    return out;
  }
  reader.check_keys(value, kinds, what);
  for (HealthKind kind : engine::kHealthKinds) {
    const ConfigNode* node = value.find(engine::health_kind_name(kind));
    if (node == nullptr) continue;
    const std::string label =
        std::string(what) + ": '" + std::string(engine::health_kind_name(kind)) + "'";
    engine::HealthCheckTuning tuning;
    tuning.where = where(*node);
    if (const auto on = switch_word(*node)) {
      tuning.enabled = *on;
    } else if (node->is_map()) {
      const std::size_t errors_before = reader.error_count();
      tuning.enabled = true;
      read_kind_settings(reader, kind, *node, label, tuning);
      if (reader.error_count() != errors_before) continue;
    } else {
      reader.error(*node, label + ": expected off, on, or a mapping of " +
                              joined(setting_names(kind)) + ", got " +
                              FieldReader::describe(*node));
      continue;
    }
    out[kind] = tuning;
  }
  return out;
}

}  // namespace bw::config
