// Prints the cost of one update of each estimator in the core, in nanoseconds (median of several
// repetitions of a long loop over pre-generated values, thread CPU time). Figures only; nothing is
// asserted.
#include <algorithm>
#include <array>
#include <cstdint>
#include <cstdio>
#include <ctime>
#include <vector>

#include "../core/test_random.h"
#include "core/cusum.h"
#include "core/ewma.h"
#include "core/episode.h"
#include "core/ewma_chart.h"
#include "core/filter_life.h"
#include "core/rate_of_change.h"
#include "core/rls.h"
#include "core/trend.h"

namespace {

using bw::core::SensorTime;

constexpr int kUpdates = 2'000'000;
constexpr int kRepetitions = 7;
constexpr std::size_t kValues = 4096;  // cycled; a power of two so the index is a mask

volatile double sink = 0;  // keeps the optimiser from dropping the loops

const std::vector<double>& values() {
  static const std::vector<double> v = [] {
    bw::test::NormalSource noise(1);
    std::vector<double> out(kValues);
    for (double& x : out) x = 50 + 2 * noise();
    return out;
  }();
  return v;
}

SensorTime time_of(int i) {
  return bw::test::at(0) + bw::core::Micros(std::int64_t{1'000'000} * i);
}

// CPU time of this thread: on a shared machine it counts only our own cycles, unlike wall time.
double thread_cpu_ns() {
  timespec ts{};
  clock_gettime(CLOCK_THREAD_CPUTIME_ID, &ts);
  return static_cast<double>(ts.tv_sec) * 1e9 + static_cast<double>(ts.tv_nsec);
}

// Runs `body` (kUpdates updates) kRepetitions times; the median time per update in ns.
template <class Body>
double median_ns_per_update(Body body) {
  std::array<double, kRepetitions> ns{};
  for (double& result : ns) {
    const double start = thread_cpu_ns();
    body();
    result = (thread_cpu_ns() - start) / kUpdates;
  }
  std::sort(ns.begin(), ns.end());
  return ns[kRepetitions / 2];
}

void report(const char* name, double ns, double aim) {
  if (aim > 0) {
    std::printf("%-22s %8.2f ns/update   (aim < %.0f ns)\n", name, ns, aim);
  } else {
    std::printf("%-22s %8.2f ns/update\n", name, ns);
  }
}

}  // namespace

int main() {
  std::printf(
      "bench_estimators: build type %s, %d updates x %d repetitions, median thread CPU time\n",
      BRINEWATCH_BUILD_TYPE, kUpdates, kRepetitions);
#ifndef __OPTIMIZE__
  std::printf("WARNING: built without optimisation; these figures mean nothing for production\n");
#endif
  const std::vector<double>& v = values();
  const std::size_t mask = kValues - 1;

  report("Ewma", median_ns_per_update([&] {
           bw::core::Ewma e(600);
           for (int i = 0; i < kUpdates; ++i) e.update(v[i & mask], time_of(i));
           sink = sink + e.mean();
         }),
         10);
  report("EwmaChart", median_ns_per_update([&] {
           bw::core::EwmaChart c({.lambda = 0.2, .nominal_interval_s = 1, .width = 3}, 50, 2);
           int signals = 0;
           for (int i = 0; i < kUpdates; ++i) signals += c.update(v[i & mask], time_of(i)).signal;
           sink = sink + signals;
         }),
         0);
  report("Cusum", median_ns_per_update([&] {
           bw::core::Cusum c({.k = 0.5, .h = 5}, 50, 2);
           int signals = 0;
           for (int i = 0; i < kUpdates; ++i) signals += c.update(v[i & mask], time_of(i)).signal;
           sink = sink + signals;
         }),
         10);
  report("Rls (4 regressors)", median_ns_per_update([&] {
           bw::core::Rls r({.regressors = 4, .forgetting = 0.999});
           std::array<double, 4> x{1, 0, 0, 0};
           double residuals = 0;
           for (int i = 0; i < kUpdates; ++i) {
             x[1] = v[i & mask];
             x[2] = v[(i + 1) & mask];
             x[3] = v[(i + 2) & mask];
             residuals += r.update(x, v[(i + 3) & mask], time_of(i)).residual;
           }
           sink = sink + residuals;
         }),
         100);
  report("LinearTrend", median_ns_per_update([&] {
           bw::core::LinearTrend t(3600);
           for (int i = 0; i < kUpdates; ++i) t.update(v[i & mask], time_of(i));
           sink = sink + t.slope_per_second();
         }),
         0);
  report("RateOfChange", median_ns_per_update([&] {
           bw::core::RateOfChange r(900);
           for (int i = 0; i < kUpdates; ++i) r.update(v[i & mask], time_of(i));
           sink = sink + r.per_hour();
         }),
         0);
  report("FilterLife", median_ns_per_update([&] {
           bw::core::FilterLife life({});
           for (int i = 0; i < kUpdates; ++i) life.update(v[i & mask], 9000, time_of(i));
           sink = sink + life.throughput();
         }),
         0);
  report("Episode", median_ns_per_update([&] {
           bw::core::Episode episode({.start_above = 52, .end_below = 51, .end_after_s = 60});
           for (int i = 0; i < kUpdates; ++i) {
             episode.update(v[i & mask], v[(i + 1) & mask], time_of(i));
           }
           sink = sink + episode.change();
         }),
         0);
  return 0;
}
