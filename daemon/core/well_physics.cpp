#include "core/well_physics.h"

#include <cassert>
#include <cmath>
#include <limits>
#include <string>

namespace bw::core {

namespace {

bool positive(double v) { return std::isfinite(v) && v > 0; }

// The log term without asserting, so check_radial_well can test it.
double log_term(const RadialWell& well) {
  const double shape = well.regime == FlowRegime::pseudo_steady_state ? -0.75 : 0.0;
  return std::log(well.drainage_radius_ft / well.wellbore_radius_ft) + shape + well.skin;
}

}  // namespace

double darcy_constant(DarcyConstant constant) {
  return constant == DarcyConstant::inverse_141_2 ? 1.0 / 141.2 : 0.00708;
}

Status check_radial_well(const RadialWell& well) {
  const struct {
    const char* name;
    double value;
  } must_be_positive[] = {
      {"permeability_md", well.permeability_md},
      {"thickness_ft", well.thickness_ft},
      {"viscosity_cp", well.viscosity_cp},
      {"volume_factor", well.volume_factor},
      {"drainage_radius_ft", well.drainage_radius_ft},
      {"wellbore_radius_ft", well.wellbore_radius_ft},
  };
  for (const auto& field : must_be_positive) {
    if (!positive(field.value)) {
      return Error{std::string(field.name) + " must be a positive number, got " +
                   std::to_string(field.value)};
    }
  }
  if (!(well.drainage_radius_ft > well.wellbore_radius_ft)) {
    return Error{"drainage_radius_ft (" + std::to_string(well.drainage_radius_ft) +
                 ") must exceed wellbore_radius_ft (" + std::to_string(well.wellbore_radius_ft) +
                 ")"};
  }
  if (!std::isfinite(well.skin)) return Error{"skin must be a finite number"};
  if (!(log_term(well) > 0)) {
    return Error{"skin " + std::to_string(well.skin) +
                 " is so negative that ln(re/rw) + s is not positive"};
  }
  return Ok{};
}

double radial_log_term(const RadialWell& well) {
  assert(check_radial_well(well).ok());
  return log_term(well);
}

double model_injectivity_index(const RadialWell& well) {
  return darcy_constant(well.constant) * well.permeability_md * well.thickness_ft /
         (well.viscosity_cp * well.volume_factor * radial_log_term(well));
}

double radial_rate_bpd(const RadialWell& well, double pressure_drop_psi) {
  return model_injectivity_index(well) * pressure_drop_psi;
}

double pressure_drop_for_rate(const RadialWell& well, double rate_bpd) {
  return rate_bpd / model_injectivity_index(well);
}

double hall_slope_psi_day_per_bbl(const RadialWell& well) {
  return 1.0 / model_injectivity_index(well);
}

double measured_injectivity_index(double rate_bpd, double pressure_drop_psi) {
  if (!std::isfinite(rate_bpd) || !std::isfinite(pressure_drop_psi) || !(pressure_drop_psi > 0)) {
    return std::numeric_limits<double>::quiet_NaN();
  }
  return rate_bpd / pressure_drop_psi;
}

}  // namespace bw::core
