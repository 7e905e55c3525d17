// What the crews would be told: passes each transition through the notification policy
// (chattering and floods held back, summaries instead) and writes what gets through as JSON
// Lines, one object per notification.
//
// Line shapes (a public interface: add fields, never rename):
//   an alert notification: the same object as the alert log (io::alert_to_json);
//   a policy notice: {"time", "site", "notice": "chattering_started" | "chattering_ended" |
//   "flood_started" | "flood_ended", "asset", "check", "count", "held", "text"}.
#pragma once

#include <cstdint>
#include <memory>

#include "engine/alert.h"
#include "engine/notification_policy.h"
#include "io/alert_log.h"

namespace bw::app {

class NotificationFeed final : public engine::AlertSink {
 public:
  NotificationFeed(engine::NotificationPolicy& policy, std::unique_ptr<io::AlertLog> out)
      : policy_(policy), out_(std::move(out)) {}

  void on_transition(const engine::AlertTransition& transition) override;
  // Time has passed: chattering and floods that ended by `now`.
  void advance(core::SensorTime now);
  bool flush() { return out_->flush(); }

  std::uint64_t sent() const { return sent_; }
  std::uint64_t held() const { return held_; }

 private:
  void write_notices(const std::vector<engine::PolicyNotice>& notices);

  engine::NotificationPolicy& policy_;
  std::unique_ptr<io::AlertLog> out_;
  std::uint64_t sent_ = 0;
  std::uint64_t held_ = 0;
};

}  // namespace bw::app
