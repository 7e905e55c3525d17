// Test helpers: find a named asset, check, estimator or signal in a compiled site, failing the
// test (not crashing) when it is absent.
#pragma once

#include <gtest/gtest.h>

#include <algorithm>
#include <string>
#include <string_view>
#include <variant>
#include <vector>

#include "engine/site_model.h"

namespace bw::config::testing {

template <class T>
const T* find_named(const std::vector<T>& items, std::string_view name) {
  auto it = std::find_if(items.begin(), items.end(), [&](const T& t) { return t.name == name; });
  return it == items.end() ? nullptr : &*it;
}

inline const engine::AssetSpec& asset(const engine::SiteSpec& site, std::string_view name) {
  const auto* found = find_named(site.assets, name);
  if (found == nullptr) throw std::runtime_error("no asset " + std::string(name));
  return *found;
}

// The kind-specific part of a named check or estimator, e.g. check<LimitCheckSpec>(a, "x").
template <class Kind>
const Kind& check(const engine::AssetSpec& asset, std::string_view name) {
  const auto* found = find_named(asset.checks, name);
  if (found == nullptr) throw std::runtime_error("no check " + std::string(name));
  return std::get<Kind>(found->kind);
}

template <class Kind>
const Kind& estimator(const engine::AssetSpec& asset, std::string_view name) {
  const auto* found = find_named(asset.estimators, name);
  if (found == nullptr) throw std::runtime_error("no estimator " + std::string(name));
  return std::get<Kind>(found->kind);
}

inline const engine::InputSpec& input(const engine::AssetSpec& asset, std::string_view role) {
  auto it = std::find_if(asset.inputs.begin(), asset.inputs.end(),
                         [&](const engine::InputSpec& i) { return i.role == role; });
  if (it == asset.inputs.end()) throw std::runtime_error("no input " + std::string(role));
  return *it;
}

// All diagnostics, formatted, for failure messages.
inline std::string dump(const std::vector<Diagnostic>& diagnostics) {
  std::string out;
  for (const auto& d : diagnostics) out += format_diagnostic(d) + "\n";
  return out;
}

}  // namespace bw::config::testing
