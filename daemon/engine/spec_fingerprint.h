// A fingerprint of an asset's compiled definition, to tell whether saved state still fits it.
//
// Two AssetSpecs that evaluate the same way have the same fingerprint; any change to what the
// engine computes (an input, a signal, an estimator or check parameter, a bound tag) changes
// it. Where a definition came from (file, line) and its description do not count, so moving
// an asset in the site file or editing a comment keeps the learned state. The fingerprint is
// 16 hex digits of a 64-bit FNV-1a hash over a canonical encoding of the spec; a new spec field
// must be added to the encoding (spec_fingerprint.cpp).
#pragma once

#include <string>

#include "engine/site_model.h"

namespace bw::engine {

std::string fingerprint(const AssetSpec& asset);

}  // namespace bw::engine
