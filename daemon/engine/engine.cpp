#include "engine/engine.h"

#include <algorithm>
#include <cmath>

namespace bw::engine {

// Counts transitions on their way to the caller's sink.
class Engine::CountingSink final : public AlertSink {
 public:
  CountingSink(AlertSink& next, std::uint64_t& count) : next_(next), count_(count) {}
  void on_transition(const AlertTransition& transition) override {
    ++count_;
    next_.on_transition(transition);
  }

 private:
  AlertSink& next_;
  std::uint64_t& count_;
};

Engine::Engine(SiteSpec site) : site_(std::make_unique<SiteSpec>(std::move(site))) {
  for (std::size_t a = 0; a < site_->assets.size(); ++a) {
    const AssetSpec& asset = site_->assets[a];
    assets_.push_back(std::make_unique<AssetEvaluator>(asset, site_->name));
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

void Engine::process(const Sample& sample, AlertSink& sink) {
  ++counters_.samples;
  auto it = bindings_.find(sample.tag);
  if (it == bindings_.end()) {
    note_unknown(sample.tag);
    return;
  }
  if (sample.quality != Quality::good) {
    ++counters_.not_good;
    return;
  }
  if (!std::isfinite(sample.value)) {
    ++counters_.non_finite;
    return;
  }
  ++counters_.evaluated;
  CountingSink counting(sink, counters_.transitions);
  for (const Binding& b : it->second) {
    assets_[b.asset]->on_input(b.input, sample.value, sample.time, it->first, counting);
  }
}

}  // namespace bw::engine
