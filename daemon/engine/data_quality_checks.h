// Data-quality checks: is the instrument behind an input telling the truth? Each watches one
// input directly (engine/check_node.h describes how the evaluator drives checks).
//
//   stale:        no sample of the input (of any quality) within factor x its expected interval,
//                 counted from the last sample, or from the evaluator's first moment when the
//                 input was never heard. Falls due at deadline() without a sample; clears on the
//                 next sample. Not held by bad or silent data: silence is what it reports.
//   flatline:     a stuck transmitter: every sample since the first of the window within
//                 `tolerance` of it for at least `window` (tolerance 0: every sample identical to
//                 it). A sample beyond the tolerance starts a new window and clears the
//                 condition. A sample at or below `at_rest_up_to` (a machine at rest) ends the
//                 window and clears the condition; the next sample above it starts a new one.
//   out_of_range: the value is outside the input's range widened by margin percent of the span:
//                 the instrument is over- or under-ranged.
//   ne43:         the input is a raw 4-20 mA current: active at or below 3.6 mA (low failure
//                 signal) or at or above 21.0 mA (high failure signal), per NAMUR NE 43. Values
//                 in 3.6-3.8 mA or 20.5-21.0 mA are outside the measurement range but are not
//                 failure signals: this check reports nothing for them (an out_of_range check
//                 with range [3.8, 20.5] does).
// Before the first sample they are clear. Not thread-safe.
#pragma once

#include <memory>

#include "engine/check_node.h"
#include "engine/site_model.h"

namespace bw::engine {

// REQUIRES: input.expected_interval_s > 0, sources.heard set.
std::unique_ptr<CheckNode> make_stale_check(const StaleCheckSpec& spec, const InputSpec& input,
                                            CheckSources sources);
std::unique_ptr<CheckNode> make_flatline_check(const FlatlineCheckSpec& spec, CheckSources sources);
// REQUIRES: the input has a range.
std::unique_ptr<CheckNode> make_out_of_range_check(const OutOfRangeCheckSpec& spec,
                                                   const InputSpec& input, CheckSources sources);
std::unique_ptr<CheckNode> make_ne43_check(CheckSources sources);

}  // namespace bw::engine
