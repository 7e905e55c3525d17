// The live daemon behind `brinewatch run`: MQTT in, the engine, alerts out through the outbox.
//
// Threading: one io_context thread runs everything on one strand: the MQTT client posts its
// events there, the tick timer and the signal handler run there, so the engine, the state
// keeper and the publisher are never touched concurrently and need no locks. paho's own threads
// only post.
//
// Nothing lost: every transition is journaled and turned into outbox messages in one SQLite
// transaction before anything is published; an outbox message is deleted only when the broker
// acknowledged it (PUBACK), so after a broker outage or a restart the outbox drains in order.
// Consumers drop duplicates by the message's "id".
//
// The wall clock drives time-driven work (stale tags, delays, shelve expiries, chattering and
// flood ends) through a tick every `live.tick`; samples drive everything else by their own time.
#pragma once

#include <memory>
#include <utility>  // before Boost.Asio: its awaitable.hpp uses std::exchange

#include <boost/asio.hpp>
#include <optional>
#include <string>
#include <vector>

#include "app/live_publisher.h"
#include "app/state_keeper.h"
#include "config/live_spec.h"
#include "core/result.h"
#include "engine/engine.h"
#include "engine/notification_policy.h"
#include "io/mqtt/decoded_sample.h"
#include "io/mqtt/sparkplug.h"
#include "io/mqtt/tag_topics.h"
#include "io/mqtt_client.h"

namespace bw::app {

struct LiveCounters {
  std::uint64_t messages = 0;
  std::uint64_t samples = 0;
  std::uint64_t commands = 0;
  std::uint64_t commands_refused = 0;
  std::uint64_t published = 0;
  std::uint64_t delivered = 0;
  std::uint64_t reconnects = 0;
  io::mqtt::RejectionCounters rejected;
  std::uint64_t unmatched_topics = 0;
};

class LiveDaemon final : public io::MqttEvents {
 public:
  static Result<std::unique_ptr<LiveDaemon>> create(engine::SiteSpec site, config::LiveSpec live,
                                                    boost::asio::io_context& io);
  ~LiveDaemon() override;

  // Connects and serves until SIGINT or SIGTERM (or stop()); returns the exit status.
  int run();
  void stop();

  void on_connected(bool session_present) override;
  void on_connection_lost(const std::string& why) override;
  void on_message(io::MqttMessage message) override;
  void on_delivered(std::uint64_t publish_id) override;
  void on_publish_failed(std::uint64_t publish_id, const std::string& why) override;

 private:
  using Strand = boost::asio::strand<boost::asio::io_context::executor_type>;
  LiveDaemon(engine::SiteSpec site, config::LiveSpec live,
             std::unique_ptr<engine::LocalCalendar> calendar, boost::asio::io_context& io);

  static core::SensorTime wall_now();
  void schedule_tick();
  void tick();
  void commit(StateKeeper::Depth depth);
  void drain();
  void handle_command(const io::MqttMessage& message);
  void handle_samples(const io::MqttMessage& message);
  void publish_direct(const std::string& topic, std::string payload, bool retained);
  void log_counters_now_and_then();

  boost::asio::io_context& io_;
  Strand strand_;
  boost::asio::steady_timer tick_timer_;
  boost::asio::signal_set signals_;
  config::LiveSpec live_;
  engine::Engine engine_;
  engine::NotificationPolicy policy_;
  LivePublisher publisher_;
  std::unique_ptr<StateKeeper> keeper_;
  std::unique_ptr<io::MqttClient> client_;
  std::vector<io::mqtt::TopicRule> rules_;
  std::unique_ptr<io::mqtt::SparkplugSession> sparkplug_;
  io::mqtt::DecodeLimits limits_;
  std::int64_t last_sent_id_ = 0;
  std::size_t in_flight_ = 0;
  std::uint64_t next_direct_id_ = 1ull << 62;  // ids of messages published outside the outbox
  std::chrono::steady_clock::time_point last_full_checkpoint_;
  std::chrono::steady_clock::time_point last_counter_log_;
  LiveCounters counters_;
  bool stopping_ = false;
};

}  // namespace bw::app
