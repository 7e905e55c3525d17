// The `live:` section: the example site's values, the defaults, and one clear diagnostic with
// file:line:col for each kind of mistake. Filter rules are those of MQTT 3.1.1 section 4.7.
#include "config/live_section.h"

#include <gtest/gtest.h>
#include <unistd.h>

#include <filesystem>
#include <fstream>
#include <string>
#include <vector>

#include "config/site_loader.h"
#include "spec_lookup.h"

namespace bw::config {
namespace {

namespace fs = std::filesystem;
using testing::dump;

const std::string kExampleSite = BRINEWATCH_SOURCE_DIR "/config-examples/dry-creek-swd4.yaml";
const std::string kGoodRules = BRINEWATCH_SOURCE_DIR "/tests/config/fixtures/rules";
constexpr int kFirstLiveLine = 5;  // the line after "live:" in LiveSection::load

TEST(LiveExample, TheExampleSiteLiveSectionLoadsWithTheValuesWritten) {
  const LoadResult result = load_site(kExampleSite);
  ASSERT_TRUE(result.ok()) << dump(result.diagnostics);
  ASSERT_TRUE(result.live.has_value());
  const LiveSpec& live = *result.live;

  EXPECT_EQ(live.broker.uri, "tcp://127.0.0.1:1883");
  EXPECT_EQ(live.broker.client_id, "dc4-brinewatch");
  EXPECT_EQ(live.broker.mqtt_version, 4);
  EXPECT_EQ(live.broker.keep_alive_s, 30);
  EXPECT_EQ(live.broker.credentials_file, "");
  EXPECT_FALSE(live.broker.tls.has_value());
  EXPECT_DOUBLE_EQ(live.broker.reconnect_min_s, 0.5);
  EXPECT_DOUBLE_EQ(live.broker.reconnect_max_s, 30);

  ASSERT_EQ(live.inputs.size(), 2u);
  EXPECT_EQ(live.inputs[0].topic, "tumbleweed/drycreek4/+/+");
  EXPECT_EQ(live.inputs[0].tag_template, "DC4.{2}.{3}");
  EXPECT_EQ(live.inputs[0].format, PayloadFormat::json);
  EXPECT_EQ(live.inputs[0].qos, 1);
  EXPECT_EQ(live.inputs[1].topic, "spBv1.0/DryCreek/#");
  EXPECT_EQ(live.inputs[1].tag_template, "{group}/{node}/{device}/{metric}");
  EXPECT_EQ(live.inputs[1].format, PayloadFormat::sparkplug);
  EXPECT_EQ(live.inputs[1].sparkplug_group, "DryCreek");

  EXPECT_EQ(live.limits.max_payload_bytes, 262144);
  EXPECT_DOUBLE_EQ(live.limits.max_future_s, 300);
  EXPECT_DOUBLE_EQ(live.limits.max_past_s, 7 * 86400);
  EXPECT_EQ(live.outputs.topic_prefix, "brinewatch/dry-creek-swd4");
  ASSERT_TRUE(live.commands.has_value());
  EXPECT_EQ(live.commands->topic, "brinewatch/dry-creek-swd4/commands/+");
  EXPECT_EQ(live.commands->authorised, (std::vector<std::string>{"ops-tablet-1", "control-room"}));
  EXPECT_EQ(live.state.dir, "/var/lib/brinewatch");
  EXPECT_DOUBLE_EQ(live.state.checkpoint_every_s, 300);
  EXPECT_DOUBLE_EQ(live.tick_s, 1);
}

TEST(LiveExample, ASiteWithoutLiveStillLoads) {
  const LoadResult result = load_site_from_string(
      "site: {name: Dry Creek SWD 4, time_zone: America/Chicago}\n"
      "assets:\n"
      "  tank_a: {template: test_vessel, tags: {level: DC4.TK1.LEVEL}}\n",
      "site.yaml", {kGoodRules});
  ASSERT_TRUE(result.ok()) << dump(result.diagnostics);
  EXPECT_FALSE(result.live.has_value());
}

TEST(SiteSlug, RunsOfOtherCharactersBecomeOneDash) {
  EXPECT_EQ(site_slug("Dry Creek SWD 4"), "dry-creek-swd-4");
  EXPECT_EQ(site_slug("  Dry  Creek -- SWD #4 "), "dry-creek-swd-4");
  EXPECT_EQ(site_slug("***"), "");
}

// Each test writes the lines of the live section; files it names live in a fresh folder that
// is also the site file's folder, so relative names resolve there.
class LiveSection : public ::testing::Test {
 protected:
  void SetUp() override {
    const auto* info = ::testing::UnitTest::GetInstance()->current_test_info();
    folder_ = fs::temp_directory_path() /
              ("brinewatch-live-" + std::string(info->name()) + "-" + std::to_string(::getpid()));
    fs::remove_all(folder_);
    fs::create_directories(folder_ / "state");
    label_ = (folder_ / "site.yaml").string();
  }
  void TearDown() override { fs::remove_all(folder_); }

  void make_file(const std::string& name) const { std::ofstream(folder_ / name) << "x\n"; }

  LoadResult load(const std::vector<std::string>& lines) {
    lines_ = lines;
    std::string text =
        "site: {name: Dry Creek SWD 4, time_zone: America/Chicago}\n"
        "assets:\n"
        "  tank_a: {template: test_vessel, tags: {level: DC4.TK1.LEVEL}}\n"
        "live:\n";
    for (const auto& line : lines) text += line + "\n";
    return load_site_from_string(text, label_, {kGoodRules});
  }

  // The 1-based column of the first `needle` on live line `index` (0-based in `lines`).
  int column_of(std::size_t index, const std::string& needle) const {
    const auto at = lines_.at(index).find(needle);
    EXPECT_NE(at, std::string::npos) << needle;
    return static_cast<int>(at) + 1;
  }

  // Exactly one diagnostic, on live line `index` at the first `needle`, with this message.
  void expect_only(const LoadResult& result, std::size_t index, const std::string& needle,
                   const std::string& message) const {
    EXPECT_FALSE(result.ok());
    EXPECT_FALSE(result.live.has_value());
    ASSERT_EQ(result.diagnostics.size(), 1u) << dump(result.diagnostics);
    const Diagnostic& d = result.diagnostics[0];
    EXPECT_EQ(d.file, label_);
    EXPECT_EQ(d.line, kFirstLiveLine + static_cast<int>(index));
    EXPECT_EQ(d.column, column_of(index, needle));
    EXPECT_EQ(d.message, message);
    EXPECT_EQ(d.source_line, lines_.at(index));
  }

  std::string path(const std::string& name) const { return (folder_ / name).string(); }

  fs::path folder_;
  std::string label_;
  std::vector<std::string> lines_;
};

const std::string kBroker = "  broker: {uri: tcp://127.0.0.1:1883}";
const std::string kInputs = "  inputs: [{topic: tumbleweed/drycreek4/+/+, tag: \"{2}.{3}\"}]";
const std::string kState = "  state: {dir: state}";

TEST_F(LiveSection, OmittedKeysTakeTheirDefaults) {
  const auto result = load({kBroker, "  inputs: [{topic: tumbleweed/#}]", kState});
  ASSERT_TRUE(result.ok()) << dump(result.diagnostics);
  const LiveSpec& live = *result.live;
  EXPECT_EQ(live.broker.client_id, "brinewatch-dry-creek-swd-4");
  EXPECT_EQ(live.broker.mqtt_version, 4);
  EXPECT_EQ(live.broker.keep_alive_s, 30);
  EXPECT_DOUBLE_EQ(live.broker.reconnect_min_s, 0.5);
  EXPECT_DOUBLE_EQ(live.broker.reconnect_max_s, 30);
  ASSERT_EQ(live.inputs.size(), 1u);
  EXPECT_EQ(live.inputs[0].tag_template, "{topic}");
  EXPECT_EQ(live.inputs[0].format, PayloadFormat::json);
  EXPECT_EQ(live.inputs[0].qos, 1);
  EXPECT_EQ(live.limits.max_payload_bytes, 256 * 1024);
  EXPECT_DOUBLE_EQ(live.limits.max_future_s, 300);
  EXPECT_DOUBLE_EQ(live.limits.max_past_s, 604800);
  EXPECT_EQ(live.outputs.topic_prefix, "brinewatch/dry-creek-swd-4");
  EXPECT_FALSE(live.commands.has_value());
  EXPECT_EQ(live.state.dir, path("state"));  // relative to the site file's folder
  EXPECT_DOUBLE_EQ(live.state.checkpoint_every_s, 300);
  EXPECT_DOUBLE_EQ(live.tick_s, 1);
}

TEST_F(LiveSection, TlsFilesAreResolvedBesideTheSiteFile) {
  for (const char* name : {"ca.pem", "client.pem", "client.key", "broker.credentials"}) {
    make_file(name);
  }
  const auto result = load({
      "  broker:",
      "    uri: ssl://[::1]:8883",
      "    mqtt_version: 5",
      "    keep_alive: 1min",
      "    credentials_file: broker.credentials",
      "    tls: {ca_file: ca.pem, cert_file: client.pem, key_file: client.key}",
      kInputs,
      kState,
  });
  ASSERT_TRUE(result.ok()) << dump(result.diagnostics);
  const BrokerSpec& broker = result.live->broker;
  EXPECT_EQ(broker.mqtt_version, 5);
  EXPECT_EQ(broker.keep_alive_s, 60);
  EXPECT_EQ(broker.credentials_file, path("broker.credentials"));
  ASSERT_TRUE(broker.tls.has_value());
  EXPECT_EQ(broker.tls->ca_file, path("ca.pem"));
  EXPECT_EQ(broker.tls->cert_file, path("client.pem"));
  EXPECT_EQ(broker.tls->key_file, path("client.key"));
}

TEST_F(LiveSection, UnknownKeySuggestsTheNearest) {
  expect_only(load({"  broker: {uri: tcp://127.0.0.1:1883, clientid: dc4}", kInputs, kState}), 0,
              "clientid", "live.broker: unknown key 'clientid'; did you mean 'client_id'?");
  expect_only(load({kBroker, kInputs, kState, "  tik: 1s"}), 3, "tik",
              "live: unknown key 'tik'; did you mean 'tick'?");
}

TEST_F(LiveSection, BadSchemeIsRefused) {
  expect_only(load({"  broker: {uri: mqtt://127.0.0.1:1883}", kInputs, kState}), 0, "mqtt:",
              "live.broker: key 'uri': scheme 'mqtt' is not supported; use tcp:// or ssl://");
  expect_only(load({"  broker: {uri: tpc://127.0.0.1:1883}", kInputs, kState}), 0, "tpc:",
              "live.broker: key 'uri': scheme 'tpc' is not supported; use tcp:// or ssl://; did "
              "you mean 'tcp'?");
  expect_only(load({"  broker: {uri: tcp://127.0.0.1:70000}", kInputs, kState}), 0,
              "tcp:", "live.broker: key 'uri': port '70000' is not a number from 1 to 65535");
}

TEST_F(LiveSection, SslWithoutCaFileIsRefused) {
  expect_only(load({"  broker: {uri: ssl://127.0.0.1:8883}", kInputs, kState}), 0, "ssl:",
              "live.broker: key 'uri': an ssl:// broker needs 'tls: {ca_file: ...}' to verify its "
              "certificate");
  make_file("client.pem");
  make_file("client.key");
  expect_only(load({"  broker:", "    uri: ssl://127.0.0.1:8883",
                    "    tls: {cert_file: client.pem, key_file: client.key}", kInputs, kState}),
              2, "{", "live.broker.tls: missing required key 'ca_file'");
}

TEST_F(LiveSection, TlsOnATcpBrokerIsRefused) {
  make_file("ca.pem");
  expect_only(load({"  broker:", "    uri: tcp://127.0.0.1:1883", "    tls: {ca_file: ca.pem}",
                    kInputs, kState}),
              2, "{",
              "live.broker: key 'tls' is given but the uri is tcp://; use ssl:// or remove 'tls'");
}

TEST_F(LiveSection, CertificateWithoutKeyIsRefused) {
  make_file("ca.pem");
  make_file("client.pem");
  expect_only(load({"  broker:", "    uri: ssl://127.0.0.1:8883",
                    "    tls: {ca_file: ca.pem, cert_file: client.pem}", kInputs, kState}),
              2, "{", "live.broker.tls: give 'cert_file' and 'key_file' together, or neither");
}

TEST_F(LiveSection, NamedFilesMustExistAndBeFiles) {
  expect_only(
      load({"  broker:", "    uri: ssl://127.0.0.1:8883", "    tls: {ca_file: ca.pem}", kInputs,
            kState}),
      2, "ca.pem",
      "live.broker.tls: key 'ca_file': '" + path("ca.pem") + "': No such file or directory");
  expect_only(load({"  broker:", "    uri: ssl://127.0.0.1:8883", "    tls: {ca_file: state}",
                    kInputs, kState}),
              2, "state",
              "live.broker.tls: key 'ca_file': '" + path("state") + "' is a folder, not a file");
  expect_only(load({"  broker:", "    uri: tcp://127.0.0.1:1883",
                    "    credentials_file: broker.credentials", kInputs, kState}),
              2, "broker.credentials",
              "live.broker: key 'credentials_file': '" + path("broker.credentials") +
                  "': No such file or directory");
}

TEST_F(LiveSection, WildcardThatIsNotAWholeLevelIsRefused) {
  expect_only(load({kBroker, "  inputs: [{topic: tumbleweed/dc4+/level}]", kState}), 1,
              "tumbleweed",
              "live.inputs item 1: key 'topic': filter 'tumbleweed/dc4+/level': level 'dc4+': a "
              "wildcard '+' or '#' must be a whole level");
  expect_only(load({kBroker, "  inputs: [{topic: tumbleweed/#/level}]", kState}), 1, "tumbleweed",
              "live.inputs item 1: key 'topic': filter 'tumbleweed/#/level': '#' must be the last "
              "level");
}

TEST_F(LiveSection, TemplateLevelBeyondTheFilterIsRefused) {
  expect_only(
      load({kBroker, "  inputs: [{topic: tumbleweed/drycreek4/+/+, tag: \"{4}\"}]", kState}), 1,
      "\"{4}\"",
      "live.inputs item 1: key 'tag': template '{4}': '{4}' names level 4, but the filter "
      "has 4 levels (0 to 3)");
  // Under '#' any level may exist, so any level may be named.
  const auto open_ended =
      load({kBroker, "  inputs: [{topic: tumbleweed/#, tag: \"{7}\"}]", kState});
  EXPECT_TRUE(open_ended.ok()) << dump(open_ended.diagnostics);
}

TEST_F(LiveSection, PlaceholderMustBeALevelNumberOrTopic) {
  expect_only(load({kBroker, "  inputs: [{topic: a/+, tag: \"{tpoic}\"}]", kState}), 1, "\"{tpoic",
              "live.inputs item 1: key 'tag': template '{tpoic}': '{tpoic}': a placeholder is a "
              "topic level number such as {2}, or {topic}; did you mean 'topic'?");
  expect_only(load({kBroker, "  inputs: [{topic: a/+, tag: \"x.{1\"}]", kState}), 1, "\"x",
              "live.inputs item 1: key 'tag': template 'x.{1': a '{' without its '}'");
  expect_only(
      load({kBroker, "  inputs: [{sparkplug_group: DryCreek, tag: \"{grop}.{metric}\"}]", kState}),
      1, "\"{grop",
      "live.inputs item 1: key 'tag': template '{grop}.{metric}': '{grop}' is no "
      "placeholder of a sparkplug input; use {group}, {node}, {device} or {metric}; did "
      "you mean 'group'?");
}

TEST_F(LiveSection, InputNeedsExactlyOneOfTopicAndSparkplugGroup) {
  expect_only(load({kBroker, "  inputs: [{topic: a/+, sparkplug_group: DryCreek}]", kState}), 1,
              "{topic",
              "live.inputs item 1: give either 'topic' (an MQTT filter) or 'sparkplug_group', not "
              "both");
  expect_only(load({kBroker, "  inputs: [{qos: 0}]", kState}), 1, "{qos",
              "live.inputs item 1: give either 'topic' (an MQTT filter) or 'sparkplug_group'");
}

TEST_F(LiveSection, SparkplugFilterMustBeInTheSparkplugNamespace) {
  expect_only(load({kBroker, "  inputs: [{topic: tumbleweed/#, format: sparkplug}]", kState}), 1,
              "tumbleweed",
              "live.inputs item 1: key 'topic': a sparkplug input's filter starts with "
              "'spBv1.0/', got 'tumbleweed/#'");
}

TEST_F(LiveSection, FilterSubscribedTwiceIsRefused) {
  expect_only(
      load({kBroker, "  inputs: [{sparkplug_group: DC}, {topic: spBv1.0/DC/#, format: sparkplug}]",
            kState}),
      1, "spBv1.0",
      "live.inputs item 2: topic filter 'spBv1.0/DC/#' is already subscribed by item 1");
}

TEST_F(LiveSection, WholeNumbersAndBoundsAreChecked) {
  expect_only(load({kBroker, "  inputs: [{topic: a/+, qos: 2}]", kState}), 1, "2",
              "live.inputs item 1: key 'qos': must be in [0, 1], got 2");
  expect_only(load({"  broker: {uri: tcp://127.0.0.1:1883, keep_alive: 1.5s}", kInputs, kState}), 0,
              "1.5s", "live.broker: key 'keep_alive': must be a whole number of seconds, got 1.5");
  expect_only(load({kBroker, kInputs, kState, "  tick: 0s"}), 3, "0s",
              "live: key 'tick': must be > 0, got 0");
  expect_only(load({"  broker: {uri: tcp://127.0.0.1:1883, reconnect: {min: 1min, max: 10s}}",
                    kInputs, kState}),
              0, "{min", "live.broker.reconnect: 'min' must not exceed 'max'");
}

TEST_F(LiveSection, StateDirIsRequired) {
  expect_only(load({kBroker, kInputs, "  state: {checkpoint_every: 5min}"}), 2, "{",
              "live.state: missing required key 'dir'");
  expect_only(load({kBroker, kInputs}), 0, "broker", "live: missing required key 'state'");
  make_file("plain");
  expect_only(load({kBroker, kInputs, "  state: {dir: plain}"}), 2, "plain",
              "live.state: key 'dir': '" + path("plain") + "' exists but is not a folder");
}

TEST_F(LiveSection, CommandsNeedAuthorisedClients) {
  expect_only(
      load({kBroker, kInputs, kState, "  commands: {topic: dc4/commands/+, authorised: []}"}), 3,
      "[]",
      "live.commands: key 'authorised': name at least one client id whose commands are "
      "accepted, as a list such as [ops-tablet-1], got an empty list");
  expect_only(
      load({kBroker, kInputs, kState, "  commands: {topic: dc4/+/commands, authorised: [tab]}"}), 3,
      "dc4",
      "live.commands: key 'topic': must end in the level '+' (the id of the sending client) and "
      "have no other wildcard, got 'dc4/+/commands'");
}

TEST_F(LiveSection, AuthorisedClientIdIsOneTopicLevel) {
  expect_only(
      load(
          {kBroker, kInputs, kState, "  commands: {topic: dc4/commands/+, authorised: [ops/tab]}"}),
      3, "ops/",
      "live.commands: key 'authorised': client id 'ops/tab' must not contain '/', '+' or '#'");
}

TEST_F(LiveSection, OutputPrefixMustNotHoldAWildcard) {
  expect_only(load({kBroker, kInputs, kState, "  outputs: {topic_prefix: brinewatch/+}"}), 3,
              "brinewatch",
              "live.outputs: key 'topic_prefix': 'brinewatch/+' must not contain '+', '#' or a NUL "
              "character");
}

TEST_F(LiveSection, EveryProblemOfTheSectionIsReportedInOnePass) {
  const auto result = load({
      "  broker: {uri: mqtt://127.0.0.1}",                // bad scheme
      "  inputs: [{topic: a/b+, qos: 1}, {topic: a/+}]",  // bad filter
      "  state: {checkpoint_every: 5min}",                // no dir
  });
  ASSERT_EQ(result.diagnostics.size(), 3u) << dump(result.diagnostics);
  EXPECT_EQ(result.diagnostics[0].line, kFirstLiveLine);
  EXPECT_EQ(result.diagnostics[1].line, kFirstLiveLine + 1);
  EXPECT_EQ(result.diagnostics[2].line, kFirstLiveLine + 2);
  EXPECT_FALSE(result.site.has_value());
  EXPECT_FALSE(result.live.has_value());
}

}  // namespace
}  // namespace bw::config
