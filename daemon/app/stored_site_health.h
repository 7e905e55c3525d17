// The site health roll-up of a state store, without the site file: for `brinewatch state`, run
// on the edge box or on a copy of the store, and for ranking many sites' stores.
//
// What it reads (io/state_schema.h): the alert book's checkpoint (every alert's ISA-18.2 state
// and since when; its definition is the site's name), the newest journal entry of each alert
// (its priority, which the book does not save), the asset checkpoints (the site's assets, in
// name order, since the store does not keep the site file's order) and the input position.
// The alert book is saved with every commit of the journal, so the two agree.
#pragma once

#include <optional>

#include "core/result.h"
#include "core/sensor_time.h"
#include "engine/site_health.h"
#include "io/state_store.h"

namespace bw::app {

struct StoredSiteHealth {
  engine::SiteHealth health;
  std::optional<core::SensorTime> as_of;  // inputs applied up to here; none before the first
};

// Fails, saying why, when the store holds no alert book yet, or one this version cannot read.
Result<StoredSiteHealth> site_health_of_store(const io::StateStore& store);

}  // namespace bw::app
