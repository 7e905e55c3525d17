#include "engine/periodic_record.h"

#include <algorithm>
#include <cassert>
#include <chrono>
#include <cmath>

namespace bw::engine {
namespace {

// Layout of save(); bump when it changes.
constexpr std::uint8_t kStateVersion = 1;
constexpr double kSecondsPerHour = 3600;

core::Micros micros(double seconds) {
  return std::chrono::duration_cast<core::Micros>(std::chrono::duration<double>(seconds));
}

}  // namespace

PeriodicRecord::PeriodicRecord(const RecordSpec& spec, std::vector<std::string> units,
                               LocalCalendar& calendar)
    : spec_(spec), units_(std::move(units)), calendar_(calendar), fields_(spec.fields.size()) {
  assert(units_.size() == spec_.fields.size());
}

void PeriodicRecord::start(core::SensorTime t) {
  period_ = calendar_.day_containing(t, micros(spec_.day_start_s));
  assert(period_->start <= t && t < period_->end);
  last_ = t;
}

std::optional<core::SensorTime> PeriodicRecord::deadline() const {
  if (!period_) return std::nullopt;
  return period_->end;
}

void PeriodicRecord::accumulate(core::SensorTime t) {
  assert(period_ && t <= period_->end);
  if (t <= last_) return;
  const double dt = core::seconds_between(last_, t);
  last_ = t;
  bool all_usable = true;
  for (std::size_t f = 0; f < fields_.size(); ++f) {
    FieldState& field = fields_[f];
    if (!field.usable) {
      all_usable = false;
      continue;
    }
    field.integral += field.held * dt;
    field.usable_s += dt;
    const auto& above = spec_.fields[f].above;
    if (above && field.held > *above) field.above_s += dt;
  }
  if (all_usable) covered_s_ += dt;
}

void PeriodicRecord::hold(std::size_t f, double value, bool usable) {
  FieldState& field = fields_[f];
  field.usable = usable && std::isfinite(value);
  if (!field.usable) return;
  field.held = value;
  field.max = field.seen ? std::max(field.max, value) : value;
  field.min = field.seen ? std::min(field.min, value) : value;
  field.seen = true;
}

double PeriodicRecord::result(std::size_t f) const {
  const FieldState& field = fields_[f];
  const RecordFieldSpec& spec = spec_.fields[f];
  const bool timed = field.usable_s > 0;
  switch (spec.stat) {
    case RecordStat::total:
      return timed ? field.integral / *spec.rate_per_s : NAN;
    case RecordStat::max:
      return field.seen ? field.max : NAN;
    case RecordStat::min:
      return field.seen ? field.min : NAN;
    case RecordStat::time_average:
      return timed ? field.integral / field.usable_s : NAN;
    case RecordStat::time_above:
      return timed ? field.above_s / kSecondsPerHour : NAN;
  }
  return NAN;
}

RecordContent PeriodicRecord::close() {
  assert(period_);
  accumulate(period_->end);
  RecordContent record;
  record.kind = spec_.name;
  record.time = period_->end;
  record.period_start = period_->start;
  record.fields.reserve(fields_.size() + 1);
  for (std::size_t f = 0; f < fields_.size(); ++f) {
    const RecordFieldSpec& spec = spec_.fields[f];
    std::string unit = spec.stat == RecordStat::total        ? spec.unit
                       : spec.stat == RecordStat::time_above ? std::string("h")
                                                             : units_[f];
    record.fields.push_back({spec.name, result(f), std::move(unit)});
  }
  record.fields.push_back({kCoveredHoursField, covered_s_ / kSecondsPerHour, "h"});
  const core::SensorTime next = period_->end;
  period_ = calendar_.day_containing(next, micros(spec_.day_start_s));
  assert(period_->start == next);
  reset_period();
  return record;
}

void PeriodicRecord::reset_period() {
  covered_s_ = 0;
  for (FieldState& field : fields_) {
    field.integral = field.usable_s = field.above_s = 0;
    field.seen = false;
    // Sample-and-hold: the value held across the boundary is the new period's first value.
    if (field.usable) hold(static_cast<std::size_t>(&field - fields_.data()), field.held, true);
  }
}

void PeriodicRecord::save(StateWriter& out) const {
  out.put_u8(kStateVersion);
  out.put_bool(period_.has_value());
  if (period_) {
    out.put_time(period_->start);
    out.put_time(period_->end);
  }
  out.put_time(last_);
  out.put_double(covered_s_);
  out.put_u64(fields_.size());
  for (const FieldState& f : fields_) {
    out.put_double(f.held);
    out.put_bool(f.usable);
    out.put_double(f.integral);
    out.put_double(f.usable_s);
    out.put_double(f.above_s);
    out.put_double(f.max);
    out.put_double(f.min);
    out.put_bool(f.seen);
  }
}

bool PeriodicRecord::load(StateReader& in) {
  if (in.get_u8() != kStateVersion) {
    in.fail();
    return false;
  }
  period_.reset();
  if (in.get_bool()) {
    const core::SensorTime start = in.get_time();
    period_ = LocalDay{start, in.get_time()};
  }
  last_ = in.get_time();
  covered_s_ = in.get_double();
  if (in.get_u64() != fields_.size()) in.fail();
  for (std::size_t i = 0; i < fields_.size() && in.ok(); ++i) {
    FieldState& f = fields_[i];
    f.held = in.get_double();
    f.usable = in.get_bool();
    f.integral = in.get_double();
    f.usable_s = in.get_double();
    f.above_s = in.get_double();
    f.max = in.get_double();
    f.min = in.get_double();
    f.seen = in.get_bool();
  }
  return in.ok();
}

}  // namespace bw::engine
