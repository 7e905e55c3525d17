// Recursive least squares against batch solutions:
//   - forgetting 1: python3-numpy numpy.linalg.lstsq on the same data, run at test time;
//   - forgetting < 1: the exponentially weighted closed form (REFERENCES.md; Haykin, Adaptive
//     Filter Theory, RLS chapter, from memory)
//       w_n = (sum lambda^(n-i) x_i x_i' + delta lambda^n I)^-1 sum lambda^(n-i) x_i y_i,
//     delta = 1 / initial_covariance, computed directly here.
#include <gtest/gtest.h>
#include <unistd.h>

#include <array>
#include <cmath>
#include <cstdio>
#include <filesystem>
#include <fstream>
#include <vector>

#include "../core/test_random.h"
#include "core/rls.h"
#include "reference_tools.h"

namespace bw::core {
namespace {

using test::at;

constexpr std::size_t kN = 3;
using Row = std::array<double, kN>;

struct Data {
  std::vector<Row> x;
  std::vector<double> y;
};

// y = 1.5 + 2 x1 - 0.7 x2 + 0.3 noise, with x = (1, x1, x2).
Data make_data(std::size_t count, std::uint64_t seed) {
  test::NormalSource noise(seed);
  Data d;
  for (std::size_t i = 0; i < count; ++i) {
    const Row x{1.0, 3 * noise(), 10 * noise.uniform()};
    d.x.push_back(x);
    d.y.push_back(1.5 + 2 * x[1] - 0.7 * x[2] + 0.3 * noise());
  }
  return d;
}

// Solves a x = b for a symmetric positive definite kN x kN matrix by Gaussian elimination with
// partial pivoting (independent of the Rls update).
Row solve(std::array<Row, kN> a, Row b) {
  for (std::size_t c = 0; c < kN; ++c) {
    std::size_t pivot = c;
    for (std::size_t r = c + 1; r < kN; ++r) {
      if (std::abs(a[r][c]) > std::abs(a[pivot][c])) pivot = r;
    }
    std::swap(a[c], a[pivot]);
    std::swap(b[c], b[pivot]);
    for (std::size_t r = c + 1; r < kN; ++r) {
      const double f = a[r][c] / a[c][c];
      for (std::size_t k = c; k < kN; ++k) a[r][k] -= f * a[c][k];
      b[r] -= f * b[c];
    }
  }
  Row w{};
  for (std::size_t c = kN; c-- > 0;) {
    double s = b[c];
    for (std::size_t k = c + 1; k < kN; ++k) s -= a[c][k] * w[k];
    w[c] = s / a[c][c];
  }
  return w;
}

Row closed_form(const Data& d, double lambda, double delta) {
  std::array<Row, kN> a{};
  Row b{};
  for (std::size_t i = 0; i < d.x.size(); ++i) {
    for (std::size_t r = 0; r < kN; ++r) {
      for (std::size_t c = 0; c < kN; ++c) a[r][c] = lambda * a[r][c] + d.x[i][r] * d.x[i][c];
      b[r] = lambda * b[r] + d.x[i][r] * d.y[i];
    }
  }
  const double prior = delta * std::pow(lambda, static_cast<double>(d.x.size()));
  for (std::size_t r = 0; r < kN; ++r) a[r][r] += prior;
  return solve(a, b);
}

Rls run(const Data& d, const RlsParams& params) {
  Rls rls(params);
  for (std::size_t i = 0; i < d.x.size(); ++i)
    rls.update(d.x[i], d.y[i], at(static_cast<double>(i)));
  return rls;
}

TEST(RlsReference, NoForgettingEqualsNumpyLeastSquares) {
  const auto python = test::find_python_with_numpy();
  BW_REQUIRE_REFERENCE_TOOL(python.has_value(), "python3 with numpy");
  const Data d = make_data(2000, 77);
  const std::filesystem::path csv =
      std::filesystem::path(testing::TempDir()) / ("bw_rls_" + std::to_string(getpid()) + ".csv");
  {
    std::ofstream out(csv);
    out.precision(17);
    for (std::size_t i = 0; i < d.x.size(); ++i) {
      out << d.x[i][0] << ',' << d.x[i][1] << ',' << d.x[i][2] << ',' << d.y[i] << '\n';
    }
  }
  const auto output =
      test::run_command(*python + " " + test::tool_path("least_squares.py") + " " + csv.string());
  std::filesystem::remove(csv);
  ASSERT_TRUE(output.has_value());
  const auto numpy_w = test::parse_numbers(*output);
  ASSERT_TRUE(numpy_w.has_value() && numpy_w->size() == kN) << *output;

  // P0 = 1e6 I is a prior of weight 1e-6 pulling w towards 0; against 2000 points it moves the
  // coefficients by well under 1e-8, the tolerance used here.
  const Rls rls = run(d, RlsParams{.regressors = kN,
                                   .forgetting = 1,
                                   .initial_covariance = 1e6,
                                   .max_covariance_trace = 1e12});
  for (std::size_t j = 0; j < kN; ++j) {
    EXPECT_NEAR(rls.coefficients()[j], (*numpy_w)[j], 1e-8) << "coefficient " << j;
  }
}

TEST(RlsReference, ForgettingEqualsTheWeightedClosedForm) {
  const Data d = make_data(500, 78);
  for (const double lambda : {0.98, 0.9}) {
    // A modest P0 makes the prior visible in early steps: check after 5 and after 500 samples.
    for (const std::size_t count : {std::size_t{5}, std::size_t{500}}) {
      const Data head{{d.x.begin(), d.x.begin() + static_cast<long>(count)},
                      {d.y.begin(), d.y.begin() + static_cast<long>(count)}};
      const Rls rls = run(head, RlsParams{.regressors = kN,
                                          .forgetting = lambda,
                                          .initial_covariance = 10,
                                          .max_covariance_trace = 1e12});
      const Row expected = closed_form(head, lambda, 1.0 / 10);
      for (std::size_t j = 0; j < kN; ++j) {
        EXPECT_NEAR(rls.coefficients()[j], expected[j], 1e-9)
            << "lambda " << lambda << ", " << count << " samples, coefficient " << j;
      }
    }
  }
}

// After a step in the true coefficient, the closed form's weights put a share 1 - lambda^m of the
// total on the m samples since the step, so the estimate has covered about 1 - lambda^m of the
// step (stationary regressors): ~63 % after 1 / (1 - lambda) samples, > 99 % after 5 of them.
TEST(RlsReference, TracksACoefficientStepWithinItsMemory) {
  const double lambda = 0.99;
  Rls rls(RlsParams{.regressors = 2, .forgetting = lambda, .max_covariance_trace = 1e12});
  test::NormalSource noise(5);
  int t = 0;
  auto feed = [&](double slope, int count) {
    for (int i = 0; i < count; ++i, ++t) {
      const std::array<double, 2> x{1.0, 1 + noise()};
      rls.update(x, 0.5 + slope * x[1] + 0.05 * noise(), at(t));
    }
  };
  feed(2.0, 2000);
  EXPECT_NEAR(rls.coefficients()[1], 2.0, 0.02);
  feed(3.0, 100);  // one memory length
  const double covered = rls.coefficients()[1] - 2.0;
  EXPECT_GT(covered, 0.5);
  EXPECT_LT(covered, 0.8);
  feed(3.0, 400);  // five memory lengths in all
  EXPECT_NEAR(rls.coefficients()[1], 3.0, 0.02);
}

}  // namespace
}  // namespace bw::core
