#include "app/replay_run.h"

#include <unistd.h>

#include <chrono>
#include <cstdio>

#include "app/alert_tally.h"
#include "app/commands_file.h"
#include "app/notification_feed.h"
#include "app/replay_summary.h"
#include "app/state_keeper.h"
#include "config/site_loader.h"
#include "engine/engine.h"
#include "io/alert_log.h"
#include "io/history_csv.h"
#include "io/record_log.h"
#include "io/zone_calendar.h"

namespace bw::app {
namespace {

using SteadyClock = std::chrono::steady_clock;

// Passes each transition and record to every receiver, in order.
class FanOut final : public engine::AlertSink {
 public:
  void add(engine::AlertSink* sink) {
    if (sink != nullptr) sinks_.push_back(sink);
  }
  void on_transition(const engine::AlertTransition& t) override {
    for (auto* sink : sinks_) sink->on_transition(t);
  }
  void on_record(const engine::AssetRecord& r) override {
    for (auto* sink : sinks_) sink->on_record(r);
  }

 private:
  std::vector<engine::AlertSink*> sinks_;
};

// Feeds samples and the commands due before them to the engine, commits state at intervals of
// event time, and shows progress on stderr every few seconds of wall time.
class EngineFeed final : public io::SampleVisitor {
 public:
  EngineFeed(engine::Engine& engine, engine::AlertSink& sink,
             std::vector<engine::AlertCommand> commands, StateKeeper* keeper,
             std::optional<core::SensorTime> resume_after, double checkpoint_every_s)
      : engine_(engine),
        sink_(sink),
        commands_(std::move(commands)),
        keeper_(keeper),
        resume_after_(resume_after),
        checkpoint_every_(std::chrono::duration_cast<core::Micros>(
            std::chrono::duration<double>(checkpoint_every_s))) {
    if (resume_after_) {
      while (next_command_ < commands_.size() && commands_[next_command_].issued <= *resume_after_) {
        ++next_command_;
        ++skipped_commands_;
      }
    }
  }

  void on_sample(const engine::Sample& sample) override {
    if ((++count_ & kProgressMask) == 0) report_progress();
    if (resume_after_ && sample.time <= *resume_after_) {
      ++skipped_samples_;
      return;
    }
    if (keeper_ != nullptr && !latest_) keeper_->report_damage(sample.time);
    if (latest_ && sample.time < *latest_) ++out_of_time_order_;
    if (latest_ && sample.time > *latest_) maybe_commit(*latest_);
    run_commands_until(sample.time);
    engine_.process(sample, sink_);
    if (!latest_ || sample.time > *latest_) latest_ = sample.time;
  }

  // Makes the final commit. Commands later than the last sample lie outside the replayed
  // stretch of history and are left for a replay of what follows (see commands_after_end()).
  bool finish() {
    if (shown_ && tty_) std::fputc('\n', stderr);
    if (keeper_ == nullptr || !latest_) return commit_ok_;
    return commit(*latest_) && commit_ok_;
  }

  std::size_t commands_after_end() const { return commands_.size() - next_command_; }

  std::uint64_t skipped_samples() const { return skipped_samples_; }
  std::uint64_t skipped_commands() const { return skipped_commands_; }
  std::uint64_t out_of_time_order() const { return out_of_time_order_; }
  std::size_t commands_run() const { return commands_run_; }

 private:
  static constexpr std::uint64_t kProgressMask = (1u << 18) - 1;
  static constexpr auto kProgressEvery = std::chrono::seconds(2);

  void run_commands_until(core::SensorTime t) {
    while (next_command_ < commands_.size() && commands_[next_command_].issued <= t) {
      const auto& command = commands_[next_command_++];
      engine_.execute(command, sink_);
      ++commands_run_;
      if (!latest_ || command.issued > *latest_) latest_ = command.issued;
    }
  }

  void maybe_commit(core::SensorTime position) {
    if (keeper_ == nullptr) return;
    if (last_commit_ && position - *last_commit_ < checkpoint_every_) return;
    commit(position);
  }

  bool commit(core::SensorTime position) {
    const auto status = keeper_->commit(position);
    last_commit_ = position;
    if (!status) {
      std::fprintf(stderr, "brinewatch replay: saving state failed: %s\n",
                   status.error().message.c_str());
      commit_ok_ = false;
    }
    return status.ok();
  }

  void report_progress() {
    const auto now = SteadyClock::now();
    if (now - last_progress_ < kProgressEvery) return;
    last_progress_ = now;
    shown_ = true;
    std::fprintf(stderr, tty_ ? "\r  ... %.1f million samples" : "  ... %.1f million samples\n",
                 static_cast<double>(count_) / 1e6);
    std::fflush(stderr);
  }

  engine::Engine& engine_;
  engine::AlertSink& sink_;
  std::vector<engine::AlertCommand> commands_;
  std::size_t next_command_ = 0;
  StateKeeper* keeper_;
  std::optional<core::SensorTime> resume_after_;
  core::Micros checkpoint_every_;
  std::optional<core::SensorTime> latest_;
  std::optional<core::SensorTime> last_commit_;
  bool commit_ok_ = true;
  std::uint64_t count_ = 0;
  std::uint64_t skipped_samples_ = 0;
  std::uint64_t skipped_commands_ = 0;
  std::uint64_t out_of_time_order_ = 0;
  std::size_t commands_run_ = 0;
  SteadyClock::time_point last_progress_ = SteadyClock::now();
  bool tty_ = isatty(STDERR_FILENO) != 0;
  bool shown_ = false;
};

}  // namespace

int replay(const ReplayRequest& request) {
  const auto started = SteadyClock::now();
  auto loaded = config::load_site(request.config, request.rule_dirs);
  for (const auto& diagnostic : loaded.diagnostics) {
    std::fprintf(stderr, "%s\n", config::format_diagnostic(diagnostic).c_str());
  }
  if (!loaded.ok()) return 2;
  const std::string time_zone = loaded.site->time_zone;

  std::vector<engine::AlertCommand> commands;
  if (!request.commands.empty()) {
    auto read = read_commands_file(request.commands, time_zone);
    if (!read) {
      std::fprintf(stderr, "brinewatch replay: %s\n", read.error().message.c_str());
      return 2;
    }
    commands = std::move(read.value());
  }

  // With a state store, outputs are appended (a resumed replay continues them) and held until
  // the commit that journals them has landed.
  const bool with_state = !request.state_dir.empty();
  const auto mode = with_state ? io::AlertLog::Mode::append : io::AlertLog::Mode::truncate;
  const auto hold = with_state ? io::AlertLog::Hold::until_flush : io::AlertLog::Hold::bounded;
  auto log = io::AlertLog::open(request.alerts, mode, hold);
  if (!log) {
    std::fprintf(stderr, "brinewatch replay: %s\n", log.error().message.c_str());
    return 1;
  }
  engine::CommandPolicy command_policy;
  command_policy.authorised_sources.push_back(std::string(kReplayCommandSource));
  auto calendar = io::make_site_calendar(time_zone);
  if (!calendar) {
    std::fprintf(stderr, "brinewatch replay: %s\n", calendar.error().message.c_str());
    return 2;
  }
  engine::Engine engine(std::move(*loaded.site), command_policy, std::move(calendar.value()));
  engine::NotificationPolicy notification_policy(engine.site().name, {});
  std::unique_ptr<NotificationFeed> notifications;
  if (!request.notifications.empty()) {
    auto file = io::AlertLog::open(request.notifications, mode, hold);
    if (!file) {
      std::fprintf(stderr, "brinewatch replay: %s\n", file.error().message.c_str());
      return 1;
    }
    notifications = std::make_unique<NotificationFeed>(notification_policy, std::move(file.value()));
  }
  std::unique_ptr<io::RecordLog> records;
  if (!request.records.empty()) {
    auto file = io::RecordLog::open(request.records, mode, hold);
    if (!file) {
      std::fprintf(stderr, "brinewatch replay: %s\n", file.error().message.c_str());
      return 1;
    }
    records = std::move(file.value());
  }
  FanOut outputs;
  outputs.add(log.value().get());
  outputs.add(notifications.get());
  outputs.add(records.get());
  outputs.add(request.also_to);
  AlertTally tally(outputs);
  auto flush_outputs = [&] {
    bool ok = log.value()->flush();
    ok = (notifications ? notifications->flush() : true) && ok;
    return (records ? records->flush() : true) && ok;
  };

  std::unique_ptr<StateKeeper> keeper;
  std::optional<core::SensorTime> resume_after;
  std::string state_note;
  if (with_state) {
    auto opened = StateKeeper::open(request.state_dir, engine, &notification_policy, tally);
    if (!opened) {
      std::fprintf(stderr, "brinewatch replay: %s\n", opened.error().message.c_str());
      return 1;
    }
    keeper = std::move(opened.value().keeper);
    keeper->set_hooks(
        [&](core::SensorTime position) {
          if (notifications) notifications->advance(position);
        },
        flush_outputs);
    resume_after = opened.value().position;
    state_note = describe_state_open(opened.value(), request.state_dir);
  }

  engine::AlertSink& first_sink = keeper ? static_cast<engine::AlertSink&>(*keeper) : tally;
  EngineFeed feed(engine, first_sink, std::move(commands), keeper.get(), resume_after,
                  request.checkpoint_every_s);
  io::HistoryOptions options;
  options.time_zone = time_zone;
  options.ignore_columns = request.ignore_columns;
  options.strict = request.strict;
  auto stats = io::read_history(request.input, options, feed);
  if (!stats) {
    std::fprintf(stderr, "brinewatch replay: %s\n", stats.error().message.c_str());
    return 1;
  }
  const bool saved = feed.finish();
  if (notifications && !keeper && engine.clock()) notifications->advance(*engine.clock());
  const bool written = flush_outputs();
  const bool to_stdout = request.alerts == "-";
  const engine::SiteHealth health = engine::roll_up_site(engine.alerts(), engine.site());
  ReplayFigures figures{
      .input = request.input.string(),
      .alerts_destination = to_stdout ? "standard output" : request.alerts.string(),
      .time_zone = time_zone,
      .history = &stats.value(),
      .engine = &engine.counters(),
      .tally = &tally,
      .wall_seconds = std::chrono::duration<double>(SteadyClock::now() - started).count(),
      .state = state_note,
      .skipped_samples = feed.skipped_samples(),
      .skipped_commands = feed.skipped_commands(),
      .out_of_time_order = with_state ? feed.out_of_time_order() : 0,
      .commands_run = feed.commands_run(),
      .commands_after_end = feed.commands_after_end(),
      .notifications_sent = notifications ? notifications->sent() : 0,
      .notifications_held = notifications ? notifications->held() : 0,
      .notifications_destination = request.notifications.string(),
      .site_health = &health,
      .last_event = engine.clock(),
      .records_destination = request.records.string(),
  };
  std::fputs(format_replay_summary(figures).c_str(), to_stdout ? stderr : stdout);
  if (!written) {
    std::fprintf(stderr, "brinewatch replay: writing %s failed\n", figures.alerts_destination.c_str());
    return 1;
  }
  if (!saved) return 1;
  if (stats->stopped_early) {
    std::fprintf(stderr, "brinewatch replay: stopped at the first bad row (--strict)\n");
    return 1;
  }
  return 0;
}

}  // namespace bw::app
