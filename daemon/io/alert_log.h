// Writes alert transitions as JSON Lines: one object per transition, in engine order.
//
// Fields (a public interface: add, never rename): time (ISO 8601 UTC), site, asset, check,
// event (see engine::AlertEvent: "raised", "cleared", "acknowledged", "shelved", ...), priority
// ("low" / "medium" / "high" / "urgent"), value, unit, tag, message, state and previous_state
// (ISA-18.2 states: "normal", "unacknowledged", ...), cause ("sample", "silence", "command",
// "shelve_expiry", "restore"), for commands who, reason and source, for look-ahead checks
// forecast {crossing, crossing_early, crossing_late, limit}, and last id (see alert_id()). Output is buffered; flush() or destruction writes it out. A write failure is sticky
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

// A stable identity for one transition: 16 hex digits of a 64-bit FNV-1a hash of site, asset,
// check, event, time and message. The same transition gets the same id live, in replay, and
// when it is published again after a reconnect, so consumers can drop duplicates.
std::string alert_id(const engine::AlertTransition& transition);

class AlertLog final : public engine::AlertSink {
 public:
  enum class Mode { truncate, append };
  enum class Hold { bounded, until_flush };
  static constexpr std::size_t kAutoFlushBytes = 1 << 20;
  // Opens `path` (emptied, or appended to); "-" means standard output.
  static Result<std::unique_ptr<AlertLog>> open(const std::filesystem::path& path,
                                                Mode mode = Mode::truncate,
                                                Hold hold = Hold::bounded);
  ~AlertLog() override;
  AlertLog(const AlertLog&) = delete;
  AlertLog& operator=(const AlertLog&) = delete;

  void on_transition(const engine::AlertTransition& transition) override;
  // Writes one JSON object of another shape (without its newline) as a line of its own.
  void write_line(std::string_view json);
  // Writes out what is buffered; returns false if any write so far failed.
  bool flush();
  bool ok() const { return ok_; }
  std::size_t written() const { return written_; }

 private:
  AlertLog(std::FILE* file, bool owned, Hold hold) : file_(file), owned_(owned), hold_(hold) {}

  std::FILE* file_;
  bool owned_;
  Hold hold_;
  bool ok_ = true;
  std::size_t written_ = 0;
  std::string held_;
};

}  // namespace bw::io
