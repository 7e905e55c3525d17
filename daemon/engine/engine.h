// The engine: routes each sample to the assets whose inputs are bound to its tag, turns the
// condition changes of their checks into alert lifecycle transitions, and takes the commands of
// the crew, all through one AlertBook.
//
// Driven only by the samples' own times (event time) and by the times passed to advance(); it
// never reads a clock, so the same samples and commands in the same order give the same
// transitions, bit for bit. Samples advance the event clock: once the clock has moved by at
// least kAdvanceStep since the last advance, time-driven work runs first (stale tags, delays
// expiring, shelves running out), exactly as a live timer would have run it. One tag may feed
// inputs of several assets; assets are visited in site-file order.
//
// Samples of any quality reach the assets: a bad or uncertain one holds the checks that depend
// on it and raises the input's data-quality alert ("<role>_quality") instead. A sample on a tag
// bound to nothing is counted, and a non-finite value on a good sample is counted and dropped.
//
// Records (asset_record.h) closed while handling a sample, a command or a time step go to the
// sink's on_record after every transition of that step, in the order the assets closed them.
// Daily records follow the local days of `calendar` (the site's time zone; days of UTC when
// none is given).
//
// Checkpoints: checkpoint() captures everything that evolves (each asset's estimators and
// checks, every alert's lifecycle, the event clock) as opaque bytes with a definition
// fingerprint per asset; restore() takes them back, keeping an asset's state only when its
// definition is unchanged.
//
// Invariants: every asset of the SiteSpec passed analyse_asset() (asserted). Not thread-safe:
// one thread (or strand) owns the engine.
#pragma once

#include <array>
#include <chrono>
#include <cstdint>
#include <functional>
#include <memory>
#include <optional>
#include <string>
#include <string_view>
#include <unordered_map>
#include <vector>

#include "engine/alert.h"
#include "engine/alert_book.h"
#include "engine/alert_command.h"
#include "engine/asset_evaluator.h"
#include "engine/asset_record.h"
#include "engine/local_calendar.h"
#include "engine/sample.h"
#include "engine/site_model.h"

namespace bw::engine {

struct EngineCounters {
  std::uint64_t samples = 0;       // every sample offered
  std::uint64_t evaluated = 0;     // samples that reached at least one asset
  std::uint64_t unknown_tag = 0;   // no asset input is bound to the tag
  std::uint64_t not_good = 0;      // bad or uncertain quality (evaluated, but held)
  std::uint64_t non_finite = 0;    // NaN or infinite value with good quality: dropped
  std::uint64_t transitions = 0;
  std::uint64_t commands = 0;
  std::uint64_t commands_refused = 0;
  std::uint64_t records = 0;
  std::vector<std::string> first_unknown_tags;  // up to kMaxListedUnknownTags distinct names
};

// One piece of saved state: an asset ("asset:<name>"), the alert book ("alert_book") or the
// engine's own clock ("engine"). `definition` fingerprints what the state belongs to.
struct EngineCheckpoint {
  std::string scope;
  std::string definition;
  std::string state;
};

struct RestoreReport {
  std::vector<std::string> restored;  // scopes taken back
  std::vector<std::string> reset;     // scopes whose saved state did not fit and were started fresh
};

class Engine {
 public:
  static constexpr std::size_t kMaxListedUnknownTags = 20;
  static constexpr auto kAdvanceStep = std::chrono::seconds(1);
  static constexpr std::string_view kDaemonAsset = "brinewatch";
  static constexpr std::string_view kAlertBookScope = "alert_book";
  // Each asset's checkpoint scope is this prefix followed by the asset's name.
  static constexpr std::string_view kAssetScopePrefix = "asset:";
  // state_store_reset: the state database was damaged, moved aside, and started afresh.
  static constexpr std::array<std::string_view, 1> kDaemonChecks = {"state_store_reset"};

  explicit Engine(SiteSpec site, CommandPolicy policy = {},
                  std::unique_ptr<LocalCalendar> calendar = nullptr);
  Engine(const Engine&) = delete;
  Engine& operator=(const Engine&) = delete;

  void process(const Sample& sample, AlertSink& sink);
  // Time-driven work up to `now` (no effect if `now` is not later than the clock).
  void advance(core::SensorTime now, AlertSink& sink);
  // The one command interface (acknowledge, shelve, ...); the command's time advances the clock.
  CommandReply execute(const AlertCommand& command, AlertSink& sink);

  // The daemon's own alerts, on the reserved asset kDaemonAsset: `check` is one of
  // kDaemonChecks. The alert is raised and its condition cleared at once, so it waits,
  // returned-unacknowledged, for a person to acknowledge it.
  void report_daemon_event(std::string_view check, std::string detail, core::SensorTime t,
                           AlertSink& sink);

  std::vector<EngineCheckpoint> checkpoint() const;
  RestoreReport restore(const std::vector<EngineCheckpoint>& saved);

  const SiteSpec& site() const { return *site_; }
  const EngineCounters& counters() const { return counters_; }
  const AlertBook& alerts() const { return book_; }
  // The latest event time seen (samples, commands, advance); nullopt before the first.
  std::optional<core::SensorTime> clock() const { return clock_; }

 private:
  struct Binding {
    std::uint32_t asset;
    std::uint32_t input;
  };
  struct TagHash {
    using is_transparent = void;
    std::size_t operator()(std::string_view s) const { return std::hash<std::string_view>{}(s); }
  };
  class BookFeed;

  void note_unknown(std::string_view tag);
  void move_clock(core::SensorTime t, AlertSink& sink);
  void run_time_driven(core::SensorTime now, AlertSink& sink);
  void hand_over_records(AlertSink& sink);

  std::unique_ptr<SiteSpec> site_;  // heap-held so evaluators' references survive moves
  std::unique_ptr<LocalCalendar> calendar_;
  std::vector<std::unique_ptr<AssetEvaluator>> assets_;
  std::vector<std::string> fingerprints_;  // per asset
  std::unordered_map<std::string, std::vector<Binding>, TagHash, std::equal_to<>> bindings_;
  AlertBook book_;
  std::vector<AssetRecord> records_;  // closed in this step, waiting for its transitions
  std::optional<core::SensorTime> clock_;
  std::optional<core::SensorTime> last_advance_;
  EngineCounters counters_;
};

}  // namespace bw::engine
