#include "io/record_log.h"

#include "core/utc_text.h"
#include "io/json_text.h"
#include "io/stable_id.h"

namespace bw::io {
namespace {

void append_time(std::string& out, core::SensorTime t) {
  append_json_string(out, core::format_utc(t, core::UtcPrecision::milliseconds));
}

}  // namespace

std::string record_to_json(const engine::AssetRecord& record) {
  const engine::RecordContent& content = record.content;
  std::string out = "{\"time\":";
  append_time(out, content.time);
  out += ",\"site\":";
  append_json_string(out, record.site);
  out += ",\"asset\":";
  append_json_string(out, record.asset);
  out += ",\"source\":";
  append_json_string(out, record.source);
  out += ",\"kind\":";
  append_json_string(out, content.kind);
  out += ",\"period_start\":";
  if (content.period_start) {
    append_time(out, *content.period_start);
  } else {
    out += "null";
  }
  out += ",\"fields\":{";
  for (std::size_t i = 0; i < content.fields.size(); ++i) {
    const engine::RecordField& field = content.fields[i];
    if (i > 0) out.push_back(',');
    append_json_string(out, field.name);
    out += ":{\"value\":";
    append_json_number(out, field.value);
    out += ",\"unit\":";
    append_json_string(out, field.unit);
    out.push_back('}');
  }
  out += "},\"id\":";
  append_json_string(out, record_id(record));
  out.push_back('}');
  return out;
}

std::string record_id(const engine::AssetRecord& record) {
  return StableId()
      .mix(record.site)
      .mix(record.asset)
      .mix(record.source)
      .mix(record.content.kind)
      .mix(std::to_string(record.content.time.time_since_epoch().count()))
      .hex();
}

Result<std::unique_ptr<RecordLog>> RecordLog::open(const std::filesystem::path& path,
                                                   AlertLog::Mode mode, AlertLog::Hold hold) {
  auto file = AlertLog::open(path, mode, hold);
  if (!file) return file.error();
  return std::unique_ptr<RecordLog>(new RecordLog(std::move(file.value())));
}

void RecordLog::on_record(const engine::AssetRecord& record) {
  file_->write_line(record_to_json(record));
}

}  // namespace bw::io
