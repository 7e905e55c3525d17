#include "config/schema.h"

namespace bw::config {
namespace {

template <class E, std::size_t N>
std::string_view name_of(const std::array<std::pair<std::string_view, E>, N>& names, E value) {
  for (const auto& [name, e] : names) {
    if (e == value) return name;
  }
  return "?";
}

}  // namespace

std::string_view priority_name(engine::Priority priority) {
  return name_of(kPriorityNames, priority);
}

std::string_view direction_name(engine::LimitDirection direction) {
  return name_of(kDirectionNames, direction);
}

void read_baseline(FieldReader& reader, const ConfigNode& value, std::string_view what,
                   engine::BaselineSpec& out) {
  if (!reader.expect_map(value, what)) return;
  reader.check_keys(value, allowed_keys(kBaselineKeys), what);
  if (!read_keys(reader, value, kBaselineKeys, out, what)) return;
  // Whatever is not given is learned, so there must be time to learn it.
  if ((!out.target || !out.sigma) && out.learn_s <= 0) {
    reader.error(value, std::string(what) +
                            ": give both 'target' and 'sigma', or a 'learn' time > 0 to learn "
                            "what is missing from the first data");
  }
}

void read_suppression(FieldReader& reader, const ConfigNode& value, std::string_view what,
                      std::optional<engine::SuppressionSpec>& out) {
  if (!reader.expect_map(value, what)) return;
  reader.check_keys(value, {"of", "below", "above"}, what);
  const std::string label(what);
  const ConfigNode* of = reader.require(value, "of", what);
  const ConfigNode* below = value.find("below");
  const ConfigNode* above = value.find("above");
  if ((below == nullptr) == (above == nullptr)) {
    reader.error(value, label + ": give exactly one of 'below' or 'above'");
    return;
  }
  const ConfigNode& threshold_node = below != nullptr ? *below : *above;
  auto signal = of != nullptr ? reader.text(*of, label + ": key 'of'") : std::nullopt;
  auto threshold = reader.number(threshold_node,
                                 label + ": key '" + (below != nullptr ? "below" : "above") + "'",
                                 kAnyValue, false);
  if (!signal || !threshold) return;
  out = engine::SuppressionSpec{
      .of = *signal,
      .when = below != nullptr ? engine::LimitDirection::low : engine::LimitDirection::high,
      .threshold = *threshold};
}

std::optional<std::pair<double, double>> read_range(FieldReader& reader, const ConfigNode& value,
                                                    std::string_view what) {
  if (!value.is_sequence() || value.items.size() != 2) {
    reader.error(value,
                 std::string(what) + ": expected [low, high], got " + FieldReader::describe(value));
    return std::nullopt;
  }
  auto low = reader.number(value.items[0], what, kAnyValue, false);
  auto high = reader.number(value.items[1], what, kAnyValue, false);
  if (!low || !high) return std::nullopt;
  if (!(*low < *high)) {
    reader.error(value, std::string(what) + ": low end must be below high end");
    return std::nullopt;
  }
  return std::pair{*low, *high};
}

}  // namespace bw::config
