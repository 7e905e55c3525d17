// All alerts of one site, each with its lifecycle (engine/alert_lifecycle.h), and the one command
// interface through which people act on them.
//
// The engine declares every alert while it compiles the site, then reports condition and
// suppression changes; people's commands (MQTT, text messages, replay) all go through
// execute(); advance() lets time pass so shelves run out. Every accepted change and every
// refused command is emitted as an AlertTransition, in time order per call, so the journal
// records each with its cause. Nothing here reads a clock: times come from the changes, the
// commands and advance() (event time in replay, wall clock live), so the same inputs give the
// same transitions.
//
// Time: the book keeps the latest time it has seen (changes, commands' issue times, advance()).
// Before handling a change or a command it lets time pass up to that time, so a shelve that ran
// out earlier is journaled first. A shelve that would end at or before that time is refused.
// Shelve expiries are journaled at the shelve's own end time, whenever advance() notices them;
// a command's transitions carry the time the person issued it.
//
// Commands are checked in this order, and the first failure is the refusal: the source must be
// listed in CommandPolicy::authorised_sources; `who` must be given; shelve and
// remove_from_service need a reason; the asset (and the check, unless empty) must name defined
// alerts; a shelve's duration must be valid; then the lifecycle rules. An asset-wide command
// (empty check) changes every alert of the asset that accepts it, one transition each, and is
// refused only when none does. A refusal is one command_refused transition; nothing changes.
//
// Transition strings (site, asset, check) view the book's own copies, which never move; who,
// reason and source view the command, or the stored shelve for expiries. All views are valid
// during the sink call only, unless the book outlives their use.
//
// A change for an alert that was never defined defines it on the spot (not latching, with the
// change's priority), so an implicit check the engine forgot to declare is still journaled.
// Not thread-safe: owned by the engine's thread.
#pragma once

#include <cstddef>
#include <deque>
#include <map>
#include <optional>
#include <string>
#include <string_view>
#include <vector>

#include "core/sensor_time.h"
#include "engine/alert.h"
#include "engine/alert_command.h"
#include "engine/alert_lifecycle.h"
#include "engine/condition.h"
#include "engine/site_model.h"
#include "engine/state_codec.h"

namespace bw::engine {

struct CommandPolicy {
  std::vector<std::string>
      authorised_sources;             // exact match; "replay" is how replayed commands arrive
  double max_shelve_s = 7 * 86400.0;  // common practice: shelving is always time-limited
};

// One alert as a summary shows it. Views are valid while the book lives.
struct AlertView {
  std::string_view asset;
  std::string_view check;
  AlertState state = AlertState::normal;
  Priority priority = Priority::medium;
  core::SensorTime since;  // when the shown state last changed (epoch when never)
};

class AlertBook {
 public:
  AlertBook(std::string site, CommandPolicy policy);
  AlertBook(const AlertBook&) = delete;
  AlertBook& operator=(const AlertBook&) = delete;

  // Declares an alert (called while the engine compiles the site, before any change). A second
  // definition of the same (asset, check) updates its priority and latching.
  void define(std::string asset, std::string check, Priority priority, bool latching);

  // A check's condition or suppression changed: apply it and emit the resulting transitions.
  void on_change(std::string_view asset, const ConditionChange& change, AlertSink& out);

  // The one command interface: validates (authorised source, known asset/check, lifecycle rules),
  // applies, emits each resulting transition (one per alert for an asset-wide command), or emits
  // one command_refused transition carrying the reason; the reply says the same to the sender.
  CommandReply execute(const AlertCommand& command, AlertSink& out);

  // Time passes (event time in replay, wall clock live): shelve expiries, in order of expiry.
  void advance(core::SensorTime now, AlertSink& out);

  // Saves every alert's state by (asset, check) name, and the latest time seen.
  void save(StateWriter& out) const;
  // Restores by name; names not defined now are dropped. Changes nothing unless the whole state
  // reads back valid.
  bool load(StateReader& in);

  // For summaries: every alert that is not normal, in definition order.
  std::vector<AlertView> not_normal() const;
  // The lifecycle of one alert, or null when it is not defined.
  const AlertLifecycle* find(std::string_view asset, std::string_view check) const;

  const std::string& site() const { return site_; }

 private:
  struct Entry {
    std::string asset;
    std::string check;
    Priority priority;
    AlertLifecycle lifecycle;
    core::SensorTime since;
  };

  Entry* find_entry(std::string_view asset, std::string_view check);
  Entry& define_entry(std::string_view asset, std::string_view check, Priority priority,
                      bool latching);
  std::vector<Entry*> targets(const AlertCommand& command);
  // Why the command is refused before any alert is asked, or nothing.
  std::optional<std::string> precheck(const AlertCommand& command, bool has_targets) const;
  Result<LifecycleChange> apply(Entry& entry, const AlertCommand& command);
  // A transition of `entry` with the fields common to every cause filled in.
  AlertTransition transition_of(Entry& entry, core::SensorTime time, const LifecycleChange& change);
  CommandReply refuse(const AlertCommand& command, const Entry* entry, std::string reason,
                      AlertSink& out) const;

  std::string site_;
  CommandPolicy policy_;
  std::deque<Entry> entries_;  // definition order; a deque never moves its elements
  std::map<std::string, std::size_t, std::less<>> index_;  // key(asset, check) -> entries_
  std::optional<core::SensorTime> now_;
  // The earliest shelve expiry, valid while !shelves_changed_ (commands and load() change
  // shelves): advance() runs once per sample in replay and mostly has nothing to do.
  std::optional<core::SensorTime> next_expiry_;
  bool shelves_changed_ = true;
};

}  // namespace bw::engine
