#include "alert_scoring.h"

#include <cmath>
#include <fstream>
#include <limits>

namespace bw::datasets {
namespace {

// The text of a string field "key":"value" in one JSON line. The alert log writes these fields
// without escapes (asset and check names are letters, digits and '_', times are ISO text).
std::optional<std::string> string_field(const std::string& line, const std::string& key) {
  const std::string marker = "\"" + key + "\":\"";
  const std::size_t at = line.find(marker);
  if (at == std::string::npos) return std::nullopt;
  const std::size_t from = at + marker.size();
  const std::size_t end = line.find('"', from);
  if (end == std::string::npos) return std::nullopt;
  return line.substr(from, end - from);
}

}  // namespace

Result<std::vector<RaisedAlert>> read_raises(const std::filesystem::path& alerts_file) {
  std::ifstream in(alerts_file);
  if (!in) return Error{"cannot open " + alerts_file.string()};
  std::vector<RaisedAlert> raises;
  std::string line;
  for (int number = 1; std::getline(in, line); ++number) {
    const std::string where = alerts_file.string() + ":" + std::to_string(number);
    const auto event = string_field(line, "event");
    if (!event) return Error{where + ": no event"};
    if (*event != "raised") continue;
    const auto time = string_field(line, "time");
    const auto asset = string_field(line, "asset");
    const auto check = string_field(line, "check");
    if (!time || !asset || !check) return Error{where + ": a raise without time, asset or check"};
    auto seconds = parse_time(*time);
    if (!seconds) return Error{where + ": " + seconds.error().message};
    raises.push_back({seconds.value(), *asset, *check});
  }
  return raises;
}

double FileScore::precision() const {
  const int scored = true_raises + false_raises;
  if (scored == 0) return std::numeric_limits<double>::quiet_NaN();
  return static_cast<double>(true_raises) / scored;
}

AssetCount FileScore::asset(const std::string& name) const {
  const auto it = shift_by_asset.find(name);
  return it == shift_by_asset.end() ? AssetCount{} : it->second;
}

bool FileScore::asset_detected(const std::string& name) const {
  return asset(name).true_raises > 0;
}

int FileScore::health(const std::string& asset, const std::string& check) const {
  const auto it = health_raises.find(asset + "." + check);
  return it == health_raises.end() ? 0 : it->second;
}

FileScore score_raises(const std::vector<RaisedAlert>& raises, const LabelTimeline& labels,
                       const std::set<std::string>& shift_checks, double learn_s) {
  FileScore score;
  const auto learned_at = labels.start + static_cast<std::int64_t>(std::ceil(learn_s));
  for (const auto& raise : raises) {
    if (!shift_checks.contains(raise.check)) {
      ++score.health_raises[raise.asset + "." + raise.check];
      continue;
    }
    if (raise.time >= labels.onset && raise.time <= labels.fault_end) {
      ++score.true_raises;
      ++score.shift_by_asset[raise.asset].true_raises;
      const std::int64_t delay = raise.time - labels.onset;
      if (!score.delay_s || delay < *score.delay_s) score.delay_s = delay;
    } else if (raise.time < learned_at || labels.label_at(raise.time) == Label::unlabelled) {
      ++score.unscored_raises;
      ++score.shift_by_asset[raise.asset].unscored_raises;
    } else {
      ++score.false_raises;
      ++score.shift_by_asset[raise.asset].false_raises;
    }
  }
  return score;
}

}  // namespace bw::datasets
