#include "engine/site_health.h"

#include <algorithm>
#include <cassert>

namespace bw::engine {
namespace {

constexpr std::array<Priority, 4> kUrgentFirst = {Priority::urgent, Priority::high,
                                                  Priority::medium, Priority::low};

std::optional<core::SensorTime> earlier(std::optional<core::SensorTime> a,
                                        std::optional<core::SensorTime> b) {
  if (!a) return b;
  if (!b) return a;
  return std::min(*a, *b);
}

}  // namespace

std::string_view to_string(SiteStatus status) {
  switch (status) {
    case SiteStatus::normal:
      return "normal";
    case SiteStatus::attention:
      return "attention";
    case SiteStatus::visit_soon:
      return "visit soon";
    case SiteStatus::visit_now:
      return "visit now";
  }
  return "unknown";
}

std::uint32_t PriorityCounts::total() const {
  std::uint32_t sum = 0;
  for (const auto n : by_priority) sum += n;
  return sum;
}

PriorityCounts& PriorityCounts::operator+=(const PriorityCounts& other) {
  for (std::size_t i = 0; i < by_priority.size(); ++i) by_priority[i] += other.by_priority[i];
  return *this;
}

std::optional<Priority> HealthFigures::worst_active() const {
  for (const Priority p : kUrgentFirst) {
    if (active(p) > 0) return p;
  }
  return std::nullopt;
}

SiteStatus HealthFigures::status() const {
  const auto worst = worst_active();
  if (worst == Priority::urgent) return SiteStatus::visit_now;
  if (worst == Priority::high) return SiteStatus::visit_soon;
  if (worst || to_review.total() > 0) return SiteStatus::attention;
  return SiteStatus::normal;
}

void HealthFigures::count(AlertState state, Priority priority, core::SensorTime since) {
  switch (state) {
    case AlertState::normal:
      return;
    case AlertState::unacknowledged:
      ++unacknowledged[priority];
      break;
    case AlertState::acknowledged:
      ++acknowledged[priority];
      return;
    case AlertState::returned_unacknowledged:
    case AlertState::latched:
      ++to_review[priority];
      break;
    case AlertState::shelved:
      ++shelved;
      return;
    case AlertState::suppressed_by_design:
      ++suppressed;
      return;
    case AlertState::out_of_service:
      ++out_of_service;
      return;
  }
  // Still waiting for an acknowledgement.
  oldest_unacknowledged = earlier(oldest_unacknowledged, since);
}

HealthFigures& HealthFigures::operator+=(const HealthFigures& other) {
  unacknowledged += other.unacknowledged;
  acknowledged += other.acknowledged;
  to_review += other.to_review;
  shelved += other.shelved;
  suppressed += other.suppressed;
  out_of_service += other.out_of_service;
  oldest_unacknowledged = earlier(oldest_unacknowledged, other.oldest_unacknowledged);
  return *this;
}

SiteHealth roll_up_site(std::string_view site, std::span<const std::string> asset_names,
                        std::span<const AlertView> alerts) {
  SiteHealth health{.site = std::string(site), .figures = {}, .assets = {}};
  auto row_of = [&](std::string_view asset) -> AssetHealth& {
    const auto it = std::find_if(health.assets.begin(), health.assets.end(),
                                 [&](const AssetHealth& row) { return row.asset == asset; });
    if (it != health.assets.end()) return *it;
    return health.assets.emplace_back(AssetHealth{std::string(asset), {}});
  };
  for (const auto& name : asset_names) row_of(name);
  for (const AlertView& view : alerts) {
    if (view.state == AlertState::normal) continue;
    row_of(view.asset).figures.count(view.state, view.priority, view.since);
  }
  SiteStatus worst_asset = SiteStatus::normal;
  for (const AssetHealth& row : health.assets) {
    health.figures += row.figures;
    worst_asset = std::max(worst_asset, row.figures.status());
  }
  // The rule is monotone in the counts, so the site's word is its worst asset's.
  assert(health.figures.status() == worst_asset);
  return health;
}

SiteHealth roll_up_site(const AlertBook& book, const SiteSpec& spec) {
  std::vector<std::string> names;
  names.reserve(spec.assets.size());
  for (const AssetSpec& asset : spec.assets) names.push_back(asset.name);
  const std::vector<AlertView> alerts = book.not_normal();
  return roll_up_site(spec.name, names, alerts);
}

bool visit_before(const SiteHealth& a, const SiteHealth& b) {
  const HealthFigures& fa = a.figures;
  const HealthFigures& fb = b.figures;
  if (fa.status() != fb.status()) return fa.status() > fb.status();
  for (const Priority p : kUrgentFirst) {
    if (fa.active(p) != fb.active(p)) return fa.active(p) > fb.active(p);
  }
  const auto waiting = [](const HealthFigures& f) {
    return f.unacknowledged.total() + f.to_review.total();
  };
  if (waiting(fa) != waiting(fb)) return waiting(fa) > waiting(fb);
  if (fa.oldest_unacknowledged != fb.oldest_unacknowledged) {
    if (!fb.oldest_unacknowledged) return true;
    if (!fa.oldest_unacknowledged) return false;
    return *fa.oldest_unacknowledged < *fb.oldest_unacknowledged;
  }
  return a.site < b.site;
}

}  // namespace bw::engine
