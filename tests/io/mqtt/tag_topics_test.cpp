// Topic filters and tag templates (daemon/io/mqtt/tag_topics.h).
#include "io/mqtt/tag_topics.h"

#include <gtest/gtest.h>

namespace bw::io::mqtt {
namespace {

struct MatchCase {
  const char* filter;
  const char* topic;
  bool matches;
};

// MQTT 3.1.1 section 4.7 (from memory): '+' matches exactly one level, '#' must be last and also
// matches the parent level, topics starting with '$' are not matched by a leading wildcard.
constexpr MatchCase kMatchTable[] = {
    {"tumbleweed/drycreek4/+/+", "tumbleweed/drycreek4/TK1/LEVEL", true},
    {"tumbleweed/drycreek4/+/+", "tumbleweed/drycreek4/TK1", false},
    {"tumbleweed/drycreek4/+/+", "tumbleweed/drycreek4/TK1/LEVEL/raw", false},
    {"tumbleweed/drycreek4/+", "tumbleweed/drycreek4/", true},  // '+' matches an empty level
    {"sport/tennis/player1/#", "sport/tennis/player1", true},   // '#' matches the parent
    {"sport/tennis/player1/#", "sport/tennis/player1/ranking", true},
    {"sport/tennis/player1/#", "sport/tennis/player1/score/wimbledon", true},
    {"sport/tennis/player1/#", "sport/tennis/player2", false},
    {"sport/#", "sport", true},
    {"#", "sport/tennis", true},
    {"#", "/leading/slash", true},
    {"+/+", "/finance", true},  // the empty first level counts
    {"/+", "/finance", true},
    {"+", "/finance", false},
    {"sport/+/player1", "sport/tennis/player1", true},
    {"sport/+/player1", "sport/player1", false},
    {"Sport/tennis", "sport/tennis", false},  // case-sensitive
    {"sport/tennis", "sport/tennis", true},
    {"#", "$SYS/broker/uptime", false},
    {"+/broker/uptime", "$SYS/broker/uptime", false},
    {"$SYS/#", "$SYS/broker/uptime", true},
    {"$SYS/+/uptime", "$SYS/broker/uptime", true},
    {"sport/tennis#", "sport/tennis", false},  // malformed filters match nothing
    {"sport/#/ranking", "sport/x/ranking", false},
    {"sport+", "sport+", false},
    {"sport/+", "sport/+", false},  // a topic name cannot hold wildcards
};

TEST(TopicMatches, FollowsTheWildcardTable) {
  for (const auto& c : kMatchTable) {
    EXPECT_EQ(topic_matches(c.filter, c.topic), c.matches)
        << "filter '" << c.filter << "' topic '" << c.topic << "'";
  }
}

TEST(TopicFilterCheck, RejectsMisplacedWildcardsWithAReason) {
  // MQTT 3.1.1 section 4.7 (from memory): wildcards fill a whole level; '#' only last.
  EXPECT_TRUE(check_topic_filter("a/+/b/#").ok());
  EXPECT_TRUE(check_topic_filter("#").ok());
  const auto hash_inside = check_topic_filter("a/#/b");
  ASSERT_FALSE(hash_inside.ok());
  EXPECT_NE(hash_inside.error().message.find("last level"), std::string::npos);
  EXPECT_FALSE(check_topic_filter("a/b+").ok());
  EXPECT_FALSE(check_topic_filter("a#").ok());
  EXPECT_FALSE(check_topic_filter("").ok());
}

TEST(TagFromTopic, BuildsTheTagFromNumberedLevels) {
  const TopicRule rule{"tumbleweed/drycreek4/+/+", "DC4.{2}.{3}"};
  EXPECT_EQ(tag_from_topic(rule, "tumbleweed/drycreek4/TK1/LEVEL"), "DC4.TK1.LEVEL");
  EXPECT_EQ(tag_from_topic(rule, "tumbleweed/drycreek5/TK1/LEVEL"), std::nullopt);
}

TEST(TagFromTopic, WholeTopicPlaceholderCopiesTheTopic) {
  const TopicRule rule{"tumbleweed/#", "{topic}"};
  EXPECT_EQ(tag_from_topic(rule, "tumbleweed/drycreek4/P1/AMPS"), "tumbleweed/drycreek4/P1/AMPS");
}

TEST(TagFromTopic, LevelBeyondTheTopicGivesNoTag) {
  const TopicRule rule{"tumbleweed/#", "{1}.{3}"};
  EXPECT_EQ(tag_from_topic(rule, "tumbleweed/drycreek4/P1/AMPS"), "drycreek4.AMPS");
  EXPECT_EQ(tag_from_topic(rule, "tumbleweed/drycreek4"), std::nullopt);
}

TEST(TagFromTopic, EmptyLevelDropsItsSeparator) {
  const TopicRule rule{"site/+/+", "{1}.{2}"};
  EXPECT_EQ(tag_from_topic(rule, "site//LEVEL"), "LEVEL");
  EXPECT_EQ(tag_from_topic(rule, "site//"), std::nullopt);  // nothing left: no tag
}

TEST(TagFromTopic, MalformedTemplateGivesNoTag) {
  EXPECT_EQ(tag_from_topic({"a/+", "{1"}, "a/b"), std::nullopt);
  EXPECT_EQ(tag_from_topic({"a/+", "x}{1}"}, "a/b"), std::nullopt);
  EXPECT_EQ(tag_from_topic({"a/+", "{}"}, "a/b"), std::nullopt);
  EXPECT_EQ(tag_from_topic({"a/+", "{name}"}, "a/b"), std::nullopt);
}

TEST(TopicRuleCheck, AcceptsGoodRulesAndExplainsBadOnes) {
  EXPECT_TRUE(check_topic_rule({"tumbleweed/drycreek4/+/+", "{2}.{3}"}).ok());
  EXPECT_TRUE(check_topic_rule({"tumbleweed/#", "{7}"}).ok());  // '#' may bring more levels
  const auto beyond = check_topic_rule({"tumbleweed/+", "{2}"});
  ASSERT_FALSE(beyond.ok());
  EXPECT_NE(beyond.error().message.find("beyond the filter's 2 levels"), std::string::npos);
  const auto unknown = check_topic_rule({"a/+", "{tag}"});
  ASSERT_FALSE(unknown.ok());
  EXPECT_NE(unknown.error().message.find("unknown placeholder {tag}"), std::string::npos);
  EXPECT_FALSE(check_topic_rule({"a/+", ""}).ok());
  EXPECT_FALSE(check_topic_rule({"a/#/b", "{0}"}).ok());
}

TEST(TopicRuleCheck, SparkplugRulesUseTheSessionPlaceholders) {
  using Format = TopicRule::Format;
  EXPECT_TRUE(check_topic_rule({"spBv1.0/DryCreek/#", "{node}.{metric}", Format::sparkplug}).ok());
  EXPECT_FALSE(check_topic_rule({"spBv1.0/DryCreek/#", "{node}", Format::sparkplug}).ok());
  EXPECT_FALSE(check_topic_rule({"spBv1.0/DryCreek/#", "{2}.{metric}", Format::sparkplug}).ok());
}

}  // namespace
}  // namespace bw::io::mqtt
