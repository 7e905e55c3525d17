// A crew command arriving over MQTT, and the reply that goes back.
//
// Topic: <commands topic with its last level the sending client's id>, e.g.
// "brinewatch/dry-creek-swd4/commands/ops-tablet-1"; the broker's ACL lets each client publish
// only under its own id, so the last level says who sent it. Payload (JSON object):
//   {"command": "acknowledge" | "shelve" | "unshelve" | "remove_from_service" |
//               "return_to_service",
//    "asset": "water_tank_2", "check": "overflow_ahead" (omit for every alert of the asset),
//    "who": "Dana Ortiz", "reason": "on my way", "duration": "4h" (shelve: seconds or a
//    number with s, min, h, d), "time": ISO 8601 (optional; default: when it arrived)}
// The reply, published to <reply prefix>/<client id>: {"accepted": bool, "message": "..."} .
// A payload that cannot be read is refused with a reason and changes nothing.
#pragma once

#include <string>
#include <string_view>

#include "core/result.h"
#include "engine/alert_command.h"

namespace bw::app {

// `source` is "mqtt:<client id>"; `received` is used when the payload carries no time.
Result<engine::AlertCommand> parse_command_message(std::string_view payload, std::string source,
                                                   core::SensorTime received);

std::string reply_payload(const engine::CommandReply& reply);

}  // namespace bw::app
