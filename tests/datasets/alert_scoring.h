// Scoring the alerts of one replay against the labels of its file.
//
// Only raises count ("event":"raised"); clears and other transitions are ignored. Raises are
// split by check into two families:
//   shift raises  - the statistical checks (names given by the caller), which claim "the process
//                   changed": these are scored against the labels;
//   health raises - every other check (flatline, stale, the implicit <role>_quality), which claim
//                   "the instrument is unwell": these are counted per asset and check, not scored,
//                   because the labels say nothing about instruments.
// A shift raise is
//   true      when its time lies in [onset, fault_end] of the timeline;
//   unscored  when it falls before start + learn_s (the learning period) or on an unlabelled row;
//   false     otherwise (a normal row after the learning period, including after the fault).
// Precision = true / (true + false); NaN when there is no scored raise. The detection delay is
// the time from the onset to the first true raise.
#pragma once

#include <cstdint>
#include <filesystem>
#include <map>
#include <optional>
#include <set>
#include <string>
#include <vector>

#include "core/result.h"
#include "label_timeline.h"

namespace bw::datasets {

struct RaisedAlert {
  std::int64_t time = 0;  // seconds since 1970, from the alert's UTC time
  std::string asset;
  std::string check;
};

// Reads the raises of an alerts file (JSON Lines as replay writes them).
Result<std::vector<RaisedAlert>> read_raises(const std::filesystem::path& alerts_file);

struct AssetCount {
  int true_raises = 0;
  int false_raises = 0;
  int unscored_raises = 0;
  int all() const { return true_raises + false_raises + unscored_raises; }
};

struct FileScore {
  int true_raises = 0;
  int false_raises = 0;
  int unscored_raises = 0;
  std::optional<std::int64_t> delay_s;
  std::map<std::string, AssetCount> shift_by_asset;  // shift raises per asset
  std::map<std::string, int> health_raises;          // "asset.check" -> raises

  bool detected() const { return true_raises > 0; }
  double precision() const;
  bool asset_detected(const std::string& name) const;
  AssetCount asset(const std::string& name) const;
  int health(const std::string& asset, const std::string& check) const;
};

FileScore score_raises(const std::vector<RaisedAlert>& raises, const LabelTimeline& labels,
                       const std::set<std::string>& shift_checks, double learn_s);

}  // namespace bw::datasets
