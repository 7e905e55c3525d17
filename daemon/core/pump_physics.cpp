#include "core/pump_physics.h"

#include <cassert>
#include <cmath>
#include <limits>
#include <numbers>

namespace bw::core {

namespace {

// (to / from)^exponent: the one affinity law with the exponent of flow, head or power.
double speed_ratio_power(double from_speed, double to_speed, int exponent) {
  assert(std::isnan(from_speed) || from_speed > 0);
  const double ratio = to_speed / from_speed;
  double scale = 1;
  for (int i = 0; i < exponent; ++i) scale *= ratio;
  return scale;
}

}  // namespace

double scale_flow(double flow, double from_speed, double to_speed) {
  return flow * speed_ratio_power(from_speed, to_speed, 1);
}

double scale_head(double head, double from_speed, double to_speed) {
  return head * speed_ratio_power(from_speed, to_speed, 2);
}

double scale_power(double power, double from_speed, double to_speed) {
  return power * speed_ratio_power(from_speed, to_speed, 3);
}

double three_phase_input_kw(double line_volts, double line_amps, double power_factor) {
  return std::numbers::sqrt3 * line_volts * line_amps * power_factor / 1000.0;
}

double shaft_output_kw(double input_kw, double motor_efficiency) {
  return input_kw * motor_efficiency;
}

double gpm_from_bbl_per_day(double bbl_per_day) { return bbl_per_day * kGpmPerBarrelPerDay; }

double hydraulic_hp(double flow_gpm, double differential_psi) {
  return flow_gpm * differential_psi / kGpmPsiPerHorsepower;
}

double hydraulic_kw(double flow_gpm, double differential_psi) {
  return hydraulic_hp(flow_gpm, differential_psi) * kKilowattsPerHorsepower;
}

double wire_to_water_efficiency(double hydraulic_power_kw, double electrical_input_kw) {
  if (!(electrical_input_kw > 0)) return std::numeric_limits<double>::quiet_NaN();
  return hydraulic_power_kw / electrical_input_kw;
}

}  // namespace bw::core
