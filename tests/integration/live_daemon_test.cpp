// The live path end to end: a real mosquitto on a fresh loopback port, `brinewatch run` as its
// own process, samples published over MQTT, alerts read back over MQTT.
#include <gtest/gtest.h>
#include <signal.h>
#include <spawn.h>
#include <sys/wait.h>

#include <cmath>
#include <filesystem>
#include <fstream>
#include <map>
#include <set>
#include <thread>

#include "mqtt_test_support.h"

extern char** environ;

namespace bw::testing {
namespace {

namespace fs = std::filesystem;
using namespace std::chrono_literals;

constexpr const char* kPrefix = "bw/tf1";

// Pulls one text field out of a flat JSON object written by brinewatch (enough for its alerts).
std::string field(const std::string& json, const std::string& name) {
  const std::string key = "\"" + name + "\":\"";
  const auto at = json.find(key);
  if (at == std::string::npos) return {};
  const auto end = json.find('"', at + key.size());
  return json.substr(at + key.size(), end - at - key.size());
}

// A site with the test template, bound to tag TF1.TK1.LEVEL, reading topic tf1/<tank>/<kind>.
fs::path write_site(const fs::path& dir, const MosquittoHarness& broker) {
  const fs::path site = dir / "site.yaml";
  std::ofstream(site) << "site: {name: Test Flats SWD 1, time_zone: UTC}\n"
                      << "rules: [" << BRINEWATCH_SOURCE_DIR << "/tests/integration/fixtures/rules]\n"
                      << "assets:\n  tank_a:\n    template: test_level\n"
                      << "    tags: {level: TF1.TK1.LEVEL}\n"
                      << "live:\n"
                      << "  broker: {uri: \"" << broker.uri() << "\", client_id: tf1-daemon,"
                      << " reconnect: {min: 0.1s, max: 1s}}\n"
                      << "  inputs:\n    - {topic: \"tf1/+/+\", tag: \"TF1.{1}.{2}\"}\n"
                      << "  outputs: {topic_prefix: " << kPrefix << "}\n"
                      << "  commands: {topic: \"" << kPrefix << "/commands/+\", authorised: [ops-1]}\n"
                      << "  state: {dir: " << (dir / "state").string() << "}\n";
  return site;
}

// The invented level: a slow swing across 15 ft, one sample every 10 s from an hour ago.
struct Sample {
  std::int64_t epoch_s;
  double level;
};
std::vector<Sample> swing(int count) {
  const std::int64_t start =
      std::chrono::duration_cast<std::chrono::seconds>(std::chrono::system_clock::now().time_since_epoch())
          .count() - 3600;
  std::vector<Sample> out;
  for (int i = 0; i < count; ++i) out.push_back({start + 10 * i, 13.0 + 3.0 * std::sin(i / 6.0)});
  return out;
}

std::string payload_of(const Sample& s) {
  return "{\"value\": " + std::to_string(s.level) + ", \"time\": " + std::to_string(s.epoch_s) + "}";
}

class Daemon {
 public:
  Daemon(const fs::path& site, const fs::path& log) : log_(log) {
    const std::string command = "exec " + std::string(BRINEWATCH_EXE) + " run --config " +
                                site.string() + " >" + log.string() + " 2>&1";
    const char* argv[] = {"/bin/sh", "-c", command.c_str(), nullptr};
    if (posix_spawn(&pid_, "/bin/sh", nullptr, nullptr, const_cast<char**>(argv), environ) != 0) pid_ = -1;
  }
  ~Daemon() {
    if (pid_ > 0) {
      ::kill(pid_, SIGKILL);
      waitpid(pid_, nullptr, 0);
    }
  }
  // SIGTERM and wait; the exit status.
  int stop() {
    int status = -1;
    ::kill(pid_, SIGTERM);
    waitpid(pid_, &status, 0);
    pid_ = -1;
    return WIFEXITED(status) ? WEXITSTATUS(status) : -1;
  }
  std::string log() const {
    std::ifstream in(log_);
    return {std::istreambuf_iterator<char>(in), {}};
  }
  bool running() const { return pid_ > 0; }

 private:
  fs::path log_;
  pid_t pid_ = -1;
};

// A test client: subscribes to everything the daemon publishes and publishes samples/commands.
class Crew {
 public:
  Crew(const MosquittoHarness& broker, const std::string& id) : events_(loop_.strand()) {
    auto settings = test_settings(broker, id);
    settings.subscriptions = {{std::string(kPrefix) + "/#", 1}};
    auto client = io::MqttClient::create(std::move(settings), loop_.strand(), events_);
    EXPECT_TRUE(client.ok());
    if (client) client_ = std::move(client).value();
    client_->start();
    EXPECT_TRUE(events_.wait_connects(1));
  }
  ~Crew() { client_->stop(); }
  void publish(const std::string& topic, const std::string& payload) {
    for (int attempt = 0; attempt < 200; ++attempt) {
      if (client_->publish(next_id_, topic, payload, 1, false)) {
        ++next_id_;
        return;
      }
      std::this_thread::sleep_for(50ms);  // not connected (broker restarting): try again
    }
    ADD_FAILURE() << "could not publish to " << topic;
  }
  bool wait_delivered(std::uint64_t n, std::chrono::seconds timeout = 20s) {
    const auto deadline = Clock::now() + timeout;
    while (Clock::now() < deadline) {
      if (events_.delivered().size() >= n) return true;
      std::this_thread::sleep_for(20ms);
    }
    return false;
  }
  std::vector<std::string> payloads(const std::string& topic) const {
    std::vector<std::string> out;
    for (const auto& m : events_.messages()) {
      if (m.message.topic == topic) out.push_back(m.message.payload);
    }
    return out;
  }
  // Whether the last message on `topic` came as the broker's retained copy.
  bool last_retained(const std::string& topic) const {
    bool retained = false;
    for (const auto& m : events_.messages()) {
      if (m.message.topic == topic) retained = m.message.retained;
    }
    return retained;
  }
  // Waits until `topic` has at least n messages.
  bool wait_for(const std::string& topic, std::size_t n, std::chrono::seconds timeout = 20s) const {
    const auto deadline = Clock::now() + timeout;
    while (Clock::now() < deadline) {
      if (payloads(topic).size() >= n) return true;
      std::this_thread::sleep_for(20ms);
    }
    return false;
  }
  std::uint64_t published() const { return next_id_ - 1; }

 private:
  AsioLoop loop_;
  RecordingEvents events_;
  std::unique_ptr<io::MqttClient> client_;
  std::uint64_t next_id_ = 1;
};

// The alerts a replay of the same samples writes: what live must match, id for id.
std::vector<std::string> replayed_alert_ids(const fs::path& dir, const fs::path& site,
                                            const std::vector<Sample>& samples) {
  std::ofstream csv(dir / "history.csv");
  csv << "time,tag,value\n";
  for (const auto& s : samples) csv << s.epoch_s << ",TF1.TK1.LEVEL," << s.level << "\n";
  csv.close();
  const std::string command = std::string(BRINEWATCH_EXE) + " replay --config " + site.string() +
                              " --input " + (dir / "history.csv").string() + " --alerts " +
                              (dir / "replayed.jsonl").string() + " >/dev/null 2>&1";
  EXPECT_EQ(std::system(command.c_str()), 0);
  std::vector<std::string> ids;
  std::ifstream in(dir / "replayed.jsonl");
  for (std::string line; std::getline(in, line);) ids.push_back(field(line, "id"));
  return ids;
}

std::vector<std::string> ids_of(const std::vector<std::string>& payloads) {
  std::vector<std::string> ids;
  for (const auto& p : payloads) ids.push_back(field(p, "id"));
  return ids;
}

fs::path scratch(const std::string& name) {
  const fs::path dir = fs::temp_directory_path() / ("brinewatch-live-" + std::to_string(getpid())) / name;
  fs::remove_all(dir);
  fs::create_directories(dir);
  return dir;
}

TEST(LiveDaemon, SamplesInAlertsOutTheSameAsReplayAndAStatusWithALastWill) {
  BW_NEED_MOSQUITTO();
  MosquittoHarness broker;
  ASSERT_TRUE(broker.start().ok()) << broker.log();
  const fs::path dir = scratch("same-as-replay");
  const fs::path site = write_site(dir, broker);
  const auto samples = swing(120);
  Crew crew(broker, "crew-watch");
  Daemon daemon(site, dir / "daemon.log");
  ASSERT_TRUE(crew.wait_for(std::string(kPrefix) + "/status", 1)) << daemon.log();
  EXPECT_EQ(crew.payloads(std::string(kPrefix) + "/status").back(), "online");

  for (const auto& s : samples) crew.publish("tf1/TK1/LEVEL", payload_of(s));
  ASSERT_TRUE(crew.wait_delivered(samples.size()));
  const auto expected = replayed_alert_ids(dir / "..", site, samples);
  ASSERT_GE(expected.size(), 4u) << "the swing crosses the limit several times";
  ASSERT_TRUE(crew.wait_for(std::string(kPrefix) + "/alerts", expected.size())) << daemon.log();
  EXPECT_EQ(ids_of(crew.payloads(std::string(kPrefix) + "/alerts")), expected)
      << "live and replay give the same alerts, same ids, same order";
  EXPECT_TRUE(crew.wait_for(std::string(kPrefix) + "/summary/tank_a", 1));

  EXPECT_EQ(daemon.stop(), 0) << daemon.log();
  ASSERT_TRUE(crew.wait_for(std::string(kPrefix) + "/status", 2));
  EXPECT_EQ(crew.payloads(std::string(kPrefix) + "/status").back(), "offline");
}

TEST(LiveDaemon, EveryAlertArrivesOnceByIdAcrossBrokerRestarts) {
  BW_NEED_MOSQUITTO();
  MosquittoHarness broker;
  ASSERT_TRUE(broker.start().ok()) << broker.log();
  const fs::path dir = scratch("restarts");
  const fs::path site = write_site(dir, broker);
  const auto samples = swing(240);
  Crew crew(broker, "crew-restarts");
  Daemon daemon(site, dir / "daemon.log");
  ASSERT_TRUE(crew.wait_for(std::string(kPrefix) + "/status", 1)) << daemon.log();
  const std::size_t chunk = samples.size() / 4;
  for (std::size_t i = 0; i < samples.size(); ++i) {
    crew.publish("tf1/TK1/LEVEL", payload_of(samples[i]));
    if (i % chunk == chunk - 1 && i + 1 < samples.size()) {
      // Let the broker hand what it holds to its persistence file, then take it down: twice
      // cleanly (SIGTERM), once with SIGKILL.
      ASSERT_TRUE(crew.wait_delivered(i + 1));
      broker.wait_for_autosave();
      if (i / chunk == 1) {
        broker.kill();
      } else {
        broker.stop();
      }
      std::this_thread::sleep_for(300ms);
      ASSERT_TRUE(broker.start().ok()) << broker.log();
    }
  }
  ASSERT_TRUE(crew.wait_delivered(samples.size()));
  const auto expected = replayed_alert_ids(dir / "..", site, samples);
  const std::set<std::string> expected_set(expected.begin(), expected.end());
  ASSERT_EQ(expected_set.size(), expected.size());
  const auto deadline = Clock::now() + 30s;
  std::set<std::string> received;
  std::size_t copies = 0;
  while (Clock::now() < deadline) {
    const auto ids = ids_of(crew.payloads(std::string(kPrefix) + "/alerts"));
    received = {ids.begin(), ids.end()};
    copies = ids.size();
    if (received.size() >= expected_set.size()) break;
    std::this_thread::sleep_for(50ms);
  }
  EXPECT_EQ(received, expected_set) << "every alert arrives, by id" << daemon.log();
  std::printf("[ figures  ] %zu alerts, %zu copies received across 3 broker restarts\n",
              expected_set.size(), copies);
  EXPECT_EQ(daemon.stop(), 0);
}

TEST(LiveDaemon, CommandsFromUnauthorisedClientsChangeNothing) {
  BW_NEED_MOSQUITTO();
  MosquittoHarness broker;
  ASSERT_TRUE(broker.start().ok()) << broker.log();
  const fs::path dir = scratch("commands");
  const fs::path site = write_site(dir, broker);
  Crew crew(broker, "crew-commands");
  Daemon daemon(site, dir / "daemon.log");
  ASSERT_TRUE(crew.wait_for(std::string(kPrefix) + "/status", 1)) << daemon.log();
  const auto now = swing(1)[0].epoch_s + 3600;
  crew.publish("tf1/TK1/LEVEL", "{\"value\": 17.0, \"time\": " + std::to_string(now) + "}");
  ASSERT_TRUE(crew.wait_for(std::string(kPrefix) + "/alerts", 1)) << daemon.log();
  const std::string ack =
      R"({"command": "acknowledge", "asset": "tank_a", "check": "level_high", "who": "Dana Ortiz", "reason": "seen"})";

  crew.publish(std::string(kPrefix) + "/commands/intruder", ack);
  ASSERT_TRUE(crew.wait_for(std::string(kPrefix) + "/replies/intruder", 1));
  EXPECT_NE(crew.payloads(std::string(kPrefix) + "/replies/intruder")[0].find("\"accepted\":false"),
            std::string::npos);
  ASSERT_TRUE(crew.wait_for(std::string(kPrefix) + "/alerts", 2));
  EXPECT_EQ(field(crew.payloads(std::string(kPrefix) + "/alerts")[1], "event"), "command_refused");
  EXPECT_EQ(field(crew.payloads(std::string(kPrefix) + "/alerts")[1], "state"), "unacknowledged")
      << "the refused command changed nothing";

  crew.publish(std::string(kPrefix) + "/commands/ops-1", ack);
  ASSERT_TRUE(crew.wait_for(std::string(kPrefix) + "/replies/ops-1", 1));
  EXPECT_NE(crew.payloads(std::string(kPrefix) + "/replies/ops-1")[0].find("\"accepted\":true"),
            std::string::npos);
  ASSERT_TRUE(crew.wait_for(std::string(kPrefix) + "/alerts", 3));
  EXPECT_EQ(field(crew.payloads(std::string(kPrefix) + "/alerts")[2], "state"), "acknowledged");
  EXPECT_EQ(daemon.stop(), 0);
}

TEST(LiveDaemon, AFloodOfMalformedPayloadsIsCountedAndGoodSamplesKeepFlowing) {
  BW_NEED_MOSQUITTO();
  MosquittoHarness broker;
  ASSERT_TRUE(broker.start().ok()) << broker.log();
  const fs::path dir = scratch("malformed");
  const fs::path site = write_site(dir, broker);
  Crew crew(broker, "crew-malformed");
  Daemon daemon(site, dir / "daemon.log");
  ASSERT_TRUE(crew.wait_for(std::string(kPrefix) + "/status", 1)) << daemon.log();
  const auto samples = swing(60);
  const std::vector<std::string> garbage = {"", "{", "nan", "[1,2", "{\"value\": \"abc\"}",
                                            std::string(300000, 'x'), "\xff\xfe\x00\x01"};
  constexpr int kBadPerGood = 7;
  for (const auto& s : samples) {
    for (int b = 0; b < kBadPerGood; ++b) crew.publish("tf1/TK1/LEVEL", garbage[static_cast<std::size_t>(b) % garbage.size()]);
    crew.publish("tf1/TK1/LEVEL", payload_of(s));
  }
  ASSERT_TRUE(crew.wait_delivered(samples.size() * (kBadPerGood + 1)));
  const auto expected = replayed_alert_ids(dir / "..", site, samples);
  ASSERT_TRUE(crew.wait_for(std::string(kPrefix) + "/alerts", expected.size())) << daemon.log();
  EXPECT_EQ(ids_of(crew.payloads(std::string(kPrefix) + "/alerts")), expected);
  ASSERT_EQ(daemon.stop(), 0);
  // The daemon's closing line counts what it got. QoS 1 is at-least-once, so under load the
  // broker may hand over a message twice: every copy must then be accounted for as well.
  const std::string log = daemon.log();
  const auto at = log.find("stopped: ");
  ASSERT_NE(at, std::string::npos) << log;
  unsigned long long messages = 0, good = 0, rejected = 0;
  ASSERT_EQ(std::sscanf(log.c_str() + at, "stopped: %llu messages, %llu samples, %llu rejected",
                        &messages, &good, &rejected),
            3)
      << log;
  const unsigned long long sent_good = samples.size();
  const unsigned long long sent_bad = samples.size() * kBadPerGood;
  EXPECT_GE(good, sent_good);
  EXPECT_GE(rejected, sent_bad);
  EXPECT_EQ(messages - (sent_good + sent_bad), (good - sent_good) + (rejected - sent_bad))
      << "every message is either a sample or a counted rejection";
  std::printf("[ figures  ] %llu messages: %llu samples, %llu rejected\n", messages, good, rejected);
}

// The roll-up follows the alert book: normal at start, "visit soon" once the high-priority level
// alert is raised (rule in engine/site_health.h), still "visit soon" but acknowledged after the
// crew acknowledges; a client that subscribes later gets the latest as the retained copy.
TEST(LiveDaemon, SiteHealthIsRetainedAtStartAndFollowsTheAlerts) {
  BW_NEED_MOSQUITTO();
  MosquittoHarness broker;
  ASSERT_TRUE(broker.start().ok()) << broker.log();
  const fs::path dir = scratch("site-health");
  const fs::path site = write_site(dir, broker);
  const std::string topic = std::string(kPrefix) + "/site_health";
  Crew crew(broker, "crew-health");
  Daemon daemon(site, dir / "daemon.log");
  ASSERT_TRUE(crew.wait_for(topic, 1)) << "published once at start" << daemon.log();
  std::string health = crew.payloads(topic).back();
  EXPECT_EQ(field(health, "site"), "Test Flats SWD 1");
  EXPECT_EQ(field(health, "status"), "normal") << health;
  EXPECT_NE(health.find(R"("assets":[{"asset":"tank_a","status":"normal")"), std::string::npos)
      << health;

  const auto now = swing(1)[0].epoch_s + 3600;
  crew.publish("tf1/TK1/LEVEL", "{\"value\": 17.0, \"time\": " + std::to_string(now) + "}");
  ASSERT_TRUE(crew.wait_for(topic, 2)) << daemon.log();
  health = crew.payloads(topic).back();
  EXPECT_EQ(field(health, "status"), "visit soon") << health;
  EXPECT_NE(health.find(R"("unacknowledged":{"low":0,"medium":0,"high":1,"urgent":0})"),
            std::string::npos)
      << health;
  EXPECT_NE(health.find(R"("worst_active_priority":"high")"), std::string::npos) << health;
  EXPECT_FALSE(field(health, "oldest_unacknowledged").empty()) << health;

  crew.publish(std::string(kPrefix) + "/commands/ops-1",
               R"({"command": "acknowledge", "asset": "tank_a", "check": "level_high", )"
               R"("who": "Dana Ortiz", "reason": "driving out"})");
  ASSERT_TRUE(crew.wait_for(topic, 3)) << daemon.log();
  health = crew.payloads(topic).back();
  EXPECT_EQ(field(health, "status"), "visit soon") << "acknowledged is not resolved: " << health;
  EXPECT_NE(health.find(R"("acknowledged":{"low":0,"medium":0,"high":1,"urgent":0})"),
            std::string::npos)
      << health;
  EXPECT_NE(health.find(R"("oldest_unacknowledged":null)"), std::string::npos) << health;

  Crew late(broker, "crew-late");
  ASSERT_TRUE(late.wait_for(topic, 1));
  EXPECT_EQ(late.payloads(topic).back(), health) << "the broker keeps the latest";
  EXPECT_TRUE(late.last_retained(topic));
  EXPECT_EQ(crew.payloads(topic).size(), 3u) << "published only when it changed";
  EXPECT_EQ(daemon.stop(), 0) << daemon.log();
}

}  // namespace
}  // namespace bw::testing
