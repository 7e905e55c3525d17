#include "engine/check_node.h"

#include <cassert>
#include <chrono>
#include <cmath>
#include <cstdio>

#include "core/overloaded.h"

namespace bw::engine {
namespace {

std::string figure(double value, std::string_view unit) {
  char text[64];
  std::snprintf(text, sizeof text, "%.4g", value);
  std::string out = text;
  if (!unit.empty()) out += " " + std::string(unit);
  return out;
}

std::string hours(double seconds) {
  char text[32];
  std::snprintf(text, sizeof text, "%.1f h", seconds / 3600.0);
  return text;
}

core::SensorTime after(core::SensorTime t, double seconds) {
  return t + std::chrono::duration_cast<core::Micros>(std::chrono::duration<double>(seconds));
}

// Raises beyond the limit; clears only once back inside the limit by the deadband.
class LimitCheckNode final : public CheckNode {
 public:
  LimitCheckNode(const LimitCheckSpec& spec, CheckSources sources)
      : spec_(spec), sources_(sources) {}

  std::optional<CheckOutcome> evaluate(core::SensorTime) override {
    const double v = *sources_.value;
    const bool high = spec_.direction == LimitDirection::high;
    const bool beyond = high ? v > spec_.limit : v < spec_.limit;
    const bool back_inside =
        high ? v < spec_.limit - spec_.deadband : v > spec_.limit + spec_.deadband;
    if (!active() && beyond) {
      return change_to(true, v,
                       figure(v, sources_.unit) + (high ? " above " : " below ") + "limit " +
                           figure(spec_.limit, sources_.unit));
    }
    if (active() && back_inside) {
      return change_to(false, v,
                       figure(v, sources_.unit) + ", back inside limit " +
                           figure(spec_.limit, sources_.unit) + " by the deadband");
    }
    return std::nullopt;
  }

 private:
  LimitCheckSpec spec_;
  CheckSources sources_;
};

// Follows a CUSUM or EWMA chart: raised while it signals out of control.
class StatisticalCheckNode final : public CheckNode {
 public:
  explicit StatisticalCheckNode(CheckSources sources) : sources_(sources) {
    assert(sources_.estimator != nullptr);
  }

  std::optional<CheckOutcome> evaluate(core::SensorTime) override {
    const bool out_of_control = sources_.estimator->signal() != 0;
    if (out_of_control == active()) return std::nullopt;
    const double v = *sources_.value;
    return change_to(out_of_control, v,
                     out_of_control ? sources_.estimator->describe_signal()
                                    : "back within the in-control band at " + figure(v, sources_.unit));
  }

 private:
  CheckSources sources_;
};

// Raised while the trend is expected to reach the limit within the lead time. Clears when the
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
    const auto side = spec_.direction == LimitDirection::high ? core::LimitSide::high
                                                              : core::LimitSide::low;
    const auto ttl = sources_.estimator->time_to_limit(spec_.limit, side, now);
    if (!ttl) return std::nullopt;
    const bool reaching = ttl->status == core::TimeToLimit::Status::crossing &&
                          std::isfinite(ttl->seconds_late);
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
      return change_to(false, v, "trend no longer reaches " + figure(spec_.limit, sources_.unit) +
                                     " within the lead time");
    }
    return std::nullopt;
  }

 private:
  TimeToLimitCheckSpec spec_;
  CheckSources sources_;
};

}  // namespace

std::optional<CheckOutcome> CheckNode::change_to(bool active, double value, std::string detail,
                                                 std::optional<Forecast> forecast) {
  active_ = active;
  return CheckOutcome{.event = active ? AlertEvent::raised : AlertEvent::cleared,
                      .value = value,
                      .detail = std::move(detail),
                      .forecast = std::move(forecast)};
}

std::unique_ptr<CheckNode> make_check_node(const CheckKind& spec, CheckSources sources) {
  assert(sources.value != nullptr);
  return std::visit(
      core::Overloaded{
          [&](const LimitCheckSpec& s) -> std::unique_ptr<CheckNode> {
            return std::make_unique<LimitCheckNode>(s, sources);
          },
          [&](const StatisticalCheckSpec&) -> std::unique_ptr<CheckNode> {
            return std::make_unique<StatisticalCheckNode>(sources);
          },
          [&](const TimeToLimitCheckSpec& s) -> std::unique_ptr<CheckNode> {
            return std::make_unique<TimeToLimitCheckNode>(s, sources);
          },
      },
      spec);
}

}  // namespace bw::engine
