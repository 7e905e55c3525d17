// Hall plot of a water injection well: the Hall integral against cumulative injected volume, and
// the slope of that line over a recent window.
//
//   G(t) = integral of (p_w - p_e) dt   psi*d   p_w: wellhead (or bottom-hole) injection pressure
//   W(t) = integral of q dt             bbl     p_e: reference (reservoir) pressure; q: rate
//
// Both integrals use the trapezoid rule between consecutive admitted samples at irregular times,
// so they are exact while pressure and rate vary linearly between samples. For steady radial flow
// p_w - p_e = q / II, so G = W / II: the plot is a straight line whose slope dG/dW (psi*d/bbl) is
// the inverse of the injectivity index (see core/well_physics.h). A rising slope says the well
// takes water harder (plugging, skin growth); a falling slope says easier (stimulation,
// fracturing). With wellhead pressure, p_e should be the reservoir pressure less the hydrostatic
// head of the water column; a constant error c in p_e adds c/q to the slope at constant rate.
//
// Slope: a WeightedLinearFit of G on W. A point (W, G) is added after every interval that injected
// volume (dW > 0); a shut-in adds to G but gives no point of its own. With window > 0 the weight of
// earlier points is multiplied by exp(-dW / window) (basis volume, window in bbl) or
// exp(-dt / window) (basis time, window in days) before each point, so the slope describes the
// recent water; window = 0 keeps every point at full weight (the whole history).
//
// Intervals longer than max_interval_s (when > 0), e.g. a communications outage, are not
// integrated: G and W keep their values, the later sample becomes the new starting point and the
// interval is counted in skipped_intervals(). With basis time the weights still decay over it.
//
// Before the first sample G = W = 0. primed(): at least 3 fit points, spread in W and more than 2
// effective points; slope is NaN until two points at different W exist.
// Samples with a NaN/Inf value and samples earlier than the last admitted one are refused and
// counted (gate()); the state is untouched. Negative excess pressures and rates are taken as given.
// Units: psi, bbl/d, psi*d, bbl, days. O(1) per update, no allocation. Copyable; not thread-safe.
#pragma once

#include <cstdint>
#include <limits>

#include "core/interval_cache.h"
#include "core/linear_fit.h"
#include "core/sample_gate.h"
#include "core/sensor_time.h"

namespace bw::core {

class HallPlot {
 public:
  enum class WindowBasis { volume, time };

  struct Options {
    // p_e in psi when it is constant; NaN when every sample brings its own.
    double reference_pressure_psi = std::numeric_limits<double>::quiet_NaN();
    double window = 0;  // bbl (basis volume) or days (basis time); 0: whole history
    WindowBasis basis = WindowBasis::volume;
    double max_interval_s = 0;  // 0: integrate every interval
  };

  // The running integrals and what the next trapezoid needs of the last admitted sample.
  struct Integrals {
    double integral_psi_day = 0;
    double volume_bbl = 0;
    double last_excess_psi = 0;
    double last_rate_bpd = 0;
    std::int64_t skipped_intervals = 0;

    bool operator==(const Integrals&) const = default;
  };

  // Plain snapshot for checkpointing: restore(state()) continues bit-identically.
  struct State {
    Integrals integrals;
    WeightedLinearFit::State fit;
    SampleGate::State gate;

    bool operator==(const State&) const = default;
  };

  // REQUIRES (asserted): window >= 0 and max_interval_s >= 0, both finite; a given
  // reference_pressure_psi finite.
  explicit HallPlot(const Options& options);

  // With the constant reference pressure of Options. REQUIRES it was given.
  void update(double injection_psi, double rate_bpd, SensorTime t);
  // With a reference pressure from a signal of its own.
  void update(double injection_psi, double reference_psi, double rate_bpd, SensorTime t);

  double integral_psi_day() const { return s_.integral_psi_day; }
  double cumulative_volume_bbl() const { return s_.volume_bbl; }
  bool primed() const;
  double slope_psi_day_per_bbl() const { return fit_.slope(); }
  double slope_stderr_psi_day_per_bbl() const { return fit_.slope_stderr(); }
  // 1 / slope, bbl/d/psi.
  double injectivity_index() const { return 1.0 / fit_.slope(); }
  std::int64_t skipped_intervals() const { return s_.skipped_intervals; }
  const SampleGate& gate() const { return gate_; }
  const WeightedLinearFit& fit() const { return fit_; }
  const Options& options() const { return options_; }

  // Back to the state before the first sample (counts included).
  void reset();

  State state() const;
  void restore(const State& state);

 private:
  void integrate(double dt_s, double excess_psi, double rate_bpd);
  void decay_by(double amount);

  Options options_;
  Integrals s_;
  WeightedLinearFit fit_;
  SampleGate gate_;
  IntervalCache decay_;
};

}  // namespace bw::core
