#include "io/sample_fields.h"

#include <algorithm>
#include <charconv>
#include <cmath>
#include <cstdint>
#include <system_error>

#include "io/csv_fields.h"

namespace bw::io {
namespace {

constexpr unsigned kMaxQualityWord = 0xFFFF;
constexpr unsigned kGoodBits = 0xC0;
constexpr unsigned kQualityBitsMask = 0xC0;

bool same_word(std::string_view text, std::string_view lower_word) {
  return std::equal(text.begin(), text.end(), lower_word.begin(), lower_word.end(),
                    [](char c, char w) { return (c >= 'A' && c <= 'Z' ? c - 'A' + 'a' : c) == w; });
}

}  // namespace

std::optional<RowProblemKind> parse_sample_value(std::string_view field, double& out) {
  field = tidy_field(field);
  if (field.empty()) return RowProblemKind::bad_value;
  const char* const last = field.data() + field.size();
  double value = 0;
  const auto [end, error] = std::from_chars(field.data(), last, value);
  if (error != std::errc() || end != last) return RowProblemKind::bad_value;
  if (!std::isfinite(value)) return RowProblemKind::not_finite;
  out = value;
  return std::nullopt;
}

std::optional<RowProblemKind> parse_sample_quality(std::string_view field, engine::Quality& out) {
  field = tidy_field(field);
  if (field.empty() || same_word(field, "good")) {
    out = engine::Quality::good;
  } else if (same_word(field, "uncertain")) {
    out = engine::Quality::uncertain;
  } else if (same_word(field, "bad")) {
    out = engine::Quality::bad;
  } else {
    const char* const last = field.data() + field.size();
    unsigned word = 0;
    const auto [end, error] = std::from_chars(field.data(), last, word);
    if (error != std::errc() || end != last || word > kMaxQualityWord) {
      return RowProblemKind::bad_quality;
    }
    const unsigned bits = word & kQualityBitsMask;
    out = bits == kGoodBits ? engine::Quality::good
          : bits == 0       ? engine::Quality::bad
                            : engine::Quality::uncertain;
  }
  return std::nullopt;
}

}  // namespace bw::io
