#include "app/command_message.h"

#include <nlohmann/json.hpp>

#include "config/quantity.h"
#include "io/json_text.h"
#include "io/time_parse.h"

namespace bw::app {
namespace {

using json = nlohmann::json;

Result<std::string> text_field(const json& object, const char* name, bool required) {
  const auto it = object.find(name);
  if (it == object.end()) {
    if (required) return Error{std::string("missing \"") + name + "\""};
    return std::string();
  }
  if (!it->is_string()) return Error{std::string("\"") + name + "\" must be text"};
  return it->get<std::string>();
}

}  // namespace

Result<engine::AlertCommand> parse_command_message(std::string_view payload, std::string source,
                                                   core::SensorTime received) {
  const json object = json::parse(payload, nullptr, /*allow_exceptions=*/false);
  if (object.is_discarded() || !object.is_object()) {
    return Error{"the command is not a JSON object"};
  }
  engine::AlertCommand command;
  auto kind_text = text_field(object, "command", true);
  if (!kind_text) return kind_text.error();
  const auto kind = engine::command_kind_from_string(kind_text.value());
  if (!kind) {
    return Error{"\"command\" must be one of acknowledge, shelve, unshelve, remove_from_service, "
                 "return_to_service, not \"" + kind_text.value() + "\""};
  }
  command.kind = *kind;
  for (auto [name, target, required] :
       {std::tuple{"asset", &command.asset, true}, {"check", &command.check, false},
        {"who", &command.who, false}, {"reason", &command.reason, false}}) {
    auto value = text_field(object, name, required);
    if (!value) return value.error();
    *target = std::move(value.value());
  }
  command.source = std::move(source);
  command.issued = received;
  auto time = text_field(object, "time", false);
  if (!time) return time.error();
  if (!time.value().empty()) {
    const auto iso = io::parse_iso8601(time.value());
    if (!iso || !iso->offset_minutes) {
      return Error{"\"time\" must be ISO 8601 with Z or an offset, not \"" + time.value() + "\""};
    }
    command.issued = io::to_sensor_time(*iso);
  }
  if (command.kind == engine::AlertCommand::Kind::shelve) {
    const auto it = object.find("duration");
    std::optional<double> seconds;
    if (it != object.end() && it->is_number()) seconds = it->get<double>();
    if (it != object.end() && it->is_string()) seconds = config::parse_duration(it->get<std::string>());
    if (!seconds) return Error{"shelve needs \"duration\", e.g. \"4h\" or 3600"};
    command.duration_s = *seconds;  // the alert book refuses non-positive ones, with a reason
  }
  return command;
}

std::string reply_payload(const engine::CommandReply& reply) {
  std::string out = std::string("{\"accepted\":") + (reply.accepted ? "true" : "false") +
                    ",\"message\":";
  io::append_json_string(out, reply.message);
  return out + "}";
}

}  // namespace bw::app
