// The delay schedule between reconnect attempts: exponential backoff with full jitter.
//
// Attempt n (0 = the first retry after a connection was lost or refused) waits a delay drawn
// uniformly from [0, ceiling(n)], where ceiling(n) = min(max_s, min_s * 2^n). Spreading the
// whole interval ("full jitter") keeps a fleet of edge boxes from reconnecting in lock step
// after the broker restarts. The draw comes from a small generator of our own (splitmix64) so
// the schedule for a given seed is the same on every platform and standard library; seed it with
// backoff_seed(client_id) so two boxes with different client ids do not share a schedule.
//
// Units are seconds (double). Invariant: 0 < min_s <= max_s, checked by the constructor's
// assertion; callers validate user input before constructing.
// Thread safety: none; one owner calls next_delay_s() and reset().
#pragma once

#include <cstdint>
#include <string_view>

namespace bw::io {

// Upper bound of the delay before attempt `attempt`: min_s * 2^attempt, capped at max_s.
// REQUIRES: attempt >= 0, 0 < min_s <= max_s.
double backoff_ceiling_s(int attempt, double min_s, double max_s);

// A stable 64-bit seed from a client id (FNV-1a).
std::uint64_t backoff_seed(std::string_view client_id);

class ReconnectBackoff {
 public:
  ReconnectBackoff(double min_s, double max_s, std::uint64_t seed);

  // Delay before the next attempt, in [0, backoff_ceiling_s(attempt(), min_s, max_s)]; then
  // counts the attempt.
  double next_delay_s();

  // After a successful connection: the next delay starts again from min_s.
  void reset() { attempt_ = 0; }

  // Attempts counted since construction or the last reset().
  int attempt() const { return attempt_; }

 private:
  double min_s_;
  double max_s_;
  std::uint64_t state_;
  int attempt_ = 0;
};

}  // namespace bw::io
