#include "app/notification_feed.h"

#include "core/utc_text.h"
#include "io/json_text.h"

namespace bw::app {
namespace {

std::string_view notice_name(engine::PolicyNotice::Kind kind) {
  switch (kind) {
    case engine::PolicyNotice::Kind::chattering_started:
      return "chattering_started";
    case engine::PolicyNotice::Kind::chattering_ended:
      return "chattering_ended";
    case engine::PolicyNotice::Kind::flood_started:
      return "flood_started";
    case engine::PolicyNotice::Kind::flood_ended:
      return "flood_ended";
  }
  return "unknown";
}

}  // namespace

void NotificationFeed::write_notices(const std::vector<engine::PolicyNotice>& notices) {
  for (const auto& n : notices) {
    std::string line = "{\"time\":";
    io::append_json_string(line, core::format_utc(n.time, core::UtcPrecision::milliseconds));
    line += ",\"site\":";
    io::append_json_string(line, policy_.site());
    line += ",\"notice\":";
    io::append_json_string(line, notice_name(n.kind));
    line += ",\"asset\":";
    io::append_json_string(line, n.asset);
    line += ",\"check\":";
    io::append_json_string(line, n.check);
    line += ",\"count\":" + std::to_string(n.count) + ",\"held\":" + std::to_string(n.held);
    line += ",\"text\":";
    io::append_json_string(line, n.text);
    line += "}";
    out_->write_line(line);
    ++sent_;
  }
}

void NotificationFeed::on_transition(const engine::AlertTransition& transition) {
  const auto decision = policy_.on_transition(transition);
  write_notices(decision.notices);
  if (decision.action == engine::Decision::Action::notify) {
    out_->on_transition(transition);
    ++sent_;
  } else {
    ++held_;
  }
}

void NotificationFeed::advance(core::SensorTime now) { write_notices(policy_.advance(now)); }

}  // namespace bw::app
