#include "core/pump_physics.h"

#include <gtest/gtest.h>

#include <cmath>
#include <limits>

#include "core/tank_geometry.h"

namespace bw::core {
namespace {

constexpr double kNaN = std::numeric_limits<double>::quiet_NaN();

// Definitions of the foot-pound-second units (common practice): the international foot and
// pound, standard gravity, and the mechanical horsepower of 550 ft*lbf/s.
constexpr double kMetresPerFoot = 0.3048;
constexpr double kNewtonsPerPoundForce = 0.45359237 * 9.80665;
constexpr double kPascalsPerPsi = kNewtonsPerPoundForce / (0.0254 * 0.0254);
constexpr double kWattsPerHorsepower = 550.0 * kMetresPerFoot * kNewtonsPerPoundForce;

// Affinity laws, REFERENCES.md "Pumps and motors" (e.g. Spellman, Handbook of Water and
// Wastewater Treatment Plant Operations): +10 % speed gives +10 % flow, +21 % head, +33.1 % power.
TEST(AffinityLaws, TenPercentMoreSpeed) {
  EXPECT_NEAR(scale_flow(100.0, 1800, 1980), 110.0, 1e-9);
  EXPECT_NEAR(scale_head(100.0, 1800, 1980), 121.0, 1e-9);
  EXPECT_NEAR(scale_power(100.0, 1800, 1980), 133.1, 1e-9);
}

// REFERENCES.md "Pumps and motors": 1800 -> 1500 rpm scales flow, head and power by
// 0.8333 / 0.6944 / 0.5787.
TEST(AffinityLaws, SlowingFrom1800To1500Rpm) {
  EXPECT_NEAR(scale_flow(1.0, 1800, 1500), 0.8333, 5e-5);
  EXPECT_NEAR(scale_head(1.0, 1800, 1500), 0.6944, 5e-5);
  EXPECT_NEAR(scale_power(1.0, 1800, 1500), 0.5787, 5e-5);
}

// Going there and back is the identity: the laws are powers of one speed ratio.
TEST(AffinityLaws, ScalingThereAndBackReturnsTheStart) {
  EXPECT_NEAR(scale_power(scale_power(42.0, 60, 47), 47, 60), 42.0, 1e-12);
  EXPECT_NEAR(scale_head(scale_head(42.0, 60, 47), 47, 60), 42.0, 1e-12);
}

TEST(AffinityLaws, NaNPropagates) {
  EXPECT_TRUE(std::isnan(scale_flow(kNaN, 1800, 1500)));
  EXPECT_TRUE(std::isnan(scale_head(10, 1800, kNaN)));
}

// US DOE Motor Challenge fact sheet "Determining Electric Motor Load and Efficiency", Eq. 1
// (REFERENCES.md "Pumps and motors"): 460 V, 34.9 A, PF 0.75 -> 20.85 kW in; 17.73 kW out at 0.85.
TEST(MotorPower, ThreePhaseInputAndShaftOutput) {
  const double input = three_phase_input_kw(460, 34.9, 0.75);
  EXPECT_NEAR(input, 20.85, 0.005);
  EXPECT_NEAR(shaft_output_kw(input, 0.85), 17.73, 0.005);
}

TEST(MotorPower, NaNPropagates) {
  EXPECT_TRUE(std::isnan(three_phase_input_kw(460, kNaN, 0.75)));
  EXPECT_TRUE(std::isnan(shaft_output_kw(kNaN, 0.85)));
}

// 1714 is the rounded value of 33000 ft*lbf/min per hp over 19.25 ft*lbf/min per gpm*psi
// (231 in^3/min x 1 lbf/in^2); the rounding is 0.017 % (common practice, derived from the unit
// definitions above).
TEST(HydraulicPower, FieldConstantFollowsFromTheUnitDefinitions) {
  const double exact = 33000.0 / (231.0 / 12.0);
  EXPECT_NEAR(kGpmPsiPerHorsepower / exact, 1.0, 2e-4);
  EXPECT_NEAR(hydraulic_hp(1.0, exact), 1.0, 2e-4);
}

// 1 hp = 0.745699872 kW (common practice): 550 ft*lbf/s in SI units.
TEST(HydraulicPower, HorsepowerInKilowattsFollowsFromTheUnitDefinitions) {
  EXPECT_NEAR(kKilowattsPerHorsepower, kWattsPerHorsepower / 1000.0, 5e-10);
}

// 1 bbl/d = 42 gal / 1440 min (REFERENCES.md "Tanks and volumes": 42 US gal per bbl).
TEST(HydraulicPower, BarrelsPerDayToGpm) {
  EXPECT_NEAR(gpm_from_bbl_per_day(1440.0), 42.0, 1e-12);
  EXPECT_NEAR(gpm_from_bbl_per_day(10000.0), 291.6667, 5e-5);
}

// An injection pump at 10,000 bbl/d across 1,500 psi, by two routes: the field formula
// Q gpm x dp psi / 1714 (REFERENCES.md, common practice) and Q [m^3/s] x dp [Pa] with the barrel
// (REFERENCES.md) and psi from their SI definitions. They agree to the 0.017 % rounding of 1714.
// By hand: 291.667 gpm x 1500 psi / 1714 = 255.25 hp.
TEST(HydraulicPower, FieldFormulaAgreesWithTheSiRoute) {
  const double bbl_per_day = 10000;
  const double dp_psi = 1500;
  const double si_watts = bbl_per_day * kCubicMetresPerBarrel / 86400.0 * dp_psi * kPascalsPerPsi;
  const double field_kw = hydraulic_kw(gpm_from_bbl_per_day(bbl_per_day), dp_psi);
  EXPECT_NEAR(field_kw / (si_watts / 1000.0), 1.0, 2e-4);
  EXPECT_NEAR(hydraulic_hp(gpm_from_bbl_per_day(bbl_per_day), dp_psi), 255.25, 0.005);
}

// Wire-to-water efficiency is the product of motor and pump efficiencies (common practice): with
// the DOE example motor (0.85) driving a pump that turns 70 % of its shaft power into hydraulic
// power, the overall figure is 0.85 x 0.70 = 0.595.
TEST(WireToWater, IsMotorTimesPumpEfficiency) {
  const double input = three_phase_input_kw(460, 34.9, 0.75);
  const double hydraulic = 0.70 * shaft_output_kw(input, 0.85);
  EXPECT_NEAR(wire_to_water_efficiency(hydraulic, input), 0.595, 1e-12);
}

TEST(WireToWater, NoInputPowerGivesNaN) {
  EXPECT_TRUE(std::isnan(wire_to_water_efficiency(5.0, 0.0)));
  EXPECT_TRUE(std::isnan(wire_to_water_efficiency(5.0, -1.0)));
  EXPECT_TRUE(std::isnan(wire_to_water_efficiency(5.0, kNaN)));
}

}  // namespace
}  // namespace bw::core
