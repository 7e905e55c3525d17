#include "engine/check_node.h"

#include <cassert>
#include <chrono>
#include <cmath>
#include <cstdio>

#include "core/overloaded.h"
#include "engine/check_settings.h"
#include "engine/data_quality_checks.h"
#include "engine/threshold_condition.h"

namespace bw::engine {
namespace {

std::string hours(double seconds) {
  char text[32];
  std::snprintf(text, sizeof text, "%.1f h", seconds / 3600.0);
  return text;
}

core::SensorTime after(core::SensorTime t, double seconds) {
  return t + std::chrono::duration_cast<core::Micros>(std::chrono::duration<double>(seconds));
}

// Raises beyond the limit after the on-delay; clears back inside by the deadband after the
// off-delay (ThresholdCondition).
class LimitCheckNode final : public CheckNode {
 public:
  LimitCheckNode(const LimitCheckSpec& spec, const LimitSettings& settings, CheckSources sources)
      : condition_(spec.direction, spec.limit, settings.deadband, settings.on_delay_s,
                   settings.off_delay_s),
        sources_(sources) {}

  std::optional<CheckOutcome> evaluate(core::SensorTime now) override {
    if (!condition_.update(active(), *sources_.value, now)) return std::nullopt;
    return flip();
  }
  std::optional<core::SensorTime> deadline() const override {
    return condition_.deadline(active());
  }
  std::optional<CheckOutcome> expire(core::SensorTime) override {
    condition_.consume();
    return flip();
  }
  void cancel_pending() override { condition_.cancel(); }

 private:
  std::optional<CheckOutcome> flip() {
    const double v = *sources_.value;
    return change_to(!active(), v, condition_.describe(!active(), v, sources_.unit));
  }
  void save_more(StateWriter& out) const override { condition_.save(out); }
  bool load_more(StateReader& in) override { return condition_.load(in); }

  ThresholdCondition condition_;
  CheckSources sources_;
};

// A limit on the smoothed rate of change: the rate estimator of the estimator set (so the rate
// speaks only after one horizon of data) followed by a ThresholdCondition on its output.
class RateCheckNode final : public CheckNode {
 public:
  RateCheckNode(const RateCheckSpec& spec, CheckSources sources)
      : rate_(make_estimator_node(RateSpec{.of = spec.of, .time_constant_s = spec.horizon_s})),
        condition_(
            spec.direction == RateDirection::rising ? LimitDirection::high : LimitDirection::low,
            spec.direction == RateDirection::rising ? spec.limit : -spec.limit, spec.deadband,
            spec.on_delay_s, spec.off_delay_s),
        sources_(sources),
        unit_(std::string(sources.unit) + "/h") {}

  std::optional<CheckOutcome> evaluate(core::SensorTime now) override {
    const double in[1] = {*sources_.value};
    if (!rate_->update(in, now, std::span<double>(&per_hour_, 1))) return std::nullopt;
    has_rate_ = true;
    if (!condition_.update(active(), per_hour_, now)) return std::nullopt;
    return flip();
  }
  std::optional<core::SensorTime> deadline() const override {
    return has_rate_ ? condition_.deadline(active()) : std::nullopt;
  }
  std::optional<CheckOutcome> expire(core::SensorTime) override {
    condition_.consume();
    return flip();
  }
  void cancel_pending() override { condition_.cancel(); }

 private:
  std::optional<CheckOutcome> flip() {
    return change_to(!active(), per_hour_,
                     "rate of change " + condition_.describe(!active(), per_hour_, unit_));
  }
  void save_more(StateWriter& out) const override {
    rate_->save(out);
    condition_.save(out);
    out.put_double(per_hour_);
    out.put_bool(has_rate_);
  }
  bool load_more(StateReader& in) override {
    if (!rate_->load(in) || !condition_.load(in)) return false;
    per_hour_ = in.get_double();
    has_rate_ = in.get_bool();
    return in.ok();
  }

  std::unique_ptr<EstimatorNode> rate_;
  ThresholdCondition condition_;
  CheckSources sources_;
  std::string unit_;
  double per_hour_ = 0;
  bool has_rate_ = false;
};

// Follows a CUSUM or EWMA chart: active while it signals out of control.
class StatisticalCheckNode final : public CheckNode {
 public:
  explicit StatisticalCheckNode(CheckSources sources) : sources_(sources) {
    assert(sources_.estimator != nullptr);
  }

  std::optional<CheckOutcome> evaluate(core::SensorTime) override {
    const bool out_of_control = (*sources_.estimator)->signal() != 0;
    if (out_of_control == active()) return std::nullopt;
    const double v = *sources_.value;
    return change_to(out_of_control, v,
                     out_of_control
                         ? (*sources_.estimator)->describe_signal()
                         : "back within the in-control band at " + figure(v, sources_.unit));
  }

 private:
  CheckSources sources_;
};

// Active while the trend is expected to reach the limit within the lead time. Clears when the
// forecast moves beyond 1.25 lead times (or the slope turns away), so a forecast wavering at
// the lead time does not chatter.
class TimeToLimitCheckNode final : public CheckNode {
 public:
  static constexpr double kClearMargin = 1.25;

  TimeToLimitCheckNode(const TimeToLimitCheckSpec& spec, CheckSources sources)
      : spec_(spec), sources_(sources) {
    assert(sources_.estimator != nullptr);
  }

  std::optional<CheckOutcome> evaluate(core::SensorTime now) override {
    const auto side =
        spec_.direction == LimitDirection::high ? core::LimitSide::high : core::LimitSide::low;
    const auto ttl = (*sources_.estimator)->time_to_limit(spec_.limit, side, now);
    if (!ttl) return std::nullopt;
    const bool reaching =
        ttl->status == core::TimeToLimit::Status::crossing && std::isfinite(ttl->seconds_late);
    const double v = *sources_.value;
    if (!active() && reaching && ttl->seconds <= spec_.lead_time_s) {
      Forecast forecast{.crossing = after(now, ttl->seconds),
                        .crossing_early = after(now, ttl->seconds_early),
                        .crossing_late = after(now, ttl->seconds_late),
                        .limit = spec_.limit};
      return change_to(true, v,
                       "will reach " + figure(spec_.limit, sources_.unit) + " in about " +
                           hours(ttl->seconds) + " (" + hours(ttl->seconds_early) + " to " +
                           hours(ttl->seconds_late) + ") at the present trend",
                       forecast);
    }
    const bool receded = !reaching || ttl->seconds > kClearMargin * spec_.lead_time_s;
    if (active() && receded && ttl->status != core::TimeToLimit::Status::already_beyond) {
      return change_to(false, v,
                       "trend no longer reaches " + figure(spec_.limit, sources_.unit) +
                           " within the lead time");
    }
    return std::nullopt;
  }

 private:
  TimeToLimitCheckSpec spec_;
  CheckSources sources_;
};

// Version of the layout written by CheckNode::save(); bump when any node's layout changes.
constexpr std::uint8_t kCheckStateVersion = 1;

}  // namespace

void CheckNode::save(StateWriter& out) const {
  out.put_u8(kCheckStateVersion);
  out.put_bool(active_);
  save_more(out);
}

bool CheckNode::load(StateReader& in) {
  if (in.get_u8() != kCheckStateVersion) in.fail();
  active_ = in.get_bool();
  return in.ok() && load_more(in) && in.ok();
}

std::optional<CheckOutcome> CheckNode::change_to(bool active, double value, std::string detail,
                                                 std::optional<Forecast> forecast) {
  active_ = active;
  return CheckOutcome{.active = active,
                      .value = value,
                      .detail = std::move(detail),
                      .forecast = std::move(forecast)};
}

std::unique_ptr<CheckNode> make_check_node(const AssetSpec& asset, const CheckSpec& check,
                                           CheckSources sources) {
  assert(sources.value != nullptr);
  auto input_of = [&](const std::string& role) -> const InputSpec& {
    const InputSpec* input = find_input(asset, role);
    assert(input != nullptr && "analyse_asset() guarantees data-quality checks watch an input");
    return *input;
  };
  return std::visit(
      core::Overloaded{
          [&](const LimitCheckSpec& s) -> std::unique_ptr<CheckNode> {
            const auto settings = limit_settings(asset, s);
            assert(settings.ok() && "analyse_asset() reports unresolvable deadbands");
            return std::make_unique<LimitCheckNode>(s, settings.value(), sources);
          },
          [&](const RateCheckSpec& s) -> std::unique_ptr<CheckNode> {
            return std::make_unique<RateCheckNode>(s, sources);
          },
          [&](const StatisticalCheckSpec&) -> std::unique_ptr<CheckNode> {
            return std::make_unique<StatisticalCheckNode>(sources);
          },
          [&](const TimeToLimitCheckSpec& s) -> std::unique_ptr<CheckNode> {
            return std::make_unique<TimeToLimitCheckNode>(s, sources);
          },
          [&](const StaleCheckSpec& s) { return make_stale_check(s, input_of(s.of), sources); },
          [&](const FlatlineCheckSpec& s) { return make_flatline_check(s, sources); },
          [&](const OutOfRangeCheckSpec& s) {
            return make_out_of_range_check(s, input_of(s.of), sources);
          },
          [&](const Ne43CheckSpec&) { return make_ne43_check(sources); },
      },
      check.kind);
}

}  // namespace bw::engine
