// The configuration schema: every key of every section, declared once.
//
// Each table row gives a key's YAML name, the struct member it fills (so its type and its
// default are those of the member in engine/site_model.h), its bounds, whether it is a duration
// (written as seconds or "90s", "15min", "6h", "1.5d"; stored in seconds) and whether it is
// required. read_keys() reads the listed keys of one mapping into a struct; unknown keys are
// reported separately by FieldReader::check_keys with allowed_keys() of the section.
//
// Rule template schema (rules/<name>.yaml; the `template` key equals the file stem):
//   template, description              texts (both required)
//   parameters: {<name>: {kind, default, unit, description, min, max}}
//               kind number (the default): default (required) a number or duration
//               kind table: a strapping table (level ft -> volume bbl); no default (none), no
//               min or max; a site gives it as [[level, volume], ...] or a CSV file path
//   inputs:     {<role>: kInputKeys + health}   health: see kStaleHealthKeys below
//   signals:    {<name>: kSignalKeys}          op: linear, sum, difference, product, ratio, gate,
//                                                  tank_volume (diameter, strapping_table)
//   estimators: {<name>: {kind, restart_on, ...}}  kind: ewma, cusum, ewma_chart, rls, trend,
//                                                    rate, hall, filter_life, episode
//   checks:     {<name>: {kind, priority, message, latching, suppressed_when, ...}}
//               kind: limit, statistical, time_to_limit, rate, stale, flatline, out_of_range, ne43
//               suppressed_when: {of: <signal>, below: <number>} or {of: <signal>, above: <number>}
//   records:    {<name>: {kind: daily, day_start, fields: {<field>: kRecordFieldKeys}}}
//               stat: total (needs rate_per and unit), max, min, time_average, time_above (needs
//               above)
// Any numeric value in a template may name a parameter instead; `strapping_table` names a table
// parameter or is written inline as [[level, volume], ...].
// Site schema (see site_loader.h): site {name, time_zone}, rules [folders], assets {<name>:
// {template, description, tags {role: tag}, parameters {name: value}, sensor_health {role: health}}},
// live {...} (live_spec.h).
// A whole-number (int) member takes the number's value only when it has no fraction; every int
// key gives both bounds.
#pragma once

#include <array>
#include <cassert>
#include <cmath>
#include <cstdint>
#include <optional>
#include <span>
#include <string>
#include <string_view>
#include <utility>
#include <variant>
#include <vector>

#include "config/field_reader.h"
#include "config/live_spec.h"
#include "config/quantity.h"
#include "config/strapping_table_reader.h"
#include "core/overloaded.h"
#include "core/tank_geometry.h"
#include "engine/sensor_health.h"
#include "engine/site_model.h"

namespace bw::config {

// A [low, high] pair of optional members (an instrument range).
template <class Spec>
struct RangeMembers {
  std::optional<double> Spec::*low;
  std::optional<double> Spec::*high;
};

// What a template parameter holds: a number (or duration), or a strapping table.
enum class ParameterKind : std::uint8_t { number, table };

template <class Spec>
using Member = std::variant<
    double Spec::*, int Spec::*, bool Spec::*, std::string Spec::*,
    std::vector<std::string> Spec::*, std::optional<double> Spec::*, engine::BaselineSpec Spec::*,
    engine::Priority Spec::*, std::optional<engine::Priority> Spec::*,
    engine::LimitDirection Spec::*, engine::SignalOp Spec::*,
    engine::Measurement Spec::*, engine::RateDirection Spec::*, engine::HallWindowBasis Spec::*,
    engine::RecordPeriod Spec::*, engine::RecordStat Spec::*,
    std::optional<engine::SuppressionSpec> Spec::*, PayloadFormat Spec::*, RangeMembers<Spec>,
    std::optional<core::StrappingTable> Spec::*, ParameterKind Spec::*>;

template <class Spec>
struct Key {
  std::string_view name;
  Member<Spec> member;
  Bounds bounds = kAnyValue;
  bool duration = false;
  bool required = false;
};

// Names as written in files. Order is the order shown in messages.
inline constexpr std::array<std::pair<std::string_view, engine::Priority>, 4> kPriorityNames{{
    {"low", engine::Priority::low},
    {"medium", engine::Priority::medium},
    {"high", engine::Priority::high},
    {"urgent", engine::Priority::urgent},
}};
inline constexpr std::array<std::pair<std::string_view, engine::LimitDirection>, 2> kDirectionNames{
    {{"high", engine::LimitDirection::high}, {"low", engine::LimitDirection::low}}};
// Operation names; engine::signal_op_name() gives the same names the other way round.
inline constexpr std::array<std::pair<std::string_view, engine::SignalOp>, 7> kSignalOpNames{{
    {"linear", engine::SignalOp::linear},
    {"sum", engine::SignalOp::sum},
    {"difference", engine::SignalOp::difference},
    {"product", engine::SignalOp::product},
    {"ratio", engine::SignalOp::ratio},
    {"gate", engine::SignalOp::gate},
    {"tank_volume", engine::SignalOp::tank_volume},
}};

inline constexpr std::array<std::pair<std::string_view, ParameterKind>, 2> kParameterKindNames{
    {{"number", ParameterKind::number}, {"table", ParameterKind::table}}};

inline constexpr std::array<std::pair<std::string_view, engine::RateDirection>, 2>
    kRateDirectionNames{
        {{"rising", engine::RateDirection::rising}, {"falling", engine::RateDirection::falling}}};
// Measurement names; engine::measurement_name() gives the same names the other way round.
inline constexpr std::array<std::pair<std::string_view, engine::Measurement>, 7> kMeasurementNames{{
    {"level", engine::Measurement::level},
    {"pressure", engine::Measurement::pressure},
    {"flow", engine::Measurement::flow},
    {"temperature", engine::Measurement::temperature},
    {"differential_pressure", engine::Measurement::differential_pressure},
    {"current", engine::Measurement::current},
    {"other", engine::Measurement::other},
}};

inline constexpr std::array<std::pair<std::string_view, engine::HallWindowBasis>, 2>
    kHallBasisNames{
        {{"volume", engine::HallWindowBasis::volume}, {"time", engine::HallWindowBasis::time}}};

inline constexpr std::array<std::pair<std::string_view, engine::RecordPeriod>, 1>
    kRecordPeriodNames{{{"daily", engine::RecordPeriod::daily}}};
inline constexpr std::array<std::pair<std::string_view, engine::RecordStat>, 5> kRecordStatNames{{
    {"total", engine::RecordStat::total},
    {"max", engine::RecordStat::max},
    {"min", engine::RecordStat::min},
    {"time_average", engine::RecordStat::time_average},
    {"time_above", engine::RecordStat::time_above},
}};

inline constexpr std::array<std::pair<std::string_view, PayloadFormat>, 2> kPayloadFormatNames{
    {{"json", PayloadFormat::json}, {"sparkplug", PayloadFormat::sparkplug}}};

inline constexpr Bounds kPercent{.min = 0.0, .max = 100.0};
inline constexpr Bounds kAtLeastOne{.min = 1.0};

std::string_view priority_name(engine::Priority priority);
std::string_view direction_name(engine::LimitDirection direction);

// A parameter declared by a rule template. A table parameter has no default value (no table
// until a site gives one) and no bounds.
struct ParameterDecl {
  std::string name;
  ParameterKind kind = ParameterKind::number;
  double default_value = 0;  // engineering units; seconds when unit is "s"
  std::string unit;
  std::string description;
  std::optional<double> min;
  std::optional<double> max;
  engine::Where where;
};

// clang-format off
// `default` is required of number parameters and refused for tables (rule_template.cpp).
inline constexpr std::array<Key<ParameterDecl>, 6> kParameterKeys{{
    {"kind", &ParameterDecl::kind},
    {"default", &ParameterDecl::default_value, kAnyValue, true},
    {"unit", &ParameterDecl::unit, kAnyValue, false, true},
    {"description", &ParameterDecl::description, kAnyValue, false, true},
    {"min", &ParameterDecl::min},
    {"max", &ParameterDecl::max},
}};

inline constexpr std::array<Key<engine::InputSpec>, 5> kInputKeys{{
    {"unit", &engine::InputSpec::unit, kAnyValue, false, true},
    {"required", &engine::InputSpec::required},
    {"expected_interval", &engine::InputSpec::expected_interval_s, kNonNegative, true},
    {"range", RangeMembers<engine::InputSpec>{&engine::InputSpec::range_low,
                                               &engine::InputSpec::range_high}},
    {"measurement", &engine::InputSpec::measurement},
}};

// diameter (ft) and strapping_table are keys of op tank_volume (engine::analyse_asset checks).
inline constexpr std::array<Key<engine::SignalSpec>, 10> kSignalKeys{{
    {"op", &engine::SignalSpec::op, kAnyValue, false, true},
    {"of", &engine::SignalSpec::operands, kAnyValue, false, true},
    {"unit", &engine::SignalSpec::unit, kAnyValue, false, true},
    {"gain", &engine::SignalSpec::gain},
    {"offset", &engine::SignalSpec::offset},
    {"exponent", &engine::SignalSpec::exponent},
    {"reference", &engine::SignalSpec::reference, kPositive},
    {"above", &engine::SignalSpec::above},
    {"diameter", &engine::SignalSpec::diameter_ft, kPositive},
    {"strapping_table", &engine::SignalSpec::strapping_table},
}};

inline constexpr std::array<Key<engine::BaselineSpec>, 3> kBaselineKeys{{
    {"target", &engine::BaselineSpec::target},
    {"sigma", &engine::BaselineSpec::sigma, kPositive},
    {"learn", &engine::BaselineSpec::learn_s, kNonNegative, true},
}};

inline constexpr std::array<Key<engine::EwmaSpec>, 2> kEwmaKeys{{
    {"of", &engine::EwmaSpec::of, kAnyValue, false, true},
    {"time_constant", &engine::EwmaSpec::time_constant_s, kPositive, true, true},
}};

inline constexpr std::array<Key<engine::CusumSpec>, 7> kCusumKeys{{
    {"of", &engine::CusumSpec::of, kAnyValue, false, true},
    {"k", &engine::CusumSpec::k, kNonNegative},
    {"h", &engine::CusumSpec::h, kPositive},
    {"head_start", &engine::CusumSpec::head_start, kNonNegative},
    {"restart_after_signal", &engine::CusumSpec::restart_after_signal},
    {"max_sum", &engine::CusumSpec::max_sum, kNonNegative},
    {"baseline", &engine::CusumSpec::baseline, kAnyValue, false, true},
}};

inline constexpr std::array<Key<engine::EwmaChartSpec>, 6> kEwmaChartKeys{{
    {"of", &engine::EwmaChartSpec::of, kAnyValue, false, true},
    {"lambda", &engine::EwmaChartSpec::lambda, kUnitInterval},
    {"nominal_interval", &engine::EwmaChartSpec::nominal_interval_s, kPositive, true},
    {"width", &engine::EwmaChartSpec::width, kPositive},
    {"time_varying_limits", &engine::EwmaChartSpec::time_varying_limits},
    {"baseline", &engine::EwmaChartSpec::baseline, kAnyValue, false, true},
}};

inline constexpr std::array<Key<engine::RlsSpec>, 9> kRlsKeys{{
    {"target", &engine::RlsSpec::target, kAnyValue, false, true},
    {"regressors", &engine::RlsSpec::regressors, kAnyValue, false, true},
    {"intercept", &engine::RlsSpec::intercept},
    {"forgetting", &engine::RlsSpec::forgetting, kUnitInterval},
    {"nominal_interval", &engine::RlsSpec::nominal_interval_s, kPositive, true},
    {"learn", &engine::RlsSpec::learn_s, kNonNegative, true},
    {"initial_covariance", &engine::RlsSpec::initial_covariance, kPositive},
    {"max_covariance_trace", &engine::RlsSpec::max_covariance_trace, kPositive},
    {"residual_time_constant", &engine::RlsSpec::residual_time_constant_s, kPositive, true},
}};

inline constexpr std::array<Key<engine::TrendSpec>, 2> kTrendKeys{{
    {"of", &engine::TrendSpec::of, kAnyValue, false, true},
    {"time_constant", &engine::TrendSpec::time_constant_s, kNonNegative, true},
}};

inline constexpr std::array<Key<engine::RateSpec>, 2> kRateKeys{{
    {"of", &engine::RateSpec::of, kAnyValue, false, true},
    {"time_constant", &engine::RateSpec::time_constant_s, kNonNegative, true},
}};

// window: bbl with basis volume, days with basis time (a plain number either way).
inline constexpr std::array<Key<engine::HallSpec>, 7> kHallKeys{{
    {"injection_pressure", &engine::HallSpec::injection_pressure, kAnyValue, false, true},
    {"rate", &engine::HallSpec::rate, kAnyValue, false, true},
    {"reference_pressure", &engine::HallSpec::reference_pressure_psi, kAnyValue, false, true},
    {"window", &engine::HallSpec::window, kNonNegative},
    {"basis", &engine::HallSpec::basis},
    {"max_interval", &engine::HallSpec::max_interval_s, kNonNegative, true},
    {"learn", &engine::HallSpec::learn_s, kNonNegative, true},
}};

inline constexpr Bounds kOpenUnitInterval{.min = 0.0, .min_open = true, .max = 1.0, .max_open = true};

// flow_time_unit: the duration the flow's unit refers to (1d for bbl/d).
inline constexpr std::array<Key<engine::FilterLifeSpec>, 8> kFilterLifeKeys{{
    {"of", &engine::FilterLifeSpec::of, kAnyValue, false, true},
    {"flow", &engine::FilterLifeSpec::flow, kAnyValue, false, true},
    {"memory", &engine::FilterLifeSpec::memory_s, kPositive, true},
    {"drop_fraction", &engine::FilterLifeSpec::drop_fraction, kOpenUnitInterval},
    {"confirm", &engine::FilterLifeSpec::confirm_s, kPositive, true},
    {"stop_gap", &engine::FilterLifeSpec::stop_gap_s, kPositive, true},
    {"flow_time_unit", &engine::FilterLifeSpec::flow_time_unit_s, kPositive, true},
    {"stop_required", &engine::FilterLifeSpec::stop_required},
}};

// end_below must be under start_above (checked by the reader).
inline constexpr std::array<Key<engine::EpisodeSpec>, 5> kEpisodeKeys{{
    {"of", &engine::EpisodeSpec::of, kAnyValue, false, true},
    {"rate", &engine::EpisodeSpec::rate, kAnyValue, false, true},
    {"start_above", &engine::EpisodeSpec::start_above, kAnyValue, false, true},
    {"end_below", &engine::EpisodeSpec::end_below, kAnyValue, false, true},
    {"end_after", &engine::EpisodeSpec::end_after_s, kNonNegative, true},
}};

// Keys every estimator has besides `kind`.
inline constexpr std::array<Key<engine::EstimatorSpec>, 1> kEstimatorCommonKeys{{
    {"restart_on", &engine::EstimatorSpec::restart_on},
}};

// Keys every check has besides `kind`.
inline constexpr std::array<Key<engine::CheckSpec>, 4> kCheckCommonKeys{{
    {"priority", &engine::CheckSpec::priority},
    {"message", &engine::CheckSpec::message, kAnyValue, false, true},
    {"latching", &engine::CheckSpec::latching},
    {"suppressed_when", &engine::CheckSpec::suppressed_when},
}};

// Unset deadband and delays take the defaults of the input's measurement type
// (engine/check_settings.h); deadband and deadband_percent exclude each other.
inline constexpr std::array<Key<engine::LimitCheckSpec>, 7> kLimitCheckKeys{{
    {"of", &engine::LimitCheckSpec::of, kAnyValue, false, true},
    {"direction", &engine::LimitCheckSpec::direction},
    {"limit", &engine::LimitCheckSpec::limit, kAnyValue, false, true},
    {"deadband", &engine::LimitCheckSpec::deadband, kNonNegative},
    {"deadband_percent", &engine::LimitCheckSpec::deadband_percent, kPercent},
    {"on_delay", &engine::LimitCheckSpec::on_delay_s, kNonNegative, true},
    {"off_delay", &engine::LimitCheckSpec::off_delay_s, kNonNegative, true},
}};

inline constexpr std::array<Key<engine::RateCheckSpec>, 7> kRateCheckKeys{{
    {"of", &engine::RateCheckSpec::of, kAnyValue, false, true},
    {"direction", &engine::RateCheckSpec::direction},
    {"limit", &engine::RateCheckSpec::limit, kPositive, false, true},
    {"horizon", &engine::RateCheckSpec::horizon_s, kPositive, true, true},
    {"deadband", &engine::RateCheckSpec::deadband, kNonNegative},
    {"on_delay", &engine::RateCheckSpec::on_delay_s, kNonNegative, true},
    {"off_delay", &engine::RateCheckSpec::off_delay_s, kNonNegative, true},
}};

inline constexpr std::array<Key<engine::StatisticalCheckSpec>, 1> kStatisticalCheckKeys{{
    {"estimator", &engine::StatisticalCheckSpec::estimator, kAnyValue, false, true},
}};

inline constexpr std::array<Key<engine::TimeToLimitCheckSpec>, 4> kTimeToLimitCheckKeys{{
    {"estimator", &engine::TimeToLimitCheckSpec::estimator, kAnyValue, false, true},
    {"direction", &engine::TimeToLimitCheckSpec::direction},
    {"limit", &engine::TimeToLimitCheckSpec::limit, kAnyValue, false, true},
    {"lead_time", &engine::TimeToLimitCheckSpec::lead_time_s, kPositive, true, true},
}};

inline constexpr std::array<Key<engine::StaleCheckSpec>, 2> kStaleCheckKeys{{
    {"of", &engine::StaleCheckSpec::of, kAnyValue, false, true},
    {"factor", &engine::StaleCheckSpec::factor, kAtLeastOne},
}};

// tolerance 0: the values must be identical.
inline constexpr std::array<Key<engine::FlatlineCheckSpec>, 4> kFlatlineCheckKeys{{
    {"of", &engine::FlatlineCheckSpec::of, kAnyValue, false, true},
    {"tolerance", &engine::FlatlineCheckSpec::tolerance, kNonNegative, false, true},
    {"window", &engine::FlatlineCheckSpec::window_s, kPositive, true, true},
    {"at_rest_up_to", &engine::FlatlineCheckSpec::at_rest_up_to},
}};

inline constexpr std::array<Key<engine::OutOfRangeCheckSpec>, 2> kOutOfRangeCheckKeys{{
    {"of", &engine::OutOfRangeCheckSpec::of, kAnyValue, false, true},
    {"margin", &engine::OutOfRangeCheckSpec::margin_percent, kPercent},
}};

inline constexpr std::array<Key<engine::Ne43CheckSpec>, 1> kNe43CheckKeys{{
    {"of", &engine::Ne43CheckSpec::of, kAnyValue, false, true},
}};

// day_start is below 24h; `fields` is read by hand (a mapping of kRecordFieldKeys).
inline constexpr Bounds kDayStart{.min = 0.0, .max = 86400.0, .max_open = true};
inline constexpr std::array<Key<engine::RecordSpec>, 2> kRecordKeys{{
    {"kind", &engine::RecordSpec::period, kAnyValue, false, true},
    {"day_start", &engine::RecordSpec::day_start_s, kDayStart, true},
}};

// Which keys each stat takes is checked in rule_template.cpp.
inline constexpr std::array<Key<engine::RecordFieldSpec>, 5> kRecordFieldKeys{{
    {"of", &engine::RecordFieldSpec::of, kAnyValue, false, true},
    {"stat", &engine::RecordFieldSpec::stat, kAnyValue, false, true},
    {"rate_per", &engine::RecordFieldSpec::rate_per_s, kPositive, true},
    {"unit", &engine::RecordFieldSpec::unit},
    {"above", &engine::RecordFieldSpec::above},
}};

// Sensor health (engine/sensor_health.h): the settings of each default check of an input, in a
// template input's `health:` block and a site asset's `sensor_health: {<role>: ...}`. Each kind
// is written `off`, `on`, or a mapping of these keys (which also switches it on); the whole
// block may be `off` or `on`. Read by config/health_block.h.
inline constexpr std::array<Key<engine::HealthCheckTuning>, 2> kStaleHealthKeys{{
    {"factor", &engine::HealthCheckTuning::factor, kAtLeastOne},
    {"priority", &engine::HealthCheckTuning::priority},
}};

inline constexpr std::array<Key<engine::HealthCheckTuning>, 4> kFlatlineHealthKeys{{
    {"window", &engine::HealthCheckTuning::window_s, kPositive, true},
    {"tolerance", &engine::HealthCheckTuning::tolerance, kNonNegative},
    {"at_rest_up_to", &engine::HealthCheckTuning::at_rest_up_to},
    {"priority", &engine::HealthCheckTuning::priority},
}};

inline constexpr std::array<Key<engine::HealthCheckTuning>, 2> kOutOfRangeHealthKeys{{
    {"margin", &engine::HealthCheckTuning::margin_percent, kPercent},
    {"priority", &engine::HealthCheckTuning::priority},
}};

inline constexpr std::array<Key<engine::HealthCheckTuning>, 1> kNe43HealthKeys{{
    {"priority", &engine::HealthCheckTuning::priority},
}};

inline constexpr std::array<Key<engine::SiteSpec>, 2> kSiteKeys{{
    {"name", &engine::SiteSpec::name, kAnyValue, false, true},
    {"time_zone", &engine::SiteSpec::time_zone, kAnyValue, false, true},
}};

// `tags` and `parameters` of an asset are mappings of names, read by the site loader.
inline constexpr std::array<Key<engine::AssetSpec>, 2> kAssetKeys{{
    {"template", &engine::AssetSpec::template_name, kAnyValue, false, true},
    {"description", &engine::AssetSpec::description},
}};

// The `live:` section (live_spec.h); its nested mappings and lists are read by live_section.cpp.
// MQTT keep alive is a 16-bit count of seconds (MQTT 3.1.1 section 3.1.2.10); 268435455 bytes
// is the largest packet MQTT can frame (section 2.2.3).
inline constexpr Bounds kMqttVersions{.min = 4.0, .max = 5.0};
inline constexpr Bounds kKeepAlive{.min = 1.0, .max = 65535.0};
inline constexpr Bounds kQos{.min = 0.0, .max = 1.0};
inline constexpr Bounds kPayloadBytes{.min = 1.0, .max = 268435455.0};

inline constexpr std::array<Key<LiveSpec>, 1> kLiveKeys{{
    {"tick", &LiveSpec::tick_s, kPositive, true},
}};

inline constexpr std::array<Key<BrokerSpec>, 5> kBrokerKeys{{
    {"uri", &BrokerSpec::uri, kAnyValue, false, true},
    {"client_id", &BrokerSpec::client_id},
    {"mqtt_version", &BrokerSpec::mqtt_version, kMqttVersions},
    {"keep_alive", &BrokerSpec::keep_alive_s, kKeepAlive, true},
    {"credentials_file", &BrokerSpec::credentials_file},
}};

inline constexpr std::array<Key<TlsSpec>, 3> kTlsKeys{{
    {"ca_file", &TlsSpec::ca_file, kAnyValue, false, true},
    {"cert_file", &TlsSpec::cert_file},
    {"key_file", &TlsSpec::key_file},
}};

inline constexpr std::array<Key<BrokerSpec>, 2> kReconnectKeys{{
    {"min", &BrokerSpec::reconnect_min_s, kPositive, true},
    {"max", &BrokerSpec::reconnect_max_s, kPositive, true},
}};

// Exactly one of `topic` and `sparkplug_group` is given; live_section.cpp checks that.
inline constexpr std::array<Key<InputRule>, 5> kInputRuleKeys{{
    {"topic", &InputRule::topic},
    {"sparkplug_group", &InputRule::sparkplug_group},
    {"tag", &InputRule::tag_template},
    {"format", &InputRule::format},
    {"qos", &InputRule::qos, kQos},
}};

inline constexpr std::array<Key<DecodeLimitsSpec>, 3> kDecodeLimitsKeys{{
    {"max_payload", &DecodeLimitsSpec::max_payload_bytes, kPayloadBytes},
    {"max_future", &DecodeLimitsSpec::max_future_s, kPositive, true},
    {"max_past", &DecodeLimitsSpec::max_past_s, kPositive, true},
}};

inline constexpr std::array<Key<OutputSpec>, 1> kOutputKeys{{
    {"topic_prefix", &OutputSpec::topic_prefix},
}};

// `authorised` (required) is read by hand: its client ids are topic levels.
inline constexpr std::array<Key<CommandSpec>, 1> kCommandKeys{{
    {"topic", &CommandSpec::topic, kAnyValue, false, true},
}};

inline constexpr std::array<Key<StateSpec>, 2> kStateKeys{{
    {"dir", &StateSpec::dir, kAnyValue, false, true},
    {"checkpoint_every", &StateSpec::checkpoint_every_s, kPositive, true},
}};
// clang-format on

// The names of a table's keys followed by `extra` names handled by hand.
template <class Spec, std::size_t N>
std::vector<std::string_view> allowed_keys(const std::array<Key<Spec>, N>& keys,
                                           std::initializer_list<std::string_view> extra = {}) {
  std::vector<std::string_view> names;
  for (const auto& key : keys) names.push_back(key.name);
  names.insert(names.end(), extra.begin(), extra.end());
  return names;
}

// Reads a baseline mapping: target and sigma optional, learn required unless both are given.
void read_baseline(FieldReader& reader, const ConfigNode& value, std::string_view what,
                   engine::BaselineSpec& out);

// Reads "{of: <signal>, below: <number>}" or "{of: <signal>, above: <number>}".
void read_suppression(FieldReader& reader, const ConfigNode& value, std::string_view what,
                      std::optional<engine::SuppressionSpec>& out);

// Reads "[low, high]" with low < high.
std::optional<std::pair<double, double>> read_range(FieldReader& reader, const ConfigNode& value,
                                                    std::string_view what);

// Reads every key of `keys` present in `map` into `out`; missing required keys are reported.
// Returns false when any key failed.
template <class Spec, std::size_t N>
bool read_keys(FieldReader& reader, const ConfigNode& map, const std::array<Key<Spec>, N>& keys,
               Spec& out, std::string_view section) {
  const std::size_t errors_before = reader.error_count();
  for (const auto& key : keys) {
    const ConfigNode* value =
        key.required ? reader.require(map, key.name, section) : map.find(key.name);
    if (value == nullptr) continue;
    const std::string what = std::string(section) + ": key '" + std::string(key.name) + "'";
    auto store = [&](auto member, auto parsed) {
      if (parsed) out.*member = std::move(*parsed);
    };
    std::visit(
        core::Overloaded{
            [&](double Spec::*m) {
              store(m, reader.number(*value, what, key.bounds, key.duration));
            },
            [&](std::optional<double> Spec::*m) {
              if (auto v = reader.number(*value, what, key.bounds, key.duration)) out.*m = *v;
            },
            [&](int Spec::*m) {
              assert(key.bounds.min && key.bounds.max);  // keeps the cast below in range
              auto number = reader.number(*value, what, key.bounds, key.duration);
              if (number && *number != std::floor(*number)) {
                reader.error(*value, what + ": must be a whole number" +
                                         (key.duration ? " of seconds" : "") + ", got " +
                                         format_number(*number));
              } else if (number) {
                out.*m = static_cast<int>(*number);
              }
            },
            [&](bool Spec::*m) { store(m, reader.flag(*value, what)); },
            [&](std::string Spec::*m) { store(m, reader.text(*value, what)); },
            [&](std::vector<std::string> Spec::*m) { store(m, reader.text_list(*value, what)); },
            [&](engine::BaselineSpec Spec::*m) { read_baseline(reader, *value, what, out.*m); },
            [&](engine::Priority Spec::*m) {
              store(m, reader.choice<engine::Priority>(*value, what, kPriorityNames));
            },
            [&](std::optional<engine::Priority> Spec::*m) {
              store(m, reader.choice<engine::Priority>(*value, what, kPriorityNames));
            },
            [&](engine::LimitDirection Spec::*m) {
              store(m, reader.choice<engine::LimitDirection>(*value, what, kDirectionNames));
            },
            [&](engine::SignalOp Spec::*m) {
              store(m, reader.choice<engine::SignalOp>(*value, what, kSignalOpNames));
            },
            [&](engine::Measurement Spec::*m) {
              store(m, reader.choice<engine::Measurement>(*value, what, kMeasurementNames));
            },
            [&](engine::RateDirection Spec::*m) {
              store(m, reader.choice<engine::RateDirection>(*value, what, kRateDirectionNames));
            },
            [&](engine::HallWindowBasis Spec::*m) {
              store(m, reader.choice<engine::HallWindowBasis>(*value, what, kHallBasisNames));
            },
            [&](std::optional<engine::SuppressionSpec> Spec::*m) {
              read_suppression(reader, *value, what, out.*m);
            },
            [&](engine::RecordPeriod Spec::*m) {
              store(m, reader.choice<engine::RecordPeriod>(*value, what, kRecordPeriodNames));
            },
            [&](engine::RecordStat Spec::*m) {
              store(m, reader.choice<engine::RecordStat>(*value, what, kRecordStatNames));
            },
            [&](PayloadFormat Spec::*m) {
              store(m, reader.choice<PayloadFormat>(*value, what, kPayloadFormatNames));
            },
            [&](std::optional<core::StrappingTable> Spec::*m) {
              read_table_reference(reader, *value, what, out.*m);
            },
            [&](ParameterKind Spec::*m) {
              store(m, reader.choice<ParameterKind>(*value, what, kParameterKindNames));
            },
            [&](RangeMembers<Spec> r) {
              if (auto range = read_range(reader, *value, what)) {
                out.*(r.low) = range->first;
                out.*(r.high) = range->second;
              }
            },
        },
        key.member);
  }
  return reader.error_count() == errors_before;
}

}  // namespace bw::config
