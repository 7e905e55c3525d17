#include "engine/engine.h"

#include <algorithm>
#include <cassert>
#include <cmath>

#include "engine/spec_fingerprint.h"
#include "engine/state_codec.h"

namespace bw::engine {
namespace {

constexpr std::uint8_t kEngineStateVersion = 1;
constexpr std::string_view kEngineScope = "engine";

// Counts transitions on their way to the caller's sink.
class CountingSink final : public AlertSink {
 public:
  CountingSink(AlertSink& next, EngineCounters& counters) : next_(next), counters_(counters) {}
  void on_transition(const AlertTransition& transition) override {
    ++counters_.transitions;
    if (transition.event == AlertEvent::command_refused) ++counters_.commands_refused;
    next_.on_transition(transition);
  }
  void on_record(const AssetRecord& record) override {
    ++counters_.records;
    next_.on_record(record);
  }

 private:
  AlertSink& next_;
  EngineCounters& counters_;
};

}  // namespace

// Hands the condition changes of the assets to the alert book, and keeps their records until
// the step's transitions are out.
class Engine::BookFeed final : public ConditionSink {
 public:
  BookFeed(AlertBook& book, AlertSink& out, std::vector<AssetRecord>& records)
      : book_(book), out_(out), records_(records) {}
  void on_change(std::string_view asset, const ConditionChange& change) override {
    book_.on_change(asset, change, out_);
  }
  void on_record(AssetRecord record) override { records_.push_back(std::move(record)); }

 private:
  AlertBook& book_;
  AlertSink& out_;
  std::vector<AssetRecord>& records_;
};

Engine::Engine(SiteSpec site, CommandPolicy policy, std::unique_ptr<LocalCalendar> calendar)
    : site_(std::make_unique<SiteSpec>(std::move(site))),
      calendar_(calendar ? std::move(calendar) : std::make_unique<UtcCalendar>()),
      book_(site_->name, std::move(policy)) {
  for (auto check : kDaemonChecks) {
    book_.define(std::string(kDaemonAsset), std::string(check), Priority::high, false);
  }
  for (std::size_t a = 0; a < site_->assets.size(); ++a) {
    const AssetSpec& asset = site_->assets[a];
    assets_.push_back(std::make_unique<AssetEvaluator>(asset, site_->name, calendar_.get()));
    fingerprints_.push_back(fingerprint(asset));
    for (const auto& check : assets_.back()->checks()) {
      book_.define(asset.name, std::string(check.name), check.priority, check.latching);
    }
    for (std::size_t i = 0; i < asset.inputs.size(); ++i) {
      if (asset.inputs[i].tag.empty()) continue;
      bindings_[asset.inputs[i].tag].push_back(
          {static_cast<std::uint32_t>(a), static_cast<std::uint32_t>(i)});
    }
  }
}

void Engine::note_unknown(std::string_view tag) {
  ++counters_.unknown_tag;
  auto& listed = counters_.first_unknown_tags;
  if (listed.size() < kMaxListedUnknownTags &&
      std::find(listed.begin(), listed.end(), tag) == listed.end()) {
    listed.emplace_back(tag);
  }
}

void Engine::hand_over_records(AlertSink& sink) {
  if (records_.empty()) return;
  for (const AssetRecord& record : records_) sink.on_record(record);
  records_.clear();
}

void Engine::run_time_driven(core::SensorTime now, AlertSink& sink) {
  BookFeed feed(book_, sink, records_);
  for (std::size_t a = 0; a < assets_.size(); ++a) assets_[a]->advance(now, feed);
  book_.advance(now, sink);
  last_advance_ = now;
  hand_over_records(sink);
}

void Engine::move_clock(core::SensorTime t, AlertSink& sink) {
  if (clock_ && t <= *clock_) return;
  clock_ = t;
  if (!last_advance_ || t - *last_advance_ >= kAdvanceStep) run_time_driven(t, sink);
}

void Engine::advance(core::SensorTime now, AlertSink& sink) {
  CountingSink counting(sink, counters_);
  if (clock_ && now <= *clock_) return;
  clock_ = now;
  run_time_driven(now, counting);
}

void Engine::process(const Sample& sample, AlertSink& sink) {
  ++counters_.samples;
  auto it = bindings_.find(sample.tag);
  if (it == bindings_.end()) {
    note_unknown(sample.tag);
    return;
  }
  if (sample.quality == Quality::good && !std::isfinite(sample.value)) {
    ++counters_.non_finite;
    return;
  }
  if (sample.quality != Quality::good) ++counters_.not_good;
  ++counters_.evaluated;
  CountingSink counting(sink, counters_);
  move_clock(sample.time, counting);
  BookFeed feed(book_, counting, records_);
  for (const Binding& b : it->second) {
    assets_[b.asset]->on_sample(b.input, sample.value, sample.quality, sample.time, it->first, feed);
  }
  hand_over_records(counting);
}

CommandReply Engine::execute(const AlertCommand& command, AlertSink& sink) {
  ++counters_.commands;
  CountingSink counting(sink, counters_);
  move_clock(command.issued, counting);
  return book_.execute(command, counting);
}

void Engine::report_daemon_event(std::string_view check, std::string detail, core::SensorTime t,
                                 AlertSink& sink) {
  assert(std::find(kDaemonChecks.begin(), kDaemonChecks.end(), check) != kDaemonChecks.end());
  CountingSink counting(sink, counters_);
  ConditionChange change{.kind = ConditionChange::Kind::condition,
                         .active = true,
                         .time = t,
                         .check = check,
                         .priority = Priority::high,
                         .detail = std::move(detail)};
  book_.on_change(kDaemonAsset, change, counting);
  change.active = false;
  book_.on_change(kDaemonAsset, change, counting);
}

std::vector<EngineCheckpoint> Engine::checkpoint() const {
  std::vector<EngineCheckpoint> out;
  for (std::size_t a = 0; a < assets_.size(); ++a) {
    StateWriter w;
    assets_[a]->save(w);
    out.push_back({std::string(kAssetScopePrefix) + site_->assets[a].name, fingerprints_[a], w.take()});
  }
  StateWriter book;
  book_.save(book);
  out.push_back({std::string(kAlertBookScope), site_->name, book.take()});
  StateWriter engine;
  engine.put_u8(kEngineStateVersion);
  engine.put_optional_time(clock_);
  engine.put_optional_time(last_advance_);
  out.push_back({std::string(kEngineScope), site_->name, engine.take()});
  return out;
}

RestoreReport Engine::restore(const std::vector<EngineCheckpoint>& saved) {
  RestoreReport report;
  auto take = [&](const EngineCheckpoint& c, bool ok) {
    (ok ? report.restored : report.reset).push_back(c.scope);
  };
  for (const auto& c : saved) {
    if (c.scope.rfind(kAssetScopePrefix, 0) == 0) {
      const std::string name = c.scope.substr(kAssetScopePrefix.size());
      for (std::size_t a = 0; a < assets_.size(); ++a) {
        if (site_->assets[a].name != name) continue;
        StateReader r(c.state);
        const bool fits = c.definition == fingerprints_[a] && assets_[a]->load(r) && r.finished();
        if (!fits) {
          // A half-applied load must not survive: start this asset afresh.
          assets_[a] =
              std::make_unique<AssetEvaluator>(site_->assets[a], site_->name, calendar_.get());
        }
        take(c, fits);
      }
    } else if (c.scope == kAlertBookScope) {
      StateReader r(c.state);
      take(c, book_.load(r) && r.finished());
    } else if (c.scope == kEngineScope) {
      StateReader r(c.state);
      const bool version_ok = r.get_u8() == kEngineStateVersion;
      const auto clock = r.get_optional_time();
      const auto last = r.get_optional_time();
      const bool fits = version_ok && r.finished();
      if (fits) {
        clock_ = clock;
        last_advance_ = last;
      }
      take(c, fits);
    }
  }
  return report;
}

}  // namespace bw::engine
