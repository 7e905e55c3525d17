// Spelling suggestions for unknown names ("did you mean 'time_constant'?").
//
// Distances are optimal-string-alignment edit distances (Levenshtein with adjacent
// transpositions counted as one edit, each substring edited at most once). A suggestion is made
// only when the candidate is close for the length of the word: at most 1 edit for words of up to
// 4 characters, 2 up to 8, 3 beyond; a candidate equal but for letter case always qualifies.
// Pure functions, thread-safe.
#pragma once

#include <cstddef>
#include <optional>
#include <string>
#include <string_view>
#include <vector>

namespace bw::config {

std::size_t edit_distance(std::string_view a, std::string_view b);

// The closest candidate within the allowed distance (the first one on a tie), or nothing.
std::optional<std::string> nearest_name(std::string_view word,
                                        const std::vector<std::string_view>& candidates);

// "; did you mean 'x'?" when nearest_name finds one, else an empty string.
std::string did_you_mean(std::string_view word, const std::vector<std::string_view>& candidates);

}  // namespace bw::config
