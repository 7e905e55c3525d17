// Radial inflow in field units against the worked values of REFERENCES.md "Wells".
#include "core/well_physics.h"

#include <gtest/gtest.h>

#include <cmath>
#include <limits>
#include <string>

namespace bw::core {
namespace {

constexpr double kNaN = std::numeric_limits<double>::quiet_NaN();

RadialWell example_well() {
  return RadialWell{.permeability_md = 100,
                    .thickness_ft = 20,
                    .viscosity_cp = 1,
                    .volume_factor = 1,
                    .drainage_radius_ft = 745,
                    .wellbore_radius_ft = 0.25,
                    .skin = 0};
}

// REFERENCES.md "Wells", example computed from the formula: k 100 md, h 20 ft, dp 500 psi,
// mu = B = 1, re 745 ft, rw 0.25 ft, s 0 -> q = 885.0 bbl/d (with the constant 0.00708).
TEST(RadialInflow, SteadyStateExampleGives885BarrelsPerDay) {
  EXPECT_NEAR(radial_rate_bpd(example_well(), 500), 885.0, 0.05);
}

// The same example with C = 1/141.2 (REFERENCES.md: 1/141.2 = 0.0070822): 0.03 % more.
TEST(RadialInflow, InverseOf141Point2ConstantDiffersByThreeHundredthsOfAPercent) {
  RadialWell well = example_well();
  well.constant = DarcyConstant::inverse_141_2;
  EXPECT_NEAR(darcy_constant(DarcyConstant::inverse_141_2), 0.0070822, 5e-8);
  EXPECT_NEAR(radial_rate_bpd(well, 500) / radial_rate_bpd(example_well(), 500),
              (1 / 141.2) / 0.00708, 1e-12);
}

// Ahmed, Reservoir Engineering Handbook, ch. 6, worked example (REFERENCES.md "Wells"; from
// memory, arithmetic checked): q 600 STB/d, pwf 1800 psi, k 120 md, h 25 ft, re 745 ft,
// rw 0.25 ft, Bo 1.25, mu 2.5 cp -> pe about 2506 psi.
TEST(RadialInflow, AhmedExampleGivesBoundaryPressureOf2506Psi) {
  const RadialWell well{.permeability_md = 120,
                        .thickness_ft = 25,
                        .viscosity_cp = 2.5,
                        .volume_factor = 1.25,
                        .drainage_radius_ft = 745,
                        .wellbore_radius_ft = 0.25};
  ASSERT_TRUE(check_radial_well(well).ok());
  EXPECT_NEAR(1800 + pressure_drop_for_rate(well, 600), 2506, 0.5);
}

// pressure_drop_for_rate is the inverse of radial_rate_bpd, and the injectivity index is
// q / dp whichever way it is measured.
TEST(RadialInflow, PressureDropForRateInvertsTheRate) {
  const RadialWell well = example_well();
  EXPECT_NEAR(pressure_drop_for_rate(well, radial_rate_bpd(well, 500)), 500, 1e-9);
  EXPECT_NEAR(measured_injectivity_index(radial_rate_bpd(well, 500), 500),
              model_injectivity_index(well), 1e-12);
}

// Pseudo-steady state replaces ln(re/rw) by ln(re/rw) - 0.75 (REFERENCES.md "Wells"): for the
// example, by hand 0.00708 x 100 x 20 x 500 / (7.99968 - 0.75) = 7080 / 7.24968 = 976.60 bbl/d.
TEST(RadialInflow, PseudoSteadyStateUsesLogTermLessThreeQuarters) {
  RadialWell well = example_well();
  well.regime = FlowRegime::pseudo_steady_state;
  EXPECT_NEAR(radial_log_term(well), std::log(745 / 0.25) - 0.75, 1e-12);
  EXPECT_NEAR(radial_rate_bpd(well, 500), 976.60, 0.01);
}

// Skin adds to the log term (REFERENCES.md formula): s = 5 divides the example's rate by
// (7.99968 + 5) / 7.99968 = 1.6250.
TEST(RadialInflow, SkinAddsToTheLogTerm) {
  RadialWell well = example_well();
  well.skin = 5;
  EXPECT_NEAR(radial_rate_bpd(example_well(), 500) / radial_rate_bpd(well, 500), 1.6250, 5e-5);
}

// Hall slope = 141.2 mu B (ln(re/rw) + s) / (k h) psi*d/bbl (REFERENCES.md "Wells", Hall 1963,
// citation from memory): for the example with C = 1/141.2, 141.2 x 7.99968 / 2000 = 0.564777
// psi*d/bbl by hand.
TEST(RadialInflow, HallSlopeIsTheInverseInjectivity) {
  RadialWell well = example_well();
  well.constant = DarcyConstant::inverse_141_2;
  EXPECT_NEAR(hall_slope_psi_day_per_bbl(well), 141.2 * std::log(2980.0) / 2000.0, 1e-12);
  EXPECT_NEAR(hall_slope_psi_day_per_bbl(well), 0.564777, 5e-6);
}

TEST(MeasuredInjectivity, NeedsAPositivePressureExcess) {
  EXPECT_DOUBLE_EQ(measured_injectivity_index(1000, 400), 2.5);
  EXPECT_TRUE(std::isnan(measured_injectivity_index(1000, 0)));
  EXPECT_TRUE(std::isnan(measured_injectivity_index(1000, -10)));
  EXPECT_TRUE(std::isnan(measured_injectivity_index(kNaN, 400)));
  EXPECT_TRUE(std::isnan(measured_injectivity_index(1000, kNaN)));
}

TEST(RadialInflow, NaNPressureGivesNaNRate) {
  EXPECT_TRUE(std::isnan(radial_rate_bpd(example_well(), kNaN)));
  EXPECT_TRUE(std::isnan(pressure_drop_for_rate(example_well(), kNaN)));
}

bool error_mentions(const RadialWell& well, const std::string& text) {
  const Status status = check_radial_well(well);
  return !status.ok() && status.error().message.find(text) != std::string::npos;
}

TEST(CheckRadialWell, NamesTheOffendingField) {
  RadialWell well = example_well();
  well.permeability_md = 0;
  EXPECT_TRUE(error_mentions(well, "permeability_md"));
  well = example_well();
  well.thickness_ft = kNaN;
  EXPECT_TRUE(error_mentions(well, "thickness_ft"));
  well = example_well();
  well.wellbore_radius_ft = 800;
  EXPECT_TRUE(error_mentions(well, "must exceed wellbore_radius_ft"));
  well = example_well();
  well.skin = kNaN;
  EXPECT_TRUE(error_mentions(well, "skin"));
}

// A skin below -ln(re/rw) = -8.0 leaves no positive log term: the formula has no meaning there.
TEST(CheckRadialWell, RefusesASkinThatMakesTheLogTermNonPositive) {
  RadialWell well = example_well();
  well.skin = -7.9;
  EXPECT_TRUE(check_radial_well(well).ok());
  well.skin = -8.1;
  EXPECT_TRUE(error_mentions(well, "ln(re/rw) + s is not positive"));
}

}  // namespace
}  // namespace bw::core
