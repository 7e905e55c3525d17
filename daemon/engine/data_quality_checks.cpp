#include "engine/data_quality_checks.h"

#include <cassert>
#include <chrono>
#include <cmath>

#include "engine/threshold_condition.h"

namespace bw::engine {
namespace {

// NAMUR NE 43 failure signal levels of a 4-20 mA transmitter.
constexpr double kLowFailure_mA = 3.6;
constexpr double kHighFailure_mA = 21.0;

class StaleCheckNode final : public CheckNode {
 public:
  StaleCheckNode(const StaleCheckSpec& spec, const InputSpec& input, CheckSources sources)
      : silence_s_(spec.factor * input.expected_interval_s),
        interval_s_(input.expected_interval_s),
        silence_(
            std::chrono::duration_cast<core::Micros>(std::chrono::duration<double>(silence_s_))),
        sources_(sources) {
    assert(silence_s_ > 0 && sources_.heard != nullptr);
  }

  // The input was heard (the evaluator has updated *heard).
  std::optional<CheckOutcome> evaluate(core::SensorTime) override {
    if (!active()) return std::nullopt;
    return change_to(false, *sources_.value, "samples arrive again");
  }
  std::optional<core::SensorTime> deadline() const override {
    if (active()) return std::nullopt;
    return *sources_.heard + silence_;
  }
  std::optional<CheckOutcome> expire(core::SensorTime) override {
    return change_to(true, *sources_.value,
                     "no sample for " + duration_words(silence_s_) + " (expected every " +
                         duration_words(interval_s_) + ")");
  }
  bool held_by_bad_data() const override { return false; }

 private:
  double silence_s_;
  double interval_s_;
  core::Micros silence_;
  CheckSources sources_;
};

class FlatlineCheckNode final : public CheckNode {
 public:
  FlatlineCheckNode(const FlatlineCheckSpec& spec, CheckSources sources)
      : tolerance_(spec.tolerance),
        window_s_(spec.window_s),
        window_(
            std::chrono::duration_cast<core::Micros>(std::chrono::duration<double>(spec.window_s))),
        at_rest_up_to_(spec.at_rest_up_to),
        sources_(sources) {
    assert(tolerance_ >= 0 && window_s_ > 0);
  }

  std::optional<CheckOutcome> evaluate(core::SensorTime now) override {
    const double v = *sources_.value;
    if (at_rest_up_to_ && v <= *at_rest_up_to_) {
      // A resting machine or an empty vessel holds its value legitimately: no window runs.
      window_start_.reset();
      if (!active()) return std::nullopt;
      return change_to(false, v,
                       figure(v, sources_.unit) + ", at rest (at or below " +
                           figure(*at_rest_up_to_, sources_.unit) + ")");
    }
    if (!window_start_ || std::abs(v - anchor_) > tolerance_) {
      const bool was_stuck = active();
      const double moved = v - anchor_;
      anchor_ = v;
      window_start_ = now;
      if (!was_stuck) return std::nullopt;
      return change_to(false, v, "moved by " + figure(moved, sources_.unit) + tolerance_words());
    }
    if (active() || now - *window_start_ < window_) return std::nullopt;
    const std::string how = tolerance_ > 0 ? "no change beyond " + figure(tolerance_, sources_.unit)
                                           : std::string("the same value");
    return change_to(true, v,
                     how + " for " + duration_words(window_s_) + " (stuck at " +
                         figure(anchor_, sources_.unit) + "?)");
  }

 private:
  void save_more(StateWriter& out) const override {
    out.put_double(anchor_);
    out.put_optional_time(window_start_);
  }
  bool load_more(StateReader& in) override {
    anchor_ = in.get_double();
    window_start_ = in.get_optional_time();
    return in.ok();
  }

  std::string tolerance_words() const {
    return tolerance_ > 0 ? ", beyond the tolerance " + figure(tolerance_, sources_.unit)
                          : std::string();
  }

  double tolerance_;
  double window_s_;
  core::Micros window_;
  std::optional<double> at_rest_up_to_;
  CheckSources sources_;
  double anchor_ = 0;
  std::optional<core::SensorTime> window_start_;
};

class OutOfRangeCheckNode final : public CheckNode {
 public:
  OutOfRangeCheckNode(const OutOfRangeCheckSpec& spec, const InputSpec& input, CheckSources sources)
      : sources_(sources) {
    assert(input.range_low && input.range_high);
    const double margin = spec.margin_percent / 100.0 * (*input.range_high - *input.range_low);
    low_ = *input.range_low - margin;
    high_ = *input.range_high + margin;
  }

  std::optional<CheckOutcome> evaluate(core::SensorTime) override {
    const double v = *sources_.value;
    const bool outside = v < low_ || v > high_;
    if (outside == active()) return std::nullopt;
    if (!outside) return change_to(false, v, figure(v, sources_.unit) + ", back within range");
    return change_to(
        true, v,
        figure(v, sources_.unit) +
            (v > high_ ? " above the instrument's range, top " + figure(high_, sources_.unit)
                       : " below the instrument's range, bottom " + figure(low_, sources_.unit)));
  }

 private:
  CheckSources sources_;
  double low_ = 0;
  double high_ = 0;
};

class Ne43CheckNode final : public CheckNode {
 public:
  explicit Ne43CheckNode(CheckSources sources) : sources_(sources) {}

  std::optional<CheckOutcome> evaluate(core::SensorTime) override {
    const double v = *sources_.value;
    const bool low = v <= kLowFailure_mA;
    const bool high = v >= kHighFailure_mA;
    if ((low || high) == active()) return std::nullopt;
    if (!low && !high) {
      return change_to(false, v, figure(v, "mA") + ", no longer a failure signal");
    }
    return change_to(true, v,
                     figure(v, "mA") + (low ? ": low failure signal (at or below 3.6 mA)"
                                            : ": high failure signal (at or above 21 mA)"));
  }

 private:
  CheckSources sources_;
};

}  // namespace

std::unique_ptr<CheckNode> make_stale_check(const StaleCheckSpec& spec, const InputSpec& input,
                                            CheckSources sources) {
  return std::make_unique<StaleCheckNode>(spec, input, sources);
}

std::unique_ptr<CheckNode> make_flatline_check(const FlatlineCheckSpec& spec,
                                               CheckSources sources) {
  return std::make_unique<FlatlineCheckNode>(spec, sources);
}

std::unique_ptr<CheckNode> make_out_of_range_check(const OutOfRangeCheckSpec& spec,
                                                   const InputSpec& input, CheckSources sources) {
  return std::make_unique<OutOfRangeCheckNode>(spec, input, sources);
}

std::unique_ptr<CheckNode> make_ne43_check(CheckSources sources) {
  return std::make_unique<Ne43CheckNode>(sources);
}

}  // namespace bw::engine
