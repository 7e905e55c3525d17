// What the live daemon publishes, as outbox messages (written in the same transaction as the
// journal entries they come from, deleted once the broker has them):
//   <prefix>/alerts                 every transition, JSON as in the alert log with its stable
//                                   "id", QoS 1 — the feed for consumers that keep their own books;
//   <prefix>/notifications          what the crews should be told after the notification policy
//                                   (chattering held, floods summarised), QoS 1;
//   <prefix>/records                every record closed (io/record_log.h: daily figures, change-outs),
//                                   JSON with its stable "id", QoS 1, not retained;
//   <prefix>/summary/<asset>        retained, QoS 1: the asset's alerts that are not normal, after
//                                   every change, so a dashboard or a tablet sees the present;
//   <prefix>/site_health            retained, QoS 1: the site's health roll-up (status word, counts
//                                   by ISA-18.2 state and priority, per asset; io/site_health_json.h),
//                                   at the first take() after start and whenever it changes;
//   <prefix>/status                 retained: "online"/"offline" (the last will), published by the
//                                   daemon directly, not through the outbox.
// Not thread-safe: lives on the daemon's strand.
#pragma once

#include <optional>
#include <set>
#include <string>
#include <vector>

#include "engine/alert.h"
#include "engine/engine.h"
#include "engine/notification_policy.h"
#include "engine/site_health.h"
#include "io/state_store.h"

namespace bw::app {

class LivePublisher final : public engine::AlertSink {
 public:
  LivePublisher(std::string topic_prefix, const engine::Engine& engine,
                engine::NotificationPolicy& policy);

  void on_transition(const engine::AlertTransition& transition) override;
  void on_record(const engine::AssetRecord& record) override;
  // Time passes: the policy's chattering and flood ends.
  void advance(core::SensorTime now);
  // The messages made since the last take(), summaries of changed assets and then the site
  // health (when it changed) last.
  std::vector<io::OutboxMessage> take(core::SensorTime now);

  std::string status_topic() const { return prefix_ + "/status"; }
  std::string site_health_topic() const { return prefix_ + "/site_health"; }

 private:
  void queue(std::string topic, std::string payload, bool retained, core::SensorTime t);
  void queue_notices(const std::vector<engine::PolicyNotice>& notices);
  std::string summary_of(const std::string& asset, core::SensorTime now) const;

  std::string prefix_;
  const engine::Engine& engine_;
  engine::NotificationPolicy& policy_;
  std::vector<io::OutboxMessage> queued_;
  std::set<std::string> changed_assets_;
  std::optional<engine::SiteHealth> published_health_;  // the last one queued
};

}  // namespace bw::app
