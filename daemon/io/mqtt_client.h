// The connection to the site's MQTT broker: subscribes to tag streams, publishes alerts.
//
// Threading. paho-mqtt-cpp runs its own threads; every callback from them is posted to the
// Boost.Asio strand given to create(), so each MqttEvents call happens on that strand, one at
// a time, and the engine state the events touch needs no lock. The per-message path is:
// paho thread -> boost::asio::post(strand) -> MqttEvents::on_message; nothing on it takes a
// lock of ours. The reconnect timer also runs on the strand, so the io_context behind it must
// be running for reconnects to happen. start(), stop(), connected() and publish() may be called
// from any thread (publish() normally from the strand).
//
// Connection. start() connects in the background. After CONNACK the client subscribes to every
// filter in MqttSettings::subscriptions (again on every connect, so a broker that lost its
// session still serves us) and calls on_connected(session_present) once the broker granted all
// of them. A refused connect, a refused subscription or a lost connection is reported through
// on_connection_lost(why) and followed by another attempt after a ReconnectBackoff delay
// (reconnect_min_s doubling to reconnect_max_s, full jitter, seeded from client_id); the
// schedule restarts from reconnect_min_s after each successful connect. There is no limit on
// attempts; stop() ends them. paho's receive thread (paho.mqtt.c 1.3.12) waits up to one second
// between polls of a new socket, so a reconnect typically lands up to ~1 s after its backoff
// delay has run out.
//
// Session. With persistent_session (the default) the client connects with clean session false
// (MQTT 3.1.1) or clean start false and a session expiry of session_expiry_s (MQTT 5), so the
// broker keeps the subscriptions and queues QoS 1 messages while we are away. Queued messages
// may reach on_message before on_connected. QoS 1 means at least once: after a reconnect or a
// broker restart a message may arrive again, so consumers must tolerate repeats (a sample with
// the same tag and time). paho acknowledges an inbound QoS 1 message once it has been posted to
// the strand, so a crash of the process loses messages posted but not yet handled.
//
// Errors reported through on_connection_lost are sentences for an operator. A lost connection
// reads "connection to <uri> lost[: cause]"; a failed attempt starts "cannot connect to <uri>: ".
// A failed TLS handshake (a broker certificate not signed by ca_file, a certificate not naming
// the host, a client certificate the broker refuses) reads "cannot connect to ssl://...: no
// connection (...); over TLS, check that ca_file '<path>' is the CA that signed the broker's
// certificate, that the certificate names the host in server_uri, and that the broker accepts
// this client's certificate" (paho-mqtt-cpp 1.2 cannot safely pass OpenSSL's own reason on:
// see mqtt_connect_options.h). A refused CONNACK reads "... broker refused the
// connection: <reason>" ("not authorized" / "bad user name or password" under 3.1.1, the MQTT 5
// reason name such as "Not authorized" under 5). A broker that is down, or that closes the
// connection before CONNACK (e.g. a TLS broker rejecting a missing client certificate after the
// handshake), reads "... no connection (refused, closed or timed out before CONNACK)".
//
// Publishing. publish() hands the message to paho and returns true; later exactly one of
// on_delivered(publish_id) (QoS 1: PUBACK received; QoS 0: written to the socket) or
// on_publish_failed(publish_id, why) follows, unless stop() comes first. It returns false at
// once, with no callback to follow, when the client is not connected or paho refuses the
// message (e.g. max_inflight reached).
//
// stop() disconnects cleanly, so the broker does NOT publish the will; it waits (each step
// bounded by connect_timeout_s) for the strand to finish the event it may be delivering and for
// an attempt in progress. No MqttEvents call is made after stop() returns, provided the
// io_context runs (or has stopped); start() may be called again later. The destructor calls
// stop(). Copying and moving are disabled.
#pragma once

#include <boost/asio/io_context.hpp>
#include <boost/asio/strand.hpp>
#include <cstddef>
#include <cstdint>
#include <memory>
#include <optional>
#include <string>
#include <utility>
#include <vector>

#include "core/result.h"

namespace bw::io {

// TLS for ssl:// URIs. ca_file verifies the broker (its certificate must also name the host in
// the URI); cert_file and key_file, both or neither, identify the client.
struct MqttTls {
  std::string ca_file;
  std::string cert_file;
  std::string key_file;
};

// Published by the broker if the connection ends without a clean disconnect.
struct MqttWill {
  std::string topic;
  std::string payload;
  int qos = 1;
  bool retained = true;
};

struct MqttSettings {
  std::string server_uri;  // "tcp://127.0.0.1:1883" or "ssl://127.0.0.1:8883"
  std::string client_id;   // must be stable across restarts for the persistent session
  int mqtt_version = 4;    // 4 = MQTT 3.1.1, 5 = MQTT 5
  bool persistent_session = true;
  std::uint32_t session_expiry_s = 7 * 24 * 3600;  // MQTT 5 only; how long the broker keeps it
  int keep_alive_s = 30;
  int connect_timeout_s = 10;
  std::optional<MqttTls> tls;    // required for ssl://, refused for tcp://
  std::string credentials_file;  // optional; see mqtt_credentials.h (mode must be 0600 or 0400)
  std::optional<MqttWill> will;
  double reconnect_min_s = 0.5;                            // first backoff ceiling, seconds
  double reconnect_max_s = 30;                             // largest backoff ceiling, seconds
  std::vector<std::pair<std::string, int>> subscriptions;  // topic filter, QoS 0..2
  std::size_t max_inflight = 64;                           // QoS 1 publishes awaiting PUBACK
};

struct MqttMessage {
  std::string topic;
  std::string payload;
  int qos = 0;
  bool retained = false;
};

// Everything the client tells the daemon; every call is made on the strand given to create().
class MqttEvents {
 public:
  virtual ~MqttEvents() = default;
  virtual void on_connected(bool session_present) = 0;  // after subscriptions are granted
  virtual void on_connection_lost(const std::string& why) = 0;
  virtual void on_message(MqttMessage message) = 0;
  virtual void on_delivered(std::uint64_t publish_id) = 0;
  virtual void on_publish_failed(std::uint64_t publish_id, const std::string& why) = 0;
};

class MqttClient {
 public:
  using Strand = boost::asio::strand<boost::asio::io_context::executor_type>;

  // Validates `settings` (URI scheme against tls, version, QoS values, backoff bounds, TLS files
  // readable, credentials file private and well formed) and returns an Error naming the setting
  // or file and what is wrong. `events` must outlive the client.
  static Result<std::unique_ptr<MqttClient>> create(MqttSettings settings, Strand strand,
                                                    MqttEvents& events);

  ~MqttClient();
  MqttClient(const MqttClient&) = delete;
  MqttClient& operator=(const MqttClient&) = delete;

  void start();
  void stop();
  bool connected() const;
  bool publish(std::uint64_t publish_id, const std::string& topic, std::string payload, int qos,
               bool retained);

  class Connection;  // the state shared with paho's callbacks; defined in mqtt_client.cpp

 private:
  explicit MqttClient(std::shared_ptr<Connection> connection);
  std::shared_ptr<Connection> connection_;
};

}  // namespace bw::io
