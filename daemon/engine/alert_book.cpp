#include "core/utc_text.h"
#include "engine/alert_book.h"

#include <algorithm>
#include <cassert>
#include <utility>

namespace bw::engine {
namespace {

constexpr std::uint8_t kStateVersion = 1;

std::string key(std::string_view asset, std::string_view check) {
  std::string k;
  k.reserve(asset.size() + 1 + check.size());
  k.append(asset);
  k.push_back('\x1f');  // cannot appear in a configured name
  k.append(check);
  return k;
}

ShelveRequest shelve_request(const AlertCommand& command) {
  return {command.issued, command.duration_s, command.who, command.reason, command.source};
}

std::string by_whom(std::string_view who, std::string_view source, std::string_view reason) {
  std::string text = " by " + std::string(who) + " (" + std::string(source) + ")";
  if (!reason.empty()) text += ": " + std::string(reason);
  return text;
}

}  // namespace

AlertBook::AlertBook(std::string site, CommandPolicy policy)
    : site_(std::move(site)), policy_(std::move(policy)) {}

AlertBook::Entry* AlertBook::find_entry(std::string_view asset, std::string_view check) {
  const auto it = index_.find(key(asset, check));
  return it == index_.end() ? nullptr : &entries_[it->second];
}

const AlertLifecycle* AlertBook::find(std::string_view asset, std::string_view check) const {
  const auto it = index_.find(key(asset, check));
  return it == index_.end() ? nullptr : &entries_[it->second].lifecycle;
}

AlertBook::Entry& AlertBook::define_entry(std::string_view asset, std::string_view check,
                                          Priority priority, bool latching) {
  const auto [it, inserted] = index_.try_emplace(key(asset, check), entries_.size());
  if (!inserted) {
    Entry& entry = entries_[it->second];
    entry.priority = priority;
    entry.lifecycle.set_latching(latching);
    return entry;
  }
  return entries_.emplace_back(Entry{std::string(asset), std::string(check), priority,
                                     AlertLifecycle(latching), core::SensorTime{}});
}

void AlertBook::define(std::string asset, std::string check, Priority priority, bool latching) {
  define_entry(asset, check, priority, latching);
}

AlertTransition AlertBook::transition_of(Entry& entry, core::SensorTime time,
                                         const LifecycleChange& change) {
  if (change.from != change.to) entry.since = time;
  AlertTransition t;
  t.time = time;
  t.site = site_;
  t.asset = entry.asset;
  t.check = entry.check;
  t.event = change.event;
  t.priority = entry.priority;
  t.from = change.from;
  t.to = change.to;
  return t;
}

void AlertBook::on_change(std::string_view asset, const ConditionChange& change, AlertSink& out) {
  advance(change.time, out);
  Entry* entry = find_entry(asset, change.check);
  if (entry == nullptr) entry = &define_entry(asset, change.check, change.priority, false);
  const auto result = change.kind == ConditionChange::Kind::condition
                          ? entry->lifecycle.set_condition(change.active)
                          : entry->lifecycle.set_suppressed(change.active);
  if (!result) return;
  AlertTransition t = transition_of(*entry, change.time, *result);
  t.cause = change.cause;
  t.tag = change.tag;
  t.value = change.value;
  t.unit = change.unit;
  t.forecast = change.forecast;
  if (change.message.empty()) {
    t.message = change.detail;
  } else {
    t.message = change.message;
    if (!change.detail.empty()) t.message += ": " + change.detail;
  }
  out.on_transition(t);
}

void AlertBook::advance(core::SensorTime now, AlertSink& out) {
  if (!now_ || now > *now_) now_ = now;  // time never runs backwards for the book
  if (shelves_changed_) {
    next_expiry_.reset();
    for (const auto& entry : entries_) {
      const auto& shelve = entry.lifecycle.shelve();
      if (shelve && (!next_expiry_ || shelve->until < *next_expiry_)) next_expiry_ = shelve->until;
    }
    shelves_changed_ = false;
  }
  if (!next_expiry_ || *next_expiry_ > *now_) return;
  shelves_changed_ = true;  // some run out now; find the next one afterwards
  std::vector<std::pair<core::SensorTime, std::size_t>> due;
  for (std::size_t i = 0; i < entries_.size(); ++i) {
    const auto& shelve = entries_[i].lifecycle.shelve();
    if (shelve && shelve->until <= *now_) due.emplace_back(shelve->until, i);
  }
  std::sort(due.begin(), due.end());
  for (const auto& [until, i] : due) {
    Entry& entry = entries_[i];
    const Shelve ended = *entry.lifecycle.shelve();  // expiry forgets it; the journal needs it
    const auto change = entry.lifecycle.expire_shelve(*now_);
    assert(change);
    AlertTransition t = transition_of(entry, until, *change);
    t.cause = TransitionCause::shelve_expiry;
    t.who = ended.who;
    t.reason = ended.reason;
    t.source = ended.source;
    t.message = "shelve ran out (shelved until " + core::format_utc(until) +
                by_whom(ended.who, ended.source, ended.reason) + ")";
    out.on_transition(t);
  }
}

std::vector<AlertBook::Entry*> AlertBook::targets(const AlertCommand& command) {
  std::vector<Entry*> chosen;
  if (!command.check.empty()) {
    if (Entry* entry = find_entry(command.asset, command.check)) chosen.push_back(entry);
    return chosen;
  }
  for (Entry& entry : entries_) {
    if (entry.asset == command.asset) chosen.push_back(&entry);
  }
  return chosen;
}

std::optional<std::string> AlertBook::precheck(const AlertCommand& command,
                                               bool has_targets) const {
  const auto& sources = policy_.authorised_sources;
  if (std::find(sources.begin(), sources.end(), command.source) == sources.end()) {
    return "source '" + command.source + "' is not authorised to send commands";
  }
  if (command.who.empty()) return std::string("the command does not say who sent it");
  const bool needs_reason = command.kind == AlertCommand::Kind::shelve ||
                            command.kind == AlertCommand::Kind::remove_from_service;
  if (needs_reason && command.reason.empty()) {
    return std::string(to_string(command.kind)) + " needs a reason";
  }
  if (!has_targets) {
    if (command.check.empty()) return "no alerts for asset '" + command.asset + "' at " + site_;
    return "no alert '" + command.asset + "/" + command.check + "' at " + site_;
  }
  if (command.kind == AlertCommand::Kind::shelve) {
    return shelve_refusal(shelve_request(command), *now_, policy_.max_shelve_s);
  }
  return std::nullopt;
}

Result<LifecycleChange> AlertBook::apply(Entry& entry, const AlertCommand& command) {
  AlertLifecycle& lifecycle = entry.lifecycle;
  switch (command.kind) {
    case AlertCommand::Kind::acknowledge:
      return lifecycle.acknowledge();
    case AlertCommand::Kind::shelve:
      return lifecycle.shelve(shelve_request(command), *now_, policy_.max_shelve_s);
    case AlertCommand::Kind::unshelve:
      return lifecycle.unshelve();
    case AlertCommand::Kind::remove_from_service:
      return lifecycle.remove_from_service();
    case AlertCommand::Kind::return_to_service:
      return lifecycle.return_to_service();
  }
  return Error{"unknown command"};
}

CommandReply AlertBook::refuse(const AlertCommand& command, const Entry* entry, std::string reason,
                               AlertSink& out) const {
  AlertTransition t;
  t.time = command.issued;
  t.site = site_;
  t.asset = command.asset;
  t.check = command.check;
  t.event = AlertEvent::command_refused;
  if (entry != nullptr) {
    t.priority = entry->priority;
    t.from = t.to = entry->lifecycle.state();
  }
  t.cause = TransitionCause::command;
  t.who = command.who;
  t.reason = command.reason;
  t.source = command.source;
  t.message = "refused: " + std::move(reason);
  out.on_transition(t);
  return {false, t.message};
}

CommandReply AlertBook::execute(const AlertCommand& command, AlertSink& out) {
  // Whatever the command did, the next advance() looks at the shelves afresh.
  struct MarkShelvesChanged {
    bool& flag;
    ~MarkShelvesChanged() { flag = true; }
  } mark{shelves_changed_};
  advance(command.issued, out);
  const std::vector<Entry*> chosen = targets(command);
  if (auto why = precheck(command, !chosen.empty())) {
    return refuse(command, chosen.size() == 1 ? chosen.front() : nullptr, std::move(*why), out);
  }
  std::string refusals;
  std::string action;
  std::size_t accepted = 0;
  for (Entry* entry : chosen) {
    auto result = apply(*entry, command);
    if (!result) {
      refusals += (refusals.empty() ? "" : "; ") + entry->asset + "/" + entry->check + ": " +
                  result.error().message;
      continue;
    }
    ++accepted;
    action = std::string(to_string(result->event));
    if (command.kind == AlertCommand::Kind::shelve) {
      action += " until " + core::format_utc(entry->lifecycle.shelve()->until);
    }
    std::replace(action.begin(), action.end(), '_', ' ');
    action += by_whom(command.who, command.source, command.reason);
    AlertTransition t = transition_of(*entry, command.issued, result.value());
    t.cause = TransitionCause::command;
    t.who = command.who;
    t.reason = command.reason;
    t.source = command.source;
    t.message = action;
    out.on_transition(t);
  }
  if (accepted == 0) {
    return refuse(command, chosen.size() == 1 ? chosen.front() : nullptr, std::move(refusals), out);
  }
  if (!command.check.empty()) return {true, command.asset + "/" + command.check + " " + action};
  return {true, std::to_string(accepted) + " of " + std::to_string(chosen.size()) + " alerts of " +
                    command.asset + " " + action};
}

std::vector<AlertView> AlertBook::not_normal() const {
  std::vector<AlertView> views;
  for (const Entry& entry : entries_) {
    const AlertState state = entry.lifecycle.state();
    if (state != AlertState::normal) {
      views.push_back({entry.asset, entry.check, state, entry.priority, entry.since});
    }
  }
  return views;
}

void AlertBook::save(StateWriter& out) const {
  out.put_u8(kStateVersion);
  out.put_optional_time(now_);
  out.put_u64(entries_.size());
  for (const Entry& entry : entries_) {
    out.put_string(entry.asset);
    out.put_string(entry.check);
    out.put_time(entry.since);
    entry.lifecycle.save(out);
  }
}

bool AlertBook::load(StateReader& in) {
  shelves_changed_ = true;
  if (in.get_u8() != kStateVersion) {
    in.fail();
    return false;
  }
  const auto now = in.get_optional_time();
  struct Restored {
    Entry* entry;
    AlertLifecycle lifecycle;
    core::SensorTime since;
  };
  std::vector<Restored> restored;
  const std::uint64_t count = in.get_u64();
  for (std::uint64_t i = 0; i < count && in.ok(); ++i) {
    const std::string asset = in.get_string();
    const std::string check = in.get_string();
    const core::SensorTime since = in.get_time();
    Entry* entry = find_entry(asset, check);
    AlertLifecycle lifecycle = entry != nullptr ? entry->lifecycle : AlertLifecycle();
    if (!lifecycle.load(in)) return false;
    if (entry != nullptr) restored.push_back({entry, std::move(lifecycle), since});
  }
  if (!in.ok()) return false;
  now_ = now;
  for (Restored& r : restored) {
    r.entry->lifecycle = std::move(r.lifecycle);
    r.entry->since = r.since;
  }
  return true;
}

}  // namespace bw::engine
