// The hall estimator kind as the engine runs it: outputs, the learned baseline slope, checkpoints
// and the definition fingerprint.
#include <gtest/gtest.h>

#include <array>
#include <cmath>
#include <vector>

#include "engine/asset_graph.h"
#include "engine/estimator_node.h"
#include "engine/spec_fingerprint.h"
#include "test_sites.h"

namespace bw::engine {
namespace {

using testing::at_seconds;

// REFERENCES.md "Wells", example computed from the radial-flow formula: k 100 md, h 20 ft,
// mu = B = 1, re 745 ft, rw 0.25 ft, s 0, dp 500 psi gives q = 885.0 bbl/d, so II = 1.770
// bbl/d/psi and the Hall slope for steady flow is 1 / II = 500 / 885.0 psi*d/bbl.
constexpr double kRateBpd = 885.0;
constexpr double kExcessPsi = 500.0;
constexpr double kReferencePsi = 1200.0;

HallSpec spec() {
  return HallSpec{.injection_pressure = "p",
                  .rate = "q",
                  .reference_pressure_psi = kReferencePsi,
                  .window = 2000,
                  .basis = HallWindowBasis::volume,
                  .max_interval_s = 0,
                  .learn_s = 86400};
}

struct Fed {
  bool wrote = false;
  std::array<double, 5> out{};
};

Fed feed(EstimatorNode& node, double excess_psi, double rate_bpd, double seconds) {
  Fed f;
  const std::array<double, 2> in{kReferencePsi + excess_psi, rate_bpd};
  f.wrote = node.update(in, at_seconds(seconds), f.out);
  return f;
}

TEST(HallNode, PublishesTheKindsOutputsInTheDeclaredOrder) {
  const EstimatorKind kind = spec();
  EXPECT_EQ(estimator_kind_name(kind), "hall");
  const std::vector<std::string> inputs{"p", "q"};
  EXPECT_EQ(estimator_inputs(kind), inputs);
  ASSERT_EQ(estimator_outputs(kind).size(), 5u);
  EXPECT_EQ(estimator_outputs(kind)[2], "slope");
  EXPECT_EQ(estimator_outputs(kind)[4], "slope_change_percent");
}

TEST(HallNode, SilentUntilTheBaselineIsLearnedThenSlopeIsTheInverseInjectivity) {
  auto node = make_estimator_node(spec());
  int i = 0;
  for (; i * 600.0 < 86400.0; ++i) EXPECT_FALSE(feed(*node, kExcessPsi, kRateBpd, i * 600.0).wrote);
  const Fed f = feed(*node, kExcessPsi, kRateBpd, i * 600.0);
  ASSERT_TRUE(f.wrote);
  EXPECT_NEAR(f.out[2], kExcessPsi / kRateBpd, 1e-9);  // slope, psi*d/bbl
  EXPECT_NEAR(f.out[3], 1.770, 5e-4);                  // injectivity, bbl/d/psi (885.0 / 500)
  // Trapezoid integrals of constants: G = dp * t, W = q * t (t in days).
  const double days = i * 600.0 / 86400.0;
  EXPECT_NEAR(f.out[0], kExcessPsi * days, 1e-6);
  EXPECT_NEAR(f.out[1], kRateBpd * days, 1e-6);
  EXPECT_NEAR(f.out[4], 0.0, 1e-6);
}

// Skin 0 -> 4 with re/rw = 2980: the log term grows from ln 2980 = 8.0 to 12.0, so at the same
// rate the excess pressure and the Hall slope grow by 4 / 8.0 = 50 % (radial-flow formula).
TEST(HallNode, SlopeChangeFollowsASkinRise) {
  auto node = make_estimator_node(spec());
  double t = 0;
  for (; t <= 2 * 86400.0; t += 600) feed(*node, kExcessPsi, kRateBpd, t);
  const double rise = (std::log(2980.0) + 4.0) / std::log(2980.0);
  Fed f;
  // After 23 days (20,000 bbl, ten windows) the old regime weighs exp(-10) of the fit.
  for (; t <= 25 * 86400.0; t += 600) f = feed(*node, kExcessPsi * rise, kRateBpd, t);
  ASSERT_TRUE(f.wrote);
  EXPECT_NEAR(f.out[4], 100.0 * (rise - 1.0), 0.5);
}

TEST(HallNode, CheckpointContinuesBitForBit) {
  auto a = make_estimator_node(spec());
  auto b = make_estimator_node(spec());
  double t = 0;
  for (; t <= 1.5 * 86400.0; t += 600) feed(*a, kExcessPsi + std::sin(t), kRateBpd, t);
  StateWriter out;
  a->save(out);
  StateReader in(out.bytes());
  ASSERT_TRUE(b->load(in));
  for (; t <= 3 * 86400.0; t += 600) {
    const Fed fa = feed(*a, kExcessPsi * 1.1, kRateBpd + std::cos(t), t);
    const Fed fb = feed(*b, kExcessPsi * 1.1, kRateBpd + std::cos(t), t);
    ASSERT_EQ(fa.wrote, fb.wrote);
    EXPECT_EQ(fa.out, fb.out);
  }
}

TEST(HallNode, FingerprintChangesWithTheHallDefinition) {
  AssetSpec asset;
  asset.name = "well";
  asset.estimators.push_back({.name = "hall", .kind = spec()});
  const std::string before = fingerprint(asset);
  std::get<HallSpec>(asset.estimators[0].kind).basis = HallWindowBasis::time;
  EXPECT_NE(fingerprint(asset), before);
}

}  // namespace
}  // namespace bw::engine
