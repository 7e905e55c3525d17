// The site health roll-up: from the alerts of one site, which of its assets need a person, how
// badly, and since when, and one status word for the site, so that a lease operator driving a
// route (or an engineer looking after many sites) knows which site to visit first.
//
// What counts, by the alert's ISA-18.2 / IEC 62682 state (EEMUA 191 uses the same lifecycle):
//
//   state                    | counted as      | why
//   -------------------------+-----------------+----------------------------------------------
//   unacknowledged           | unacknowledged  | the condition is active and nobody has seen it
//   acknowledged             | acknowledged    | the condition is active; seen, not yet resolved
//   returned_unacknowledged  | to review       | the condition cleared before anybody saw it
//   latched                  | to review       | cleared, but configured to wait for a person
//   shelved                  | shelved         | a person set it aside for a limited time
//   suppressed_by_design     | suppressed      | a configured condition (e.g. pump stopped) holds
//   out_of_service           | out of service  | taken out of service (maintenance)
//   normal                   | not counted     |
//
// "Active" below means unacknowledged or acknowledged. Unacknowledged, acknowledged and to-review
// alerts are counted by priority; shelved, suppressed and out-of-service alerts are counted in
// total only and never raise the status or the visit order: setting an alert aside is a
// person's decision that it does not call for a visit now.
//
// Status word (per asset and for the site, from that scope's counts), the first rule that holds:
//   "visit now"   an active alert of urgent priority;
//   "visit soon"  an active alert of high priority;
//   "attention"   an active alert of medium or low priority, or any alert to review;
//   "normal"      otherwise (also when everything not normal is shelved, suppressed or out
//                 of service).
// An acknowledged alert keeps its weight: acknowledging says someone knows, not that the tank,
// pump or well is fine again. An alert to review never makes more than "attention": its
// condition has cleared, and it can be acknowledged from afar.
//
// The oldest unacknowledged time is the earliest time at which an alert still waiting for an
// acknowledgement (unacknowledged, returned unacknowledged or latched) entered that state.
//
// Assets: one row for every asset of the site, in site-file order, even when all its alerts
// are normal; then one row for each other asset that has an alert not normal (the daemon's own
// alerts on Engine::kDaemonAsset), in the order the book lists them. The site's figures are the
// sum over every row.
//
// Pure and deterministic: no clock, no I/O. Invariants: every count is the number of alerts in
// that state; the site's figures are the sum of its rows, and its status word is the worst of
// its rows' (asserted in roll_up_site).
#pragma once

#include <array>
#include <cstdint>
#include <optional>
#include <span>
#include <string>
#include <string_view>
#include <vector>

#include "core/sensor_time.h"
#include "engine/alert_book.h"
#include "engine/site_model.h"

namespace bw::engine {

// Ordered: a larger value asks for a visit sooner.
enum class SiteStatus : std::uint8_t { normal = 0, attention = 1, visit_soon = 2, visit_now = 3 };

// "normal", "attention", "visit soon", "visit now".
std::string_view to_string(SiteStatus status);

// Alerts counted by priority: index 0 low, 1 medium, 2 high, 3 urgent.
struct PriorityCounts {
  std::array<std::uint32_t, 4> by_priority{};

  std::uint32_t& operator[](Priority p) { return by_priority[static_cast<std::size_t>(p) - 1]; }
  std::uint32_t operator[](Priority p) const {
    return by_priority[static_cast<std::size_t>(p) - 1];
  }
  std::uint32_t total() const;
  PriorityCounts& operator+=(const PriorityCounts& other);
  bool operator==(const PriorityCounts&) const = default;
};

// The figures of one scope (an asset, or the whole site).
struct HealthFigures {
  PriorityCounts unacknowledged;  // active, not acknowledged
  PriorityCounts acknowledged;    // active, acknowledged
  PriorityCounts to_review;       // returned unacknowledged or latched
  std::uint32_t shelved = 0;
  std::uint32_t suppressed = 0;
  std::uint32_t out_of_service = 0;
  std::optional<core::SensorTime> oldest_unacknowledged;

  // The status word by the rule in the file comment.
  SiteStatus status() const;
  // The highest priority among active alerts; none when nothing is active.
  std::optional<Priority> worst_active() const;
  // Active alerts (unacknowledged + acknowledged) of one priority.
  std::uint32_t active(Priority p) const { return unacknowledged[p] + acknowledged[p]; }
  // Adds one alert in `state` (normal adds nothing).
  void count(AlertState state, Priority priority, core::SensorTime since);
  HealthFigures& operator+=(const HealthFigures& other);
  bool operator==(const HealthFigures&) const = default;
};

struct AssetHealth {
  std::string asset;
  HealthFigures figures;
  bool operator==(const AssetHealth&) const = default;
};

struct SiteHealth {
  std::string site;
  HealthFigures figures;  // the whole site
  std::vector<AssetHealth> assets;
  bool operator==(const SiteHealth&) const = default;
};

// The roll-up of `alerts` (AlertBook::not_normal(); normal views are ignored). `asset_names` are
// the site's assets in the order they are listed first.
SiteHealth roll_up_site(std::string_view site, std::span<const std::string> asset_names,
                        std::span<const AlertView> alerts);
SiteHealth roll_up_site(const AlertBook& book, const SiteSpec& spec);

// Visit order: true when site `a` should be visited before site `b`. A strict weak ordering,
// comparing in turn (the first difference decides):
//   1. status, "visit now" first;
//   2. active alerts by priority, urgent first: more urgent ones first, then more high ones,
//      then medium, then low;
//   3. more alerts waiting for an acknowledgement (unacknowledged and to review) first;
//   4. the older oldest unacknowledged alert first; a site with none after one with some;
//   5. site name, alphabetical.
// Sites equal in all five are ties; sort with std::stable_sort to keep their given order.
bool visit_before(const SiteHealth& a, const SiteHealth& b);

}  // namespace bw::engine
