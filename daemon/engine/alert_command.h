// A person's command on alerts, and the reply that goes back to them.
//
// Every path that lets a person act on alerts (MQTT, text messages, a replayed command file)
// builds an AlertCommand and hands it to AlertBook::execute(), the one command interface. The
// command carries who sent it, from where, when and why, so the journal can say so.
#pragma once

#include <array>
#include <cstddef>
#include <cstdint>
#include <optional>
#include <string>
#include <string_view>

#include "core/sensor_time.h"

namespace bw::engine {

struct AlertCommand {
  // Wire value (command payloads and the journal use the names of to_string()): do not rename
  // or renumber.
  enum class Kind : std::uint8_t {
    acknowledge,
    shelve,
    unshelve,
    remove_from_service,
    return_to_service
  };
  Kind kind = Kind::acknowledge;
  std::string asset;
  std::string check;        // empty: every alert of the asset (e.g. an asset under maintenance)
  std::string who;          // person
  std::string reason;       // free text
  std::string source;       // where it came from, e.g. "mqtt:client-7", "sms:+15550100", "replay"
  core::SensorTime issued;  // when the person issued it
  double duration_s = 0;    // shelve only
};

struct CommandReply {
  bool accepted = false;
  std::string message;  // for a person
};

inline constexpr std::array<std::string_view, 5> kCommandKindNames = {
    "acknowledge", "shelve", "unshelve", "remove_from_service", "return_to_service"};

// "acknowledge", "shelve", "unshelve", "remove_from_service", "return_to_service".
inline std::string_view to_string(AlertCommand::Kind kind) {
  return kCommandKindNames.at(static_cast<std::size_t>(kind));
}

// The inverse of to_string(); nothing for any other text (exact, case-sensitive match).
inline std::optional<AlertCommand::Kind> command_kind_from_string(std::string_view text) {
  for (std::size_t i = 0; i < kCommandKindNames.size(); ++i) {
    if (kCommandKindNames[i] == text) return static_cast<AlertCommand::Kind>(i);
  }
  return std::nullopt;
}

}  // namespace bw::engine
