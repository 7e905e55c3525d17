// Keeps an engine's state in the durable store: restores it at start, journals every
// transition, and commits checkpoints, journal and position together.
//
// Sits in the transition path as an AlertSink: every transition is buffered as a journal entry
// until commit(), which (1) passes the buffered transitions on to `next` (whose outputs must be
// held, not yet written), (2) writes in one transaction the journal entries, a checkpoint of
// every engine scope and of the notification policy, and the position (the event time up to
// which every input has been applied), and (3) only then calls `after_commit` to write the held
// outputs. So what the crew sees is always backed by the journal, and a restart after a crash
// neither loses a journal entry nor repeats one; on restart, inputs at or before the position
// are skipped. (A crash between (2) and (3) loses output lines, never journal entries.)
//
// Records (engine/asset_record.h) take the same path: held until commit, passed on to `next`
// after the transitions, and written out by `after_commit`. Closing a record changes the state
// of its asset, so a commit that carries records checkpoints the assets whatever its depth: a
// restart never closes the same period twice.
//
// A damaged store found at open is moved aside by the store; the keeper then raises the
// daemon's own alert saying so (Engine::report_daemon_event) when report_damage(t) is called:
// at start-up on the wall clock live, at the first sample's time in replay, so that the
// journal stays in time order.
#pragma once

#include <filesystem>
#include <functional>
#include <memory>
#include <optional>
#include <string>
#include <vector>

#include "core/result.h"
#include "engine/engine.h"
#include "engine/notification_policy.h"
#include "io/state_store.h"

namespace bw::app {

class StateKeeper final : public engine::AlertSink {
 public:
  struct Opened {
    std::unique_ptr<StateKeeper> keeper;
    io::StoreOpenReport store;
    engine::RestoreReport restore;
    std::optional<core::SensorTime> position;  // inputs at or before it were applied already
  };

  // Opens the store in `dir` and restores `engine` (and `policy`, when given) from it.
  static Result<Opened> open(const std::filesystem::path& dir, engine::Engine& engine,
                             engine::NotificationPolicy* policy, engine::AlertSink& next);

  // Raises the damaged-store alert at `t` if the store had to start afresh; once only.
  void report_damage(core::SensorTime t);

  ~StateKeeper() override;
  StateKeeper(const StateKeeper&) = delete;
  StateKeeper& operator=(const StateKeeper&) = delete;

  void on_transition(const engine::AlertTransition& transition) override;
  void on_record(const engine::AssetRecord& record) override;

  // Hooks of each commit: `caught_up(position)` once the buffered transitions have been passed
  // on (time-driven output up to the position, e.g. flood summaries); `after_commit()` once
  // the transaction landed (write out what was held; false on failure).
  void set_hooks(std::function<void(core::SensorTime)> caught_up,
                 std::function<bool()> after_commit) {
    caught_up_ = std::move(caught_up);
    after_commit_ = std::move(after_commit);
  }

  // What a commit saves besides the journal, the alert book and the position: `full` also
  // checkpoints every asset's estimators and checks and the notification policy (larger; live,
  // every few minutes), `journal_only` does not (live, after each burst of transitions, so the
  // outbox fills without delay). The alert book is always saved with the journal it explains.
  enum class Depth { full, journal_only };

  // See the class comment. On failure the journal entries stay buffered for the next attempt.
  Status commit(core::SensorTime position, Depth depth = Depth::full);

  // Live publishing: `source` yields the outbox messages made from the transitions just passed
  // on (called inside commit, so they land in the same transaction as their journal entries).
  void set_outbox_source(std::function<std::vector<io::OutboxMessage>()> source) {
    outbox_source_ = std::move(source);
  }
  // The broker has outbox message `id`: it is deleted with the next commit and no longer read.
  void mark_delivered(std::int64_t id) { delivered_.push_back(id); }
  // Outbox messages after `after_id` that are not marked delivered, oldest first.
  Result<std::vector<io::OutboxMessage>> read_outbox(std::int64_t after_id, std::size_t limit) const;

  // Transitions and records waiting for the next commit.
  std::size_t pending() const { return pending_.size() + pending_records_.size(); }
  std::int64_t last_seq() const { return last_seq_; }

 private:
  StateKeeper(std::unique_ptr<io::StateStore> store, engine::Engine& engine,
              engine::NotificationPolicy* policy, engine::AlertSink& next);

  std::unique_ptr<io::StateStore> store_;
  engine::Engine& engine_;
  engine::NotificationPolicy* policy_;
  engine::AlertSink& next_;
  std::function<void(core::SensorTime)> caught_up_;
  std::function<bool()> after_commit_;
  std::size_t passed_on_ = 0;  // leading pending_ entries already passed to next_
  std::string damage_;         // what report_damage() will say; empty when there is nothing
  std::function<std::vector<io::OutboxMessage>()> outbox_source_;
  std::vector<std::int64_t> delivered_;  // sorted on use
  // Each pending transition as a journal entry and, for the sink, a copy that owns its strings.
  struct Pending;
  std::vector<std::unique_ptr<Pending>> pending_;
  struct PendingRecord;
  std::vector<std::unique_ptr<PendingRecord>> pending_records_;
  std::size_t records_passed_on_ = 0;
  std::int64_t last_seq_ = 0;
};

// The meta key under which the position is stored (microseconds since the epoch, decimal).
inline constexpr const char* kPositionKey = "input_position_us";
// The checkpoint scope of the notification policy.
inline constexpr const char* kPolicyScope = "notification_policy";

}  // namespace bw::app
