// Writes alert transitions as JSON Lines: one object per transition, in engine order.
//
// Fields (a public interface: add, never rename): time (ISO 8601 UTC), site, asset, check,
// event ("raised" / "cleared"), priority ("low" / "medium" / "high" / "urgent"), value, unit,
// tag, message, and for look-ahead checks forecast {crossing, crossing_early, crossing_late,
// limit}. Output is buffered; flush() or destruction writes it out. A write failure is sticky
// and reported by ok().
#pragma once

#include <cstdio>
#include <filesystem>
#include <string>

#include "core/result.h"
#include "engine/alert.h"

namespace bw::io {

// The JSON object for one transition, without a trailing newline.
std::string alert_to_json(const engine::AlertTransition& transition);

class AlertLog final : public engine::AlertSink {
 public:
  // Opens (truncates) `path`; "-" means standard output.
  static Result<std::unique_ptr<AlertLog>> open(const std::filesystem::path& path);
  ~AlertLog() override;
  AlertLog(const AlertLog&) = delete;
  AlertLog& operator=(const AlertLog&) = delete;

  void on_transition(const engine::AlertTransition& transition) override;
  // Writes out what is buffered; returns false if any write so far failed.
  bool flush();
  bool ok() const { return ok_; }
  std::size_t written() const { return written_; }

 private:
  AlertLog(std::FILE* file, bool owned) : file_(file), owned_(owned) {}

  std::FILE* file_;
  bool owned_;
  bool ok_ = true;
  std::size_t written_ = 0;
  std::string line_;
};

}  // namespace bw::io
