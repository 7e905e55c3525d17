#include "core/rls.h"

#include <gtest/gtest.h>

#include <array>
#include <cmath>
#include <limits>
#include <vector>

#include "test_random.h"

namespace bw::core {
namespace {

using test::at;

// Cholesky factorisation succeeds exactly when a symmetric matrix is positive definite.
bool positive_definite(const Rls& rls) {
  const std::size_t n = rls.regressors();
  std::vector<double> l(n * n, 0.0);
  for (std::size_t j = 0; j < n; ++j) {
    double d = rls.covariance(j, j);
    for (std::size_t k = 0; k < j; ++k) d -= l[j * n + k] * l[j * n + k];
    if (!(d > 0)) return false;
    l[j * n + j] = std::sqrt(d);
    for (std::size_t i = j + 1; i < n; ++i) {
      double s = rls.covariance(i, j);
      for (std::size_t k = 0; k < j; ++k) s -= l[i * n + k] * l[j * n + k];
      l[i * n + j] = s / l[j * n + j];
    }
  }
  return true;
}

TEST(Rls, BeforeFirstSampleCoefficientsAreZero) {
  const Rls rls(RlsParams{.regressors = 3});
  for (const double w : rls.coefficients()) EXPECT_EQ(w, 0.0);
  EXPECT_EQ(rls.predict(std::array{1.0, 2.0, 3.0}), 0.0);
  EXPECT_EQ(rls.covariance(1, 1), 1e4);
  EXPECT_EQ(rls.covariance(0, 1), 0.0);
}

TEST(Rls, ResidualIsAPriori) {
  Rls rls(RlsParams{.regressors = 2});
  const RlsStep step = rls.update(std::array{1.0, 2.0}, 7.0, at(0));
  EXPECT_TRUE(step.accepted);
  EXPECT_EQ(step.prediction, 0.0);
  EXPECT_EQ(step.residual, 7.0);
  EXPECT_NE(rls.predict(std::array{1.0, 2.0}), 0.0);
}

// Closed form (REFERENCES.md, Haykin): noise-free data y = 2 + 3 x is recovered up to the pull of
// the prior 1/P0 = 1e-6 towards 0, which against 200 points is a few parts in 1e8.
TEST(Rls, RecoversANoiseFreeLine) {
  Rls rls(RlsParams{.regressors = 2, .initial_covariance = 1e6, .max_covariance_trace = 1e12});
  for (int i = 0; i < 200; ++i) {
    const double x = 0.1 * i;
    rls.update(std::array{1.0, x}, 2 + 3 * x, at(i));
  }
  EXPECT_NEAR(rls.coefficients()[0], 2.0, 1e-7);
  EXPECT_NEAR(rls.coefficients()[1], 3.0, 1e-7);
}

TEST(Rls, NonFiniteValueOrRegressorIsIgnoredAndCounted) {
  Rls rls(RlsParams{.regressors = 2});
  rls.update(std::array{1.0, 1.0}, 3.0, at(0));
  const Rls::State before = rls.state();
  constexpr double kNaN = std::numeric_limits<double>::quiet_NaN();
  EXPECT_FALSE(rls.update(std::array{1.0, kNaN}, 3.0, at(1)).accepted);
  EXPECT_FALSE(rls.update(std::array{1.0, 1.0}, kNaN, at(2)).accepted);
  EXPECT_EQ(rls.gate().non_finite(), 2);
  Rls::State after = rls.state();
  after.gate = before.gate;  // only the counters moved
  EXPECT_EQ(after, before);
}

TEST(Rls, TimeGoingBackwardsIsIgnoredAndCounted) {
  Rls rls(RlsParams{.regressors = 1});
  rls.update(std::array{1.0}, 3.0, at(10));
  const double w = rls.coefficients()[0];
  EXPECT_FALSE(rls.update(std::array{1.0}, 30.0, at(5)).accepted);
  EXPECT_EQ(rls.coefficients()[0], w);
  EXPECT_EQ(rls.gate().out_of_order(), 1);
}

// Forgetting over elapsed time: forgetting 0.9 per 10 s applied to samples 20 s apart must equal
// forgetting 0.81 per update (0.9^(20/10)).
TEST(Rls, ForgettingFollowsElapsedTime) {
  Rls timed(RlsParams{.regressors = 2, .forgetting = 0.9, .nominal_interval_s = 10});
  Rls per_update(RlsParams{.regressors = 2, .forgetting = 0.81});
  test::NormalSource noise(4);
  for (int i = 0; i < 300; ++i) {
    const double x = noise();
    const double y = 1 + 0.5 * x + 0.1 * noise();
    timed.update(std::array{1.0, x}, y, at(20.0 * i));
    per_update.update(std::array{1.0, x}, y, at(20.0 * i));
  }
  // Only the prior's weight differs (the timed form's first step forgets one interval, 0.9, not
  // 0.81): after 300 steps it is below 1e-25 of the data's weight.
  EXPECT_NEAR(timed.coefficients()[0], per_update.coefficients()[0], 1e-12);
  EXPECT_NEAR(timed.coefficients()[1], per_update.coefficients()[1], 1e-12);
  EXPECT_NEAR(timed.covariance(1, 1), per_update.covariance(1, 1), 1e-12);
}

TEST(Rls, FrozenKeepsCoefficientsButTracksResiduals) {
  Rls rls(RlsParams{.regressors = 1, .residual_time_constant_s = 5});
  for (int i = 0; i < 10; ++i) rls.update(std::array{1.0}, 5.0, at(i));
  rls.freeze(true);
  const double w = rls.coefficients()[0];
  const double p = rls.covariance(0, 0);
  for (int i = 10; i < 100; ++i) {
    const RlsStep step = rls.update(std::array{1.0}, 8.0, at(i));
    EXPECT_DOUBLE_EQ(step.residual, 8.0 - w);
  }
  EXPECT_EQ(rls.coefficients()[0], w);
  EXPECT_EQ(rls.covariance(0, 0), p);
  // 90 s at tau = 5 s: the EWMA of squared residuals has forgotten all but e^-18 of the past.
  EXPECT_NEAR(rls.residual_variance(), (8.0 - w) * (8.0 - w), 1e-6);
}

// "RLS stays positive definite over 10^6 updates": forgetting with almost no excitation (the
// regressors hardly move) winds P up without the trace bound; with it P stays bounded and
// positive definite and the coefficients stay finite.
TEST(Rls, StaysPositiveDefiniteOverAMillionPoorlyExcitedUpdates) {
  const RlsParams params{
      .regressors = 4, .forgetting = 0.95, .initial_covariance = 100, .max_covariance_trace = 1e6};
  Rls rls(params);
  test::NormalSource noise(99);
  std::array<double, 4> x{1, 2, -1, 0.5};
  for (int i = 0; i < 1'000'000; ++i) {
    x[3] = 0.5 + 1e-6 * noise();
    rls.update(x, 4 + 1e-3 * noise(), at(0.001 * i));
    if (i % 100'000 == 99'999) {
      double trace = 0;
      for (std::size_t j = 0; j < 4; ++j) trace += rls.covariance(j, j);
      ASSERT_LE(trace, params.max_covariance_trace * (1 + 1e-12)) << "update " << i;
      ASSERT_TRUE(positive_definite(rls)) << "update " << i;
      for (std::size_t a = 0; a < 4; ++a) {
        for (std::size_t b = 0; b < 4; ++b) ASSERT_EQ(rls.covariance(a, b), rls.covariance(b, a));
      }
      for (const double w : rls.coefficients()) ASSERT_TRUE(std::isfinite(w));
    }
  }
  EXPECT_NEAR(rls.predict(x), 4.0, 0.01);
}

TEST(Rls, RestoreContinuesBitIdentically) {
  const RlsParams params{.regressors = 3, .forgetting = 0.99, .nominal_interval_s = 5};
  test::NormalSource noise(17);
  Rls original(params);
  auto feed = [&noise](Rls& a, Rls* b, int i) {
    const std::array<double, 3> x{1.0, noise(), noise()};
    const double y = 2 * x[0] - x[1] + 0.5 * x[2] + 0.1 * noise();
    a.update(x, y, at(3.0 * i));
    if (b != nullptr) b->update(x, y, at(3.0 * i));
  };
  for (int i = 0; i < 100; ++i) feed(original, nullptr, i);
  Rls restored(params);
  restored.restore(original.state());
  for (int i = 100; i < 200; ++i) feed(original, &restored, i);
  EXPECT_EQ(restored.state(), original.state());
}

}  // namespace
}  // namespace bw::core
