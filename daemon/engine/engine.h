// The engine: routes each sample to the assets whose inputs are bound to its tag and passes on
// the alert transitions they produce.
//
// Driven only by the samples' own times (event time); it never reads a clock, so the same
// samples in the same order give the same transitions, bit for bit. One tag may feed inputs of
// several assets; assets are visited in site-file order.
//
// A sample of bad or uncertain quality is counted and not evaluated (the data-quality checks
// that report it belong to the sensor-health rules). A non-finite value is counted and dropped.
//
// Invariants: every asset of the SiteSpec passed analyse_asset() (asserted). Not thread-safe:
// one thread (or strand) owns the engine.
#pragma once

#include <cstdint>
#include <functional>
#include <memory>
#include <string>
#include <string_view>
#include <unordered_map>
#include <vector>

#include "engine/alert.h"
#include "engine/asset_evaluator.h"
#include "engine/sample.h"
#include "engine/site_model.h"

namespace bw::engine {

struct EngineCounters {
  std::uint64_t samples = 0;       // every sample offered
  std::uint64_t evaluated = 0;     // samples that reached at least one asset
  std::uint64_t unknown_tag = 0;   // no asset input is bound to the tag
  std::uint64_t not_good = 0;      // bad or uncertain quality
  std::uint64_t non_finite = 0;    // NaN or infinite value
  std::uint64_t transitions = 0;
  std::vector<std::string> first_unknown_tags;  // up to kMaxListedUnknownTags distinct names
};

class Engine {
 public:
  static constexpr std::size_t kMaxListedUnknownTags = 20;

  explicit Engine(SiteSpec site);
  Engine(const Engine&) = delete;
  Engine& operator=(const Engine&) = delete;

  void process(const Sample& sample, AlertSink& sink);

  const SiteSpec& site() const { return *site_; }
  const EngineCounters& counters() const { return counters_; }

 private:
  struct Binding {
    std::uint32_t asset;
    std::uint32_t input;
  };
  struct TagHash {
    using is_transparent = void;
    std::size_t operator()(std::string_view s) const { return std::hash<std::string_view>{}(s); }
  };
  class CountingSink;

  void note_unknown(std::string_view tag);

  std::unique_ptr<SiteSpec> site_;  // heap-held so evaluators' references survive moves
  std::vector<std::unique_ptr<AssetEvaluator>> assets_;
  std::unordered_map<std::string, std::vector<Binding>, TagHash, std::equal_to<>> bindings_;
  EngineCounters counters_;
};

}  // namespace bw::engine
