// The site health roll-up (engine/site_health.h) as plain text for a person: one site as a
// table of its assets, and many sites in visit order. No colour codes; columns padded with
// spaces so the text reads the same in a terminal, a log or an e-mail.
//
// Count cells list the non-zero counts by priority, most urgent first ("1 urgent, 2 low"), or
// "-" when there are none; the set-aside cell lists shelved, suppressed and out-of-service
// counts the same way. Times are ISO 8601 UTC to the second.
#pragma once

#include <optional>
#include <string>
#include <vector>

#include "core/sensor_time.h"
#include "engine/site_health.h"

namespace bw::app {

// "site health [as of <time>]: <status> (<site>)" and a table: one row per asset, then the
// whole site. `as_of` is the event time the roll-up describes (the last input), when known.
std::string format_site_health(const engine::SiteHealth& health,
                               std::optional<core::SensorTime> as_of);

// One site read from a state store, for the visit order.
struct RankedSite {
  std::string dir;                           // where its state store is
  std::optional<engine::SiteHealth> health;  // none when the store could not be read
  std::optional<core::SensorTime> as_of;     // the store's input position
  std::string problem;                       // why it could not be read
};

// Sorts `sites` into visit order (engine::visit_before; ties keep their given order) and
// formats them as a numbered table; sites that could not be read are listed after it.
std::string format_visit_order(std::vector<RankedSite>& sites);

}  // namespace bw::app
