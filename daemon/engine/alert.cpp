#include "engine/alert.h"

namespace bw::engine {

std::string_view to_string(AlertEvent event) {
  switch (event) {
    case AlertEvent::raised:
      return "raised";
    case AlertEvent::cleared:
      return "cleared";
    case AlertEvent::acknowledged:
      return "acknowledged";
    case AlertEvent::shelved:
      return "shelved";
    case AlertEvent::unshelved:
      return "unshelved";
    case AlertEvent::shelve_expired:
      return "shelve_expired";
    case AlertEvent::suppressed:
      return "suppressed";
    case AlertEvent::unsuppressed:
      return "unsuppressed";
    case AlertEvent::removed_from_service:
      return "removed_from_service";
    case AlertEvent::returned_to_service:
      return "returned_to_service";
    case AlertEvent::command_refused:
      return "command_refused";
  }
  return "unknown";
}

std::string_view to_string(TransitionCause cause) {
  switch (cause) {
    case TransitionCause::sample:
      return "sample";
    case TransitionCause::silence:
      return "silence";
    case TransitionCause::command:
      return "command";
    case TransitionCause::shelve_expiry:
      return "shelve_expiry";
    case TransitionCause::restore:
      return "restore";
  }
  return "unknown";
}

std::string_view to_string(Priority priority) {
  switch (priority) {
    case Priority::low:
      return "low";
    case Priority::medium:
      return "medium";
    case Priority::high:
      return "high";
    case Priority::urgent:
      return "urgent";
  }
  return "unknown";
}

std::optional<Priority> priority_from_string(std::string_view name) {
  for (const Priority p : {Priority::low, Priority::medium, Priority::high, Priority::urgent}) {
    if (to_string(p) == name) return p;
  }
  return std::nullopt;
}

}  // namespace bw::engine
