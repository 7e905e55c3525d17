// Default sensor-health checks: every bound input is watched for the usual instrument failures
// without a template or site having to write a check for it.
//
// add_sensor_health_checks() appends to an asset, for each bound input (an unbound optional
// input gets nothing), ordinary CheckSpecs named after the input's role:
//   <role>_stale         when the input declares an expected interval: no sample for
//                        3 x that interval; priority medium.
//   <role>_out_of_range  when the input declares a range: outside it by more than 2 % of span;
//                        priority low.
//   <role>_ne43          when the input's unit is "mA" (a raw loop current): at a NAMUR NE 43
//                        failure level; priority medium.
//   <role>_flatline      always: the same value (tolerance 0) for the larger of 6 h and 100
//                        expected intervals (6 h without one); a value at or below the bottom of
//                        the input's range counts as a machine at rest, not as stuck; priority
//                        medium.
// Each message names the input in plain words (its role with spaces).
//
// A check that the asset already has of the same kind on the same input replaces the default
// (nothing is added for it). A tuning per input (from the template's `health:` block of the
// input, overlaid by the site's `sensor_health:` of the asset) switches a kind off or on and
// overrides its settings; merge_tuning() overlays one layer on another.
//
// Problems (each with where the tuning or the input was written): a tuning that gives settings
// or says "on" for a kind that does not apply to the input (stale without an expected interval,
// out_of_range without a range, ne43 not in mA), settings for a kind the asset already checks
// with its own check (tune that check instead), and a default whose name another check of the
// asset already takes. A tuning that only says "off" is never a problem. The asset is complete
// only when no problem is returned. Pure; thread-safe.
#pragma once

#include <array>
#include <cstdint>
#include <functional>
#include <map>
#include <optional>
#include <string>
#include <string_view>
#include <vector>

#include "engine/asset_graph.h"
#include "engine/site_model.h"

namespace bw::engine {

enum class HealthKind : std::uint8_t { stale, flatline, out_of_range, ne43 };
inline constexpr std::array<HealthKind, 4> kHealthKinds{HealthKind::stale, HealthKind::flatline,
                                                        HealthKind::out_of_range, HealthKind::ne43};

// "stale", "flatline", "out_of_range", "ne43": the names used in files and in check names.
std::string_view health_kind_name(HealthKind kind);

// Default settings (see the header comment; rules/README.md "Sensor health" says why).
inline constexpr double kHealthStaleFactor = 3.0;
inline constexpr double kHealthRangeMarginPercent = 2.0;
inline constexpr double kHealthFlatlineMinWindow_s = 6 * 3600.0;
inline constexpr double kHealthFlatlineIntervals = 100.0;

// One layer's word on one kind of default on one input; unset members leave the layer below.
struct HealthCheckTuning {
  std::optional<bool> enabled;
  std::optional<Priority> priority;
  std::optional<double> factor;          // stale
  std::optional<double> window_s;        // flatline
  std::optional<double> tolerance;       // flatline
  std::optional<double> at_rest_up_to;   // flatline
  std::optional<double> margin_percent;  // out_of_range
  Where where;                           // where it was written

  // True when anything but `enabled` is set.
  bool has_settings() const;
};

struct InputHealthTuning {
  std::array<HealthCheckTuning, kHealthKinds.size()> kinds;  // indexed by HealthKind

  HealthCheckTuning& operator[](HealthKind kind) { return kinds[static_cast<std::size_t>(kind)]; }
  const HealthCheckTuning& operator[](HealthKind kind) const {
    return kinds[static_cast<std::size_t>(kind)];
  }
};

// Input role -> tuning.
using SensorHealthTuning = std::map<std::string, InputHealthTuning, std::less<>>;

// Overlays `over` on `base`: every member `over` sets replaces the one in `base`.
void merge_tuning(InputHealthTuning& base, const InputHealthTuning& over);

// Appends the default checks of every bound input of `asset` (see above).
std::vector<GraphProblem> add_sensor_health_checks(AssetSpec& asset,
                                                   const SensorHealthTuning& tuning);

}  // namespace bw::engine
