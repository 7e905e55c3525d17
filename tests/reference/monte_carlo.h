// Test support: Monte Carlo average run length (ARL) of a control chart on N(shift, 1) data.
//
// Each run copies the detector fresh, feeds it standard normal values plus `shift` at 1 s spacing
// and counts observations up to and including the first signal. The summary carries the mean
// run length and its standard error, estimated from the spread of the simulated run lengths, so
// tolerances derived from it stay valid whatever number of runs is chosen.
#pragma once

#include <cmath>
#include <cstdint>

#include "../core/test_random.h"

namespace bw::test {

struct RunLengthSummary {
  double mean = 0;
  double standard_error = 0;
  int runs = 0;
  int truncated = 0;  // runs that reached max_length without a signal (should be 0)
};

// Number of runs for a case: `runs`, reduced when built with sanitizers (they slow the loop down
// about tenfold); tolerances follow from the standard error, so they remain honest.
constexpr int scaled_runs(int runs) {
#ifdef BRINEWATCH_REDUCED_SIMULATION
  return runs / 5;
#else
  return runs;
#endif
}

template <class Detector>
RunLengthSummary simulate_run_lengths(const Detector& prototype, double shift, int runs,
                                      std::uint64_t seed, int max_length = 1'000'000) {
  NormalSource noise(seed);
  double sum = 0;
  double sum_squares = 0;
  RunLengthSummary summary;
  for (int r = 0; r < runs; ++r) {
    Detector detector = prototype;
    int length = 0;
    bool signalled = false;
    while (!signalled && length < max_length) {
      ++length;
      signalled = detector.update(shift + noise(), at(length)).signal != 0;
    }
    if (!signalled) ++summary.truncated;
    sum += length;
    sum_squares += static_cast<double>(length) * length;
  }
  summary.runs = runs;
  summary.mean = sum / runs;
  const double variance = (sum_squares - sum * summary.mean) / (runs - 1);
  summary.standard_error = std::sqrt(variance / runs);
  return summary;
}

}  // namespace bw::test
