// The effective settings of limit checks: deadband and delays given in the check, or else the
// defaults of what the watched input measures.
//
// Defaults by measurement type (common practice in alarm management, from memory: the widely
// published ISA-18.2 guidance tables of deadbands and delays by signal type). The deadband is a
// percent of the input's span (its range); the on-delay and off-delay are equal:
//   flow                   5 %, 15 s
//   level                  5 %, 60 s
//   pressure               2 %, 15 s
//   temperature            1 %, 60 s
//   differential_pressure  2 %, 15 s   (treated like pressure)
//   current                2 %, 15 s   (an assumption: motor current moves like pressure)
//   other                  0 %,  0 s
// A limit check on a derived signal or estimator output has no measurement type: what it does
// not give is 0.
//
// Pure functions; thread-safe.
#pragma once

#include <string>
#include <string_view>

#include "core/result.h"
#include "engine/site_model.h"

namespace bw::engine {

struct MeasurementDefaults {
  double deadband_percent = 0;  // of the input's span
  double on_delay_s = 0;
  double off_delay_s = 0;
};

MeasurementDefaults measurement_defaults(Measurement measurement);

// Names as written in files ("level", "differential_pressure", ...).
std::string_view measurement_name(Measurement measurement);

struct LimitSettings {
  double deadband = 0;  // engineering units
  double on_delay_s = 0;
  double off_delay_s = 0;
};

// The settings a limit check of `asset` runs with. An error (for a person) when a deadband in
// percent of span is asked for, explicitly or by the measurement type's default, and the watched
// signal is not an input with a range.
Result<LimitSettings> limit_settings(const AssetSpec& asset, const LimitCheckSpec& spec);

// The input of `asset` whose role is `name`, or nullptr.
const InputSpec* find_input(const AssetSpec& asset, std::string_view name);

// The name of the implicit data-quality check of an input: "<role>_quality".
std::string quality_check_name(std::string_view role);

}  // namespace bw::engine
