#include "app/live_daemon.h"

#include <spdlog/spdlog.h>

#include "app/command_message.h"
#include "app/systemd_notify.h"
#include "io/mqtt/json_samples.h"
#include "io/zone_calendar.h"

namespace bw::app {
namespace {

constexpr std::size_t kMaxInFlight = 64;
constexpr auto kCounterLogEvery = std::chrono::seconds(60);

io::MqttSettings mqtt_settings(const config::LiveSpec& live, const std::string& status_topic) {
  io::MqttSettings s;
  s.server_uri = live.broker.uri;
  s.client_id = live.broker.client_id;
  s.mqtt_version = live.broker.mqtt_version;
  s.keep_alive_s = live.broker.keep_alive_s;
  s.credentials_file = live.broker.credentials_file;
  if (live.broker.tls) {
    s.tls = io::MqttTls{live.broker.tls->ca_file, live.broker.tls->cert_file,
                        live.broker.tls->key_file};
  }
  s.will = io::MqttWill{status_topic, "offline", 1, true};
  s.reconnect_min_s = live.broker.reconnect_min_s;
  s.reconnect_max_s = live.broker.reconnect_max_s;
  for (const auto& input : live.inputs) s.subscriptions.emplace_back(input.topic, input.qos);
  if (live.commands) s.subscriptions.emplace_back(live.commands->topic, 1);
  return s;
}

std::string last_level(std::string_view topic) {
  const auto slash = topic.rfind('/');
  return std::string(slash == std::string_view::npos ? topic : topic.substr(slash + 1));
}

}  // namespace

LiveDaemon::LiveDaemon(engine::SiteSpec site, config::LiveSpec live,
                       std::unique_ptr<engine::LocalCalendar> calendar, boost::asio::io_context& io)
    : io_(io),
      strand_(boost::asio::make_strand(io)),
      tick_timer_(strand_),
      signals_(strand_, SIGINT, SIGTERM),
      live_(std::move(live)),
      engine_(std::move(site),
              engine::CommandPolicy{.authorised_sources = [&] {
                std::vector<std::string> sources;
                if (live_.commands) {
                  for (const auto& id : live_.commands->authorised) sources.push_back("mqtt:" + id);
                }
                return sources;
              }()},
              std::move(calendar)),
      policy_(engine_.site().name, {}),
      publisher_(live_.outputs.topic_prefix, engine_, policy_),
      limits_{.max_payload_bytes = static_cast<std::size_t>(live_.limits.max_payload_bytes),
              .max_future_s = live_.limits.max_future_s,
              .max_past_s = live_.limits.max_past_s} {
  for (const auto& input : live_.inputs) {
    rules_.push_back({input.topic, input.tag_template,
                      input.format == config::PayloadFormat::sparkplug
                          ? io::mqtt::TopicRule::Format::sparkplug
                          : io::mqtt::TopicRule::Format::json});
    if (input.format == config::PayloadFormat::sparkplug && !sparkplug_) {
      sparkplug_ = std::make_unique<io::mqtt::SparkplugSession>(input.tag_template, limits_);
    }
  }
}

LiveDaemon::~LiveDaemon() = default;

Result<std::unique_ptr<LiveDaemon>> LiveDaemon::create(engine::SiteSpec site, config::LiveSpec live,
                                                       boost::asio::io_context& io) {
  auto calendar = io::make_site_calendar(site.time_zone);
  if (!calendar) return calendar.error();
  std::unique_ptr<LiveDaemon> d(
      new LiveDaemon(std::move(site), std::move(live), std::move(calendar.value()), io));
  auto opened = StateKeeper::open(d->live_.state.dir, d->engine_, &d->policy_, d->publisher_);
  if (!opened) return opened.error();
  d->keeper_ = std::move(opened.value().keeper);
  d->keeper_->set_outbox_source([daemon = d.get()] { return daemon->publisher_.take(wall_now()); });
  d->keeper_->set_hooks([daemon = d.get()](core::SensorTime t) { daemon->publisher_.advance(t); },
                        {});
  spdlog::info("state {}: {} parts restored, {} reset{}", d->live_.state.dir,
               opened.value().restore.restored.size(), opened.value().restore.reset.size(),
               opened.value().store.moved_aside ? " (a damaged database was moved aside)" : "");
  auto client = io::MqttClient::create(mqtt_settings(d->live_, d->publisher_.status_topic()),
                                       d->strand_, *d);
  if (!client) return client.error();
  d->client_ = std::move(client.value());
  d->keeper_->report_damage(wall_now());
  return d;
}

core::SensorTime LiveDaemon::wall_now() {
  return std::chrono::time_point_cast<core::Micros>(std::chrono::system_clock::now());
}

int LiveDaemon::run() {
  signals_.async_wait([this](const boost::system::error_code& ec, int signal) {
    if (ec) return;
    spdlog::info("stopping on signal {}", signal);
    stop();
  });
  last_full_checkpoint_ = std::chrono::steady_clock::now();
  last_counter_log_ = last_full_checkpoint_;
  spdlog::info("running: site {}, broker {}", engine_.site().name, live_.broker.uri);
  boost::asio::post(strand_, [this] {
    client_->start();
    schedule_tick();
  });
  io_.run();
  return 0;
}

void LiveDaemon::stop() {
  boost::asio::post(strand_, [this] {
    if (stopping_) return;
    stopping_ = true;
    tick_timer_.cancel();
    signals_.cancel();
    commit(StateKeeper::Depth::full);
    if (client_->connected()) publish_direct(publisher_.status_topic(), "offline", true);
    client_->stop();
    notify_systemd("STOPPING=1");
    spdlog::info("stopped: {} messages, {} samples, {} rejected, {} published, {} delivered",
                 counters_.messages, counters_.samples, counters_.rejected.total,
                 counters_.published, counters_.delivered);
    io_.stop();
  });
}

void LiveDaemon::schedule_tick() {
  tick_timer_.expires_after(std::chrono::duration_cast<std::chrono::steady_clock::duration>(
      std::chrono::duration<double>(live_.tick_s)));
  tick_timer_.async_wait([this](const boost::system::error_code& ec) {
    if (ec || stopping_) return;
    tick();
    schedule_tick();
  });
}

void LiveDaemon::tick() {
  engine_.advance(wall_now(), *keeper_);
  const auto now = std::chrono::steady_clock::now();
  const bool full_due = now - last_full_checkpoint_ >=
                        std::chrono::duration<double>(live_.state.checkpoint_every_s);
  if (full_due) {
    last_full_checkpoint_ = now;
    commit(StateKeeper::Depth::full);
  } else {
    commit(StateKeeper::Depth::journal_only);
  }
  notify_systemd("WATCHDOG=1");
  log_counters_now_and_then();
}

void LiveDaemon::commit(StateKeeper::Depth depth) {
  const auto status = keeper_->commit(wall_now(), depth);
  if (!status) {
    spdlog::error("saving state failed: {}", status.error().message);
    return;
  }
  drain();
}

void LiveDaemon::drain() {
  if (stopping_ || !client_->connected() || in_flight_ >= kMaxInFlight) return;
  auto waiting = keeper_->read_outbox(last_sent_id_, kMaxInFlight - in_flight_);
  if (!waiting) {
    spdlog::error("reading the outbox failed: {}", waiting.error().message);
    return;
  }
  for (auto& m : waiting.value()) {
    if (!client_->publish(static_cast<std::uint64_t>(m.id), m.topic, std::move(m.payload), m.qos,
                          m.retained)) {
      return;
    }
    last_sent_id_ = m.id;
    ++in_flight_;
    ++counters_.published;
  }
}

void LiveDaemon::on_connected(bool session_present) {
  spdlog::info("connected to {} (session {})", live_.broker.uri, session_present ? "kept" : "new");
  // Everything not yet acknowledged goes out again, in order.
  last_sent_id_ = 0;
  in_flight_ = 0;
  publish_direct(publisher_.status_topic(), "online", true);
  notify_systemd("READY=1\nSTATUS=connected to " + live_.broker.uri);
  drain();
}

void LiveDaemon::on_connection_lost(const std::string& why) {
  ++counters_.reconnects;
  spdlog::warn("connection to {} lost: {}", live_.broker.uri, why);
  notify_systemd("STATUS=broker unreachable: " + why);
}

void LiveDaemon::on_delivered(std::uint64_t publish_id) {
  if (publish_id >= (1ull << 62)) return;  // a direct publish
  ++counters_.delivered;
  if (in_flight_ > 0) --in_flight_;
  keeper_->mark_delivered(static_cast<std::int64_t>(publish_id));
  drain();
}

void LiveDaemon::on_publish_failed(std::uint64_t publish_id, const std::string& why) {
  if (publish_id >= (1ull << 62)) return;
  spdlog::warn("publishing outbox message {} failed: {}; it stays in the outbox", publish_id, why);
  if (in_flight_ > 0) --in_flight_;
}

void LiveDaemon::publish_direct(const std::string& topic, std::string payload, bool retained) {
  client_->publish(next_direct_id_++, topic, std::move(payload), 1, retained);
}

void LiveDaemon::on_message(io::MqttMessage message) {
  ++counters_.messages;
  if (live_.commands && io::mqtt::topic_matches(live_.commands->topic, message.topic)) {
    handle_command(message);
  } else {
    handle_samples(message);
  }
  if (keeper_->pending() > 0) commit(StateKeeper::Depth::journal_only);
}

void LiveDaemon::handle_command(const io::MqttMessage& message) {
  ++counters_.commands;
  const std::string client = last_level(message.topic);
  auto command = parse_command_message(message.payload, "mqtt:" + client, wall_now());
  engine::CommandReply reply;
  if (!command) {
    reply = {false, "refused: " + command.error().message};
  } else {
    reply = engine_.execute(command.value(), *keeper_);
  }
  if (!reply.accepted) ++counters_.commands_refused;
  publish_direct(live_.outputs.topic_prefix + "/replies/" + client, reply_payload(reply), false);
}

void LiveDaemon::handle_samples(const io::MqttMessage& message) {
  const auto received = wall_now();
  for (const auto& rule : rules_) {
    if (!io::mqtt::topic_matches(rule.filter, message.topic)) continue;
    if (rule.format == io::mqtt::TopicRule::Format::sparkplug) {
      auto result = sparkplug_->on_message(message.topic, message.payload, received);
      counters_.rejected += result.rejected;
      for (const auto& s : result.samples) engine_.process(s.view(), *keeper_);
      counters_.samples += result.samples.size();
      for (const auto& node : result.rebirth_requests) {
        publish_direct(io::mqtt::topic_for_rebirth(node.group, node.node),
                       io::mqtt::encode_rebirth_request(received), false);
      }
    } else {
      const auto tag = io::mqtt::tag_from_topic(rule, message.topic);
      auto batch = io::mqtt::decode_json_samples(tag.value_or(""), message.payload, received, limits_);
      counters_.rejected += batch.rejected;
      for (const auto& s : batch.samples) engine_.process(s.view(), *keeper_);
      counters_.samples += batch.samples.size();
    }
    return;
  }
  ++counters_.unmatched_topics;
}

void LiveDaemon::log_counters_now_and_then() {
  const auto now = std::chrono::steady_clock::now();
  if (now - last_counter_log_ < kCounterLogEvery) return;
  last_counter_log_ = now;
  std::string rejected;
  for (std::size_t i = 0; i < io::mqtt::kRejectionKinds; ++i) {
    if (counters_.rejected.by_reason[i] == 0) continue;
    rejected += " " + std::string(io::mqtt::to_string(static_cast<io::mqtt::Rejection>(i))) + "=" +
                std::to_string(counters_.rejected.by_reason[i]);
  }
  spdlog::info("{} messages, {} samples, {} commands ({} refused), {} published, {} delivered{}{}",
               counters_.messages, counters_.samples, counters_.commands,
               counters_.commands_refused, counters_.published, counters_.delivered,
               rejected.empty() ? "" : "; rejected:", rejected);
}

}  // namespace bw::app
