#include "engine/notification_policy.h"

#include <algorithm>
#include <cassert>
#include <cstdio>

namespace bw::engine {
namespace {

constexpr std::uint8_t kStateVersion = 1;
constexpr std::size_t kFloodNamesListed = 3;

std::string key(std::string_view asset, std::string_view check) {
  std::string k(asset);
  k.push_back('\x1f');  // cannot appear in a configured name
  k.append(check);
  return k;
}

core::Micros micros(double seconds) {
  return std::chrono::round<core::Micros>(std::chrono::duration<double>(seconds));
}

std::string number(double v) {
  char buffer[32];
  std::snprintf(buffer, sizeof buffer, "%.4g", v);
  return buffer;
}

bool is_priority(std::uint8_t v) { return v >= 1 && v <= 4; }

}  // namespace

NotificationPolicy::NotificationPolicy(std::string site, NotificationParams params)
    : site_(std::move(site)),
      params_(params),
      chatter_window_(micros(params.chatter_window_s)),
      flood_window_(micros(params.flood_window_s)) {
  assert(params.chatter_count >= 1 && params.flood_count >= 1);
  assert(params.chatter_window_s > 0 && params.flood_window_s > 0);
}

bool NotificationPolicy::chattering(std::string_view asset, std::string_view check) const {
  const auto it = chatter_.find(key(asset, check));
  return it != chatter_.end() && it->second.chattering;
}

void NotificationPolicy::pass_time(core::SensorTime now, std::vector<PolicyNotice>& notices) {
  if (now_ && now < *now_) now = *now_;
  now_ = now;
  std::vector<PolicyNotice> ended;
  for (auto it = chatter_.begin(); it != chatter_.end();) {
    Chatter& c = it->second;
    std::optional<core::SensorTime> last_left;
    while (!c.raises.empty() && c.raises.front() + chatter_window_ <= now) {
      last_left = c.raises.front() + chatter_window_;
      c.raises.pop_front();
    }
    if (c.chattering && c.raises.empty()) {
      ended.push_back({PolicyNotice::Kind::chattering_ended, *last_left, c.asset, c.check,
                       c.raises_held, c.held,
                       c.asset + "/" + c.check +
                           " stopped chattering: " + std::to_string(c.raises_held) +
                           " raises and " + std::to_string(c.held) + " notifications were held"});
      c.chattering = false;
    }
    it = c.raises.empty() && !c.chattering ? chatter_.erase(it) : std::next(it);
  }
  while (!raises_.empty() && raises_.front().time + flood_window_ <= now) {
    const core::SensorTime left = raises_.front().time + flood_window_;
    raises_.pop_front();
    if (flood_ && raises_.size() <= static_cast<std::size_t>(params_.flood_count)) {
      const double minutes = core::seconds_between(flood_->started, left) / 60.0;
      ended.push_back({PolicyNotice::Kind::flood_ended,
                       left,
                       {},
                       {},
                       flood_->new_alerts,
                       flood_->held,
                       "Alert flood at " + site_ + " is over after " + number(minutes) +
                           " min: " + std::to_string(flood_->held) + " notifications were held (" +
                           std::to_string(flood_->new_alerts) +
                           " new alerts); the journal has every one"});
      flood_.reset();
    }
  }
  std::stable_sort(ended.begin(), ended.end(),
                   [](const PolicyNotice& a, const PolicyNotice& b) { return a.time < b.time; });
  notices.insert(notices.end(), ended.begin(), ended.end());
}

std::vector<PolicyNotice> NotificationPolicy::advance(core::SensorTime now) {
  std::vector<PolicyNotice> notices;
  pass_time(now, notices);
  return notices;
}

bool NotificationPolicy::note_raise(Chatter& c, const AlertTransition& t,
                                    std::vector<PolicyNotice>& notices) {
  c.raises.push_back(t.time);
  if (!c.chattering && c.raises.size() >= static_cast<std::size_t>(params_.chatter_count)) {
    c.chattering = true;
    const int raises = static_cast<int>(c.raises.size());
    notices.push_back({PolicyNotice::Kind::chattering_started, t.time, c.asset, c.check, raises, 0,
                       c.asset + "/" + c.check + " is chattering (" + std::to_string(raises) +
                           " raises within " + number(params_.chatter_window_s) +
                           " s); its notifications are held until it settles"});
  }
  if (c.chattering) ++c.raises_held;
  return !c.chattering;
}

PolicyNotice NotificationPolicy::flood_started(core::SensorTime time) const {
  std::vector<const Raise*> ranked;
  for (const Raise& r : raises_) ranked.push_back(&r);
  std::stable_sort(ranked.begin(), ranked.end(),
                   [](const Raise* a, const Raise* b) { return a->priority > b->priority; });
  const int count = static_cast<int>(raises_.size());
  std::string text = "Alert flood at " + site_ + ": " + std::to_string(count) +
                     " new alerts within " + number(params_.flood_window_s / 60.0) +
                     " min; single notifications are held until it eases. Highest priority:";
  for (std::size_t i = 0; i < ranked.size() && i < kFloodNamesListed; ++i) {
    text += (i == 0 ? " " : ", ") + std::string(to_string(ranked[i]->priority)) + " " +
            ranked[i]->asset + "/" + ranked[i]->check;
  }
  return {PolicyNotice::Kind::flood_started, time, {}, {}, count, 0, std::move(text)};
}

Decision NotificationPolicy::on_transition(const AlertTransition& t) {
  Decision decision;
  pass_time(t.time, decision.notices);
  bool counted = false;
  Chatter* chatter = nullptr;
  if (t.event == AlertEvent::raised) {
    const auto [it, inserted] = chatter_.try_emplace(
        key(t.asset, t.check), Chatter{std::string(t.asset), std::string(t.check)});
    chatter = &it->second;
    counted = note_raise(*chatter, t, decision.notices);
  } else if (t.event == AlertEvent::cleared) {
    const auto it = chatter_.find(key(t.asset, t.check));
    if (it != chatter_.end()) chatter = &it->second;
  }
  if (counted) {
    raises_.push_back({t.time, t.priority, std::string(t.asset), std::string(t.check)});
    if (flood_) {
      ++flood_->new_alerts;
    } else if (raises_.size() > static_cast<std::size_t>(params_.flood_count)) {
      flood_ = Flood{t.time, 1, 0};
      decision.notices.push_back(flood_started(t.time));
    }
  }
  if (flood_) {
    ++flood_->held;
    decision.action = Decision::Action::held_flood;
  } else if (chatter != nullptr && chatter->chattering) {
    ++chatter->held;
    decision.action = Decision::Action::held_chattering;
  }
  return decision;
}

void NotificationPolicy::save(StateWriter& out) const {
  out.put_u8(kStateVersion);
  out.put_optional_time(now_);
  out.put_bool(flood_.has_value());
  if (flood_) {
    out.put_time(flood_->started);
    out.put_i64(flood_->new_alerts);
    out.put_i64(flood_->held);
  }
  out.put_u64(raises_.size());
  for (const Raise& r : raises_) {
    out.put_time(r.time);
    out.put_u8(static_cast<std::uint8_t>(r.priority));
    out.put_string(r.asset);
    out.put_string(r.check);
  }
  out.put_u64(chatter_.size());
  for (const auto& [k, c] : chatter_) {
    out.put_string(c.asset);
    out.put_string(c.check);
    out.put_u64(c.raises.size());
    for (const core::SensorTime r : c.raises) out.put_time(r);
    out.put_bool(c.chattering);
    out.put_i64(c.raises_held);
    out.put_i64(c.held);
  }
}

bool NotificationPolicy::load(StateReader& in) {
  if (in.get_u8() != kStateVersion) {
    in.fail();
    return false;
  }
  const auto now = in.get_optional_time();
  std::optional<Flood> flood;
  if (in.get_bool()) {
    flood = Flood{in.get_time(), static_cast<int>(in.get_i64()), static_cast<int>(in.get_i64())};
  }
  std::deque<Raise> raises;
  const std::uint64_t raise_count = in.get_u64();
  for (std::uint64_t i = 0; i < raise_count && in.ok(); ++i) {
    Raise r;
    r.time = in.get_time();
    const std::uint8_t priority = in.get_u8();
    if (!is_priority(priority)) in.fail();
    r.priority = static_cast<Priority>(priority);
    r.asset = in.get_string();
    r.check = in.get_string();
    raises.push_back(std::move(r));
  }
  std::map<std::string, Chatter, std::less<>> chatter;
  const std::uint64_t chatter_count = in.get_u64();
  for (std::uint64_t i = 0; i < chatter_count && in.ok(); ++i) {
    Chatter c;
    c.asset = in.get_string();
    c.check = in.get_string();
    const std::uint64_t n = in.get_u64();
    for (std::uint64_t j = 0; j < n && in.ok(); ++j) c.raises.push_back(in.get_time());
    c.chattering = in.get_bool();
    if (c.chattering && c.raises.empty()) in.fail();  // chattering ends when the last raise leaves
    c.raises_held = static_cast<int>(in.get_i64());
    c.held = static_cast<int>(in.get_i64());
    chatter.emplace(key(c.asset, c.check), std::move(c));
  }
  if (!in.ok()) return false;
  now_ = now;
  flood_ = flood;
  raises_ = std::move(raises);
  chatter_ = std::move(chatter);
  return true;
}

}  // namespace bw::engine
