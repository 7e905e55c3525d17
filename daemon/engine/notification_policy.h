// Which alert transitions reach the crews (text messages, MQTT notifications) for one site. The
// journal keeps every transition regardless; this only decides what interrupts a person.
//
// Chattering (common practice: an alert that raises 3 or more times within 60 s): from the raise
// that makes an alert chattering, its raised and cleared notifications are held. It stops
// chattering once it has not raised for one full window. Command transitions of a chattering
// alert (acknowledged, shelved, ...) still go out: shelving is the usual remedy.
//
// Flood (more than 10 new alerts in 10 minutes at one site: the ISA-18.2 flood figure and the
// EEMUA 191 benchmark of at most 10 alarms in the first 10 minutes of an upset): the raise that
// makes the count exceed the threshold starts a flood. While in flood every notification is
// held and replaced by one flood-start summary (new alerts in the window, the highest-priority
// ones named) and, once the count in the window falls to the threshold or below, one flood-end
// summary saying how many notifications were held. "New alerts" are raised transitions; a raise
// held for chattering is not counted, so one faulty transmitter cannot switch a whole site to
// summaries.
//
// Windows: a raise at time r counts in the window until r + window (exclusive), so a raise at
// r + window no longer sees it. Every start and end is reported as a PolicyNotice whose time is
// when it happened (a flood ends when the raise that brings the count down leaves the window;
// chattering ends one window after the last raise), however late advance() is called, so live
// and replay runs report the same. on_transition() first lets time pass up to the transition's
// time, so notices always come out in time order. Transitions must arrive in time order.
//
// Not thread-safe: owned by the engine's thread (or the dispatcher's, but only one).
#pragma once

#include <cstdint>
#include <deque>
#include <map>
#include <optional>
#include <string>
#include <string_view>
#include <vector>

#include "core/sensor_time.h"
#include "engine/alert.h"
#include "engine/state_codec.h"

namespace bw::engine {

struct NotificationParams {
  int chatter_count = 3;         // common practice: 3 raises ...
  double chatter_window_s = 60;  // ... within 60 s
  int flood_count = 10;          // ISA-18.2 / EEMUA 191: more than 10 new alerts ...
  double flood_window_s = 600;   // ... in 10 minutes
};

struct PolicyNotice {
  enum class Kind : std::uint8_t {
    chattering_started,
    chattering_ended,
    flood_started,
    flood_ended
  };
  Kind kind = Kind::flood_started;
  core::SensorTime time;
  std::string asset;  // chattering: the alert; flood: empty
  std::string check;
  int count = 0;     // raises in the window (starts), or new alerts while it lasted (ends)
  int held = 0;      // notifications held while it lasted (ends)
  std::string text;  // for a person
};

struct Decision {
  enum class Action : std::uint8_t { notify, held_chattering, held_flood };
  Action action = Action::notify;
  std::vector<PolicyNotice> notices;  // to send, in this order, before the transition (if any)
};

class NotificationPolicy {
 public:
  NotificationPolicy(std::string site, NotificationParams params);

  Decision on_transition(const AlertTransition& transition);
  // Time passes: chattering and floods that are over. `now` earlier than a time already seen is
  // treated as that time.
  std::vector<PolicyNotice> advance(core::SensorTime now);

  bool in_flood() const { return flood_.has_value(); }
  const std::string& site() const { return site_; }
  bool chattering(std::string_view asset, std::string_view check) const;

  // Run-time state only (params are configuration). load() changes nothing unless the whole
  // state reads back valid.
  void save(StateWriter& out) const;
  bool load(StateReader& in);

 private:
  struct Raise {
    core::SensorTime time;
    Priority priority;
    std::string asset;
    std::string check;
  };
  struct Chatter {
    std::string asset;
    std::string check;
    std::deque<core::SensorTime> raises;  // within the chatter window
    bool chattering = false;
    int raises_held = 0;
    int held = 0;
  };
  struct Flood {
    core::SensorTime started;
    int new_alerts = 0;
    int held = 0;
  };

  void pass_time(core::SensorTime now, std::vector<PolicyNotice>& notices);
  bool note_raise(Chatter& chatter, const AlertTransition& t, std::vector<PolicyNotice>& notices);
  PolicyNotice flood_started(core::SensorTime time) const;

  std::string site_;
  NotificationParams params_;
  core::Micros chatter_window_;
  core::Micros flood_window_;
  std::map<std::string, Chatter, std::less<>> chatter_;  // by alert key; idle ones are dropped
  std::deque<Raise> raises_;  // counted raises within the flood window, oldest first
  std::optional<Flood> flood_;
  std::optional<core::SensorTime> now_;
};

}  // namespace bw::engine
