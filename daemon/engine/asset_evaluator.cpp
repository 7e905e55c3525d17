#include "engine/asset_evaluator.h"

#include <algorithm>
#include <cassert>
#include <chrono>
#include <cmath>

#include "core/overloaded.h"
#include "engine/check_settings.h"
#include "engine/threshold_condition.h"

namespace bw::engine {
namespace {

// Layout of save(); bump when it changes.
constexpr std::uint8_t kStateVersion = 2;
constexpr std::string_view kQualityMessage = "Bad quality from the instrument";

core::Micros micros(double seconds) {
  return std::chrono::duration_cast<core::Micros>(std::chrono::duration<double>(seconds));
}

std::string quality_words(Quality quality, double value) {
  if (quality == Quality::bad) return "quality bad";
  if (quality == Quality::uncertain) return "quality uncertain";
  return std::isnan(value) ? "value is not a number" : "value is infinite";
}

void put_forecast(StateWriter& out, const std::optional<Forecast>& forecast) {
  out.put_bool(forecast.has_value());
  if (!forecast) return;
  out.put_time(forecast->crossing);
  out.put_time(forecast->crossing_early);
  out.put_optional_time(forecast->crossing_late);
  out.put_double(forecast->limit);
}

std::optional<Forecast> get_forecast(StateReader& in) {
  if (!in.get_bool()) return std::nullopt;
  Forecast forecast;
  forecast.crossing = in.get_time();
  forecast.crossing_early = in.get_time();
  forecast.crossing_late = in.get_optional_time();
  forecast.limit = in.get_double();
  return forecast;
}

}  // namespace

AssetEvaluator::AssetEvaluator(const AssetSpec& spec, std::string_view site_name,
                               LocalCalendar* calendar)
    : spec_(spec),
      site_name_(site_name),
      signals_(spec),
      calendar_(calendar != nullptr ? *calendar : utc_calendar_) {
  compile();
  compile_records();
}

void AssetEvaluator::compile_records() {
  std::vector<std::vector<std::uint8_t>> reached;
  for (std::size_t i = 0; i < spec_.inputs.size(); ++i) reached.push_back(signals_.reached_from(i));
  records_.reserve(spec_.records.size());
  for (const RecordSpec& spec : spec_.records) {
    std::vector<std::string> units;
    std::vector<std::size_t> slots;
    std::vector<std::vector<std::size_t>> inputs;
    for (const RecordFieldSpec& field : spec.fields) {
      const std::size_t slot = signals_.slot_of(field.of);
      slots.push_back(slot);
      units.push_back(signals_.unit(slot));
      auto& from = inputs.emplace_back();
      for (std::size_t i = 0; i < reached.size(); ++i) {
        if (reached[i][slot]) from.push_back(i);
      }
    }
    records_.push_back({PeriodicRecord(spec, std::move(units), calendar_), std::move(slots),
                        std::move(inputs)});
  }
}

void AssetEvaluator::compile() {
  inputs_.resize(spec_.inputs.size());
  for (std::size_t i = 0; i < spec_.inputs.size(); ++i) {
    const InputSpec& input = spec_.inputs[i];
    if (input.tag.empty()) continue;
    inputs_[i].quality_check = quality_check_name(input.role);
    if (input.expected_interval_s <= 0) continue;
    double factor = kDefaultStaleFactor;
    for (const auto& check : spec_.checks) {
      if (const auto* stale = std::get_if<StaleCheckSpec>(&check.kind);
          stale && stale->of == input.role) {
        factor = std::min(factor, stale->factor);
      }
    }
    inputs_[i].silence = micros(factor * input.expected_interval_s);
  }

  checks_.resize(spec_.checks.size());
  for (std::size_t c = 0; c < spec_.checks.size(); ++c) {
    const CheckSpec& check = spec_.checks[c];
    CheckStep& step = checks_[c];
    step.spec_index = c;
    std::size_t watched = 0;
    CheckSources sources;
    std::visit(
        core::Overloaded{
            [&](const LimitCheckSpec& s) { watched = step.trigger_slot = signals_.slot_of(s.of); },
            [&](const RateCheckSpec& s) { watched = step.trigger_slot = signals_.slot_of(s.of); },
            [&](const StatisticalCheckSpec& s) {
              const auto ref = signals_.estimator(s.estimator);
              step.trigger_slot = ref.first_output_slot;
              watched = ref.watched_slot;
              sources.estimator = ref.node;
            },
            [&](const TimeToLimitCheckSpec& s) {
              const auto ref = signals_.estimator(s.estimator);
              step.trigger_slot = ref.first_output_slot;
              watched = ref.watched_slot;
              sources.estimator = ref.node;
            },
            [&](const StaleCheckSpec& s) {
              watched = step.trigger_slot = signals_.slot_of(s.of);
              step.heard_input = watched;  // an input's slot is its index
              sources.heard = &inputs_[watched].heard;
            },
            [&](const auto& s) { watched = step.trigger_slot = signals_.slot_of(s.of); },
        },
        check.kind);
    sources.value = signals_.value_pointer(watched);
    sources.unit = signals_.unit(watched);
    step.unit = signals_.unit(watched);
    if (std::holds_alternative<RateCheckSpec>(check.kind)) step.unit += "/h";
    step.node = make_check_node(spec_, check, sources);
    if (check.suppressed_when) step.suppression_slot = signals_.slot_of(check.suppressed_when->of);
  }

  check_plans_.resize(spec_.inputs.size());
  for (std::size_t i = 0; i < spec_.inputs.size(); ++i) {
    const auto reached = signals_.reached_from(i);
    for (std::size_t c = 0; c < checks_.size(); ++c) {
      CheckStep& step = checks_[c];
      if (!reached[step.trigger_slot]) continue;
      if (step.node->held_by_bad_data()) step.inputs.push_back(i);
      if (!step.heard_input) check_plans_[i].push_back(c);
    }
  }
  for (CheckStep& step : checks_) {
    const std::size_t first = step.heard_input      ? *step.heard_input
                              : step.inputs.empty() ? spec_.inputs.size()
                                                    : step.inputs.front();
    if (first < spec_.inputs.size()) step.tag = spec_.inputs[first].tag;
  }
}

std::vector<AssetEvaluator::CheckInfo> AssetEvaluator::checks() const {
  std::vector<CheckInfo> out;
  for (const auto& check : spec_.checks)
    out.push_back({check.name, check.priority, check.latching});
  for (const auto& input : inputs_) {
    if (!input.quality_check.empty()) out.push_back({input.quality_check, Priority::low, false});
  }
  return out;
}

void AssetEvaluator::start_clock(core::SensorTime t) {
  if (started_) return;
  started_ = t;
  for (auto& input : inputs_) input.heard = t;
  for (auto& step : records_) step.record.start(t);
}

void AssetEvaluator::accumulate_records(core::SensorTime t) {
  for (auto& step : records_) step.record.accumulate(t);
}

void AssetEvaluator::hold_records() {
  for (auto& step : records_) {
    for (std::size_t f = 0; f < step.slots.size(); ++f) {
      const std::size_t slot = step.slots[f];
      const bool inputs_ok = std::all_of(
          step.inputs[f].begin(), step.inputs[f].end(),
          [&](std::size_t i) { return inputs_[i].usable && !inputs_[i].silent; });
      step.record.hold(f, signals_.value(slot), inputs_ok && signals_.has_value(slot));
    }
  }
}

void AssetEvaluator::report_estimator_records(ConditionSink& sink) {
  auto& records = signals_.records();
  if (records.empty()) return;
  for (auto& r : records) {
    sink.on_record({site_name_, spec_.name, spec_.estimators[r.estimator].name,
                    std::move(r.content)});
  }
  signals_.clear_records();
}

bool AssetEvaluator::held(const CheckStep& check) const {
  return std::any_of(check.inputs.begin(), check.inputs.end(),
                     [&](std::size_t i) { return !inputs_[i].usable || inputs_[i].silent; });
}

void AssetEvaluator::hold_dependents(std::size_t input) {
  for (auto& check : checks_) {
    if (std::find(check.inputs.begin(), check.inputs.end(), input) != check.inputs.end()) {
      check.node->cancel_pending();
    }
  }
}

void AssetEvaluator::on_sample(std::size_t input_index, double value, Quality quality,
                               core::SensorTime t, std::string_view tag, ConditionSink& sink) {
  assert(input_index < inputs_.size());
  advance(t, sink);
  accumulate_records(t);
  InputState& input = inputs_[input_index];
  input.heard = t;
  input.silent = false;
  const bool usable = quality == Quality::good && std::isfinite(value);
  if (usable) {
    signals_.set_input(input_index, value, t);
  } else {
    signals_.begin_pass();
  }
  for (auto& check : checks_) {
    if (check.heard_input != input_index) continue;
    if (auto outcome = check.node->evaluate(t)) publish(check, std::move(*outcome), t, tag, sink);
  }
  note_quality(input_index, usable, value, quality, t, sink);
  // Suppression first, so that a check suppressed by this very sample does not report.
  for (auto& check : checks_) {
    if (check.suppression_slot && signals_.fresh(*check.suppression_slot)) {
      update_suppression(check, t, tag, sink);
    }
  }
  for (std::size_t c : check_plans_[input_index]) {
    CheckStep& check = checks_[c];
    if (!signals_.fresh(check.trigger_slot) || held(check)) continue;
    if (auto outcome = check.node->evaluate(t)) publish(check, std::move(*outcome), t, tag, sink);
  }
  hold_records();
  report_estimator_records(sink);
  deadlines_changed_ = true;  // a sample may start or cancel delays and silences
}

void AssetEvaluator::advance(core::SensorTime now, ConditionSink& sink) {
  start_clock(now);
  // Nothing changed since the last scan and nothing falls due yet: the common case, per sample.
  if (!deadlines_changed_ && (!next_due_ || now < *next_due_)) return;
  for (;;) {
    enum class Due : std::uint8_t { check, input, record };
    std::optional<core::SensorTime> earliest;
    std::size_t index = 0;
    Due what = Due::check;
    auto consider = [&](core::SensorTime due, std::size_t i, Due kind) {
      if (due <= now && (!earliest || due < *earliest)) {
        earliest = due;
        index = i;
        what = kind;
      }
    };
    // Checks first: on a tie a delay runs out on data that were still fresh until that moment.
    for (std::size_t c = 0; c < checks_.size(); ++c) {
      if (held(checks_[c])) continue;
      if (auto due = checks_[c].node->deadline()) consider(*due, c, Due::check);
    }
    for (std::size_t i = 0; i < inputs_.size(); ++i) {
      const InputState& input = inputs_[i];
      if (input.silence.count() > 0 && !input.silent)
        consider(input.heard + input.silence, i, Due::input);
    }
    for (std::size_t r = 0; r < records_.size(); ++r) {
      if (auto due = records_[r].record.deadline()) consider(*due, r, Due::record);
    }
    if (!earliest) {
      remember_next_due();
      return;
    }
    accumulate_records(*earliest);
    if (what == Due::input) {
      inputs_[index].silent = true;
      hold_dependents(index);
      hold_records();
      continue;
    }
    if (what == Due::record) {
      PeriodicRecord& record = records_[index].record;
      sink.on_record({site_name_, spec_.name, record.spec().name, record.close()});
      continue;
    }
    CheckStep& check = checks_[index];
    auto outcome = check.node->expire(*earliest);
    assert(!check.node->deadline() || *check.node->deadline() > *earliest);
    if (outcome) publish(check, std::move(*outcome), *earliest, check.tag, sink);
  }
}

void AssetEvaluator::remember_next_due() {
  next_due_.reset();
  auto keep = [&](core::SensorTime due) {
    if (!next_due_ || due < *next_due_) next_due_ = due;
  };
  for (const auto& check : checks_) {
    if (held(check)) continue;
    if (auto due = check.node->deadline()) keep(*due);
  }
  for (const auto& input : inputs_) {
    if (input.silence.count() > 0 && !input.silent) keep(input.heard + input.silence);
  }
  for (const auto& step : records_) {
    if (auto due = step.record.deadline()) keep(*due);
  }
  deadlines_changed_ = false;
}

void AssetEvaluator::note_quality(std::size_t input_index, bool usable, double value,
                                  Quality quality, core::SensorTime t, ConditionSink& sink) {
  InputState& input = inputs_[input_index];
  const bool was_usable = input.usable;
  input.usable = usable;
  if (was_usable && !usable) hold_dependents(input_index);
  if (input.quality_check.empty() || input.quality_active == !usable) return;
  input.quality_active = !usable;
  const InputSpec& spec = spec_.inputs[input_index];
  ConditionChange change;
  change.kind = ConditionChange::Kind::condition;
  change.active = !usable;
  change.time = t;
  change.check = input.quality_check;
  change.priority = Priority::low;
  change.message = kQualityMessage;
  change.value = signals_.value(input_index);
  change.unit = spec.unit;
  change.tag = spec.tag;
  change.detail = usable ? "good samples again" : quality_words(quality, value);
  sink.on_change(spec_.name, change);
}

void AssetEvaluator::update_suppression(CheckStep& check, core::SensorTime t, std::string_view tag,
                                        ConditionSink& sink) {
  const CheckSpec& spec = spec_.checks[check.spec_index];
  const SuppressionSpec& when = *spec.suppressed_when;
  const std::size_t slot = *check.suppression_slot;
  const double v = signals_.value(slot);
  const bool below = when.when == LimitDirection::low;
  const bool suppress = below ? v < when.threshold : v > when.threshold;
  if (suppress == check.suppressed) return;
  check.suppressed = suppress;
  ConditionChange change;
  change.kind = ConditionChange::Kind::suppression;
  change.active = suppress;
  change.time = t;
  change.check = spec.name;
  change.priority = spec.priority;
  change.message = spec.message;
  change.value = v;
  change.unit = signals_.unit(slot);
  change.tag = tag;
  change.detail = when.of + " " + figure(v, change.unit) + (suppress ? " " : " no longer ") +
                  (below ? "below " : "above ") + figure(when.threshold, change.unit);
  sink.on_change(spec_.name, change);
  if (!suppress && check.node->active() != check.reported) {
    check.reported = check.node->active();
    emit_condition(check, t, tag, sink);
  }
}

void AssetEvaluator::publish(CheckStep& check, CheckOutcome outcome, core::SensorTime t,
                             std::string_view tag, ConditionSink& sink) {
  check.last = std::move(outcome);
  if (check.suppressed || check.last.active == check.reported) return;
  check.reported = check.last.active;
  emit_condition(check, t, tag, sink);
}

void AssetEvaluator::emit_condition(const CheckStep& check, core::SensorTime t,
                                    std::string_view tag, ConditionSink& sink) const {
  const CheckSpec& spec = spec_.checks[check.spec_index];
  ConditionChange change;
  change.kind = ConditionChange::Kind::condition;
  change.active = check.reported;
  change.time = t;
  change.check = spec.name;
  change.priority = spec.priority;
  change.message = spec.message;
  change.value = check.last.value;
  change.unit = check.unit;
  change.tag = tag;
  change.detail = check.last.detail;
  change.forecast = check.last.forecast;
  // A stale tag is raised by time passing without a sample; everything else by a sample.
  const bool silence = std::holds_alternative<StaleCheckSpec>(spec.kind) && check.reported;
  change.cause = silence ? TransitionCause::silence : TransitionCause::sample;
  sink.on_change(spec_.name, change);
}

void AssetEvaluator::save(StateWriter& out) const {
  out.put_u8(kStateVersion);
  signals_.save(out);
  out.put_optional_time(started_);
  out.put_u64(inputs_.size());
  for (const auto& input : inputs_) {
    out.put_time(input.heard);
    out.put_bool(input.usable);
    out.put_bool(input.silent);
    out.put_bool(input.quality_active);
  }
  out.put_u64(checks_.size());
  for (const auto& check : checks_) {
    check.node->save(out);
    out.put_bool(check.reported);
    out.put_bool(check.suppressed);
    out.put_bool(check.last.active);
    out.put_double(check.last.value);
    out.put_string(check.last.detail);
    put_forecast(out, check.last.forecast);
  }
  out.put_u64(records_.size());
  for (const auto& step : records_) step.record.save(out);
}

bool AssetEvaluator::load(StateReader& in) {
  deadlines_changed_ = true;
  if (in.get_u8() != kStateVersion || !signals_.load(in)) {
    in.fail();
    return false;
  }
  started_ = in.get_optional_time();
  if (in.get_u64() != inputs_.size()) in.fail();
  for (std::size_t i = 0; i < inputs_.size() && in.ok(); ++i) {
    inputs_[i].heard = in.get_time();
    inputs_[i].usable = in.get_bool();
    inputs_[i].silent = in.get_bool();
    inputs_[i].quality_active = in.get_bool();
  }
  if (in.get_u64() != checks_.size()) in.fail();
  for (std::size_t c = 0; c < checks_.size() && in.ok(); ++c) {
    CheckStep& check = checks_[c];
    if (!check.node->load(in)) in.fail();
    check.reported = in.get_bool();
    check.suppressed = in.get_bool();
    check.last.active = in.get_bool();
    check.last.value = in.get_double();
    check.last.detail = in.get_string();
    check.last.forecast = get_forecast(in);
  }
  if (in.get_u64() != records_.size()) in.fail();
  for (std::size_t r = 0; r < records_.size() && in.ok(); ++r) {
    if (!records_[r].record.load(in)) in.fail();
  }
  return in.ok();
}

}  // namespace bw::engine
