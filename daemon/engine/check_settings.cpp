#include "engine/check_settings.h"

#include <algorithm>
#include <cstdio>

namespace bw::engine {
namespace {

std::string percent(double value) {
  char text[32];
  std::snprintf(text, sizeof text, "%g %%", value);
  return text;
}

}  // namespace

MeasurementDefaults measurement_defaults(Measurement measurement) {
  // Common practice in alarm management, from memory (see the header).
  switch (measurement) {
    case Measurement::flow:
      return {5.0, 15.0, 15.0};
    case Measurement::level:
      return {5.0, 60.0, 60.0};
    case Measurement::pressure:
    case Measurement::differential_pressure:
      return {2.0, 15.0, 15.0};
    case Measurement::temperature:
      return {1.0, 60.0, 60.0};
    case Measurement::current:  // assumption: like pressure
      return {2.0, 15.0, 15.0};
    case Measurement::other:
      return {};
  }
  return {};
}

std::string_view measurement_name(Measurement measurement) {
  switch (measurement) {
    case Measurement::level:
      return "level";
    case Measurement::pressure:
      return "pressure";
    case Measurement::flow:
      return "flow";
    case Measurement::temperature:
      return "temperature";
    case Measurement::differential_pressure:
      return "differential_pressure";
    case Measurement::current:
      return "current";
    case Measurement::other:
      return "other";
  }
  return "other";
}

const InputSpec* find_input(const AssetSpec& asset, std::string_view name) {
  auto it = std::find_if(asset.inputs.begin(), asset.inputs.end(),
                         [&](const InputSpec& input) { return input.role == name; });
  return it == asset.inputs.end() ? nullptr : &*it;
}

std::string quality_check_name(std::string_view role) { return std::string(role) + "_quality"; }

Result<LimitSettings> limit_settings(const AssetSpec& asset, const LimitCheckSpec& spec) {
  const InputSpec* input = find_input(asset, spec.of);
  const MeasurementDefaults defaults =
      input != nullptr ? measurement_defaults(input->measurement) : MeasurementDefaults{};
  LimitSettings settings{.deadband = 0,
                         .on_delay_s = spec.on_delay_s.value_or(defaults.on_delay_s),
                         .off_delay_s = spec.off_delay_s.value_or(defaults.off_delay_s)};
  if (spec.deadband) {
    settings.deadband = *spec.deadband;
    return settings;
  }
  const double percent_of_span = spec.deadband_percent.value_or(defaults.deadband_percent);
  if (percent_of_span == 0) return settings;
  const bool has_range = input != nullptr && input->range_low && input->range_high;
  if (!has_range) {
    const std::string why = spec.deadband_percent
                                ? "a deadband of " + percent(percent_of_span) + " of span"
                                : "the default deadband of a " +
                                      std::string(measurement_name(input->measurement)) +
                                      " input (" + percent(percent_of_span) + " of span)";
    const std::string fix = input != nullptr ? "give input '" + spec.of + "' a range"
                                             : "give the deadband in engineering units";
    return Error{
        why + " needs a range, but '" + spec.of +
        (input != nullptr ? "' declares none" : "' is not an input (only inputs have ranges)") +
        "; " + fix + " or give 'deadband'"};
  }
  settings.deadband = percent_of_span / 100.0 * (*input->range_high - *input->range_low);
  return settings;
}

}  // namespace bw::engine
