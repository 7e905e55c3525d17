// Centrifugal pump and three-phase motor relations used to judge a pump's operating point.
//
// Affinity laws for one impeller at a changed speed (flow ~ N, head ~ N^2, power ~ N^3): each
// scale_* function takes a value measured at speed `from_speed` and returns it at `to_speed`;
// speeds in any one unit (rpm, Hz of the drive). Valid for speed changes on the same pump and
// fluid; not for trimmed impellers or other pumps.
//
// Power: electrical input of a three-phase motor from line-to-line volts, line amps and power
// factor; shaft output = input x motor efficiency; hydraulic power from flow and differential
// pressure; wire-to-water efficiency = hydraulic power / electrical input (motor, drive and pump
// losses together).
//
// Units: kW and hp (mechanical horsepower, 550 ft*lbf/s = 0.745699872 kW); flow in US gpm or
// bbl/d (1 bbl/d = 42/1440 gpm); pressure in psi; efficiencies and power factor as fractions
// (0.85, not 85).
//
// NaN in gives NaN out; nothing is clamped. REQUIRES (asserted): from_speed > 0 for the affinity
// laws. Division by a zero input power gives NaN (no efficiency without power), not infinity.
// Pure functions; safe from any thread.
#pragma once

namespace bw::core {

inline constexpr double kKilowattsPerHorsepower = 0.745699872;
inline constexpr double kGpmPerBarrelPerDay = 42.0 / 1440.0;
// Q [gpm] x dp [psi] / 1714 = hydraulic hp (the rounded field constant, 33000 / 19.25 = 1714.3).
inline constexpr double kGpmPsiPerHorsepower = 1714.0;

double scale_flow(double flow, double from_speed, double to_speed);
double scale_head(double head, double from_speed, double to_speed);
double scale_power(double power, double from_speed, double to_speed);

// sqrt(3) V I PF / 1000, kW.
double three_phase_input_kw(double line_volts, double line_amps, double power_factor);
// input_kw x motor_efficiency, kW.
double shaft_output_kw(double input_kw, double motor_efficiency);

double gpm_from_bbl_per_day(double bbl_per_day);
// flow_gpm x dp_psi / 1714, hp.
double hydraulic_hp(double flow_gpm, double differential_psi);
double hydraulic_kw(double flow_gpm, double differential_psi);
// hydraulic_power_kw / electrical_input_kw; NaN unless electrical_input_kw > 0.
double wire_to_water_efficiency(double hydraulic_power_kw, double electrical_input_kw);

}  // namespace bw::core
