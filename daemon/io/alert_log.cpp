#include "io/alert_log.h"

#include <cerrno>
#include <cstdio>
#include <cstring>
#include <memory>

#include "core/utc_text.h"
#include "io/json_text.h"
#include "io/stable_id.h"

namespace bw::io {

std::string alert_to_json(const engine::AlertTransition& t) {
  std::string out;
  out.reserve(256);
  auto field = [&out](std::string_view name) {
    out += out.empty() ? "{" : ",";
    append_json_string(out, name);
    out.push_back(':');
  };
  field("time");
  append_json_string(out, core::format_utc(t.time, core::UtcPrecision::milliseconds));
  field("site");
  append_json_string(out, t.site);
  field("asset");
  append_json_string(out, t.asset);
  field("check");
  append_json_string(out, t.check);
  field("event");
  append_json_string(out, engine::to_string(t.event));
  field("priority");
  append_json_string(out, engine::to_string(t.priority));
  field("value");
  append_json_number(out, t.value);
  field("unit");
  append_json_string(out, t.unit);
  field("tag");
  append_json_string(out, t.tag);
  field("message");
  append_json_string(out, t.message);
  field("state");
  append_json_string(out, engine::to_string(t.to));
  field("previous_state");
  append_json_string(out, engine::to_string(t.from));
  field("cause");
  append_json_string(out, engine::to_string(t.cause));
  for (auto [name, text] : {std::pair{"who", t.who}, {"reason", t.reason}, {"source", t.source}}) {
    if (text.empty()) continue;
    field(name);
    append_json_string(out, text);
  }
  if (t.forecast) {
    field("forecast");
    out += "{\"crossing\":";
    append_json_string(out, core::format_utc(t.forecast->crossing, core::UtcPrecision::milliseconds));
    out += ",\"crossing_early\":";
    append_json_string(out, core::format_utc(t.forecast->crossing_early, core::UtcPrecision::milliseconds));
    out += ",\"crossing_late\":";
    if (t.forecast->crossing_late) {
      append_json_string(out, core::format_utc(*t.forecast->crossing_late, core::UtcPrecision::milliseconds));
    } else {
      out += "null";
    }
    out += ",\"limit\":";
    append_json_number(out, t.forecast->limit);
    out.push_back('}');
  }
  field("id");
  append_json_string(out, alert_id(t));
  out.push_back('}');
  return out;
}

std::string alert_id(const engine::AlertTransition& t) {
  return StableId()
      .mix(t.site)
      .mix(t.asset)
      .mix(t.check)
      .mix(engine::to_string(t.event))
      .mix(std::to_string(t.time.time_since_epoch().count()))
      .mix(t.message)
      .hex();
}

Result<std::unique_ptr<AlertLog>> AlertLog::open(const std::filesystem::path& path, Mode mode,
                                                 Hold hold) {
  if (path == "-") return std::unique_ptr<AlertLog>(new AlertLog(stdout, false, hold));
  std::FILE* file = std::fopen(path.c_str(), mode == Mode::append ? "a" : "w");
  if (file == nullptr) {
    return Error{"cannot write to " + path.string() + ": " + std::strerror(errno)};
  }
  return std::unique_ptr<AlertLog>(new AlertLog(file, true, hold));
}

AlertLog::~AlertLog() {
  flush();
  if (owned_) std::fclose(file_);
}

void AlertLog::on_transition(const engine::AlertTransition& transition) {
  write_line(alert_to_json(transition));
}

void AlertLog::write_line(std::string_view json) {
  held_.append(json);
  held_.push_back('\n');
  ++written_;
  if (hold_ == Hold::bounded && held_.size() >= kAutoFlushBytes) flush();
}

bool AlertLog::flush() {
  if (!held_.empty() && std::fwrite(held_.data(), 1, held_.size(), file_) != held_.size()) {
    ok_ = false;
  }
  held_.clear();
  if (std::fflush(file_) != 0) ok_ = false;
  return ok_;
}

}  // namespace bw::io
