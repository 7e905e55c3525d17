#include "app/replay_run.h"

#include <unistd.h>

#include <chrono>
#include <cstdio>

#include "app/alert_tally.h"
#include "app/replay_summary.h"
#include "config/site_loader.h"
#include "engine/engine.h"
#include "io/alert_log.h"
#include "io/history_csv.h"

namespace bw::app {
namespace {

using SteadyClock = std::chrono::steady_clock;

// Feeds samples to the engine and shows progress on stderr every few seconds of wall time.
class EngineFeed final : public io::SampleVisitor {
 public:
  EngineFeed(engine::Engine& engine, engine::AlertSink& sink) : engine_(engine), sink_(sink) {}

  void on_sample(const engine::Sample& sample) override {
    engine_.process(sample, sink_);
    if ((++count_ & kProgressMask) == 0) report_progress();
  }

  void finish() const {
    if (shown_ && tty_) std::fputc('\n', stderr);
  }

 private:
  static constexpr std::uint64_t kProgressMask = (1u << 18) - 1;
  static constexpr auto kProgressEvery = std::chrono::seconds(2);

  void report_progress() {
    const auto now = SteadyClock::now();
    if (now - last_ < kProgressEvery) return;
    last_ = now;
    shown_ = true;
    std::fprintf(stderr, tty_ ? "\r  ... %.1f million samples" : "  ... %.1f million samples\n",
                 static_cast<double>(count_) / 1e6);
    std::fflush(stderr);
  }

  engine::Engine& engine_;
  engine::AlertSink& sink_;
  std::uint64_t count_ = 0;
  SteadyClock::time_point last_ = SteadyClock::now();
  bool tty_ = isatty(STDERR_FILENO) != 0;
  bool shown_ = false;
};

// Passes each transition to the alert log and, when asked, to a second receiver.
class FanOut final : public engine::AlertSink {
 public:
  FanOut(engine::AlertSink& first, engine::AlertSink* second) : first_(first), second_(second) {}
  void on_transition(const engine::AlertTransition& t) override {
    first_.on_transition(t);
    if (second_ != nullptr) second_->on_transition(t);
  }

 private:
  engine::AlertSink& first_;
  engine::AlertSink* second_;
};

}  // namespace

int replay(const ReplayRequest& request) {
  const auto started = SteadyClock::now();
  auto loaded = config::load_site(request.config, request.rule_dirs);
  for (const auto& diagnostic : loaded.diagnostics) {
    std::fprintf(stderr, "%s\n", config::format_diagnostic(diagnostic).c_str());
  }
  if (!loaded.ok()) return 2;

  auto log = io::AlertLog::open(request.alerts);
  if (!log) {
    std::fprintf(stderr, "brinewatch replay: %s\n", log.error().message.c_str());
    return 1;
  }
  const std::string time_zone = loaded.site->time_zone;
  engine::Engine engine(std::move(*loaded.site));
  FanOut both(*log.value(), request.also_to);
  AlertTally tally(both);
  EngineFeed feed(engine, tally);

  io::HistoryOptions options;
  options.time_zone = time_zone;
  options.ignore_columns = request.ignore_columns;
  options.strict = request.strict;
  auto stats = io::read_history(request.input, options, feed);
  feed.finish();
  if (!stats) {
    std::fprintf(stderr, "brinewatch replay: %s\n", stats.error().message.c_str());
    return 1;
  }
  const bool written = log.value()->flush();
  const bool to_stdout = request.alerts == "-";
  ReplayFigures figures{
      .input = request.input.string(),
      .alerts_destination = to_stdout ? "standard output" : request.alerts.string(),
      .time_zone = time_zone,
      .history = &stats.value(),
      .engine = &engine.counters(),
      .tally = &tally,
      .wall_seconds = std::chrono::duration<double>(SteadyClock::now() - started).count(),
  };
  std::fputs(format_replay_summary(figures).c_str(), to_stdout ? stderr : stdout);
  if (!written) {
    std::fprintf(stderr, "brinewatch replay: writing %s failed\n", figures.alerts_destination.c_str());
    return 1;
  }
  if (stats->stopped_early) {
    std::fprintf(stderr, "brinewatch replay: stopped at the first bad row (--strict)\n");
    return 1;
  }
  return 0;
}

}  // namespace bw::app
