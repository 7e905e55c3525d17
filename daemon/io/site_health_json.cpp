#include "io/site_health_json.h"

#include "core/utc_text.h"
#include "engine/alert.h"
#include "io/json_text.h"

namespace bw::io {
namespace {

using engine::Priority;

void append_time(std::string& out, core::SensorTime t) {
  append_json_string(out, core::format_utc(t, core::UtcPrecision::milliseconds));
}

void append_counts(std::string& out, const char* name, const engine::PriorityCounts& counts) {
  out += ",\"";
  out += name;
  out += "\":{";
  const char* separator = "";
  for (const Priority p : {Priority::low, Priority::medium, Priority::high, Priority::urgent}) {
    out += separator;
    separator = ",";
    append_json_string(out, engine::to_string(p));
    out += ":" + std::to_string(counts[p]);
  }
  out += "}";
}

void append_figures(std::string& out, const engine::HealthFigures& f) {
  out += ",\"status\":";
  append_json_string(out, engine::to_string(f.status()));
  out += ",\"worst_active_priority\":";
  if (const auto worst = f.worst_active()) {
    append_json_string(out, engine::to_string(*worst));
  } else {
    out += "null";
  }
  append_counts(out, "unacknowledged", f.unacknowledged);
  append_counts(out, "acknowledged", f.acknowledged);
  append_counts(out, "to_review", f.to_review);
  out += ",\"shelved\":" + std::to_string(f.shelved);
  out += ",\"suppressed_by_design\":" + std::to_string(f.suppressed);
  out += ",\"out_of_service\":" + std::to_string(f.out_of_service);
  out += ",\"oldest_unacknowledged\":";
  if (f.oldest_unacknowledged) {
    append_time(out, *f.oldest_unacknowledged);
  } else {
    out += "null";
  }
}

}  // namespace

std::string site_health_to_json(const engine::SiteHealth& health, core::SensorTime computed) {
  std::string out = "{\"time\":";
  append_time(out, computed);
  out += ",\"site\":";
  append_json_string(out, health.site);
  append_figures(out, health.figures);
  out += ",\"assets\":[";
  const char* separator = "";
  for (const auto& row : health.assets) {
    out += separator;
    separator = ",";
    out += "{\"asset\":";
    append_json_string(out, row.asset);
    append_figures(out, row.figures);
    out += "}";
  }
  return out + "]}";
}

}  // namespace bw::io
