// Hall plot of an injection well: the slope against the radial-flow relation of REFERENCES.md
// "Wells" (Hall, 1963, "How to analyze waterflood injection well performance", World Oil;
// citation from memory), the trapezoid integral against closed-form integrals, and the estimator's
// handling of bad samples, gaps, shut-ins and checkpoints.
#include <gtest/gtest.h>

#include <algorithm>
#include <cmath>
#include <cstdint>
#include <limits>
#include <vector>

#include "../core/test_random.h"
#include "core/hall_integral.h"
#include "core/well_physics.h"

namespace bw::core {
namespace {

using test::at;

constexpr double kNaN = std::numeric_limits<double>::quiet_NaN();
constexpr double kDay = 86400;
constexpr double kReservoirPsi = 2000;

HallPlot::Options constant_reference(double window = 0,
                                     HallPlot::WindowBasis basis = HallPlot::WindowBasis::volume) {
  return {.reference_pressure_psi = kReservoirPsi, .window = window, .basis = basis};
}

// A disposal well in steady radial flow: k 50 md, h 40 ft, mu = B = 1, re 1000 ft, rw 0.3 ft,
// s 2, with the constant 1/141.2.
RadialWell disposal_well() {
  return RadialWell{.permeability_md = 50,
                    .thickness_ft = 40,
                    .viscosity_cp = 1,
                    .volume_factor = 1,
                    .drainage_radius_ft = 1000,
                    .wellbore_radius_ft = 0.3,
                    .skin = 2,
                    .constant = DarcyConstant::inverse_141_2};
}

// Feeds `days` of samples every 15 minutes at constant `rate_bpd`, with the sandface pressure the
// well needs for that rate (pressure_drop_for_rate), starting at `start_s`.
void inject_steadily(HallPlot& plot, const RadialWell& well, double rate_bpd, double start_s,
                     double days) {
  const int samples = static_cast<int>(days * 96);
  for (int i = 0; i <= samples; ++i) {
    plot.update(kReservoirPsi + pressure_drop_for_rate(well, rate_bpd), rate_bpd,
                at(start_s + 900.0 * i));
  }
}

// (a) Steady radial flow at constant rate. p_w - p_e = q / II at every sample, so over each
// interval dG = (q / II) dt and dW = q dt: G = W / II and the slope is
//   m = 1 / II = 141.2 mu B (ln(re/rw) + s) / (k h)
//     = 141.2 x 1 x 1 x (ln(1000 / 0.3) + 2) / (50 x 40) = 141.2 x 10.11173 / 2000
//     = 0.713888 psi*d/bbl (by hand).
// Points lie exactly on the line, so only rounding separates the fit from m.
TEST(HallPlotReference, SteadyRadialFlowAtConstantRateGivesTheRadialSlope) {
  const RadialWell well = disposal_well();
  HallPlot plot(constant_reference());
  inject_steadily(plot, well, 3000, 0, 20);
  const double expected = 141.2 * 1 * 1 * (std::log(1000 / 0.3) + 2) / (50 * 40);
  EXPECT_NEAR(expected, 0.713888, 5e-7);
  ASSERT_TRUE(plot.primed());
  EXPECT_NEAR(plot.slope_psi_day_per_bbl(), expected, 1e-9 * expected);
  EXPECT_NEAR(plot.injectivity_index(), 1 / expected, 1e-9 / expected);
  EXPECT_NEAR(plot.cumulative_volume_bbl(), 3000.0 * 20, 1e-6);
}

// The same relation with a rate that changes at every sample and irregular sample times: with the
// pressure following the rate (steady state), the trapezoid of q / II over an interval is exactly
// dW / II, so G = W / II still holds to rounding.
TEST(HallPlotReference, SteadyRadialFlowAtVaryingRateAndIrregularTimesKeepsTheSlope) {
  const RadialWell well = disposal_well();
  test::NormalSource random(5);
  HallPlot plot(constant_reference());
  double t = 0;
  for (int i = 0; i < 2000; ++i) {
    const double rate = 2000 + 2000 * random.uniform();
    plot.update(kReservoirPsi + pressure_drop_for_rate(well, rate), rate, at(t));
    t += 60 + 1800 * random.uniform();
  }
  const double expected = hall_slope_psi_day_per_bbl(well);
  EXPECT_NEAR(plot.slope_psi_day_per_bbl(), expected, 1e-9 * expected);
  EXPECT_NEAR(plot.fit().r_squared(), 1.0, 1e-12);
}

// (b) Skin rises from 0 to 5 at mid-history (30 of 60 days at 3000 bbl/d, the REFERENCES.md
// example geometry: k 100 md, h 20 ft, re 745 ft, rw 0.25 ft). The slope after over the slope
// before must be (ln(re/rw) + 5) / ln(re/rw) = 12.99968 / 7.99968 = 1.62503 (by hand).
// Tolerance: before the step every point lies on one line, so the slope is exact to rounding.
// After it the windowed fit still holds the old points with total weight share at most
// exp(-V_after / window) = exp(-30) = 9.4e-14 (window 1 day of water). An old point at distance
// |x - mean x| <= 180,000 bbl from the centre has a residual from the new line of at most
// (m1 - m0) x 90,000 bbl (plus the one straddling interval's offset, of the same order), and the
// weighted spread of exponential weights is Sxx ~ W window^2 = W x 3000^2. So the slope moves by
// at most 9.4e-14 x 180,000 x 90,000 x (m1 - m0) / 3000^2 ~ 1.7e-10 (m1 - m0): relative error
// below 1e-9, which is the tolerance. The same holds with a window in days (1 day = 3000 bbl).
void check_skin_step(HallPlot::Options options) {
  RadialWell well{.permeability_md = 100,
                  .thickness_ft = 20,
                  .drainage_radius_ft = 745,
                  .wellbore_radius_ft = 0.25,
                  .constant = DarcyConstant::inverse_141_2};
  HallPlot plot(options);
  inject_steadily(plot, well, 3000, 0, 30);
  const double before = plot.slope_psi_day_per_bbl();
  EXPECT_NEAR(before, hall_slope_psi_day_per_bbl(well), 1e-9 * before);
  well.skin = 5;
  inject_steadily(plot, well, 3000, 30 * kDay + 900, 30);
  const double after = plot.slope_psi_day_per_bbl();
  const double log_term = std::log(745 / 0.25);
  EXPECT_NEAR(after / before, (log_term + 5) / log_term, 1e-9);
  EXPECT_NEAR(after / before, 1.62503, 5e-6);
}

TEST(HallPlotReference, SkinStepRaisesTheSlopeByTheRatioOfLogTermsVolumeWindow) {
  check_skin_step(constant_reference(3000, HallPlot::WindowBasis::volume));
}

TEST(HallPlotReference, SkinStepRaisesTheSlopeByTheRatioOfLogTermsTimeWindow) {
  check_skin_step(constant_reference(1, HallPlot::WindowBasis::time));
}

// Over the whole history (window 0) the same step only bends the line: the slope lies strictly
// between the two regimes' slopes (a least-squares line through two joined segments).
TEST(HallPlotReference, WholeHistorySlopeLiesBetweenTheTwoRegimes) {
  RadialWell well{.permeability_md = 100,
                  .thickness_ft = 20,
                  .drainage_radius_ft = 745,
                  .wellbore_radius_ft = 0.25};
  HallPlot plot(constant_reference());
  const double before = hall_slope_psi_day_per_bbl(well);
  inject_steadily(plot, well, 3000, 0, 30);
  well.skin = 5;
  inject_steadily(plot, well, 3000, 30 * kDay + 900, 30);
  EXPECT_GT(plot.slope_psi_day_per_bbl(), before * 1.01);
  EXPECT_LT(plot.slope_psi_day_per_bbl(), hall_slope_psi_day_per_bbl(well) * 0.99);
}

// (c) The trapezoid rule is exact for pressures and rates linear between samples. Closed forms
// (calculus): with p_w = 1800 + 25 t up to t = 4 d and 1900 - 10 (t - 4) after, p_e = 1200,
//   G(T) = integral of 600 + 25 t over [0, 4] + integral of 700 - 10 (t - 4) over [4, T]
//        = 2600 + 700 (T - 4) - 5 (T - 4)^2           (T = 10 d: 6620 psi*d by hand)
// and with q = 1000 + 50 t, W(T) = 1000 T + 25 T^2 (T = 10 d: 12,500 bbl by hand).
// Samples fall at random irregular times (1 to 30 minutes apart), with the knot at 4 d and the
// end at 10 d among them.
TEST(HallPlotReference, TrapezoidIsExactForPiecewiseLinearSignals) {
  auto pressure = [](double t) { return t <= 4 ? 1800 + 25 * t : 1900 - 10 * (t - 4); };
  auto rate = [](double t) { return 1000 + 50 * t; };
  std::vector<std::int64_t> times_us;
  test::NormalSource random(11);
  for (std::int64_t us = 0; us < 10 * 86'400'000'000LL;
       us += 60'000'000 + static_cast<std::int64_t>(1740e6 * random.uniform())) {
    times_us.push_back(us);
  }
  times_us.push_back(4 * 86'400'000'000LL);
  times_us.push_back(10 * 86'400'000'000LL);
  std::sort(times_us.begin(), times_us.end());

  HallPlot plot({.reference_pressure_psi = 1200});
  const SensorTime origin = at(0);
  for (std::int64_t us : times_us) {
    const double t = static_cast<double>(us) / 86'400e6;
    plot.update(pressure(t), rate(t), origin + Micros(us));
  }
  EXPECT_NEAR(plot.integral_psi_day(), 6620, 1e-8);
  EXPECT_NEAR(plot.cumulative_volume_bbl(), 12500, 1e-8);
}

// A reference pressure given with each sample is subtracted sample by sample: a reference that
// ramps linearly gives G = integral of (p_w - p_e) by the same closed form. Here p_w is constant
// 2500 psi and p_e = 1500 + 10 t over 5 days: G = 1000 x 5 - 5 x 25 = 4875 psi*d (by hand).
TEST(HallPlotReference, ReferencePressureSignalIsSubtractedSampleBySample) {
  HallPlot plot({});
  for (int i = 0; i <= 5 * 24; ++i) {
    const double t = i / 24.0;
    plot.update(2500, 1500 + 10 * t, 1000, at(t * kDay));
  }
  EXPECT_NEAR(plot.integral_psi_day(), 4875, 1e-9);
  EXPECT_NEAR(plot.cumulative_volume_bbl(), 5000, 1e-9);
}

TEST(HallPlot, BeforeTheFirstSampleIntegralsAreZeroAndSlopeIsNaN) {
  HallPlot plot(constant_reference());
  EXPECT_EQ(plot.integral_psi_day(), 0.0);
  EXPECT_EQ(plot.cumulative_volume_bbl(), 0.0);
  EXPECT_TRUE(std::isnan(plot.slope_psi_day_per_bbl()));
  EXPECT_FALSE(plot.primed());
  plot.update(2500, 1000, at(0));
  plot.update(2500, 1000, at(900));
  EXPECT_TRUE(std::isnan(plot.slope_psi_day_per_bbl()));  // one point: no slope yet
  EXPECT_FALSE(plot.primed());
}

TEST(HallPlot, NonFiniteAndOutOfOrderSamplesAreRefusedAndCounted) {
  HallPlot plot(constant_reference());
  plot.update(2500, 1000, at(0));
  plot.update(2500, 1000, at(kDay));
  const HallPlot::State before = plot.state();
  plot.update(kNaN, 1000, at(2 * kDay));
  plot.update(2500, std::numeric_limits<double>::infinity(), at(2 * kDay));
  plot.update(2500, kNaN, 1000, at(2 * kDay));
  plot.update(2500, 1000, at(0.5 * kDay));
  EXPECT_EQ(plot.gate().non_finite(), 3);
  EXPECT_EQ(plot.gate().out_of_order(), 1);
  EXPECT_EQ(plot.state().integrals, before.integrals);
  EXPECT_EQ(plot.state().fit, before.fit);
}

// 500 psi over 1 day at 1000 bbl/d, then a 2-day gap longer than the 36 h limit, then 1 day more:
// the gap adds nothing, so G = 1000 psi*d and W = 2000 bbl (by hand).
TEST(HallPlot, IntervalsLongerThanTheLimitAreSkippedAndCounted) {
  HallPlot plot({.reference_pressure_psi = kReservoirPsi, .max_interval_s = 1.5 * kDay});
  plot.update(2500, 1000, at(0));
  plot.update(2500, 1000, at(kDay));
  plot.update(2500, 1000, at(3 * kDay));
  plot.update(2500, 1000, at(4 * kDay));
  EXPECT_EQ(plot.skipped_intervals(), 1);
  EXPECT_NEAR(plot.integral_psi_day(), 1000, 1e-9);
  EXPECT_NEAR(plot.cumulative_volume_bbl(), 2000, 1e-9);
}

// A shut-in day (rate 0, pressure still 100 psi above p_e) adds 100 psi*d to G but no volume and
// no fit point.
TEST(HallPlot, ShutInAddsToTheIntegralButNoFitPoint) {
  HallPlot plot(constant_reference());
  plot.update(2500, 1000, at(0));
  plot.update(2500, 1000, at(kDay));
  plot.update(2100, 0, at(kDay));
  plot.update(2100, 0, at(2 * kDay));
  EXPECT_EQ(plot.fit().count(), 1);
  EXPECT_NEAR(plot.integral_psi_day(), 600, 1e-9);
  EXPECT_NEAR(plot.cumulative_volume_bbl(), 1000, 1e-9);
}

TEST(HallPlot, RestoredStateContinuesBitIdentically) {
  const RadialWell well = disposal_well();
  test::NormalSource random(3);
  HallPlot whole(constant_reference(5000));
  HallPlot first_half(constant_reference(5000));
  std::vector<double> rates;
  for (int i = 0; i < 400; ++i) rates.push_back(2500 + 1000 * random.uniform());
  for (int i = 0; i < 200; ++i) {
    const double p = kReservoirPsi + pressure_drop_for_rate(well, rates[i]) + random();
    whole.update(p, rates[i], at(600.0 * i));
    first_half.update(p, rates[i], at(600.0 * i));
  }
  HallPlot resumed(constant_reference(5000));
  resumed.restore(first_half.state());
  for (int i = 200; i < 400; ++i) {
    const double p = kReservoirPsi + pressure_drop_for_rate(well, rates[i]) + random();
    whole.update(p, rates[i], at(600.0 * i));
    resumed.update(p, rates[i], at(600.0 * i));
  }
  EXPECT_EQ(resumed.state(), whole.state());
  EXPECT_EQ(resumed.slope_psi_day_per_bbl(), whole.slope_psi_day_per_bbl());
}

TEST(HallPlot, ResetForgetsEverything) {
  HallPlot plot(constant_reference());
  inject_steadily(plot, disposal_well(), 3000, 0, 1);
  plot.update(kNaN, 3000, at(2 * kDay));
  plot.reset();
  EXPECT_EQ(plot.state(), HallPlot::State{});
}

}  // namespace
}  // namespace bw::core
