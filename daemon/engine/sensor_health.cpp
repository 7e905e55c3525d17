#include "engine/sensor_health.h"

#include <algorithm>
#include <iterator>

namespace bw::engine {
namespace {

// "tubing_pressure" -> "tubing pressure": how the crew reads an input's name.
std::string plain_words(std::string_view role) {
  std::string words(role);
  std::replace(words.begin(), words.end(), '_', ' ');
  return words;
}

bool applies(HealthKind kind, const InputSpec& input) {
  switch (kind) {
    case HealthKind::stale:
      return input.expected_interval_s > 0;
    case HealthKind::out_of_range:
      return input.range_low && input.range_high;
    case HealthKind::ne43:
      return input.unit == "mA";
    case HealthKind::flatline:
      return true;
  }
  return false;
}

std::string_view why_not(HealthKind kind) {
  switch (kind) {
    case HealthKind::stale:
      return "declares no expected_interval";
    case HealthKind::out_of_range:
      return "declares no range";
    case HealthKind::ne43:
      return "is not a raw loop current in 'mA'";
    case HealthKind::flatline:
      break;
  }
  return "";
}

bool watches(const CheckKind& kind, HealthKind health, const std::string& role) {
  switch (health) {
    case HealthKind::stale:
      if (const auto* s = std::get_if<StaleCheckSpec>(&kind)) return s->of == role;
      return false;
    case HealthKind::flatline:
      if (const auto* s = std::get_if<FlatlineCheckSpec>(&kind)) return s->of == role;
      return false;
    case HealthKind::out_of_range:
      if (const auto* s = std::get_if<OutOfRangeCheckSpec>(&kind)) return s->of == role;
      return false;
    case HealthKind::ne43:
      if (const auto* s = std::get_if<Ne43CheckSpec>(&kind)) return s->of == role;
      return false;
  }
  return false;
}

CheckSpec default_check(HealthKind kind, const InputSpec& input, const HealthCheckTuning& t) {
  const std::string words = plain_words(input.role);
  CheckSpec check;
  check.name = input.role + "_" + std::string(health_kind_name(kind));
  check.where = input.where;
  switch (kind) {
    case HealthKind::stale:
      check.kind =
          StaleCheckSpec{.of = input.role, .factor = t.factor.value_or(kHealthStaleFactor)};
      check.priority = t.priority.value_or(Priority::medium);
      check.message =
          "No " + words + " reading arrives: check the transmitter, the RTU and the communications";
      break;
    case HealthKind::flatline: {
      const double window_s = std::max(kHealthFlatlineMinWindow_s,
                                       kHealthFlatlineIntervals * input.expected_interval_s);
      const FlatlineCheckSpec spec{
          .of = input.role,
          .tolerance = t.tolerance.value_or(0.0),
          .window_s = t.window_s.value_or(window_s),
          .at_rest_up_to = t.at_rest_up_to ? t.at_rest_up_to : input.range_low};
      check.message = "The " + words + " reading has " +
                      (spec.tolerance > 0 ? "hardly moved" : "not changed at all") +
                      ": transmitter stuck or RTU register frozen?";
      check.kind = spec;
      check.priority = t.priority.value_or(Priority::medium);
      break;
    }
    case HealthKind::out_of_range:
      check.kind = OutOfRangeCheckSpec{
          .of = input.role, .margin_percent = t.margin_percent.value_or(kHealthRangeMarginPercent)};
      check.priority = t.priority.value_or(Priority::low);
      check.message = "The " + words +
                      " reading is outside the instrument's range: transmitter failed, "
                      "miscalibrated or over-ranged?";
      break;
    case HealthKind::ne43:
      check.kind = Ne43CheckSpec{.of = input.role};
      check.priority = t.priority.value_or(Priority::medium);
      check.message = "The " + words +
                      " loop current is at a NAMUR NE 43 failure level: the transmitter reports "
                      "a fault, or the loop is open or shorted";
      break;
  }
  return check;
}

}  // namespace

std::string_view health_kind_name(HealthKind kind) {
  switch (kind) {
    case HealthKind::stale:
      return "stale";
    case HealthKind::flatline:
      return "flatline";
    case HealthKind::out_of_range:
      return "out_of_range";
    case HealthKind::ne43:
      return "ne43";
  }
  return "?";
}

bool HealthCheckTuning::has_settings() const {
  return priority || factor || window_s || tolerance || at_rest_up_to || margin_percent;
}

void merge_tuning(InputHealthTuning& base, const InputHealthTuning& over) {
  for (HealthKind kind : kHealthKinds) {
    HealthCheckTuning& b = base[kind];
    const HealthCheckTuning& o = over[kind];
    auto overlay = [](auto& into, const auto& from) {
      if (from) into = from;
    };
    overlay(b.enabled, o.enabled);
    overlay(b.priority, o.priority);
    overlay(b.factor, o.factor);
    overlay(b.window_s, o.window_s);
    overlay(b.tolerance, o.tolerance);
    overlay(b.at_rest_up_to, o.at_rest_up_to);
    overlay(b.margin_percent, o.margin_percent);
    if (o.enabled || o.has_settings()) b.where = o.where;
  }
}

std::vector<GraphProblem> add_sensor_health_checks(AssetSpec& asset,
                                                   const SensorHealthTuning& tuning) {
  std::vector<GraphProblem> problems;
  const InputHealthTuning no_tuning;
  std::vector<CheckSpec> added;
  for (const InputSpec& input : asset.inputs) {
    if (input.tag.empty()) continue;
    const auto found = tuning.find(input.role);
    const InputHealthTuning& layers = found != tuning.end() ? found->second : no_tuning;
    for (HealthKind kind : kHealthKinds) {
      const HealthCheckTuning& t = layers[kind];
      const std::string kind_name(health_kind_name(kind));
      if (!applies(kind, input)) {
        if (t.enabled.value_or(false) || t.has_settings()) {
          problems.push_back({"sensor health of input '" + input.role + "': '" + kind_name +
                                  "' does not apply, because the input " +
                                  std::string(why_not(kind)),
                              t.where});
        }
        continue;
      }
      if (!t.enabled.value_or(true)) continue;
      const auto own =
          std::find_if(asset.checks.begin(), asset.checks.end(),
                       [&](const CheckSpec& c) { return watches(c.kind, kind, input.role); });
      if (own != asset.checks.end()) {
        if (t.has_settings()) {
          problems.push_back({"sensor health of input '" + input.role +
                                  "': the asset has its own " + kind_name + " check '" + own->name +
                                  "' on it, which replaces the default; tune that check instead",
                              t.where});
        }
        continue;
      }
      CheckSpec check = default_check(kind, input, t);
      const auto clash = std::find_if(asset.checks.begin(), asset.checks.end(),
                                      [&](const CheckSpec& c) { return c.name == check.name; });
      if (clash != asset.checks.end()) {
        problems.push_back({"check name '" + check.name + "' is taken by the default " + kind_name +
                                " check of input '" + input.role +
                                "'; choose another name, or switch the default off (health: {" +
                                kind_name + ": off})",
                            clash->where});
        continue;
      }
      added.push_back(std::move(check));
    }
  }
  asset.checks.insert(asset.checks.end(), std::make_move_iterator(added.begin()),
                      std::make_move_iterator(added.end()));
  return problems;
}

}  // namespace bw::engine
