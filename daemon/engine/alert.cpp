#include "engine/alert.h"

namespace bw::engine {

std::string_view to_string(AlertEvent event) {
  switch (event) {
    case AlertEvent::raised:
      return "raised";
    case AlertEvent::cleared:
      return "cleared";
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

}  // namespace bw::engine
