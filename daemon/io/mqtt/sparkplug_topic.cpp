// The parts of sparkplug.h that deal with topic and tag-name text.
#include <array>
#include <string>

#include "io/mqtt/sparkplug.h"
#include "io/mqtt/tag_template.h"

namespace bw::io::mqtt {
namespace {

constexpr std::string_view kNamespace = "spBv1.0";
constexpr std::string_view kState = "STATE";
constexpr std::array<std::string_view, 4> kNodeTypes = {"NBIRTH", "NDEATH", "NDATA", "NCMD"};
constexpr std::array<std::string_view, 4> kDeviceTypes = {"DBIRTH", "DDEATH", "DDATA", "DCMD"};
constexpr std::size_t kMaxLevels = 5;

bool one_of(std::string_view word, const std::array<std::string_view, 4>& words) {
  for (const auto w : words) {
    if (w == word) return true;
  }
  return false;
}

bool valid_id(std::string_view id) {
  return !id.empty() && id.find_first_of("+#") == std::string_view::npos;
}

}  // namespace

std::optional<SparkplugTopic> parse_sparkplug_topic(std::string_view topic) {
  std::array<std::string_view, kMaxLevels> levels;
  std::size_t count = 0;
  std::size_t start = 0;
  while (true) {
    if (count == kMaxLevels) return std::nullopt;
    const std::size_t slash = topic.find('/', start);
    levels[count++] = topic.substr(start, slash == std::string_view::npos ? slash : slash - start);
    if (slash == std::string_view::npos) break;
    start = slash + 1;
  }
  if (count < 3 || levels[0] != kNamespace) return std::nullopt;
  for (std::size_t i = 1; i < count; ++i) {
    if (!valid_id(levels[i])) return std::nullopt;
  }
  if (count == 3) {
    if (levels[1] != kState) return std::nullopt;
    return SparkplugTopic{"", std::string(kState), std::string(levels[2]), ""};
  }
  const bool node_type = one_of(levels[2], kNodeTypes);
  const bool device_type = one_of(levels[2], kDeviceTypes);
  if (!(node_type && count == 4) && !(device_type && count == 5)) return std::nullopt;
  return SparkplugTopic{std::string(levels[1]), std::string(levels[2]), std::string(levels[3]),
                        count == 5 ? std::string(levels[4]) : std::string()};
}

Status check_sparkplug_tag_template(std::string_view tag_template) {
  bool has_metric = false;
  std::string unknown;
  const auto expanded =
      expand_tag_template(tag_template, [&](std::string_view name, std::string& out) {
        if (name == "metric") {
          has_metric = true;
        } else if (name != "group" && name != "node" && name != "device") {
          unknown = name;
          return false;
        }
        out.push_back('x');
        return true;
      });
  const auto fail = [&](const std::string& reason) {
    return Error{"tag template '" + std::string(tag_template) + "': " + reason};
  };
  if (!unknown.empty()) {
    return fail("unknown placeholder {" + unknown + "} (use {group} {node} {device} {metric})");
  }
  if (!expanded) return fail("unbalanced or empty {}");
  if (!has_metric) return fail("must contain {metric}");
  return Ok{};
}

std::string topic_for_rebirth(std::string_view group, std::string_view node) {
  std::string topic(kNamespace);
  topic.append("/").append(group).append("/NCMD/").append(node);
  return topic;
}

}  // namespace bw::io::mqtt
