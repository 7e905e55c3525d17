// Records (engine/asset_record.h) as JSON: one object per record, and a JSON Lines file of them.
//
// Fields (a public interface: add, never rename): time (ISO 8601 UTC: when the event happened,
// or the period's end), site, asset, source (the estimator or record spec that produced it),
// kind, period_start (ISO 8601 UTC, or null for an event), fields (an object keyed by field
// name, in the producer's order, each {"value": number or null, "unit": text}), and id
// (record_id()).
#pragma once

#include <filesystem>
#include <memory>
#include <string>

#include "core/result.h"
#include "engine/alert.h"
#include "engine/asset_record.h"
#include "io/alert_log.h"

namespace bw::io {

// The JSON object for one record, without a trailing newline.
std::string record_to_json(const engine::AssetRecord& record);

// A stable identity (io/stable_id.h) of site, asset, source, kind and time: the same record gets
// the same id live, in replay and when it is sent again.
std::string record_id(const engine::AssetRecord& record);

// Writes every record it receives as one line; ignores alert transitions. Buffering, holding
// and failure reporting are AlertLog's (alert_log.h).
class RecordLog final : public engine::AlertSink {
 public:
  static Result<std::unique_ptr<RecordLog>> open(const std::filesystem::path& path,
                                                 AlertLog::Mode mode, AlertLog::Hold hold);

  void on_transition(const engine::AlertTransition&) override {}
  void on_record(const engine::AssetRecord& record) override;
  bool flush() { return file_->flush(); }
  std::size_t written() const { return file_->written(); }

 private:
  explicit RecordLog(std::unique_ptr<AlertLog> file) : file_(std::move(file)) {}

  std::unique_ptr<AlertLog> file_;
};

}  // namespace bw::io
