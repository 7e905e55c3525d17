// Reads one time field of a delimited file: epoch seconds, ISO 8601 with an offset, or ISO 8601
// without one, which is local time in the caller's zone.
//
// Shared by the history reader and the commands reader so that both accept exactly the same
// times. Pure except for the zone's cache (see LocalTimeZone).
#pragma once

#include <optional>
#include <string_view>

#include "core/sensor_time.h"
#include "io/history_stats.h"
#include "io/local_time_zone.h"

namespace bw::io {

// On success returns nothing and sets `out`; `note` is set for local times (how the zone
// resolved them) and reset otherwise. On failure returns bad_time (not a time) or no_time_zone
// (a local time but `zone` is null). `field` must already be tidied (no spaces or quotes).
std::optional<RowProblemKind> parse_time_field(std::string_view field, LocalTimeZone* zone,
                                               core::SensorTime& out,
                                               std::optional<ConversionNote>& note);

}  // namespace bw::io
