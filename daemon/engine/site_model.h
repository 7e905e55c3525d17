// The compiled site: plain structs that the configuration loader builds and the engine consumes.
//
// A rule template declares an asset class (inputs, derived signals, estimators, checks, with
// parameters); a site file instantiates templates for its assets. The loader resolves every
// parameter to a number and every tag binding, so the structs below hold only concrete values.
// Nothing here depends on YAML: a test can build a SiteSpec by hand.
//
// Names used for cross references inside one asset:
//   - an input role ("level"), a derived signal name ("volume"), or an estimator output written
//     "<estimator>.<output>" (for example "pump_model.residual_percent"; see kEstimatorOutputs)
//     are all "signals" and may feed estimators, other derived signals, limit and rate checks
//     and suppression conditions;
//   - statistical and time-to-limit checks name an estimator directly;
//   - data-quality checks (stale, flatline, out_of_range, ne43) name an input; the loader adds
//     the default ones of every bound input (engine/sensor_health.h) as ordinary checks;
//   - every bound input also has an implicit data-quality check "<role>_quality", so no
//     configured check may take that name.
// Invariants established by the loader with engine/asset_graph.h (the engine asserts them):
// names are unique within an asset across inputs, signals and estimators; every reference
// resolves to a node of the right kind; the graph has no cycle; every required input is bound.
// Signals and estimators may be listed in any order: the engine evaluates them in dependency
// order.
#pragma once

#include <cstdint>
#include <limits>
#include <optional>
#include <string>
#include <variant>
#include <vector>

#include "core/tank_geometry.h"

namespace bw::engine {

// Where a definition came from, so that every message can point at a file and line.
struct Where {
  std::string file;
  int line = 0;    // 1-based; 0 when unknown (built in code)
  int column = 0;  // 1-based
};

// Alert priority. Stored and transmitted by name; numeric values are ordinal only.
enum class Priority : std::uint8_t { low = 1, medium = 2, high = 3, urgent = 4 };

// What an input measures. Limit checks on an input take their default deadband and delays from
// it (see engine/check_settings.h). Written by name in files.
enum class Measurement : std::uint8_t {
  level,
  pressure,
  flow,
  temperature,
  differential_pressure,
  current,
  other,
};

struct InputSpec {
  std::string role;  // name inside the template, e.g. "level"
  std::string unit;  // engineering unit, e.g. "ft"
  std::string tag;   // bound tag name; empty when the input is optional and not bound
  bool required = true;
  double expected_interval_s = 0;   // nominal sampling interval; 0 = not declared
  std::optional<double> range_low;  // instrument range, engineering units
  std::optional<double> range_high;
  Measurement measurement = Measurement::other;
  Where where;
};

// Derived signal operations. Operands are signal names; values are sample-and-hold.
enum class SignalOp : std::uint8_t {
  linear,       // gain * a + offset
  sum,          // a + b + ...
  difference,   // a - b
  product,      // a * b * ...
  ratio,        // a / (b / reference)^exponent (undefined when b <= 0 and exponent is not 1);
                // with exponent 0, a passed through only while b > 0 (a gate)
  gate,         // a while b > above; no value otherwise (a dP read only while flow runs)
  tank_volume,  // bbl held at level a (ft): strapping table if given, else a vertical cylinder
};

// tank_volume (core/tank_geometry.h) uses the strapping table when there is one (extended along
// its end segments outside it), otherwise an upright cylinder of inside diameter `diameter_ft`
// with nothing below gauge zero. `diameter_ft` and `strapping_table` belong to tank_volume only;
// the asset analysis refuses them on other operations and refuses a tank_volume with neither.
struct SignalSpec {
  std::string name;
  std::string unit;
  SignalOp op = SignalOp::linear;
  std::vector<std::string> operands;
  double gain = 1.0;
  double offset = 0.0;
  double exponent = 1.0;
  double reference = 1.0;  // ratio: the value of b that a is referred to (> 0)
  double above = 0.0;      // gate: b must be above this for a to pass
  std::optional<double> diameter_ft;
  std::optional<core::StrappingTable> strapping_table;
  Where where;
};

// Reference level and spread for a statistical estimator. A value not given is learned from the
// first `learn_s` seconds of data (mean and standard deviation), then held.
struct BaselineSpec {
  std::optional<double> target;
  std::optional<double> sigma;
  double learn_s = 0;
};

struct EwmaSpec {  // exponentially weighted mean and variance
  std::string of;
  double time_constant_s = 0;
};

struct CusumSpec {  // two-sided tabular CUSUM (Page's test) on standardised values
  std::string of;
  double k = 0.5;           // reference value, sigma units
  double h = 5.0;           // decision interval, sigma units
  double head_start = 0.0;  // fast initial response, sigma units (0 = none; h/2 is usual)
  bool restart_after_signal = false;  // true: sums restart at head_start after each signal
  double max_sum = 0.0;     // clamp on each sum, sigma units (0 = no clamp)
  BaselineSpec baseline;
};

struct EwmaChartSpec {  // EWMA control statistic with L-sigma limits
  std::string of;
  double lambda = 0.1;             // weight per nominal interval
  double nominal_interval_s = 1;   // spacing that lambda refers to
  double width = 2.814;            // L, in units of the EWMA statistic's sigma
  bool time_varying_limits = true;
  BaselineSpec baseline;
};

struct RlsSpec {  // recursive least squares of `target` on `regressors`
  std::string target;
  std::vector<std::string> regressors;
  bool intercept = true;
  double forgetting = 1.0;          // per nominal interval; 1 = none
  double nominal_interval_s = 1;
  double learn_s = 0;               // freeze the coefficients after this long; 0 = never
  double initial_covariance = 1e4;  // P0 = initial_covariance * I
  double max_covariance_trace = 1e8;
  double residual_time_constant_s = 3600;  // for the residual variance estimate
};

struct TrendSpec {  // exponentially weighted linear trend, time-to-limit
  std::string of;
  double time_constant_s = 0;  // 0 = no forgetting (ordinary least squares)
};

struct RateSpec {  // smoothed rate of change
  std::string of;
  double time_constant_s = 0;
};

// What the weight of earlier Hall plot points decays with (core/hall_integral.h).
enum class HallWindowBasis : std::uint8_t { volume, time };

// Hall plot of an injection well (core/hall_integral.h): the integral of the excess of the
// injection pressure over a constant reference pressure against cumulative injected volume, and
// the slope of that line over a recent window. The slope is the inverse of the injectivity
// index; the first usable slope once `learn_s` seconds of data have passed (0: the first usable
// slope) is held as the baseline of slope_change_percent.
struct HallSpec {
  std::string injection_pressure;  // a signal, psi (wellhead or bottom-hole)
  std::string rate;                // a signal, bbl/d
  double reference_pressure_psi = 0;
  double window = 0;  // bbl (basis volume) or days (basis time); 0 = the whole history
  HallWindowBasis basis = HallWindowBasis::volume;
  double max_interval_s = 0;  // longer gaps are not integrated; 0 = integrate every gap
  double learn_s = 0;         // when the baseline slope is taken, after the first sample
};

// The life of a filter element between change-outs (core/filter_life.h): feed it the
// flow-normalised dP, gated to on-line flow. A change-out closes the element's life as a record
// (kind "change_out") and restarts the estimators that name this one in `restart_on`.
struct FilterLifeSpec {
  std::string of;    // the flow-normalised dP, a signal with values only while on line
  std::string flow;  // the flow through the filter, a signal
  double memory_s = 7200;
  double drop_fraction = 0.4;
  double confirm_s = 900;
  double stop_gap_s = 600;
  double flow_time_unit_s = 86400;  // the flow's time unit: 86400 for a flow per day
  bool stop_required = true;        // false: every confirmed step drop is a change-out
};

// A stretch during which a rate runs high, and the change of a quantity over it
// (core/episode.h): an oil slug and its volume. Each episode that ends is a record
// (kind "episode").
struct EpisodeSpec {
  std::string of;    // the quantity, a signal
  std::string rate;  // its rate of change, a signal
  double start_above = 0;
  double end_below = 0;
  double end_after_s = 0;
};

using EstimatorKind = std::variant<EwmaSpec, CusumSpec, EwmaChartSpec, RlsSpec, TrendSpec, RateSpec,
                                   HallSpec, FilterLifeSpec, EpisodeSpec>;

struct EstimatorSpec {
  std::string name;
  EstimatorKind kind;
  // The name of an estimator that recognises events (filter_life); each event restarts this
  // estimator from nothing (a trend of dP starts afresh on a clean element). Empty: never.
  std::string restart_on;
  Where where;
};

// Outputs that each estimator kind publishes as signals "<estimator>.<output>".
//   ewma:       mean, stddev
//   cusum:      upper, lower            (sigma units)
//   ewma_chart: statistic, upper_limit, lower_limit
//   rls:        prediction, residual, residual_percent
//   trend:      level, slope_per_hour
//   rate:       per_hour
//   hall:       integral (psi*d), volume (bbl), slope (psi*d/bbl), injectivity (bbl/d/psi),
//               slope_change_percent (against the learned baseline slope)
//   filter_life: level (reference normalised dP), online_hours, throughput, days_in_service,
//               unexplained_drop (1 after a drop without a change-out, until the next one),
//               change_outs (count)
//   episode:    active (1 or 0), change (the quantity's change since the episode began; 0 when
//               none is active), hours, peak_rate
// (The engine owns the table; this comment documents the contract.)

enum class LimitDirection : std::uint8_t { high, low };

// A limit on a signal. Several levels (high-high, high, low, low-low) are separate checks on the
// same signal. Settings left unset take defaults (engine/check_settings.h): on an input, those
// of its measurement type; on any other signal, 0.
struct LimitCheckSpec {
  std::string of;  // a signal
  LimitDirection direction = LimitDirection::high;
  double limit = 0;
  // The condition clears only once the value is back inside the limit by the deadband: given in
  // engineering units, or in percent of the input's span (its range); at most one of the two.
  std::optional<double> deadband;
  std::optional<double> deadband_percent;
  std::optional<double> on_delay_s;   // the value must stay beyond the limit this long to raise
  std::optional<double> off_delay_s;  // and back inside this long to clear
};

enum class RateDirection : std::uint8_t { rising, falling };

// A limit on the smoothed rate of change of a signal, in its units per hour.
struct RateCheckSpec {
  std::string of;                                   // a signal
  RateDirection direction = RateDirection::rising;  // rising: rate > limit; falling: < -limit
  double limit = 0;                                 // units per hour, > 0
  double horizon_s = 0;                             // smoothing time constant of the rate, > 0
  double deadband = 0;                              // units per hour
  double on_delay_s = 0;
  double off_delay_s = 0;
};

struct StatisticalCheckSpec {  // raises when a CUSUM or EWMA chart signals
  std::string estimator;
};

struct TimeToLimitCheckSpec {  // raises when a trend will cross `limit` within `lead_time_s`
  std::string estimator;
  LimitDirection direction = LimitDirection::high;  // high: rising toward it; low: falling
  double limit = 0;
  double lead_time_s = 0;
};

// Data-quality checks; each watches one input directly.
struct StaleCheckSpec {  // no sample within factor x the input's expected_interval
  std::string of;
  double factor = 3.0;
};

// Every sample within `tolerance` of the window's first for `window`. Tolerance 0 asks for
// identical values (a frozen register repeats its value bit for bit). A value at or below
// `at_rest_up_to` is a machine or vessel at rest (a stopped pump's flow and current, an empty
// tank), not a stuck transmitter: it restarts the window and clears the condition.
struct FlatlineCheckSpec {
  std::string of;
  double tolerance = 0;                 // engineering units, >= 0
  double window_s = 0;                  // > 0
  std::optional<double> at_rest_up_to;  // engineering units; unset: no value counts as at rest
};

struct OutOfRangeCheckSpec {  // the value is outside the input's range, widened by `margin`
  std::string of;
  double margin_percent = 0;  // percent of span
};

struct Ne43CheckSpec {  // a raw 4-20 mA current at a NAMUR NE 43 failure level
  std::string of;
};

using CheckKind =
    std::variant<LimitCheckSpec, StatisticalCheckSpec, TimeToLimitCheckSpec, RateCheckSpec,
                 StaleCheckSpec, FlatlineCheckSpec, OutOfRangeCheckSpec, Ne43CheckSpec>;

// Suppression by design: while `of` is below (or above) `threshold` the check reports that it is
// suppressed and keeps its condition changes to itself.
struct SuppressionSpec {
  std::string of;                             // a signal
  LimitDirection when = LimitDirection::low;  // low: while of < threshold; high: of > threshold
  double threshold = 0;
};

struct CheckSpec {
  std::string name;
  CheckKind kind;
  Priority priority = Priority::medium;
  std::string message;    // plain words for the crew; the engine appends figures
  bool latching = false;  // the alert stays raised until acknowledged (the lifecycle's job)
  std::optional<SuppressionSpec> suppressed_when;
  Where where;
};

// Periodic records: facts kept for each reporting period besides alerts (one day's injected
// volume and pressures for the well's injection report). A field summarises one signal over the
// period, sample-and-hold between samples, counting only time in which the signal's data were
// usable (every input it comes from good and not silent).
enum class RecordPeriod : std::uint8_t {
  daily,  // local days of the site's time zone, starting at day_start
};

enum class RecordStat : std::uint8_t {
  total,         // integral of a rate over time: sum of value * dt / rate_per; unit given
  max,           // largest usable value (the held value at the period's start counts)
  min,           // smallest usable value
  time_average,  // integral of value over time / usable time
  time_above,    // hours in which the held value was above `above`
};

struct RecordFieldSpec {
  std::string name;  // the wire name of the field, e.g. "injected_volume"
  std::string of;    // a signal
  RecordStat stat = RecordStat::max;
  std::optional<double> rate_per_s;  // total: the rate's time unit in seconds (bbl/d: 86400)
  std::string unit;                  // total: the unit of the total (others take the signal's)
  std::optional<double> above;       // time_above: the threshold, in the signal's unit
  Where where;
};

struct RecordSpec {
  std::string name;  // the record's kind on the wire, e.g. "daily_injection"
  RecordPeriod period = RecordPeriod::daily;
  double day_start_s = 0;  // daily: start of the reporting day after local midnight, [0, 24h)
  std::vector<RecordFieldSpec> fields;
  Where where;
};

// Every periodic record ends with this field: hours of the period in which every field's
// signal had usable data. No configured field may take the name.
inline constexpr const char* kCoveredHoursField = "covered_h";

struct AssetSpec {
  std::string name;
  std::string template_name;
  std::string description;
  std::vector<InputSpec> inputs;
  std::vector<SignalSpec> signals;
  std::vector<EstimatorSpec> estimators;
  std::vector<CheckSpec> checks;
  std::vector<RecordSpec> records;
  Where where;
};

struct SiteSpec {
  std::string name;
  std::string time_zone;  // IANA name, e.g. "America/Chicago"
  std::vector<AssetSpec> assets;
  std::string file;  // the site file it was loaded from
};

}  // namespace bw::engine
