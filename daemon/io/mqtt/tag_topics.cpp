#include "io/mqtt/tag_topics.h"

#include <charconv>
#include <string>
#include <system_error>
#include <vector>

#include "io/mqtt/sparkplug.h"
#include "io/mqtt/tag_template.h"

namespace bw::io::mqtt {
namespace {

constexpr std::string_view kWholeTopic = "topic";

// Splits at every '/'; "a//b" has three levels, "a/" two (the last empty).
std::vector<std::string_view> split_levels(std::string_view text) {
  std::vector<std::string_view> levels;
  std::size_t start = 0;
  while (true) {
    const std::size_t slash = text.find('/', start);
    if (slash == std::string_view::npos) {
      levels.push_back(text.substr(start));
      return levels;
    }
    levels.push_back(text.substr(start, slash - start));
    start = slash + 1;
  }
}

std::optional<std::size_t> level_number(std::string_view name) {
  std::size_t value = 0;
  const auto [end, error] = std::from_chars(name.data(), name.data() + name.size(), value);
  if (error != std::errc() || end != name.data() + name.size()) return std::nullopt;
  return value;
}

Error rule_error(std::string_view what, std::string_view text, std::string_view reason) {
  return Error{std::string(what) + " '" + std::string(text) + "': " + std::string(reason)};
}

}  // namespace

Status check_topic_filter(std::string_view filter) {
  if (filter.empty()) return rule_error("topic filter", filter, "is empty");
  const auto levels = split_levels(filter);
  for (std::size_t i = 0; i < levels.size(); ++i) {
    const std::string_view level = levels[i];
    const bool has_wildcard = level.find_first_of("+#") != std::string_view::npos;
    if (has_wildcard && level.size() != 1) {
      return rule_error("topic filter", filter, "'+' and '#' must fill a whole level");
    }
    if (level == "#" && i + 1 != levels.size()) {
      return rule_error("topic filter", filter, "'#' must be the last level");
    }
  }
  return Ok{};
}

bool topic_matches(std::string_view filter, std::string_view topic) {
  if (!check_topic_filter(filter).ok()) return false;
  if (topic.empty() || topic.find_first_of("+#") != std::string_view::npos) return false;
  const auto filter_levels = split_levels(filter);
  const auto topic_levels = split_levels(topic);
  if (topic.front() == '$' && (filter.front() == '+' || filter.front() == '#')) return false;
  for (std::size_t i = 0; i < filter_levels.size(); ++i) {
    if (filter_levels[i] == "#") return true;  // also matches the parent: "a/#" matches "a"
    if (i >= topic_levels.size()) return false;
    if (filter_levels[i] != "+" && filter_levels[i] != topic_levels[i]) return false;
  }
  return filter_levels.size() == topic_levels.size();
}

std::optional<std::string> tag_from_topic(const TopicRule& rule, std::string_view topic) {
  if (!topic_matches(rule.filter, topic)) return std::nullopt;
  const auto levels = split_levels(topic);
  auto tag = expand_tag_template(rule.tag_template, [&](std::string_view name, std::string& out) {
    if (name == kWholeTopic) {
      out.append(topic);
      return true;
    }
    const auto level = level_number(name);
    if (!level || *level >= levels.size()) return false;
    out.append(levels[*level]);
    return true;
  });
  if (!tag || tag->empty()) return std::nullopt;
  return tag;
}

Status check_topic_rule(const TopicRule& rule) {
  if (auto filter = check_topic_filter(rule.filter); !filter.ok()) return filter;
  if (rule.format == TopicRule::Format::sparkplug) {
    return check_sparkplug_tag_template(rule.tag_template);
  }
  const auto levels = split_levels(rule.filter);
  const bool open_ended = levels.back() == "#";
  std::string problem;
  const auto expanded =
      expand_tag_template(rule.tag_template, [&](std::string_view name, std::string& out) {
        if (name == kWholeTopic) return true;
        const auto level = level_number(name);
        if (!level) {
          problem = "unknown placeholder {" + std::string(name) + "} (use {N} or {topic})";
          return false;
        }
        if (!open_ended && *level >= levels.size()) {
          problem = "{" + std::string(name) + "} is beyond the filter's " +
                    std::to_string(levels.size()) + " levels";
          return false;
        }
        out.push_back('x');  // stands in for the level text, unknown until a topic arrives
        return true;
      });
  if (!expanded) {
    return rule_error("tag template", rule.tag_template,
                      problem.empty() ? "unbalanced or empty {}" : problem);
  }
  if (expanded->empty()) return rule_error("tag template", rule.tag_template, "is empty");
  return Ok{};
}

}  // namespace bw::io::mqtt
