// Counts alert transitions by asset and check on their way to another sink, for summaries.
#pragma once

#include <cstdint>
#include <map>
#include <string>
#include <utility>

#include "engine/alert.h"

namespace bw::app {

struct TallyRow {
  std::uint64_t raised = 0;
  std::uint64_t cleared = 0;
};

class AlertTally final : public engine::AlertSink {
 public:
  explicit AlertTally(engine::AlertSink& next) : next_(next) {}
  void on_transition(const engine::AlertTransition& t) override {
    auto& row = rows_[{std::string(t.asset), std::string(t.check)}];
    ++(t.event == engine::AlertEvent::raised ? row.raised : row.cleared);
    next_.on_transition(t);
  }
  void on_record(const engine::AssetRecord& r) override { next_.on_record(r); }
  // Keyed by (asset, check), in name order.
  const std::map<std::pair<std::string, std::string>, TallyRow>& rows() const { return rows_; }

 private:
  engine::AlertSink& next_;
  std::map<std::pair<std::string, std::string>, TallyRow> rows_;
};

}  // namespace bw::app
