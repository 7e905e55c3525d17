#include "engine/spec_fingerprint.h"

#include <cstdio>

#include "core/overloaded.h"
#include "engine/state_codec.h"

namespace bw::engine {
namespace {

// Bump when the encoding below changes meaning, so old checkpoints are not taken for new.
constexpr std::uint8_t kEncodingVersion = 2;

void put_optional(StateWriter& w, const std::optional<double>& v) {
  w.put_bool(v.has_value());
  if (v) w.put_double(*v);
}

void put_names(StateWriter& w, const std::vector<std::string>& names) {
  w.put_u64(names.size());
  for (const auto& n : names) w.put_string(n);
}

void put_baseline(StateWriter& w, const BaselineSpec& b) {
  put_optional(w, b.target);
  put_optional(w, b.sigma);
  w.put_double(b.learn_s);
}

void put_estimator(StateWriter& w, const EstimatorKind& kind) {
  w.put_u8(static_cast<std::uint8_t>(kind.index()));
  std::visit(core::Overloaded{
                 [&](const EwmaSpec& s) {
                   w.put_string(s.of);
                   w.put_double(s.time_constant_s);
                 },
                 [&](const CusumSpec& s) {
                   w.put_string(s.of);
                   w.put_double(s.k);
                   w.put_double(s.h);
                   w.put_double(s.head_start);
                   w.put_bool(s.restart_after_signal);
                   w.put_double(s.max_sum);
                   put_baseline(w, s.baseline);
                 },
                 [&](const EwmaChartSpec& s) {
                   w.put_string(s.of);
                   w.put_double(s.lambda);
                   w.put_double(s.nominal_interval_s);
                   w.put_double(s.width);
                   w.put_bool(s.time_varying_limits);
                   put_baseline(w, s.baseline);
                 },
                 [&](const RlsSpec& s) {
                   w.put_string(s.target);
                   put_names(w, s.regressors);
                   w.put_bool(s.intercept);
                   w.put_double(s.forgetting);
                   w.put_double(s.nominal_interval_s);
                   w.put_double(s.learn_s);
                   w.put_double(s.initial_covariance);
                   w.put_double(s.max_covariance_trace);
                   w.put_double(s.residual_time_constant_s);
                 },
                 [&](const TrendSpec& s) {
                   w.put_string(s.of);
                   w.put_double(s.time_constant_s);
                 },
                 [&](const RateSpec& s) {
                   w.put_string(s.of);
                   w.put_double(s.time_constant_s);
                 },
                 [&](const HallSpec& s) {
                   w.put_string(s.injection_pressure);
                   w.put_string(s.rate);
                   w.put_double(s.reference_pressure_psi);
                   w.put_double(s.window);
                   w.put_u8(static_cast<std::uint8_t>(s.basis));
                   w.put_double(s.max_interval_s);
                   w.put_double(s.learn_s);
                 },
                 [&](const FilterLifeSpec& s) {
                   w.put_string(s.of);
                   w.put_string(s.flow);
                   w.put_double(s.memory_s);
                   w.put_double(s.drop_fraction);
                   w.put_double(s.confirm_s);
                   w.put_double(s.stop_gap_s);
                   w.put_double(s.flow_time_unit_s);
                   w.put_bool(s.stop_required);
                 },
                 [&](const EpisodeSpec& s) {
                   w.put_string(s.of);
                   w.put_string(s.rate);
                   w.put_double(s.start_above);
                   w.put_double(s.end_below);
                   w.put_double(s.end_after_s);
                 },
             },
             kind);
}

void put_check(StateWriter& w, const CheckKind& kind) {
  w.put_u8(static_cast<std::uint8_t>(kind.index()));
  std::visit(core::Overloaded{
                 [&](const LimitCheckSpec& s) {
                   w.put_string(s.of);
                   w.put_u8(static_cast<std::uint8_t>(s.direction));
                   w.put_double(s.limit);
                   put_optional(w, s.deadband);
                   put_optional(w, s.deadband_percent);
                   put_optional(w, s.on_delay_s);
                   put_optional(w, s.off_delay_s);
                 },
                 [&](const StatisticalCheckSpec& s) { w.put_string(s.estimator); },
                 [&](const TimeToLimitCheckSpec& s) {
                   w.put_string(s.estimator);
                   w.put_u8(static_cast<std::uint8_t>(s.direction));
                   w.put_double(s.limit);
                   w.put_double(s.lead_time_s);
                 },
                 [&](const RateCheckSpec& s) {
                   w.put_string(s.of);
                   w.put_u8(static_cast<std::uint8_t>(s.direction));
                   w.put_double(s.limit);
                   w.put_double(s.horizon_s);
                   w.put_double(s.deadband);
                   w.put_double(s.on_delay_s);
                   w.put_double(s.off_delay_s);
                 },
                 [&](const StaleCheckSpec& s) {
                   w.put_string(s.of);
                   w.put_double(s.factor);
                 },
                 [&](const FlatlineCheckSpec& s) {
                   w.put_string(s.of);
                   w.put_double(s.tolerance);
                   w.put_double(s.window_s);
                   put_optional(w, s.at_rest_up_to);
                 },
                 [&](const OutOfRangeCheckSpec& s) {
                   w.put_string(s.of);
                   w.put_double(s.margin_percent);
                 },
                 [&](const Ne43CheckSpec& s) { w.put_string(s.of); },
             },
             kind);
}

std::uint64_t fnv1a(std::string_view bytes) {
  std::uint64_t hash = 0xcbf29ce484222325ull;
  for (unsigned char c : bytes) {
    hash ^= c;
    hash *= 0x100000001b3ull;
  }
  return hash;
}

}  // namespace

std::string fingerprint(const AssetSpec& asset) {
  StateWriter w;
  w.put_u8(kEncodingVersion);
  w.put_string(asset.name);
  w.put_u64(asset.inputs.size());
  for (const auto& in : asset.inputs) {
    w.put_string(in.role);
    w.put_string(in.unit);
    w.put_string(in.tag);
    w.put_bool(in.required);
    w.put_double(in.expected_interval_s);
    put_optional(w, in.range_low);
    put_optional(w, in.range_high);
    w.put_u8(static_cast<std::uint8_t>(in.measurement));
  }
  w.put_u64(asset.signals.size());
  for (const auto& s : asset.signals) {
    w.put_string(s.name);
    w.put_string(s.unit);
    w.put_u8(static_cast<std::uint8_t>(s.op));
    put_names(w, s.operands);
    w.put_double(s.gain);
    w.put_double(s.offset);
    w.put_double(s.exponent);
    w.put_double(s.reference);
    w.put_double(s.above);
    put_optional(w, s.diameter_ft);
    w.put_bool(s.strapping_table.has_value());
    if (s.strapping_table) {
      w.put_u64(s.strapping_table->points().size());
      for (const auto& p : s.strapping_table->points()) {
        w.put_double(p.level_ft);
        w.put_double(p.volume_bbl);
      }
    }
  }
  w.put_u64(asset.estimators.size());
  for (const auto& e : asset.estimators) {
    w.put_string(e.name);
    put_estimator(w, e.kind);
    w.put_string(e.restart_on);
  }
  w.put_u64(asset.checks.size());
  for (const auto& c : asset.checks) {
    w.put_string(c.name);
    put_check(w, c.kind);
    w.put_bool(c.suppressed_when.has_value());
    if (c.suppressed_when) {
      w.put_string(c.suppressed_when->of);
      w.put_u8(static_cast<std::uint8_t>(c.suppressed_when->when));
      w.put_double(c.suppressed_when->threshold);
    }
  }
  w.put_u64(asset.records.size());
  for (const auto& r : asset.records) {
    w.put_string(r.name);
    w.put_u8(static_cast<std::uint8_t>(r.period));
    w.put_double(r.day_start_s);
    w.put_u64(r.fields.size());
    for (const auto& f : r.fields) {
      w.put_string(f.name);
      w.put_string(f.of);
      w.put_u8(static_cast<std::uint8_t>(f.stat));
      put_optional(w, f.rate_per_s);
      w.put_string(f.unit);
      put_optional(w, f.above);
    }
  }
  char text[17];
  std::snprintf(text, sizeof text, "%016llx", static_cast<unsigned long long>(fnv1a(w.bytes())));
  return text;
}

}  // namespace bw::engine
