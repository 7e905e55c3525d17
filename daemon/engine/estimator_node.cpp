#include "core/overloaded.h"
#include "engine/estimator_node.h"

#include <cassert>
#include <cmath>
#include <cstdio>
#include <limits>
#include <utility>
#include <vector>

#include "core/cusum.h"
#include "core/ewma.h"
#include "core/episode.h"
#include "core/ewma_chart.h"
#include "core/filter_life.h"
#include "core/hall_integral.h"
#include "core/rate_of_change.h"
#include "core/rls.h"
#include "engine/baseline.h"
#include "engine/core_state_codec.h"

namespace bw::engine {
namespace {

constexpr double kSecondsPerHour = 3600.0;

std::string format_figure(const char* pattern, double a, double b) {
  char text[96];
  std::snprintf(text, sizeof text, pattern, a, b);
  return text;
}

class EwmaNode final : public EstimatorNode {
 public:
  explicit EwmaNode(const EwmaSpec& spec) : ewma_(spec.time_constant_s) {}
  bool update(std::span<const double> in, core::SensorTime t, std::span<double> out) override {
    ewma_.update(in[0], t);
    out[0] = ewma_.mean();
    out[1] = ewma_.stddev();
    return true;
  }
  void save(StateWriter& out) const override { put(out, ewma_.state()); }
  bool load(StateReader& in) override {
    core::Ewma::State state;
    if (!get(in, state)) return false;
    ewma_.restore(state);
    return true;
  }

 private:
  core::Ewma ewma_;
};

class CusumNode final : public EstimatorNode {
 public:
  explicit CusumNode(const CusumSpec& spec)
      : baseline_(spec.baseline),
        cusum_(core::CusumParams{.k = spec.k,
                                 .h = spec.h,
                                 .head_start = spec.head_start,
                                 .restart_after_signal = spec.restart_after_signal,
                                 .max_sum = spec.max_sum},
               0.0, 1.0),
        h_(spec.h) {}

  bool update(std::span<const double> in, core::SensorTime t, std::span<double> out) override {
    if (!baseline_.ready()) {
      if (!baseline_.observe(in[0], t)) return false;
      cusum_.set_baseline(baseline_.target(), baseline_.sigma());
      return false;  // the learning samples are not judged against themselves
    }
    const auto step = cusum_.update(in[0], t);
    if (!step.accepted) return false;
    signal_ = step.signal != 0 ? step.signal : (step.upper > h_ ? 1 : step.lower > h_ ? -1 : 0);
    out[0] = step.upper;
    out[1] = step.lower;
    return true;
  }
  void save(StateWriter& out) const override {
    baseline_.save(out);
    put(out, cusum_.state());
    out.put_i64(signal_);
  }
  bool load(StateReader& in) override {
    core::Cusum::State state;
    if (!baseline_.load(in) || !get(in, state)) return false;
    cusum_.restore(state);
    signal_ = static_cast<int>(in.get_i64());
    return in.ok();
  }
  int signal() const override { return signal_; }
  std::string describe_signal() const override {
    const double sum = signal_ >= 0 ? cusum_.upper() : cusum_.lower();
    return format_figure(signal_ >= 0 ? "upper CUSUM %.2f sigma (limit %.2f)"
                                      : "lower CUSUM %.2f sigma (limit %.2f)",
                         sum, h_) +
           format_figure("; baseline %.4g, sigma %.4g", baseline_.target(), baseline_.sigma());
  }

 private:
  BaselineLearner baseline_;
  core::Cusum cusum_;
  double h_;
  int signal_ = 0;
};

class EwmaChartNode final : public EstimatorNode {
 public:
  explicit EwmaChartNode(const EwmaChartSpec& spec)
      : baseline_(spec.baseline),
        chart_(core::EwmaChartParams{.lambda = spec.lambda,
                                     .nominal_interval_s = spec.nominal_interval_s,
                                     .width = spec.width,
                                     .time_varying_limits = spec.time_varying_limits},
               0.0, 1.0) {}

  bool update(std::span<const double> in, core::SensorTime t, std::span<double> out) override {
    if (!baseline_.ready()) {
      if (!baseline_.observe(in[0], t)) return false;
      chart_.set_baseline(baseline_.target(), baseline_.sigma());
      return false;
    }
    const auto point = chart_.update(in[0], t);
    if (!point.accepted) return false;
    last_ = point;
    out[0] = last_.statistic;
    out[1] = last_.upper;
    out[2] = last_.lower;
    return true;
  }
  void save(StateWriter& out) const override {
    baseline_.save(out);
    put(out, chart_.state());
    out.put_double(last_.statistic);
    out.put_double(last_.lower);
    out.put_double(last_.upper);
    out.put_i64(last_.signal);
    out.put_bool(last_.accepted);
  }
  bool load(StateReader& in) override {
    core::EwmaChart::State state;
    if (!baseline_.load(in) || !get(in, state)) return false;
    chart_.restore(state);
    last_.statistic = in.get_double();
    last_.lower = in.get_double();
    last_.upper = in.get_double();
    last_.signal = static_cast<int>(in.get_i64());
    last_.accepted = in.get_bool();
    return in.ok();
  }
  int signal() const override { return last_.signal; }
  std::string describe_signal() const override {
    return format_figure("EWMA %.4g outside %.4g", last_.statistic,
                         last_.signal >= 0 ? last_.upper : last_.lower) +
           format_figure(" (baseline %.4g, sigma %.4g)", baseline_.target(), baseline_.sigma());
  }

 private:
  BaselineLearner baseline_;
  core::EwmaChart chart_;
  core::EwmaChartResult last_{};
};

class RlsNode final : public EstimatorNode {
 public:
  explicit RlsNode(const RlsSpec& spec)
      : rls_(core::RlsParams{.regressors = spec.regressors.size() + (spec.intercept ? 1 : 0),
                             .forgetting = spec.forgetting,
                             .nominal_interval_s = spec.nominal_interval_s,
                             .initial_covariance = spec.initial_covariance,
                             .max_covariance_trace = spec.max_covariance_trace,
                             .residual_time_constant_s = spec.residual_time_constant_s}),
        intercept_(spec.intercept),
        learn_s_(spec.learn_s),
        x_(spec.regressors.size() + (spec.intercept ? 1 : 0)) {}

  bool update(std::span<const double> in, core::SensorTime t, std::span<double> out) override {
    if (!first_) first_ = t;
    std::size_t j = 0;
    if (intercept_) x_[j++] = 1.0;
    for (std::size_t i = 1; i < in.size(); ++i) x_[j++] = in[i];
    if (learn_s_ > 0 && core::seconds_between(*first_, t) >= learn_s_) rls_.freeze(true);
    const auto step = rls_.update(x_, in[0], t);
    if (!step.accepted) return false;
    out[0] = step.prediction;
    out[1] = step.residual;
    out[2] = step.prediction != 0 ? 100.0 * step.residual / step.prediction : 0.0;
    return true;
  }
  void save(StateWriter& out) const override {
    put(out, rls_.state());
    out.put_optional_time(first_);
  }
  bool load(StateReader& in) override {
    core::Rls::State state;
    if (!get(in, state)) return false;
    const std::size_t n = rls_.regressors();
    if (state.coefficients.size() != n || state.covariance.size() != n * n) return false;
    rls_.restore(state);
    first_ = in.get_optional_time();
    return in.ok();
  }

 private:
  core::Rls rls_;
  bool intercept_;
  double learn_s_;
  std::vector<double> x_;  // regressor buffer, sized once
  std::optional<core::SensorTime> first_;
};

// Trends and rates speak only after one time constant of data: a line fitted to the first few
// samples is too confident about where it is heading.
class WarmUp {
 public:
  explicit WarmUp(double seconds) : seconds_(seconds) {}
  bool over(core::SensorTime t) {
    if (!first_) first_ = t;
    return core::seconds_between(*first_, t) >= seconds_;
  }
  void save(StateWriter& out) const { out.put_optional_time(first_); }
  bool load(StateReader& in) {
    first_ = in.get_optional_time();
    return in.ok();
  }

 private:
  double seconds_;
  std::optional<core::SensorTime> first_;
};

class TrendNode final : public EstimatorNode {
 public:
  explicit TrendNode(const TrendSpec& spec)
      : trend_(spec.time_constant_s), warm_up_(spec.time_constant_s) {}
  bool update(std::span<const double> in, core::SensorTime t, std::span<double> out) override {
    trend_.update(in[0], t);
    ready_ = warm_up_.over(t) && trend_.primed();
    if (!ready_) return false;
    out[0] = trend_.level_at(t);
    out[1] = trend_.slope_per_second() * kSecondsPerHour;
    return true;
  }
  std::optional<core::TimeToLimit> time_to_limit(double limit, core::LimitSide side,
                                                 core::SensorTime now) const override {
    if (!ready_) return std::nullopt;
    return trend_.time_to_limit(limit, now, side);
  }
  void save(StateWriter& out) const override {
    put(out, trend_.state());
    warm_up_.save(out);
    out.put_bool(ready_);
  }
  bool load(StateReader& in) override {
    core::LinearTrend::State state;
    if (!get(in, state) || !warm_up_.load(in)) return false;
    trend_.restore(state);
    ready_ = in.get_bool();
    return in.ok();
  }

 private:
  core::LinearTrend trend_;
  WarmUp warm_up_;
  bool ready_ = false;
};

class RateNode final : public EstimatorNode {
 public:
  explicit RateNode(const RateSpec& spec)
      : rate_(spec.time_constant_s), warm_up_(spec.time_constant_s) {}
  bool update(std::span<const double> in, core::SensorTime t, std::span<double> out) override {
    rate_.update(in[0], t);
    if (!warm_up_.over(t) || !rate_.primed()) return false;
    out[0] = rate_.per_hour();
    return true;
  }
  void save(StateWriter& out) const override {
    put(out, rate_.state());
    warm_up_.save(out);
  }
  bool load(StateReader& in) override {
    core::RateOfChange::State state;
    if (!get(in, state) || !warm_up_.load(in)) return false;
    rate_.restore(state);
    return true;
  }

 private:
  core::RateOfChange rate_;
  WarmUp warm_up_;
};

// The Hall plot speaks once its fit is primed and a baseline slope has been taken: the slope
// reached after `learn_s` seconds of data, when the well is taken to be as it should be.
class HallNode final : public EstimatorNode {
 public:
  explicit HallNode(const HallSpec& spec)
      : plot_(core::HallPlot::Options{
            .reference_pressure_psi = spec.reference_pressure_psi,
            .window = spec.window,
            .basis = spec.basis == HallWindowBasis::time ? core::HallPlot::WindowBasis::time
                                                         : core::HallPlot::WindowBasis::volume,
            .max_interval_s = spec.max_interval_s}),
        learn_(spec.learn_s) {}

  bool update(std::span<const double> in, core::SensorTime t, std::span<double> out) override {
    plot_.update(in[0], in[1], t);
    const bool learned = learn_.over(t);
    if (!plot_.primed()) return false;
    const double slope = plot_.slope_psi_day_per_bbl();
    // A baseline must be a well taking water: a non-positive slope is no reference to judge by.
    if (std::isnan(baseline_slope_) && learned && slope > 0) baseline_slope_ = slope;
    if (std::isnan(baseline_slope_)) return false;
    out[0] = plot_.integral_psi_day();
    out[1] = plot_.cumulative_volume_bbl();
    out[2] = slope;
    out[3] = plot_.injectivity_index();
    out[4] = 100.0 * (slope / baseline_slope_ - 1.0);
    return true;
  }
  void save(StateWriter& out) const override {
    put(out, plot_.state());
    learn_.save(out);
    out.put_double(baseline_slope_);
  }
  bool load(StateReader& in) override {
    core::HallPlot::State state;
    if (!get(in, state) || !learn_.load(in)) return false;
    plot_.restore(state);
    baseline_slope_ = in.get_double();
    return in.ok();
  }

 private:
  core::HallPlot plot_;
  WarmUp learn_;
  double baseline_slope_ = std::numeric_limits<double>::quiet_NaN();
};


std::string unit_at(std::span<const std::string> units, std::size_t i) {
  return i < units.size() ? units[i] : std::string();
}

// "bbl/d" -> "bbl": the volume unit of a flow unit.
std::string volume_unit_of(const std::string& flow_unit) {
  return flow_unit.substr(0, flow_unit.find('/'));
}

class FilterLifeNode final : public EstimatorNode {
 public:
  FilterLifeNode(const FilterLifeSpec& spec, std::span<const std::string> units)
      : life_(core::FilterLife::Options{.memory_s = spec.memory_s,
                                        .drop_fraction = spec.drop_fraction,
                                        .confirm_s = spec.confirm_s,
                                        .stop_gap_s = spec.stop_gap_s,
                                        .flow_time_unit_s = spec.flow_time_unit_s,
                                        .stop_required = spec.stop_required}),
        dp_unit_(unit_at(units, 0)),
        volume_unit_(volume_unit_of(unit_at(units, 1))) {}

  bool update(std::span<const double> in, core::SensorTime t, std::span<double> out) override {
    changed_ = life_.update(in[0], in[1], t);
    if (changed_) record_ = record_of(*changed_);
    out[0] = life_.reference_level();
    out[1] = life_.online_hours();
    out[2] = life_.throughput();
    out[3] = life_.days_in_service(t);
    out[4] = life_.unexplained_drop() ? 1.0 : 0.0;
    out[5] = static_cast<double>(life_.change_outs());
    return true;
  }
  std::optional<RecordContent> take_record() override { return std::exchange(record_, std::nullopt); }
  bool restarts_dependents() const override { return changed_.has_value(); }
  void save(StateWriter& out) const override { put(out, life_.state()); }
  bool load(StateReader& in) override {
    core::FilterLife::State state;
    if (!get(in, state)) return false;
    life_.restore(state);
    changed_.reset();
    record_.reset();
    return true;
  }

 private:
  RecordContent record_of(const core::FilterLife::ChangeOut& c) const {
    return RecordContent{
        .kind = "change_out",
        .time = c.time,
        .period_start = c.life_start,
        .fields = {{"run_life_days", core::seconds_between(c.life_start, c.life_end) / 86400.0, "d"},
                   {"online_hours", c.online_s / 3600.0, "h"},
                   {"throughput", c.throughput, volume_unit_},
                   {"dp_before", c.level_before, dp_unit_},
                   {"dp_after", c.level_after, dp_unit_},
                   {"whole_life_seen", c.life_complete ? 1.0 : 0.0, ""}}};
  }

  core::FilterLife life_;
  std::string dp_unit_;
  std::string volume_unit_;
  std::optional<core::FilterLife::ChangeOut> changed_;
  std::optional<RecordContent> record_;
};

class EpisodeNode final : public EstimatorNode {
 public:
  EpisodeNode(const EpisodeSpec& spec, std::span<const std::string> units)
      : episode_(core::Episode::Options{.start_above = spec.start_above,
                                        .end_below = spec.end_below,
                                        .end_after_s = spec.end_after_s}),
        quantity_unit_(unit_at(units, 0)),
        rate_unit_(unit_at(units, 1)) {}

  bool update(std::span<const double> in, core::SensorTime t, std::span<double> out) override {
    if (auto closed = episode_.update(in[0], in[1], t)) {
      record_ = RecordContent{
          .kind = "episode",
          .time = closed->end,
          .period_start = closed->start,
          .fields = {{"change", closed->change, quantity_unit_},
                     {"hours", core::seconds_between(closed->start, closed->end) / 3600.0, "h"},
                     {"peak_rate", closed->peak_rate, rate_unit_}}};
    }
    out[0] = episode_.active() ? 1.0 : 0.0;
    out[1] = episode_.active() ? episode_.change() : 0.0;
    out[2] = episode_.hours_active(t);
    out[3] = episode_.peak_rate();
    return true;
  }
  std::optional<RecordContent> take_record() override { return std::exchange(record_, std::nullopt); }
  void save(StateWriter& out) const override { put(out, episode_.state()); }
  bool load(StateReader& in) override {
    core::Episode::State state;
    if (!get(in, state)) return false;
    episode_.restore(state);
    record_.reset();
    return true;
  }

 private:
  core::Episode episode_;
  std::string quantity_unit_;
  std::string rate_unit_;
  std::optional<RecordContent> record_;
};

}  // namespace

std::unique_ptr<EstimatorNode> make_estimator_node(const EstimatorKind& spec,
                                                   std::span<const std::string> input_units) {
  return std::visit(
      core::Overloaded{
          [](const EwmaSpec& s) -> std::unique_ptr<EstimatorNode> { return std::make_unique<EwmaNode>(s); },
          [](const CusumSpec& s) -> std::unique_ptr<EstimatorNode> { return std::make_unique<CusumNode>(s); },
          [](const EwmaChartSpec& s) -> std::unique_ptr<EstimatorNode> { return std::make_unique<EwmaChartNode>(s); },
          [](const RlsSpec& s) -> std::unique_ptr<EstimatorNode> { return std::make_unique<RlsNode>(s); },
          [](const TrendSpec& s) -> std::unique_ptr<EstimatorNode> { return std::make_unique<TrendNode>(s); },
          [](const RateSpec& s) -> std::unique_ptr<EstimatorNode> { return std::make_unique<RateNode>(s); },
          [](const HallSpec& s) -> std::unique_ptr<EstimatorNode> { return std::make_unique<HallNode>(s); },
          [&](const FilterLifeSpec& s) -> std::unique_ptr<EstimatorNode> {
            return std::make_unique<FilterLifeNode>(s, input_units);
          },
          [&](const EpisodeSpec& s) -> std::unique_ptr<EstimatorNode> {
            return std::make_unique<EpisodeNode>(s, input_units);
          },
      },
      spec);
}

}  // namespace bw::engine
