#include "io/time_parse.h"

#include <cassert>
#include <chrono>

namespace bw::io {
namespace {

constexpr int kMaxFractionDigits = 9;
constexpr int kMicroDigits = 6;
constexpr std::size_t kMaxEpochIntegerDigits = 12;

bool is_digit(char c) { return c >= '0' && c <= '9'; }

// Cursor over the text. A failed read ends the whole parse, so readers never need to rewind.
class Cursor {
 public:
  explicit Cursor(std::string_view text) : text_(text) {}

  bool done() const { return pos_ == text_.size(); }
  char peek() const { return done() ? '\0' : text_[pos_]; }
  void advance() { ++pos_; }

  bool take(char c) {
    if (peek() != c) return false;
    ++pos_;
    return true;
  }

  // Exactly `count` digits as a number.
  bool digits(std::size_t count, int& out) {
    if (text_.size() - pos_ < count) return false;
    int value = 0;
    for (std::size_t i = 0; i < count; ++i) {
      const char c = text_[pos_ + i];
      if (!is_digit(c)) return false;
      value = value * 10 + (c - '0');
    }
    pos_ += count;
    out = value;
    return true;
  }

  // 1 to kMaxFractionDigits digits, scaled to microseconds (extra digits truncated).
  bool fraction_micros(int& out) {
    int value = 0;
    int count = 0;
    while (is_digit(peek())) {
      if (count == kMaxFractionDigits) return false;
      if (count < kMicroDigits) value = value * 10 + (peek() - '0');
      ++count;
      advance();
    }
    if (count == 0) return false;
    for (int i = count; i < kMicroDigits; ++i) value *= 10;
    out = value;
    return true;
  }

 private:
  std::string_view text_;
  std::size_t pos_ = 0;
};

bool valid_date(int year, int month, int day) {
  using namespace std::chrono;
  return year >= 1 &&
         year_month_day(std::chrono::year(year), std::chrono::month(static_cast<unsigned>(month)),
                        std::chrono::day(static_cast<unsigned>(day)))
             .ok();
}

// Z, +hh:mm, +hhmm, +hh (or with '-'); leaves `offset` empty when nothing follows.
bool parse_offset(Cursor& in, std::optional<int>& offset) {
  if (in.done()) return true;
  if (in.take('Z') || in.take('z')) {
    offset = 0;
    return true;
  }
  int sign = 0;
  if (in.take('+')) {
    sign = 1;
  } else if (in.take('-')) {
    sign = -1;
  } else {
    return false;
  }
  int hours = 0;
  int minutes = 0;
  if (!in.digits(2, hours) || hours > 23) return false;
  if (!in.done()) {
    in.take(':');
    if (!in.digits(2, minutes) || minutes > 59) return false;
  }
  offset = sign * (hours * 60 + minutes);
  return true;
}

}  // namespace

std::optional<IsoTime> parse_iso8601(std::string_view text) {
  Cursor in(text);
  IsoTime t;
  CivilTime& c = t.civil;
  if (!in.digits(4, c.year) || !in.take('-') || !in.digits(2, c.month) || !in.take('-') ||
      !in.digits(2, c.day)) {
    return std::nullopt;
  }
  if (!valid_date(c.year, c.month, c.day)) return std::nullopt;
  if (!in.take('T') && !in.take('t') && !in.take(' ')) return std::nullopt;
  if (!in.digits(2, c.hour) || c.hour > 23 || !in.take(':') || !in.digits(2, c.minute) ||
      c.minute > 59) {
    return std::nullopt;
  }
  if (in.take(':')) {
    if (!in.digits(2, c.second) || c.second > 59) return std::nullopt;
    if ((in.take('.') || in.take(',')) && !in.fraction_micros(c.micros)) return std::nullopt;
  }
  if (!parse_offset(in, t.offset_minutes) || !in.done()) return std::nullopt;
  return t;
}

bool looks_like_epoch_seconds(std::string_view text) {
  if (text.empty()) return false;
  for (const char ch : text) {
    if (!is_digit(ch) && ch != '.' && ch != '-') return false;
  }
  return true;
}

std::optional<core::SensorTime> parse_epoch_seconds(std::string_view text) {
  Cursor in(text);
  const bool negative = in.take('-');
  std::int64_t seconds = 0;
  std::size_t integer_digits = 0;
  while (is_digit(in.peek())) {
    if (++integer_digits > kMaxEpochIntegerDigits) return std::nullopt;
    seconds = seconds * 10 + (in.peek() - '0');
    in.advance();
  }
  if (integer_digits == 0) return std::nullopt;
  int micros = 0;
  if (in.take('.') && !in.fraction_micros(micros)) return std::nullopt;
  if (!in.done()) return std::nullopt;
  const std::int64_t total = seconds * 1'000'000 + micros;
  return core::SensorTime(core::Micros(negative ? -total : total));
}

core::Micros micros_since_epoch_as_utc(const CivilTime& civil) {
  using namespace std::chrono;
  const sys_days day = year_month_day(std::chrono::year(civil.year),
                                      std::chrono::month(static_cast<unsigned>(civil.month)),
                                      std::chrono::day(static_cast<unsigned>(civil.day)));
  return duration_cast<core::Micros>(day.time_since_epoch()) + hours(civil.hour) +
         minutes(civil.minute) + seconds(civil.second) + core::Micros(civil.micros);
}

core::SensorTime to_sensor_time(const IsoTime& time) {
  assert(time.offset_minutes.has_value());
  return core::SensorTime(micros_since_epoch_as_utc(time.civil) -
                          std::chrono::minutes(*time.offset_minutes));
}

}  // namespace bw::io
