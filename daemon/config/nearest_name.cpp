#include "config/nearest_name.h"

#include <algorithm>
#include <cctype>

namespace bw::config {
namespace {

std::size_t allowed_distance(std::size_t length) {
  if (length <= 4) return 1;
  if (length <= 8) return 2;
  return 3;
}

bool equal_ignoring_case(std::string_view a, std::string_view b) {
  return std::equal(a.begin(), a.end(), b.begin(), b.end(), [](char x, char y) {
    return std::tolower(static_cast<unsigned char>(x)) ==
           std::tolower(static_cast<unsigned char>(y));
  });
}

}  // namespace

std::size_t edit_distance(std::string_view a, std::string_view b) {
  const std::size_t n = a.size();
  const std::size_t m = b.size();
  // Three rows suffice: the transposition step looks two rows back.
  std::vector<std::size_t> before(m + 1), previous(m + 1), current(m + 1);
  for (std::size_t j = 0; j <= m; ++j) previous[j] = j;
  for (std::size_t i = 1; i <= n; ++i) {
    current[0] = i;
    for (std::size_t j = 1; j <= m; ++j) {
      const std::size_t cost = a[i - 1] == b[j - 1] ? 0 : 1;
      current[j] = std::min({previous[j] + 1, current[j - 1] + 1, previous[j - 1] + cost});
      if (i > 1 && j > 1 && a[i - 1] == b[j - 2] && a[i - 2] == b[j - 1]) {
        current[j] = std::min(current[j], before[j - 2] + 1);
      }
    }
    std::swap(before, previous);
    std::swap(previous, current);
  }
  return previous[m];
}

std::optional<std::string> nearest_name(std::string_view word,
                                        const std::vector<std::string_view>& candidates) {
  std::optional<std::string> best;
  std::size_t best_distance = allowed_distance(word.size()) + 1;
  for (auto candidate : candidates) {
    const std::size_t d = equal_ignoring_case(word, candidate) ? 0 : edit_distance(word, candidate);
    if (d < best_distance) {
      best_distance = d;
      best = std::string(candidate);
    }
  }
  return best;
}

std::string did_you_mean(std::string_view word, const std::vector<std::string_view>& candidates) {
  auto best = nearest_name(word, candidates);
  return best ? "; did you mean '" + *best + "'?" : std::string();
}

}  // namespace bw::config
