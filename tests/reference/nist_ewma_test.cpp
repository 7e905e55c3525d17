// NIST/SEMATECH e-Handbook of Statistical Methods, section 6.3.2.4 (EWMA control charts), worked
// example: lambda 0.3, start 50, s = 2.0539, L = 3 (values as listed in REFERENCES.md).
#include <gtest/gtest.h>

#include <array>
#include <cmath>

#include "../core/test_random.h"
#include "core/ewma.h"
#include "core/ewma_chart.h"

namespace bw::core {
namespace {

using test::at;

constexpr std::array kData{52.0, 47.0, 53.0, 49.3, 50.1, 47.0, 51.0, 50.1, 51.2, 50.5,
                           49.6, 47.6, 49.9, 51.3, 47.8, 51.2, 52.6, 52.4, 53.6, 52.1};
// NIST/SEMATECH e-Handbook 6.3.2.4: EWMA values, printed to 2 decimals.
constexpr std::array kEwma{50.60, 49.52, 50.56, 50.18, 50.16, 49.21, 49.75, 49.85, 50.26, 50.33,
                           50.11, 49.36, 49.52, 50.05, 49.38, 49.92, 50.73, 51.23, 51.94, 51.99};
// Half of the last printed digit, plus room for binary rounding.
constexpr double kTwoDecimals = 0.005 + 1e-9;

EwmaChartParams nist_params(bool time_varying) {
  return {.lambda = 0.3, .nominal_interval_s = 1, .width = 3, .time_varying_limits = time_varying};
}

TEST(NistEwmaExample, ChartReproducesEveryEwmaValueAndNoSignal) {
  EwmaChart chart(nist_params(false), 50, 2.0539);
  for (std::size_t i = 0; i < kData.size(); ++i) {
    const EwmaChartResult r = chart.update(kData[i], at(static_cast<double>(i)));
    EXPECT_NEAR(r.statistic, kEwma[i], kTwoDecimals) << "point " << i + 1;
    // NIST/SEMATECH e-Handbook 6.3.2.4: none of the points is out of control.
    EXPECT_EQ(r.signal, 0) << "point " << i + 1;
  }
}

// NIST/SEMATECH e-Handbook 6.3.2.4: UCL 52.5884, LCL 47.4115 (NIST rounds the factor
// sqrt(lambda / (2 - lambda)) to 0.4201; the exact factor gives the same 4 decimals).
TEST(NistEwmaExample, AsymptoticLimits) {
  EwmaChart chart(nist_params(false), 50, 2.0539);
  const EwmaChartResult r = chart.update(kData[0], at(0));
  EXPECT_NEAR(r.upper, 52.5884, 1e-4);
  EXPECT_NEAR(r.lower, 47.4115, 1.5e-4);
}

// NIST/SEMATECH e-Handbook 6.3.2.4 (REFERENCES.md): time-varying UCL at i = 1, 2, 3.
TEST(NistEwmaExample, TimeVaryingLimitsForTheFirstThreePoints) {
  EwmaChart chart(nist_params(true), 50, 2.0539);
  constexpr std::array kUcl{51.8485, 52.2564, 52.4314};
  for (std::size_t i = 0; i < kUcl.size(); ++i) {
    const EwmaChartResult r = chart.update(kData[i], at(static_cast<double>(i)));
    EXPECT_NEAR(r.upper, kUcl[i], 1e-4) << "i = " << i + 1;
    EXPECT_NEAR(r.lower, 100 - kUcl[i], 1e-4) << "i = " << i + 1;
  }
}

// The time-constant Ewma reproduces the same values when tau is chosen so that one second gives
// alpha = 0.3 (tau = -1 / ln 0.7) and the start value 50 is fed as its first sample.
TEST(NistEwmaExample, TimeConstantEwmaReproducesTheValues) {
  Ewma ewma(-1 / std::log(0.7));
  ewma.update(50, at(0));
  for (std::size_t i = 0; i < kData.size(); ++i) {
    ewma.update(kData[i], at(static_cast<double>(i + 1)));
    EXPECT_NEAR(ewma.mean(), kEwma[i], kTwoDecimals) << "point " << i + 1;
  }
}

}  // namespace
}  // namespace bw::core
