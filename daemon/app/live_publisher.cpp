#include "app/live_publisher.h"

#include "core/utc_text.h"
#include "io/alert_log.h"
#include "io/json_text.h"
#include "io/site_health_json.h"
#include "io/record_log.h"

namespace bw::app {

LivePublisher::LivePublisher(std::string topic_prefix, const engine::Engine& engine,
                             engine::NotificationPolicy& policy)
    : prefix_(std::move(topic_prefix)), engine_(engine), policy_(policy) {}

void LivePublisher::queue(std::string topic, std::string payload, bool retained,
                          core::SensorTime t) {
  queued_.push_back({.topic = std::move(topic),
                     .payload = std::move(payload),
                     .qos = 1,
                     .retained = retained,
                     .created_us = t.time_since_epoch().count()});
}

void LivePublisher::queue_notices(const std::vector<engine::PolicyNotice>& notices) {
  for (const auto& n : notices) {
    std::string payload = "{\"time\":";
    io::append_json_string(payload, core::format_utc(n.time, core::UtcPrecision::milliseconds));
    payload += ",\"site\":";
    io::append_json_string(payload, engine_.site().name);
    payload += ",\"notice\":";
    io::append_json_string(payload, n.text);
    payload += ",\"count\":" + std::to_string(n.count) + ",\"held\":" + std::to_string(n.held) + "}";
    queue(prefix_ + "/notifications", std::move(payload), false, n.time);
  }
}

void LivePublisher::on_transition(const engine::AlertTransition& t) {
  std::string json = io::alert_to_json(t);
  queue(prefix_ + "/alerts", json, false, t.time);
  const auto decision = policy_.on_transition(t);
  queue_notices(decision.notices);
  if (decision.action == engine::Decision::Action::notify) {
    queue(prefix_ + "/notifications", std::move(json), false, t.time);
  }
  changed_assets_.emplace(t.asset);
}

void LivePublisher::on_record(const engine::AssetRecord& record) {
  queue(prefix_ + "/records", io::record_to_json(record), false, record.content.time);
}

void LivePublisher::advance(core::SensorTime now) { queue_notices(policy_.advance(now)); }

std::string LivePublisher::summary_of(const std::string& asset, core::SensorTime now) const {
  std::string out = "{\"time\":";
  io::append_json_string(out, core::format_utc(now, core::UtcPrecision::milliseconds));
  out += ",\"site\":";
  io::append_json_string(out, engine_.site().name);
  out += ",\"asset\":";
  io::append_json_string(out, asset);
  out += ",\"alerts\":[";
  bool first = true;
  for (const auto& view : engine_.alerts().not_normal()) {
    if (view.asset != asset) continue;
    out += first ? "{" : ",{";
    first = false;
    out += "\"check\":";
    io::append_json_string(out, view.check);
    out += ",\"state\":";
    io::append_json_string(out, engine::to_string(view.state));
    out += ",\"priority\":";
    io::append_json_string(out, engine::to_string(view.priority));
    out += ",\"since\":";
    io::append_json_string(out, core::format_utc(view.since, core::UtcPrecision::milliseconds));
    out += "}";
  }
  return out + "]}";
}

std::vector<io::OutboxMessage> LivePublisher::take(core::SensorTime now) {
  for (const auto& asset : changed_assets_) {
    queue(prefix_ + "/summary/" + asset, summary_of(asset, now), true, now);
  }
  changed_assets_.clear();
  // Compared whole rather than on transitions: a shelve running out or a restore changes it too.
  engine::SiteHealth health = engine::roll_up_site(engine_.alerts(), engine_.site());
  if (!published_health_ || *published_health_ != health) {
    queue(site_health_topic(), io::site_health_to_json(health, now), true, now);
    published_health_ = std::move(health);
  }
  return std::exchange(queued_, {});
}

}  // namespace bw::app
