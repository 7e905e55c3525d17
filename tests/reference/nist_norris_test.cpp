// NIST Statistical Reference Datasets, linear regression "Norris": certified values (REFERENCES.md)
// for WeightedLinearFit with no decay and for LinearTrend with x read as seconds.
#include <gtest/gtest.h>

#include <algorithm>
#include <array>
#include <cmath>
#include <utility>

#include "../core/test_random.h"
#include "core/linear_fit.h"
#include "core/trend.h"

namespace bw::core {
namespace {

// NIST StRD Norris data (REFERENCES.md).
constexpr std::array<double, 36> kX{0.2,   337.4, 118.2, 884.6, 10.1,  226.5, 666.3, 996.3, 448.6,
                                    777.0, 558.2, 0.4,   0.6,   775.5, 666.9, 338.0, 447.5, 11.6,
                                    556.0, 228.1, 995.8, 887.6, 120.2, 0.3,   0.3,   556.8, 339.1,
                                    887.2, 999.0, 779.0, 11.1,  118.3, 229.2, 669.1, 448.9, 0.5};
constexpr std::array<double, 36> kY{0.1,   338.8, 118.1, 888.0, 9.2,   228.1, 668.5, 998.5, 449.1,
                                    778.9, 559.2, 0.3,   0.1,   778.1, 668.8, 339.3, 448.9, 10.8,
                                    557.7, 228.3, 998.0, 888.8, 119.6, 0.3,   0.6,   557.6, 339.3,
                                    888.0, 998.5, 778.9, 10.2,  117.6, 228.9, 668.4, 449.2, 0.2};

// NIST StRD Norris certified values (REFERENCES.md).
constexpr double kSlope = 1.00211681802045;
constexpr double kIntercept = -0.262323073774029;
constexpr double kRSquared = 0.999993745883712;
constexpr double kSlopeStderr = 4.29796848199937e-4;
constexpr double kInterceptStderr = 0.232818234301152;

double relative_error(double value, double certified) {
  return std::abs(value - certified) / std::abs(certified);
}

TEST(NistNorris, WeightedLinearFitReproducesCertifiedValues) {
  WeightedLinearFit fit;
  for (std::size_t i = 0; i < kX.size(); ++i) fit.add(kX[i], kY[i]);
  EXPECT_LT(relative_error(fit.slope(), kSlope), 1e-12);
  EXPECT_LT(relative_error(fit.intercept(), kIntercept), 1e-12);
  EXPECT_LT(relative_error(fit.r_squared(), kRSquared), 1e-12);
  EXPECT_LT(relative_error(fit.slope_stderr(), kSlopeStderr), 1e-9);
  EXPECT_LT(relative_error(fit.intercept_stderr(), kInterceptStderr), 1e-9);
  std::printf(
      "  Norris relative errors: slope %.1e intercept %.1e R^2 %.1e se(b) %.1e se(a) %.1e\n",
      relative_error(fit.slope(), kSlope), relative_error(fit.intercept(), kIntercept),
      relative_error(fit.r_squared(), kRSquared), relative_error(fit.slope_stderr(), kSlopeStderr),
      relative_error(fit.intercept_stderr(), kInterceptStderr));
}

// The trend takes samples in time order, so the points are fed sorted by x (least squares does not
// depend on the order of the points). Times are whole tenths of a second: exact in microseconds.
TEST(NistNorris, LinearTrendReproducesCertifiedValuesWithXAsSeconds) {
  std::array<std::pair<double, double>, 36> points{};
  for (std::size_t i = 0; i < kX.size(); ++i) points[i] = {kX[i], kY[i]};
  std::sort(points.begin(), points.end());
  LinearTrend trend(0);
  for (const auto& [x, y] : points) trend.update(y, test::at(x));
  ASSERT_TRUE(trend.primed());
  EXPECT_LT(relative_error(trend.slope_per_second(), kSlope), 1e-12);
  EXPECT_LT(relative_error(trend.level_at(test::at(0)), kIntercept), 1e-11);
  EXPECT_LT(relative_error(trend.slope_stderr_per_second(), kSlopeStderr), 1e-9);
  EXPECT_LT(relative_error(trend.fit().r_squared(), kRSquared), 1e-12);
}

}  // namespace
}  // namespace bw::core
