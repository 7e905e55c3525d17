#include "io/time_field.h"

#include "io/time_parse.h"

namespace bw::io {

std::optional<RowProblemKind> parse_time_field(std::string_view field, LocalTimeZone* zone,
                                               core::SensorTime& out,
                                               std::optional<ConversionNote>& note) {
  note.reset();
  if (looks_like_epoch_seconds(field)) {
    const auto epoch = parse_epoch_seconds(field);
    if (!epoch) return RowProblemKind::bad_time;
    out = *epoch;
    return std::nullopt;
  }
  const auto iso = parse_iso8601(field);
  if (!iso) return RowProblemKind::bad_time;
  if (iso->offset_minutes) {
    out = to_sensor_time(*iso);
    return std::nullopt;
  }
  if (zone == nullptr) return RowProblemKind::no_time_zone;
  note.emplace();
  out = zone->to_utc(iso->civil, *note);
  return std::nullopt;
}

}  // namespace bw::io
