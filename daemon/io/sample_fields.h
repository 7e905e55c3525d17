// Reading the value and quality fields of a history row.
//
// value:   a decimal number as std::from_chars reads it (e.g. "12.5", "-3e-2"), after removing
//          blanks and enclosing quotes. Empty, partial ("12.5x") or out-of-range text is
//          bad_value; "nan", "inf" and friends are not_finite.
// quality: empty -> good; the words good / uncertain / bad in any ASCII case; or a number
//          0-65535, the quality word of OPC-style sources, judged by the top two bits of its low
//          byte: 11 good, 01 and 10 uncertain, 00 bad (low byte >= 192 good, 64-191 uncertain,
//          < 64 bad). Anything else is bad_quality.
// Both return std::nullopt on success and the problem otherwise; `out` is written only on
// success.
//
// Thread safety: pure functions.
#pragma once

#include <optional>
#include <string_view>

#include "engine/sample.h"
#include "io/history_stats.h"

namespace bw::io {

std::optional<RowProblemKind> parse_sample_value(std::string_view field, double& out);

std::optional<RowProblemKind> parse_sample_quality(std::string_view field, engine::Quality& out);

}  // namespace bw::io
