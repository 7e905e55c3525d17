// Radial Darcy flow between a well and its drainage boundary, in oil-field units.
//
//   q = C k h dp / (mu B L)   with
//   L = ln(re/rw) + s          steady state: constant pressure at the drainage boundary re
//   L = ln(re/rw) - 0.75 + s   pseudo-steady state: closed boundary, dp from the average pressure
// Units: q bbl/d (surface barrels), k md, h ft, dp psi, mu cp, B reservoir bbl per surface bbl
// (about 1 for produced water), re and rw ft, skin s dimensionless. C is 0.00708 (the rounded
// textbook constant) or 1/141.2 = 0.0070822; the two differ by 0.03 %.
//
// The same law serves producers and injectors: for a disposal well q is the injection rate and dp
// the excess of the sandface (bottom-hole) pressure over the reservoir pressure. Rate and dp
// always carry the same sign.
//
// Injectivity index II = q / dp (bbl/d/psi); its inverse is the slope of a Hall plot for steady
// radial flow (see core/hall_integral.h).
//
// Validity: check_radial_well() is the boundary check for values from a configuration; the other
// functions REQUIRE (assert) a well that passes it. NaN flow or pressure arguments give NaN.
// Pure functions; safe from any thread.
#pragma once

#include "core/result.h"

namespace bw::core {

enum class FlowRegime { steady_state, pseudo_steady_state };

enum class DarcyConstant {
  rounded_0_00708,  // 0.00708
  inverse_141_2     // 1 / 141.2
};

struct RadialWell {
  double permeability_md = 0;
  double thickness_ft = 0;
  double viscosity_cp = 1;
  double volume_factor = 1;  // B, reservoir bbl per surface bbl
  double drainage_radius_ft = 0;
  double wellbore_radius_ft = 0;
  double skin = 0;
  FlowRegime regime = FlowRegime::steady_state;
  DarcyConstant constant = DarcyConstant::rounded_0_00708;
};

// The value of C for a choice of constant.
double darcy_constant(DarcyConstant constant);

// Fails with a message naming the offending field unless k, h, mu, B, re, rw are finite and
// positive, re > rw, skin is finite and the log term L is positive (a large negative skin can
// make the formula meaningless).
Status check_radial_well(const RadialWell& well);

// L: ln(re/rw) + s, less 0.75 for pseudo-steady state.
double radial_log_term(const RadialWell& well);

// Injectivity (or productivity) index the model predicts: C k h / (mu B L), bbl/d/psi.
double model_injectivity_index(const RadialWell& well);

// Rate for a pressure difference, bbl/d.
double radial_rate_bpd(const RadialWell& well, double pressure_drop_psi);

// Pressure difference that drives a rate, psi (the inverse of radial_rate_bpd).
double pressure_drop_for_rate(const RadialWell& well, double rate_bpd);

// Slope of the Hall plot for steady radial flow: 1 / II = mu B L / (C k h), psi*d/bbl.
double hall_slope_psi_day_per_bbl(const RadialWell& well);

// Injectivity index from measurements, q / dp in bbl/d/psi; NaN unless dp > 0 (no pressure
// excess means no meaningful index) and both values are finite.
double measured_injectivity_index(double rate_bpd, double pressure_drop_psi);

}  // namespace bw::core
