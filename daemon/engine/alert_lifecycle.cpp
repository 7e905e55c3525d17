#include "engine/alert_lifecycle.h"

#include "core/utc_text.h"

#include <cassert>
#include <chrono>
#include <cmath>
#include <cstdio>

#include "engine/alert.h"

namespace bw::engine {
namespace {

constexpr std::uint8_t kStateVersion = 1;

bool is_underlying(AlertState s) {
  return s == AlertState::normal || s == AlertState::unacknowledged ||
         s == AlertState::acknowledged || s == AlertState::returned_unacknowledged ||
         s == AlertState::latched;
}

// Shortest form that reads back the same, so a person sees "3600" rather than "3600.000000".
std::string seconds_text(double s) {
  char buffer[32];
  std::snprintf(buffer, sizeof buffer, "%.15g", s);
  return buffer;
}

core::SensorTime shelve_end(const ShelveRequest& request) {
  return request.issued +
         std::chrono::round<core::Micros>(std::chrono::duration<double>(request.duration_s));
}

}  // namespace

std::string_view to_string(AlertState state) {
  switch (state) {
    case AlertState::normal:
      return "normal";
    case AlertState::unacknowledged:
      return "unacknowledged";
    case AlertState::acknowledged:
      return "acknowledged";
    case AlertState::returned_unacknowledged:
      return "returned_unacknowledged";
    case AlertState::latched:
      return "latched";
    case AlertState::shelved:
      return "shelved";
    case AlertState::suppressed_by_design:
      return "suppressed_by_design";
    case AlertState::out_of_service:
      return "out_of_service";
  }
  return "unknown";
}

std::optional<std::string> shelve_refusal(const ShelveRequest& request, core::SensorTime now,
                                          double max_shelve_s) {
  assert(std::isfinite(max_shelve_s));
  // Written so that NaN fails too.
  if (!(request.duration_s > 0)) {
    return "shelve duration must be positive (got " + seconds_text(request.duration_s) + " s)";
  }
  if (request.duration_s > max_shelve_s) {
    return "shelve duration " + seconds_text(request.duration_s) + " s is over the maximum of " +
           seconds_text(max_shelve_s) + " s";
  }
  const core::SensorTime until = shelve_end(request);
  if (until <= now) {
    return "shelve until " + core::format_utc(until) + " would already have run out (now " +
           core::format_utc(now) + ")";
  }
  return std::nullopt;
}

AlertState AlertLifecycle::state() const {
  if (out_of_service_) return AlertState::out_of_service;
  if (suppressed_) return AlertState::suppressed_by_design;
  if (shelve_) return AlertState::shelved;
  return underlying_;
}

bool AlertLifecycle::consistent() const {
  if (hidden()) return true;
  const bool shows_active =
      underlying_ == AlertState::unacknowledged || underlying_ == AlertState::acknowledged;
  return shows_active == active_;
}

void AlertLifecycle::reveal() {
  if (!hidden()) underlying_ = active_ ? AlertState::unacknowledged : AlertState::normal;
}

std::optional<LifecycleChange> AlertLifecycle::set_condition(bool active) {
  if (active == active_) return std::nullopt;
  active_ = active;
  if (hidden()) return std::nullopt;
  const AlertState from = underlying_;
  if (active) {
    underlying_ = AlertState::unacknowledged;
  } else if (underlying_ == AlertState::acknowledged) {
    underlying_ = AlertState::normal;
  } else {
    underlying_ = latching_ ? AlertState::latched : AlertState::returned_unacknowledged;
  }
  assert(consistent());
  return LifecycleChange{from, underlying_, active ? AlertEvent::raised : AlertEvent::cleared};
}

std::optional<LifecycleChange> AlertLifecycle::set_suppressed(bool suppressed) {
  if (suppressed == suppressed_) return std::nullopt;
  const AlertState from = state();
  suppressed_ = suppressed;
  if (out_of_service_) return std::nullopt;
  reveal();
  return LifecycleChange{from, state(),
                         suppressed ? AlertEvent::suppressed : AlertEvent::unsuppressed};
}

Result<LifecycleChange> AlertLifecycle::acknowledge() {
  const AlertState from = state();
  switch (from) {
    case AlertState::unacknowledged:
      underlying_ = AlertState::acknowledged;
      break;
    case AlertState::returned_unacknowledged:
    case AlertState::latched:
      underlying_ = AlertState::normal;
      break;
    default:
      return Error{"nothing to acknowledge: the alert is " + std::string(to_string(from))};
  }
  assert(consistent());
  return LifecycleChange{from, underlying_, AlertEvent::acknowledged};
}

Result<LifecycleChange> AlertLifecycle::shelve(const ShelveRequest& request, core::SensorTime now,
                                               double max_shelve_s) {
  if (auto why = shelve_refusal(request, now, max_shelve_s)) return Error{std::move(*why)};
  const AlertState from = state();
  shelve_ = Shelve{shelve_end(request), request.who, request.reason, request.source};
  return LifecycleChange{from, state(), AlertEvent::shelved};
}

LifecycleChange AlertLifecycle::end_shelve(AlertEvent event) {
  const AlertState from = state();
  shelve_.reset();
  reveal();
  return LifecycleChange{from, state(), event};
}

Result<LifecycleChange> AlertLifecycle::unshelve() {
  if (!shelve_)
    return Error{"the alert is not shelved (it is " + std::string(to_string(state())) + ")"};
  return end_shelve(AlertEvent::unshelved);
}

std::optional<LifecycleChange> AlertLifecycle::expire_shelve(core::SensorTime now) {
  if (!shelve_ || shelve_->until > now) return std::nullopt;
  return end_shelve(AlertEvent::shelve_expired);
}

Result<LifecycleChange> AlertLifecycle::remove_from_service() {
  if (out_of_service_) return Error{"the alert is already out of service"};
  const AlertState from = state();
  out_of_service_ = true;
  return LifecycleChange{from, state(), AlertEvent::removed_from_service};
}

Result<LifecycleChange> AlertLifecycle::return_to_service() {
  if (!out_of_service_) return Error{"the alert is already in service"};
  const AlertState from = state();
  out_of_service_ = false;
  reveal();
  return LifecycleChange{from, state(), AlertEvent::returned_to_service};
}

void AlertLifecycle::save(StateWriter& out) const {
  out.put_u8(kStateVersion);
  out.put_u8(static_cast<std::uint8_t>(underlying_));
  out.put_bool(active_);
  out.put_bool(suppressed_);
  out.put_bool(out_of_service_);
  out.put_bool(shelve_.has_value());
  if (shelve_) {
    out.put_time(shelve_->until);
    out.put_string(shelve_->who);
    out.put_string(shelve_->reason);
    out.put_string(shelve_->source);
  }
}

bool AlertLifecycle::load(StateReader& in) {
  if (in.get_u8() != kStateVersion) {
    in.fail();
    return false;
  }
  AlertLifecycle restored(latching_);
  restored.underlying_ = static_cast<AlertState>(in.get_u8());
  restored.active_ = in.get_bool();
  restored.suppressed_ = in.get_bool();
  restored.out_of_service_ = in.get_bool();
  if (in.get_bool()) {
    Shelve s;
    s.until = in.get_time();
    s.who = in.get_string();
    s.reason = in.get_string();
    s.source = in.get_string();
    restored.shelve_ = std::move(s);
  }
  if (!in.ok() || !is_underlying(restored.underlying_) || !restored.consistent()) {
    in.fail();
    return false;
  }
  *this = std::move(restored);
  return true;
}

}  // namespace bw::engine
