// MqttClient against a real mosquitto broker (the reference: a broker and command-line clients
// this project did not write), each test on its own broker and fresh loopback port.
#include "io/mqtt_client.h"

#include <gtest/gtest.h>
#include <signal.h>
#include <sys/stat.h>
#include <sys/wait.h>
#include <unistd.h>

#include <algorithm>
#include <cstdio>
#include <fstream>
#include <memory>
#include <thread>

#include "mosquitto_harness.h"
#include "mqtt_test_support.h"

namespace bw::testing {
namespace {

using io::MqttClient;
using io::MqttSettings;
using namespace std::chrono_literals;

constexpr const char* kTagFilter = "drycreek/swd4/tags/#";

std::unique_ptr<MqttClient> make_client(MqttSettings settings, const AsioLoop& loop,
                                        RecordingEvents& events) {
  Result<std::unique_ptr<MqttClient>> client =
      MqttClient::create(std::move(settings), loop.strand(), events);
  EXPECT_TRUE(client.ok()) << (client.ok() ? "" : client.error().message);
  return client.ok() ? std::move(client).value() : nullptr;
}

double percentile(std::vector<double> values, double fraction) {
  std::sort(values.begin(), values.end());
  const auto index = static_cast<std::size_t>(fraction * static_cast<double>(values.size() - 1));
  return values[index];
}

TEST(MqttClient, Qos1RoundTripDeliversEachPublishIdOnce) {
  BW_NEED_MOSQUITTO();
  MosquittoHarness broker;
  ASSERT_TRUE(broker.start().ok()) << broker.log();
  AsioLoop loop;
  RecordingEvents sub_events(loop.strand());
  RecordingEvents pub_events(loop.strand());
  MqttSettings sub_settings = test_settings(broker, "swd4-round-trip-sub");
  sub_settings.subscriptions = {{kTagFilter, 1}};
  auto subscriber = make_client(sub_settings, loop, sub_events);
  auto publisher = make_client(test_settings(broker, "swd4-round-trip-pub"), loop, pub_events);
  ASSERT_TRUE(subscriber && publisher);

  EXPECT_FALSE(publisher->publish(0, "drycreek/swd4/tags/early", "x", 1, false))
      << "publish before connecting must be refused";
  const Clock::time_point connect_start = Clock::now();
  subscriber->start();
  publisher->start();
  ASSERT_TRUE(sub_events.wait_connects(1)) << broker.log();
  ASSERT_TRUE(pub_events.wait_connects(1)) << broker.log();
  std::printf("[figure] connect (two clients, subscription granted): %.1f ms\n",
              milliseconds_between(connect_start, Clock::now()));
  EXPECT_FALSE(sub_events.connects()[0].session_present) << "a new client id has no session";
  EXPECT_TRUE(subscriber->connected());

  // One message in flight at a time, so each figure is one publish -> broker -> subscriber trip.
  constexpr int kMessages = 3000;
  std::vector<double> trip_ms;
  trip_ms.reserve(kMessages);
  for (int i = 0; i < kMessages; ++i) {
    const Clock::time_point sent = Clock::now();
    ASSERT_TRUE(publisher->publish(static_cast<std::uint64_t>(i) + 1,
                                   "drycreek/swd4/tags/TK-101.level", std::to_string(i), 1, false));
    ASSERT_TRUE(sub_events.wait_messages(static_cast<std::size_t>(i) + 1, 5s)) << "message " << i;
    trip_ms.push_back(milliseconds_between(sent, sub_events.last_message().at));
  }
  ASSERT_TRUE(pub_events.wait_until(
      [&] { return pub_events.delivered().size() >= static_cast<std::size_t>(kMessages); }));
  std::printf("[figure] QoS 1 round trip over loopback, %d messages: p50 %.3f ms, p99 %.3f ms\n",
              kMessages, percentile(trip_ms, 0.5), percentile(trip_ms, 0.99));

  const std::vector<ReceivedMessage> received = sub_events.messages();
  ASSERT_EQ(received.size(), static_cast<std::size_t>(kMessages));
  for (int i = 0; i < kMessages; ++i) {
    EXPECT_EQ(received[static_cast<std::size_t>(i)].message.payload, std::to_string(i));
    EXPECT_EQ(received[static_cast<std::size_t>(i)].message.qos, 1);
  }
  const std::map<std::uint64_t, int> delivered = pub_events.delivered();
  ASSERT_EQ(delivered.size(), static_cast<std::size_t>(kMessages));
  for (const auto& [id, count] : delivered) {
    EXPECT_GE(id, 1u);
    EXPECT_LE(id, static_cast<std::uint64_t>(kMessages));
    EXPECT_EQ(count, 1) << "publish id " << id;
  }
  EXPECT_TRUE(pub_events.failed().empty());
  EXPECT_EQ(sub_events.off_strand_calls() + pub_events.off_strand_calls(), 0);
}

TEST(MqttClient, Mqtt311AndMqtt5BothConnectAndExchangeMessages) {
  BW_NEED_MOSQUITTO();
  MosquittoHarness broker;
  ASSERT_TRUE(broker.start().ok()) << broker.log();
  AsioLoop loop;
  for (const int version : {4, 5}) {
    SCOPED_TRACE("mqtt_version " + std::to_string(version));
    RecordingEvents events(loop.strand());
    MqttSettings settings = test_settings(broker, "swd4-version-" + std::to_string(version));
    settings.mqtt_version = version;
    settings.subscriptions = {{kTagFilter, 1}};
    auto client = make_client(settings, loop, events);
    ASSERT_TRUE(client);
    client->start();
    ASSERT_TRUE(events.wait_connects(1)) << broker.log();
    ASSERT_TRUE(client->publish(7, "drycreek/swd4/tags/P-201.current", "41.7", 1, false));
    ASSERT_TRUE(events.wait_messages(1));
    EXPECT_EQ(events.messages()[0].message.payload, "41.7");
    EXPECT_TRUE(events.wait_until([&] { return events.delivered().count(7) == 1; }));
    client->stop();
    EXPECT_FALSE(client->connected());
  }
  // The broker's own log names the protocol each client used (mosquitto logs "p2" for 3.1.1
  // and "p5" for MQTT 5 on every new connection).
  EXPECT_NE(broker.log().find("swd4-version-4 (p2"), std::string::npos) << broker.log();
  EXPECT_NE(broker.log().find("swd4-version-5 (p5"), std::string::npos) << broker.log();
}

TEST(MqttClient, PersistentSessionSurvivesBrokerKillAndClientReconnectsByItself) {
  BW_NEED_MOSQUITTO();
  MosquittoHarness broker;
  ASSERT_TRUE(broker.start().ok()) << broker.log();
  AsioLoop loop;
  MqttSettings settings = test_settings(broker, "swd4-persistent");
  settings.subscriptions = {{kTagFilter, 1}};

  {  // Make the session, then leave cleanly: the broker keeps it (clean session false).
    RecordingEvents events(loop.strand());
    auto first = make_client(settings, loop, events);
    ASSERT_TRUE(first);
    first->start();
    ASSERT_TRUE(events.wait_connects(1)) << broker.log();
    first->stop();
  }
  // While the subscriber is away another client (mosquitto_pub) publishes at QoS 1; then the
  // broker dies with no chance to save beyond its periodic autosave.
  for (int i = 0; i < 3; ++i) {
    ASSERT_TRUE(broker.mosquitto_pub({"-q", "1", "-i", "swd4-cli-" + std::to_string(i), "-t",
                                      "drycreek/swd4/tags/TK-102.level", "-m",
                                      "queued-" + std::to_string(i)}));
  }
  ASSERT_TRUE(broker.wait_for_autosave());
  broker.kill();
  ASSERT_TRUE(broker.start().ok()) << broker.log();

  RecordingEvents events(loop.strand());
  auto client = make_client(settings, loop, events);
  ASSERT_TRUE(client);
  client->start();
  ASSERT_TRUE(events.wait_connects(1)) << broker.log();
  EXPECT_TRUE(events.connects()[0].session_present);
  ASSERT_TRUE(events.wait_messages(3)) << broker.log();
  for (int i = 0; i < 3; ++i) {
    EXPECT_EQ(events.messages()[static_cast<std::size_t>(i)].message.payload,
              "queued-" + std::to_string(i));
  }

  // Now kill the broker under a connected client and bring it back on the same port.
  ASSERT_TRUE(broker.wait_for_autosave());  // so the reconnected session survives the kill
  const Clock::time_point killed = Clock::now();
  broker.kill();
  ASSERT_TRUE(events.wait_losses(1));
  std::printf("[figure] connection loss noticed %.1f ms after SIGKILL: %s\n",
              milliseconds_between(killed, events.losses()[0].at), events.losses()[0].why.c_str());
  EXPECT_FALSE(client->connected());
  EXPECT_FALSE(client->publish(99, "drycreek/swd4/tags/TK-102.level", "lost", 1, false));
  std::this_thread::sleep_for(300ms);  // a few refused attempts while the broker is down
  ASSERT_TRUE(broker.start().ok()) << broker.log();
  const Clock::time_point back = Clock::now();
  ASSERT_TRUE(events.wait_connects(2)) << broker.log();
  std::printf(
      "[figure] reconnected %.1f ms after the broker accepted connections again "
      "(backoff 0.1 s doubling to 1 s, full jitter; %zu loss reports)\n",
      milliseconds_between(back, events.connects()[1].at), events.losses().size());
  EXPECT_TRUE(events.connects()[1].session_present);
  if (events.losses().size() > 1) {
    std::printf("[figure] attempt while the broker was down reported as: %s\n",
                events.losses()[1].why.c_str());
  }
  ASSERT_TRUE(broker.mosquitto_pub(
      {"-q", "1", "-t", "drycreek/swd4/tags/TK-102.level", "-m", "after-restart"}));
  ASSERT_TRUE(events.wait_until([&] {
    const std::vector<ReceivedMessage> all = events.messages();
    return std::any_of(all.begin(), all.end(), [](const ReceivedMessage& m) {
      return m.message.payload == "after-restart";
    });
  })) << broker.log();
  // QoS 1 is "at least once" (MQTT 3.1.1 section 4.3.2): a message whose PUBACK the broker had
  // not saved before SIGKILL is sent again. Anything else is a bug.
  const std::vector<ReceivedMessage> all = events.messages();
  int resent = 0;
  for (std::size_t i = 3; i < all.size(); ++i) {
    const std::string& payload = all[i].message.payload;
    if (payload == "after-restart") continue;
    EXPECT_TRUE(payload.starts_with("queued-")) << payload;
    ++resent;
  }
  std::printf("[figure] QoS 1 messages sent again after the broker restart: %d\n", resent);
  EXPECT_EQ(events.off_strand_calls(), 0);
}

// Starts tests/integration/mqtt_will_client and returns its pid once it printed "connected".
pid_t start_will_client(const std::string& uri, const std::string& topic,
                        const std::string& payload) {
  int out[2];
  if (::pipe(out) != 0) return -1;
  const pid_t pid = ::fork();
  if (pid == 0) {
    ::dup2(out[1], STDOUT_FILENO);
    ::close(out[0]);
    ::close(out[1]);
    ::execl(MQTT_WILL_CLIENT, MQTT_WILL_CLIENT, uri.c_str(), "swd4-will-helper", topic.c_str(),
            payload.c_str(), static_cast<char*>(nullptr));
    ::_exit(127);
  }
  ::close(out[1]);
  std::string line;
  char c = 0;
  while (line != "connected" && ::read(out[0], &c, 1) == 1) {
    line = c == '\n' ? std::string() : line + c;
  }
  ::close(out[0]);
  if (line != "connected") {
    ::kill(pid, SIGKILL);
    ::waitpid(pid, nullptr, 0);
    return -1;
  }
  return pid;
}

TEST(MqttClient, WillIsPublishedOnAbruptEndButNotOnCleanStop) {
  BW_NEED_MOSQUITTO();
  MosquittoHarness broker;
  ASSERT_TRUE(broker.start().ok()) << broker.log();
  AsioLoop loop;
  const std::string status_topic = "drycreek/swd4/brinewatch/status";
  RecordingEvents watcher_events(loop.strand());
  MqttSettings watcher_settings = test_settings(broker, "swd4-will-watcher");
  watcher_settings.subscriptions = {{status_topic, 1}};
  auto watcher = make_client(watcher_settings, loop, watcher_events);
  ASSERT_TRUE(watcher);
  watcher->start();
  ASSERT_TRUE(watcher_events.wait_connects(1));

  {  // A clean stop sends DISCONNECT: the broker must discard the will.
    RecordingEvents events(loop.strand());
    MqttSettings settings = test_settings(broker, "swd4-will-clean");
    settings.will = io::MqttWill{status_topic, "offline-after-clean-stop", 1, false};
    auto client = make_client(settings, loop, events);
    ASSERT_TRUE(client);
    client->start();
    ASSERT_TRUE(events.wait_connects(1));
    client->stop();
  }
  // A process killed with its connection open: the broker publishes the will.
  const pid_t helper = start_will_client(broker.uri(), status_topic, "offline-after-kill");
  ASSERT_GT(helper, 0) << "the will helper did not connect";
  ::kill(helper, SIGKILL);
  ::waitpid(helper, nullptr, 0);
  ASSERT_TRUE(watcher_events.wait_messages(1)) << broker.log();
  // The clean stop came first, so its will would have arrived first had the broker sent it.
  const std::vector<ReceivedMessage> received = watcher_events.messages();
  ASSERT_EQ(received.size(), 1u);
  EXPECT_EQ(received[0].message.topic, status_topic);
  EXPECT_EQ(received[0].message.payload, "offline-after-kill");
}

TEST(MqttClient, TlsConnectsWithTheRightCaAndIsRefusedClearlyWithAnother) {
  BW_NEED_MOSQUITTO();
  MosquittoHarness broker({.tls = true, .require_client_certificate = true});
  ASSERT_TRUE(broker.start().ok()) << broker.log();
  Result<TlsFiles> other = make_tls_files(broker.dir(), "other");
  ASSERT_TRUE(other.ok()) << other.error().message;
  const TlsFiles& files = broker.tls_files();
  AsioLoop loop;

  RecordingEvents good_events(loop.strand());
  MqttSettings good = test_settings(broker, "swd4-tls-good");
  good.tls = io::MqttTls{files.ca_cert, files.client_cert, files.client_key};
  good.subscriptions = {{kTagFilter, 1}};
  auto good_client = make_client(good, loop, good_events);
  ASSERT_TRUE(good_client);
  good_client->start();
  ASSERT_TRUE(good_events.wait_connects(1)) << broker.log();
  ASSERT_TRUE(broker.mosquitto_pub({"-q", "1", "-t", "drycreek/swd4/tags/F-301.dp", "-m", "12.5"}));
  ASSERT_TRUE(good_events.wait_messages(1));
  EXPECT_EQ(good_events.messages()[0].message.payload, "12.5");

  RecordingEvents bad_events(loop.strand());
  MqttSettings bad = test_settings(broker, "swd4-tls-wrong-ca");
  bad.tls = io::MqttTls{other->ca_cert, files.client_cert, files.client_key};
  auto bad_client = make_client(bad, loop, bad_events);
  ASSERT_TRUE(bad_client);
  bad_client->start();
  ASSERT_TRUE(bad_events.wait_losses(2)) << "the client must keep retrying";
  bad_client->stop();
  const std::string why = bad_events.losses()[0].why;
  std::printf("[figure] wrong CA reported as: %s\n", why.c_str());
  EXPECT_EQ(why.rfind("cannot connect to " + broker.uri(), 0), 0u) << why;
  EXPECT_NE(why.find("over TLS, check that ca_file '" + other->ca_cert + "'"), std::string::npos)
      << why;
  EXPECT_TRUE(bad_events.connects().empty());

  // The broker demands a client certificate; without one the handshake fails.
  RecordingEvents anonymous_events(loop.strand());
  MqttSettings anonymous = test_settings(broker, "swd4-tls-no-cert");
  anonymous.tls = io::MqttTls{files.ca_cert, "", ""};
  auto anonymous_client = make_client(anonymous, loop, anonymous_events);
  ASSERT_TRUE(anonymous_client);
  anonymous_client->start();
  ASSERT_TRUE(anonymous_events.wait_losses(1));
  anonymous_client->stop();
  EXPECT_TRUE(anonymous_events.connects().empty());
  EXPECT_EQ(anonymous_events.losses()[0].why.rfind("cannot connect to " + broker.uri(), 0), 0u);
  std::printf("[figure] missing client certificate reported as: %s\n",
              anonymous_events.losses()[0].why.c_str());
}

std::string write_credentials(const std::string& dir, const std::string& name,
                              const std::string& text, mode_t mode) {
  const std::string path = dir + "/" + name;
  std::ofstream(path) << text;
  ::chmod(path.c_str(), mode);
  return path;
}

TEST(MqttClient, CredentialsAreCheckedByTheBrokerAndGuardedOnDisk) {
  BW_NEED_MOSQUITTO();
  MosquittoHarness broker({.users = {{"swd4-edge", "brine-42"}}});
  ASSERT_TRUE(broker.start().ok()) << broker.log();
  AsioLoop loop;

  RecordingEvents refused_events(loop.strand());
  MqttSettings exposed = test_settings(broker, "swd4-creds-exposed");
  exposed.credentials_file =
      write_credentials(broker.dir(), "exposed", "swd4-edge\nbrine-42\n", 0644);
  Result<std::unique_ptr<MqttClient>> refused =
      MqttClient::create(exposed, loop.strand(), refused_events);
  ASSERT_FALSE(refused.ok());
  EXPECT_NE(refused.error().message.find(exposed.credentials_file), std::string::npos);
  EXPECT_NE(refused.error().message.find("chmod 600"), std::string::npos);

  for (const int version : {4, 5}) {
    SCOPED_TRACE("mqtt_version " + std::to_string(version));
    RecordingEvents good_events(loop.strand());
    MqttSettings good = test_settings(broker, "swd4-creds-good-" + std::to_string(version));
    good.mqtt_version = version;
    good.credentials_file = write_credentials(broker.dir(), "good", "swd4-edge\nbrine-42\n", 0600);
    auto good_client = make_client(good, loop, good_events);
    ASSERT_TRUE(good_client);
    good_client->start();
    EXPECT_TRUE(good_events.wait_connects(1)) << broker.log();

    RecordingEvents bad_events(loop.strand());
    MqttSettings bad = test_settings(broker, "swd4-creds-bad-" + std::to_string(version));
    bad.mqtt_version = version;
    bad.credentials_file =
        write_credentials(broker.dir(), "bad", "swd4-edge\nnot-the-password\n", 0600);
    auto bad_client = make_client(bad, loop, bad_events);
    ASSERT_TRUE(bad_client);
    bad_client->start();
    ASSERT_TRUE(bad_events.wait_losses(1));
    bad_client->stop();
    EXPECT_TRUE(bad_events.connects().empty());
    const std::string why = bad_events.losses()[0].why;
    std::printf("[figure] wrong password (MQTT %s) reported as: %s\n", version == 5 ? "5" : "3.1.1",
                why.c_str());
    EXPECT_NE(why.find("broker refused the connection"), std::string::npos) << why;
  }
}

TEST(MqttClient, CreateRefusesInconsistentSettings) {
  AsioLoop loop;
  RecordingEvents events(loop.strand());
  MqttSettings base;
  base.server_uri = "tcp://127.0.0.1:1";
  base.client_id = "swd4-settings";
  auto refusal = [&](MqttSettings settings) {
    Result<std::unique_ptr<MqttClient>> client =
        MqttClient::create(std::move(settings), loop.strand(), events);
    return client.ok() ? std::string() : client.error().message;
  };
  EXPECT_EQ(refusal(base), "");

  MqttSettings ssl_without_tls = base;
  ssl_without_tls.server_uri = "ssl://127.0.0.1:1";
  EXPECT_NE(refusal(ssl_without_tls).find("ca_file"), std::string::npos);
  MqttSettings missing_ca = ssl_without_tls;
  missing_ca.tls = io::MqttTls{"/nonexistent/dry-creek-ca.crt", "", ""};
  EXPECT_NE(refusal(missing_ca).find("/nonexistent/dry-creek-ca.crt"), std::string::npos);
  MqttSettings version = base;
  version.mqtt_version = 3;
  EXPECT_NE(refusal(version).find("mqtt_version"), std::string::npos);
  MqttSettings backoff = base;
  backoff.reconnect_max_s = 0.1;
  EXPECT_NE(refusal(backoff).find("reconnect"), std::string::npos);
  MqttSettings qos = base;
  qos.subscriptions = {{kTagFilter, 3}};
  EXPECT_NE(refusal(qos).find(kTagFilter), std::string::npos);
  MqttSettings will = base;
  will.will = io::MqttWill{"drycreek/#", "offline", 1, true};
  EXPECT_NE(refusal(will).find("will.topic"), std::string::npos);
  MqttSettings scheme = base;
  scheme.server_uri = "http://127.0.0.1:1";
  EXPECT_NE(refusal(scheme).find("tcp://"), std::string::npos);
}

}  // namespace
}  // namespace bw::testing
