// Which MQTT topics carry which tags: topic filters with wildcards, and tag names built from the
// levels of a topic.
//
// A TopicRule pairs a subscription filter with a tag template and the payload format of the
// matching topics. For Format::json the template may use "{N}" (level N of the topic, 0-based)
// and "{topic}" (the whole topic): rule {"tumbleweed/drycreek4/+/+", "{2}.{3}"} names the tag of
// topic "tumbleweed/drycreek4/TK1/LEVEL" "TK1.LEVEL". For Format::sparkplug the topic names the
// edge node, not the tag, and the template is the SparkplugSession's ("{group}", "{node}",
// "{device}", "{metric}"; see sparkplug.h).
//
// Filter matching follows MQTT 3.1.1 section 4.7: levels are split at '/'; '+' matches exactly
// one level (possibly empty); '#' must be the last level and matches that level's parent and any
// number of levels below it; a topic starting with '$' is not matched by a filter whose first
// level is a wildcard. Matching is case-sensitive and byte-wise.
//
// Thread safety: pure functions.
#pragma once

#include <cstdint>
#include <optional>
#include <string>
#include <string_view>

#include "core/result.h"

namespace bw::io::mqtt {

struct TopicRule {
  std::string filter;        // MQTT subscription filter with + and # wildcards
  std::string tag_template;  // see above
  enum class Format : std::uint8_t { json, sparkplug } format = Format::json;
};

// Whether `topic` (a topic name, no wildcards) matches subscription `filter`. A malformed filter
// (see check_topic_filter) matches nothing.
bool topic_matches(std::string_view filter, std::string_view topic);

// The tag of `topic` under `rule`: nullopt when the topic does not match the filter, the
// template is malformed or names a level the topic does not have, or the result is empty. An
// empty level expands to nothing (tag_template.h says how the separator after it is dropped).
std::optional<std::string> tag_from_topic(const TopicRule& rule, std::string_view topic);

// For the configuration loader: a clear error when the filter is not a valid MQTT filter
// (empty; '+' or '#' sharing a level with other characters; '#' not last) or the template is
// malformed for the rule's format. A "{N}" beyond the filter's levels is an error unless the
// filter ends in '#'.
Status check_topic_rule(const TopicRule& rule);
Status check_topic_filter(std::string_view filter);

}  // namespace bw::io::mqtt
