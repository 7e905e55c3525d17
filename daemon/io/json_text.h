// Small helpers for writing JSON text by hand: string escaping and numbers.
//
// Enough for the flat records brinewatch emits (alerts, summaries); not a general JSON library.
#pragma once

#include <string>
#include <string_view>

#include "core/sensor_time.h"

namespace bw::io {

// Appends `text` as a JSON string literal (quotes included) to `out`. Control characters are
// escaped as \uXXXX; bytes >= 0x80 are passed through (the input is expected to be UTF-8).
void append_json_string(std::string& out, std::string_view text);

// Appends a number; non-finite values become null, which JSON can represent.
void append_json_number(std::string& out, double value);

}  // namespace bw::io
