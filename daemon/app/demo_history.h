// An invented history for the demo site (Dry Creek SWD 4): four days of one-minute tank
// levels, written as a wide CSV with local times (no offset), the way a site's history export
// usually looks.
//
// The story, all invented: trucks unload into the skim tank by day, and on the third morning
// two unload at once; water tank 1 cycles normally on its injection pump; on water tank 2 the
// pump's suction filter clogs on the second evening, the pump falls behind the inflow through
// the night and the level climbs toward its high level until the crew changes the filter on the
// third morning.
// Deterministic: the same call gives the same text.
#pragma once

#include <string>

namespace bw::app {

std::string make_demo_history();

}  // namespace bw::app
