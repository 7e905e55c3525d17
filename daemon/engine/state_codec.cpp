#include "engine/state_codec.h"

#include <algorithm>
#include <array>
#include <bit>
#include <cstring>

namespace bw::engine {
namespace {

static_assert(std::endian::native == std::endian::little || std::endian::native == std::endian::big);

template <class T>
T to_little_endian(T v) {
  if constexpr (std::endian::native == std::endian::big) {
    auto bytes = std::bit_cast<std::array<unsigned char, sizeof(T)>>(v);
    std::reverse(bytes.begin(), bytes.end());
    return std::bit_cast<T>(bytes);
  }
  return v;
}

}  // namespace

void StateWriter::put_u8(std::uint8_t v) { bytes_.push_back(static_cast<char>(v)); }

void StateWriter::put_i64(std::int64_t v) { put_u64(static_cast<std::uint64_t>(v)); }

void StateWriter::put_u64(std::uint64_t v) {
  const std::uint64_t le = to_little_endian(v);
  bytes_.append(reinterpret_cast<const char*>(&le), sizeof le);
}

void StateWriter::put_double(double v) { put_u64(std::bit_cast<std::uint64_t>(v)); }

void StateWriter::put_optional_time(const std::optional<core::SensorTime>& t) {
  put_bool(t.has_value());
  if (t) put_time(*t);
}

void StateWriter::put_string(std::string_view s) {
  put_u64(s.size());
  bytes_.append(s);
}

bool StateReader::take(void* out, std::size_t n) {
  if (!ok_ || bytes_.size() - position_ < n) {
    ok_ = false;
    std::memset(out, 0, n);
    return false;
  }
  std::memcpy(out, bytes_.data() + position_, n);
  position_ += n;
  return true;
}

std::uint8_t StateReader::get_u8() {
  std::uint8_t v = 0;
  take(&v, 1);
  return v;
}

std::uint64_t StateReader::get_u64() {
  std::uint64_t v = 0;
  take(&v, sizeof v);
  return to_little_endian(v);
}

std::int64_t StateReader::get_i64() { return static_cast<std::int64_t>(get_u64()); }

double StateReader::get_double() { return std::bit_cast<double>(get_u64()); }

std::optional<core::SensorTime> StateReader::get_optional_time() {
  if (!get_bool()) return std::nullopt;
  return get_time();
}

std::string StateReader::get_string() {
  const std::uint64_t n = get_u64();
  if (!ok_ || n > bytes_.size() - position_) {
    ok_ = false;
    return {};
  }
  std::string s(bytes_.substr(position_, n));
  position_ += n;
  return s;
}

}  // namespace bw::engine
