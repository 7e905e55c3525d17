#include "io/backoff.h"

#include <cassert>
#include <cmath>

namespace bw::io {

namespace {

// Past 2^62 every ceiling is max_s anyway; capping the exponent keeps ldexp finite.
constexpr int kMaxExponent = 62;

std::uint64_t splitmix64(std::uint64_t& state) {
  state += 0x9E3779B97F4A7C15ULL;
  std::uint64_t z = state;
  z = (z ^ (z >> 30)) * 0xBF58476D1CE4E5B9ULL;
  z = (z ^ (z >> 27)) * 0x94D049BB133111EBULL;
  return z ^ (z >> 31);
}

// Uniform in [0, 1]: the top 53 bits over 2^53 - 1, so both ends are reachable.
double unit_draw(std::uint64_t& state) {
  constexpr double kScale = 1.0 / 9007199254740991.0;  // 1 / (2^53 - 1)
  return static_cast<double>(splitmix64(state) >> 11) * kScale;
}

}  // namespace

double backoff_ceiling_s(int attempt, double min_s, double max_s) {
  assert(attempt >= 0 && min_s > 0 && min_s <= max_s);
  const int exponent = attempt < kMaxExponent ? attempt : kMaxExponent;
  const double ceiling = std::ldexp(min_s, exponent);
  return ceiling < max_s ? ceiling : max_s;
}

std::uint64_t backoff_seed(std::string_view client_id) {
  std::uint64_t hash = 0xCBF29CE484222325ULL;
  for (const char c : client_id) {
    hash ^= static_cast<unsigned char>(c);
    hash *= 0x100000001B3ULL;
  }
  return hash;
}

ReconnectBackoff::ReconnectBackoff(double min_s, double max_s, std::uint64_t seed)
    : min_s_(min_s), max_s_(max_s), state_(seed) {
  assert(min_s > 0 && min_s <= max_s);
}

double ReconnectBackoff::next_delay_s() {
  const double ceiling = backoff_ceiling_s(attempt_, min_s_, max_s_);
  if (attempt_ < kMaxExponent) ++attempt_;
  return ceiling * unit_draw(state_);
}

}  // namespace bw::io
