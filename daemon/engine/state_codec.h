// A compact binary encoding for checkpoints of run-time state (estimators, checks, alerts).
//
// StateWriter appends fixed-width little-endian fields to a byte string; StateReader reads them
// back in the same order. The format carries no field names: every class that saves state
// reads it back in exactly the order it wrote it, and a class whose layout changes bumps the
// version byte it writes first. A reader never reads past the end: once a read fails (too few
// bytes, or a length that does not fit) ok() stays false and every later read returns a zero
// value, so a damaged checkpoint is detected and discarded rather than half-applied.
//
// Doubles are stored bit for bit (NaN and infinities survive), so a restored estimator
// continues exactly as the uninterrupted one would have.
#pragma once

#include <cstdint>
#include <optional>
#include <string>
#include <string_view>

#include "core/sensor_time.h"

namespace bw::engine {

class StateWriter {
 public:
  void put_u8(std::uint8_t v);
  void put_bool(bool v) { put_u8(v ? 1 : 0); }
  void put_i64(std::int64_t v);
  void put_u64(std::uint64_t v);
  void put_double(double v);
  void put_time(core::SensorTime t) { put_i64(t.time_since_epoch().count()); }
  void put_optional_time(const std::optional<core::SensorTime>& t);
  void put_string(std::string_view s);

  const std::string& bytes() const { return bytes_; }
  std::string take() { return std::move(bytes_); }

 private:
  std::string bytes_;
};

class StateReader {
 public:
  explicit StateReader(std::string_view bytes) : bytes_(bytes) {}

  std::uint8_t get_u8();
  bool get_bool() { return get_u8() != 0; }
  std::int64_t get_i64();
  std::uint64_t get_u64();
  double get_double();
  core::SensorTime get_time() { return core::SensorTime(core::Micros(get_i64())); }
  std::optional<core::SensorTime> get_optional_time();
  std::string get_string();

  // True while every read so far succeeded.
  bool ok() const { return ok_; }
  // True when every byte was consumed and every read succeeded: the state matched its reader.
  bool finished() const { return ok_ && position_ == bytes_.size(); }
  // Marks the state as unusable (e.g. a version byte the reader does not know).
  void fail() { ok_ = false; }

 private:
  bool take(void* out, std::size_t n);

  std::string_view bytes_;
  std::size_t position_ = 0;
  bool ok_ = true;
};

}  // namespace bw::engine
