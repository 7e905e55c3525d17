// NIST/SEMATECH e-Handbook of Statistical Methods, section 6.3.2.3 (CUSUM control charts), worked
// example: target 325, k = 0.3175, h = 4.1959 in data units, sigma 0.635 (REFERENCES.md).
// The Cusum works in sigma units: k = 0.3175 / 0.635 = 0.5, h = 4.1959 / 0.635; sums are
// converted back to data units (times 0.635) for comparison with the printed values.
#include <gtest/gtest.h>

#include <algorithm>
#include <array>

#include "../core/test_random.h"
#include "core/cusum.h"

namespace bw::core {
namespace {

using test::at;

constexpr double kSigma = 0.635;
constexpr std::array kData{324.925, 324.675, 324.725, 324.350, 325.350, 325.225, 324.125,
                           324.525, 325.225, 324.600, 324.625, 325.150, 328.325, 327.250,
                           327.825, 328.500, 326.675, 327.775, 326.875, 328.350};

TEST(NistCusumExample, SumsAndSignalsMatchThePublishedTable) {
  Cusum cusum(CusumParams{.k = 0.3175 / kSigma, .h = 4.1959 / kSigma}, 325, kSigma);
  int first_signal = 0;
  double max_lower = 0;
  for (std::size_t i = 0; i < kData.size(); ++i) {
    const int point = static_cast<int>(i) + 1;
    const CusumPoint p = cusum.update(kData[i], at(point));
    max_lower = std::max(max_lower, p.lower * kSigma);
    if (p.signal != 0 && first_signal == 0) first_signal = point;
    // NIST/SEMATECH e-Handbook 6.3.2.3: upper sum 3.007 at point 13.
    if (point == 13) {
      EXPECT_NEAR(p.upper * kSigma, 3.007, 1e-3);
    }
    // NIST/SEMATECH e-Handbook 6.3.2.3: first signal at point 14, upper sum 4.94.
    if (point == 14) {
      EXPECT_NEAR(p.upper * kSigma, 4.94, 5e-3);
    }
    // NIST/SEMATECH e-Handbook 6.3.2.3: points 14-20 out of control (upper side).
    EXPECT_EQ(p.signal, point >= 14 ? 1 : 0) << "point " << point;
    // NIST/SEMATECH e-Handbook 6.3.2.3: final upper sum 19.035.
    if (point == 20) {
      EXPECT_NEAR(p.upper * kSigma, 19.035, 1e-3);
    }
  }
  EXPECT_EQ(first_signal, 14);
  // NIST/SEMATECH e-Handbook 6.3.2.3: the lower sum never rises above 0.72.
  EXPECT_LE(max_lower, 0.72);
  // Hand-worked from the definition: it peaks at 0.715 at point 8, so the bound above is tight.
  EXPECT_NEAR(max_lower, 0.715, 1e-9);
}

}  // namespace
}  // namespace bw::core
