// A plain-text account of a compiled site, for people checking what a configuration does.
//
// For each asset: its template and description, its tag bindings (tag -> role [unit]) and
// unbound optional inputs, its derived signals and estimators in evaluation order (as given by
// engine::analyse_asset(); kind, inputs, key parameters with units), and its checks (kind, what
// they watch, limit, priority). Durations are shown in the largest whole unit ("6h"). Pure,
// thread-safe; the site should be one that loaded without diagnostics.
#pragma once

#include <string>

#include "engine/site_model.h"

namespace bw::config {

std::string describe_site(const engine::SiteSpec& site);

}  // namespace bw::config
