// The lifecycle of one alert (one check of one asset): the ISA-18.2 / IEC 62682 alarm states and
// the rules that move between them.
//
// AlertLifecycle holds the process condition as last reported (active or clear), the state the
// crews see, whether the alert latches (configuration), the shelve (expiry, who, why, from
// where), suppression by design and out of service. It knows no names and no clock: every time
// is an argument, and the caller (AlertBook) turns each accepted change into a journaled
// transition.
//
// State model (ISA-18.2 / IEC 62682 alarm states; "active"/"clear" is the process condition):
//
// from                      | happening           | to                       | event
// --------------------------+---------------------+--------------------------+---------------------
// normal                    | condition active    | unacknowledged           | raised
// unacknowledged            | acknowledge         | acknowledged             | acknowledged
// unacknowledged            | condition clear     | returned_unacknowledged  | cleared
// unacknowledged (latching) | condition clear     | latched                  | cleared
// acknowledged              | condition clear     | normal                   | cleared
// returned_unacknowledged   | acknowledge         | normal                   | acknowledged
// returned_unacknowledged   | condition active    | unacknowledged           | raised
// latched                   | acknowledge         | normal                   | acknowledged
// latched                   | condition active    | unacknowledged           | raised
// any                       | shelve              | shelved (1)              | shelved
// shelved                   | unshelve            | (2)                      | unshelved
// shelved                   | shelve runs out     | (2)                      | shelve_expired
// any                       | suppression begins  | suppressed_by_design (1) | suppressed
// suppressed_by_design      | suppression ends    | (2)                      | unsuppressed
// any in service            | remove from service | out_of_service           | removed_from_service
// out_of_service            | return to service   | (2)                      | returned_to_service
//
//   (1) Precedence: out_of_service > suppressed_by_design > shelved. When a state of higher
//       precedence holds, the shown state stays and the new shelve or suppression shows once
//       that state ends.
//   (2) The next state by precedence that still holds; else unacknowledged when the condition
//       is active, else normal (the crews see a still-active condition again as new).
//
// While shelved, suppressed or out of service the condition is still tracked, so the return is
// right, but no raised/cleared change is reported for it; likewise a suppression change hidden
// behind out_of_service is tracked silently. Every accepted command reports a change, even when
// the shown state stays (a shelve placed on an out-of-service alert). A condition or suppression
// report that repeats the current one reports nothing.
//
// Refusals (nothing changes; the Error says why, for a person): acknowledge when nothing is
// unacknowledged, returned unacknowledged or latched; unshelve when not shelved; return to
// service when in service; remove from service when already out; shelve with a duration that is
// not positive, over the maximum, or that would already have run out.
//
// Invariant: when no shelve, suppression or out-of-service hides it, the underlying state is
// unacknowledged or acknowledged exactly when the condition is active (asserted).
// Not thread-safe: owned by the engine's thread.
#pragma once

#include <cstdint>
#include <optional>
#include <string>
#include <string_view>

#include "core/result.h"
#include "core/sensor_time.h"
#include "engine/state_codec.h"

namespace bw::engine {

enum class AlertEvent : std::uint8_t;  // engine/alert.h

// ISA-18.2 / IEC 62682 alarm states. Wire and disk values: do not renumber.
enum class AlertState : std::uint8_t {
  normal = 0,
  unacknowledged = 1,
  acknowledged = 2,
  returned_unacknowledged = 3,
  latched = 4,
  shelved = 5,
  suppressed_by_design = 6,
  out_of_service = 7,
};

// "normal", "unacknowledged", ..., "out_of_service" (the enumerator names).
std::string_view to_string(AlertState state);

// An accepted change: the shown state before and after, and the event to journal.
struct LifecycleChange {
  AlertState from = AlertState::normal;
  AlertState to = AlertState::normal;
  AlertEvent event;
};

struct ShelveRequest {
  core::SensorTime issued;  // when the person asked; the shelve runs from here
  double duration_s = 0;
  std::string who;
  std::string reason;
  std::string source;
};

struct Shelve {
  core::SensorTime until;
  std::string who;
  std::string reason;
  std::string source;
};

// Why `request` cannot be accepted at `now` (duration not positive or NaN, over `max_shelve_s`,
// or running out at or before `now`), or nothing when it can. REQUIRES: max_shelve_s finite.
std::optional<std::string> shelve_refusal(const ShelveRequest& request, core::SensorTime now,
                                          double max_shelve_s);


class AlertLifecycle {
 public:
  explicit AlertLifecycle(bool latching = false) : latching_(latching) {}

  AlertState state() const;
  bool condition_active() const { return active_; }
  bool latching() const { return latching_; }
  bool suppressed() const { return suppressed_; }
  bool out_of_service() const { return out_of_service_; }
  const std::optional<Shelve>& shelve() const { return shelve_; }
  // Configuration changed: applies from the next time the condition clears.
  void set_latching(bool latching) { latching_ = latching; }

  // Process side: the check's condition or its suppression by design as now reported.
  std::optional<LifecycleChange> set_condition(bool active);
  std::optional<LifecycleChange> set_suppressed(bool suppressed);

  // Operator side: the change, or an Error with the reason of the refusal.
  Result<LifecycleChange> acknowledge();
  Result<LifecycleChange> shelve(const ShelveRequest& request, core::SensorTime now,
                                 double max_shelve_s);
  Result<LifecycleChange> unshelve();
  Result<LifecycleChange> remove_from_service();
  Result<LifecycleChange> return_to_service();

  // Time passes: ends a shelve whose expiry is at or before `now`.
  std::optional<LifecycleChange> expire_shelve(core::SensorTime now);

  // State only: latching is configuration and is kept from the constructor on load. load()
  // changes nothing unless the whole record reads back valid.
  void save(StateWriter& out) const;
  bool load(StateReader& in);

 private:
  bool hidden() const { return out_of_service_ || suppressed_ || shelve_.has_value(); }
  // Called after a hiding state ended: a still-active condition shows as new.
  void reveal();
  bool consistent() const;
  LifecycleChange end_shelve(AlertEvent event);

  bool latching_;
  bool active_ = false;
  AlertState underlying_ = AlertState::normal;  // one of the first five states
  bool suppressed_ = false;
  bool out_of_service_ = false;
  std::optional<Shelve> shelve_;
};

}  // namespace bw::engine
