#include "app/state_keeper.h"

#include <algorithm>
#include <charconv>

namespace bw::app {
namespace {

std::int64_t micros(core::SensorTime t) { return t.time_since_epoch().count(); }

}  // namespace

// A transition held until its commit lands: the journal row, and the strings the transition's
// views point into, so it can be passed on intact afterwards.
struct StateKeeper::Pending {
  io::JournalEntry entry;
  engine::AlertTransition transition;
  std::string unit;

  explicit Pending(const engine::AlertTransition& t) : transition(t), unit(t.unit) {
    entry.time_us = micros(t.time);
    entry.site = std::string(t.site);
    entry.asset = std::string(t.asset);
    entry.check = std::string(t.check);
    entry.event = std::string(engine::to_string(t.event));
    entry.from_state = std::string(engine::to_string(t.from));
    entry.to_state = std::string(engine::to_string(t.to));
    entry.priority = std::string(engine::to_string(t.priority));
    entry.cause = std::string(engine::to_string(t.cause));
    entry.who = std::string(t.who);
    entry.reason = std::string(t.reason);
    entry.source = std::string(t.source);
    entry.tag = std::string(t.tag);
    entry.message = t.message;
    entry.value = t.value;
    // Re-point every view at strings this object owns.
    transition.site = entry.site;
    transition.asset = entry.asset;
    transition.check = entry.check;
    transition.tag = entry.tag;
    transition.unit = unit;
    transition.who = entry.who;
    transition.reason = entry.reason;
    transition.source = entry.source;
  }
};

// A record held until its commit lands, with the strings its views point into.
struct StateKeeper::PendingRecord {
  std::string site;
  std::string asset;
  std::string source;
  engine::AssetRecord record;

  explicit PendingRecord(const engine::AssetRecord& r)
      : site(r.site), asset(r.asset), source(r.source), record{site, asset, source, r.content} {}
};

StateKeeper::StateKeeper(std::unique_ptr<io::StateStore> store, engine::Engine& engine,
                         engine::NotificationPolicy* policy, engine::AlertSink& next)
    : store_(std::move(store)), engine_(engine), policy_(policy), next_(next) {}

StateKeeper::~StateKeeper() = default;

Result<StateKeeper::Opened> StateKeeper::open(const std::filesystem::path& dir,
                                              engine::Engine& engine,
                                              engine::NotificationPolicy* policy,
                                              engine::AlertSink& next) {
  Opened opened;
  auto store = io::StateStore::open(dir, opened.store);
  if (!store) return store.error();
  auto checkpoints = store.value()->load_checkpoints();
  if (!checkpoints) return checkpoints.error();
  std::vector<engine::EngineCheckpoint> saved;
  for (auto& c : checkpoints.value()) {
    if (c.scope == kPolicyScope) {
      if (policy == nullptr) continue;
      engine::StateReader r(c.state);
      (policy->load(r) && r.finished() ? opened.restore.restored : opened.restore.reset)
          .push_back(c.scope);
      continue;
    }
    saved.push_back({std::move(c.scope), std::move(c.definition_hash), std::move(c.state)});
  }
  const auto restored = engine.restore(saved);
  opened.restore.restored.insert(opened.restore.restored.end(), restored.restored.begin(),
                                 restored.restored.end());
  opened.restore.reset.insert(opened.restore.reset.end(), restored.reset.begin(),
                              restored.reset.end());
  auto position = store.value()->meta(kPositionKey);
  if (!position) return position.error();
  if (position.value()) {
    std::int64_t us = 0;
    const std::string& text = *position.value();
    if (std::from_chars(text.data(), text.data() + text.size(), us).ec != std::errc()) {
      return Error{"state store " + store.value()->path().string() + ": bad " + kPositionKey +
                   " '" + text + "'"};
    }
    opened.position = core::SensorTime(core::Micros(us));
  }
  auto last = store.value()->last_seq();
  if (!last) return last.error();
  opened.keeper.reset(new StateKeeper(std::move(store.value()), engine, policy, next));
  opened.keeper->last_seq_ = last.value();
  if (opened.store.moved_aside) {
    opened.keeper->damage_ = "the state database was damaged (" + opened.store.problem +
                             "); it was moved to " + opened.store.moved_aside->string() +
                             " and brinewatch started with fresh state";
  }
  return opened;
}

void StateKeeper::report_damage(core::SensorTime t) {
  if (damage_.empty()) return;
  engine_.report_daemon_event(engine::Engine::kDaemonChecks[0], std::move(damage_), t, *this);
  damage_.clear();
}

void StateKeeper::on_transition(const engine::AlertTransition& transition) {
  pending_.push_back(std::make_unique<Pending>(transition));
}

void StateKeeper::on_record(const engine::AssetRecord& record) {
  pending_records_.push_back(std::make_unique<PendingRecord>(record));
}

Status StateKeeper::commit(core::SensorTime position, Depth depth) {
  // Pass on first, so the notification policy's checkpoint includes these transitions.
  for (; passed_on_ < pending_.size(); ++passed_on_) next_.on_transition(pending_[passed_on_]->transition);
  for (; records_passed_on_ < pending_records_.size(); ++records_passed_on_) {
    next_.on_record(pending_records_[records_passed_on_]->record);
  }
  const bool assets_too = depth == Depth::full || !pending_records_.empty();
  if (caught_up_) caught_up_(position);
  io::StateStore::Batch batch;
  for (const auto& p : pending_) batch.journal.push_back(p->entry);
  if (outbox_source_) batch.outbox = outbox_source_();
  batch.delivered = delivered_;
  for (auto& c : engine_.checkpoint()) {
    if (!assets_too && c.scope != engine::Engine::kAlertBookScope) continue;
    batch.checkpoints.push_back(
        {std::move(c.scope), std::move(c.definition), micros(position), std::move(c.state)});
  }
  if (policy_ != nullptr && depth == Depth::full) {
    engine::StateWriter w;
    policy_->save(w);
    batch.checkpoints.push_back({kPolicyScope, engine_.site().name, micros(position), w.take()});
  }
  batch.meta.emplace_back(kPositionKey, std::to_string(micros(position)));
  auto seq = store_->commit(batch);
  if (!seq) return seq.error();
  last_seq_ = seq.value();
  pending_.clear();
  passed_on_ = 0;
  pending_records_.clear();
  records_passed_on_ = 0;
  delivered_.erase(delivered_.begin(), delivered_.begin() + static_cast<std::ptrdiff_t>(batch.delivered.size()));
  if (after_commit_ && !after_commit_()) return Error{"writing the alert outputs failed"};
  return Ok{};
}

Result<std::vector<io::OutboxMessage>> StateKeeper::read_outbox(std::int64_t after_id,
                                                               std::size_t limit) const {
  auto messages = store_->read_outbox(after_id, limit + delivered_.size());
  if (!messages) return messages.error();
  std::vector<io::OutboxMessage> waiting;
  for (auto& m : messages.value()) {
    if (waiting.size() == limit) break;
    if (std::find(delivered_.begin(), delivered_.end(), m.id) != delivered_.end()) continue;
    waiting.push_back(std::move(m));
  }
  return waiting;
}

}  // namespace bw::app
