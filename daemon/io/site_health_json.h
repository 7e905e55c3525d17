// The site health roll-up (engine/site_health.h) as one JSON object, for the live daemon's
// retained `<prefix>/site_health` topic and anyone who reads it:
//
//   {"time": "<when it was computed, ISO 8601 UTC>", "site": "...", <figures>,
//    "assets": [{"asset": "...", <figures>}, ...]}
//
// where <figures> is
//   "status": "normal" | "attention" | "visit soon" | "visit now",
//   "worst_active_priority": "low" | "medium" | "high" | "urgent" | null,
//   "unacknowledged": {"low": n, "medium": n, "high": n, "urgent": n},
//   "acknowledged": {...}, "to_review": {...},
//   "shelved": n, "suppressed_by_design": n, "out_of_service": n,
//   "oldest_unacknowledged": "<ISO 8601 UTC>" | null
// Assets in the roll-up's order (site-file order, then the daemon's own when not normal).
// Field names and words are a public interface: add fields, never rename them.
#pragma once

#include <string>

#include "core/sensor_time.h"
#include "engine/site_health.h"

namespace bw::io {

std::string site_health_to_json(const engine::SiteHealth& health, core::SensorTime computed);

}  // namespace bw::io
