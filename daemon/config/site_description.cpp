#include "config/site_description.h"

#include <sstream>

#include "config/quantity.h"
#include "config/schema.h"
#include "core/overloaded.h"
#include "engine/asset_graph.h"
#include "engine/check_settings.h"

namespace bw::config {
namespace {

using core::Overloaded;

std::string join(const std::vector<std::string>& items, std::string_view separator) {
  std::string out;
  for (const auto& item : items) out += (out.empty() ? "" : std::string(separator)) + item;
  return out;
}

// The engineering unit of a signal reference, as far as the asset tells it; empty if unknown.
std::string unit_of(const engine::AssetSpec& asset, const std::string& ref) {
  const auto dot = ref.find('.');
  const std::string head = ref.substr(0, dot);
  for (const auto& input : asset.inputs) {
    if (input.role == head) return input.unit;
  }
  for (const auto& signal : asset.signals) {
    if (signal.name == head) return signal.unit;
  }
  if (dot == std::string::npos) return "";
  for (const auto& e : asset.estimators) {
    if (e.name != head) continue;
    const std::string output = ref.substr(dot + 1);
    std::vector<std::string> input_units;
    for (const auto& input : engine::estimator_inputs(e.kind)) {
      input_units.push_back(unit_of(asset, input));
    }
    return engine::estimator_output_unit(output, input_units);
  }
  return "";
}

std::string with_unit(double value, const std::string& unit) {
  return format_number(value) + (unit.empty() ? "" : " " + unit);
}

std::string describe_baseline(const engine::BaselineSpec& b) {
  std::string out = "baseline ";
  out += b.target ? "target " + format_number(*b.target) : "target learned";
  out += b.sigma ? ", sigma " + format_number(*b.sigma) : ", sigma learned";
  if (b.learn_s > 0) out += " over the first " + format_duration(b.learn_s);
  return out;
}

std::string describe_signal(const engine::SignalSpec& s) {
  std::string out = "signal " + s.name + " [" + s.unit +
                    "] = " + std::string(engine::signal_op_name(s.op)) + "(" +
                    join(s.operands, ", ") + ")";
  if (s.op == engine::SignalOp::linear) {
    out += ", gain " + format_number(s.gain) + ", offset " + format_number(s.offset);
  }
  if (s.op == engine::SignalOp::ratio && s.exponent != 1.0) {
    out += ", exponent " + format_number(s.exponent);
  }
  if (s.op == engine::SignalOp::gate) out += ", while above " + format_number(s.above);
  if (s.op == engine::SignalOp::ratio && s.reference != 1.0) {
    out += ", referred to " + format_number(s.reference);
  }
  if (s.op == engine::SignalOp::tank_volume && s.strapping_table) {
    const auto& points = s.strapping_table->points();
    out += ", strapping table of " + std::to_string(points.size()) + " points, " +
           format_number(points.front().level_ft) + " to " + format_number(points.back().level_ft) +
           " ft (straight-line beyond)";
  } else if (s.op == engine::SignalOp::tank_volume && s.diameter_ft) {
    out += ", vertical cylinder " + format_number(*s.diameter_ft) + " ft inside diameter";
  }
  return out;
}

std::string describe_estimator(const engine::EstimatorSpec& e) {
  const std::string head = "estimator " + e.name + ": " +
                           std::string(engine::estimator_kind_name(e.kind)) + " of " +
                           join(engine::estimator_inputs(e.kind), ", ");
  const std::string details = std::visit(
      Overloaded{
          [](const engine::EwmaSpec& s) {
            return "time constant " + format_duration(s.time_constant_s);
          },
          [](const engine::CusumSpec& s) {
            return "k " + format_number(s.k) + ", h " + format_number(s.h) + ", head start " +
                   format_number(s.head_start) + ", " + describe_baseline(s.baseline);
          },
          [](const engine::EwmaChartSpec& s) {
            return "lambda " + format_number(s.lambda) + " per " +
                   format_duration(s.nominal_interval_s) + ", L " + format_number(s.width) +
                   (s.time_varying_limits ? " (time-varying limits), " : ", ") +
                   describe_baseline(s.baseline);
          },
          [](const engine::RlsSpec& s) {
            return std::string(s.intercept ? "with intercept" : "no intercept") + ", forgetting " +
                   format_number(s.forgetting) + " per " + format_duration(s.nominal_interval_s) +
                   (s.learn_s > 0 ? ", frozen after " + format_duration(s.learn_s) : "");
          },
          [](const engine::TrendSpec& s) {
            return s.time_constant_s > 0 ? "time constant " + format_duration(s.time_constant_s)
                                         : std::string("no forgetting");
          },
          [](const engine::RateSpec& s) {
            return "time constant " + format_duration(s.time_constant_s);
          },
          [](const engine::HallSpec& s) {
            const bool volume = s.basis == engine::HallWindowBasis::volume;
            return "reference pressure " + format_number(s.reference_pressure_psi) + " psi, " +
                   (s.window > 0 ? "window " + format_number(s.window) + (volume ? " bbl" : " d")
                                 : std::string("whole history")) +
                   ", baseline slope after " + format_duration(s.learn_s);
          },
          [](const engine::FilterLifeSpec& s) {
            return "drop of " + format_number(100 * s.drop_fraction) + " % confirmed over " +
                   format_duration(s.confirm_s) + ", stop after a gap of " +
                   format_duration(s.stop_gap_s) +
                   (s.stop_required ? ", change-outs need a stop" : ", any drop is a change-out") +
                   ", reference time constant " + format_duration(s.memory_s);
          },
          [](const engine::EpisodeSpec& s) {
            return "starts above " + format_number(s.start_above) + ", ends below " +
                   format_number(s.end_below) + " for " + format_duration(s.end_after_s);
          },
      },
      e.kind);
  return head + "; " + details + (e.restart_on.empty() ? "" : "; restarts on " + e.restart_on);
}

std::string describe_limit(const engine::AssetSpec& asset, const engine::LimitCheckSpec& s) {
  const std::string unit = unit_of(asset, s.of);
  std::string out = "limit on " + s.of + ", " + std::string(direction_name(s.direction)) + " " +
                    with_unit(s.limit, unit);
  const auto settings = engine::limit_settings(asset, s);
  if (!settings) return out;
  out += " (deadband " + with_unit(settings->deadband, unit);
  if (settings->on_delay_s > 0 || settings->off_delay_s > 0) {
    out += ", on-delay " + format_duration(settings->on_delay_s) + ", off-delay " +
           format_duration(settings->off_delay_s);
  }
  return out + ")";
}

std::string describe_check(const engine::AssetSpec& asset, const engine::CheckSpec& c) {
  const std::string body = std::visit(
      Overloaded{
          [&](const engine::LimitCheckSpec& s) { return describe_limit(asset, s); },
          [&](const engine::RateCheckSpec& s) {
            const std::string unit = unit_of(asset, s.of) + "/h";
            return "rate of change of " + s.of + ", " +
                   (s.direction == engine::RateDirection::rising ? "rising faster than "
                                                                 : "falling faster than ") +
                   with_unit(s.limit, unit) + " over " + format_duration(s.horizon_s) +
                   " (deadband " + with_unit(s.deadband, unit) + ", on-delay " +
                   format_duration(s.on_delay_s) + ", off-delay " + format_duration(s.off_delay_s) +
                   ")";
          },
          [](const engine::StatisticalCheckSpec& s) {
            return "statistical, when estimator " + s.estimator + " signals";
          },
          [&](const engine::TimeToLimitCheckSpec& s) {
            return "time to limit, when trend " + s.estimator +
                   (s.direction == engine::LimitDirection::low ? " will fall to "
                                                               : " will reach ") +
                   with_unit(s.limit, unit_of(asset, s.estimator + ".level")) + " within " +
                   format_duration(s.lead_time_s);
          },
          [&](const engine::StaleCheckSpec& s) {
            const auto* input = engine::find_input(asset, s.of);
            const double interval = input != nullptr ? input->expected_interval_s : 0;
            return "stale, when " + s.of + " has no sample for " +
                   format_duration(s.factor * interval) + " (" + format_number(s.factor) + " x " +
                   format_duration(interval) + ")";
          },
          [&](const engine::FlatlineCheckSpec& s) {
            const std::string unit = unit_of(asset, s.of);
            return "flatline, when " + s.of +
                   (s.tolerance > 0 ? " moves less than " + with_unit(s.tolerance, unit)
                                    : std::string(" repeats one value")) +
                   " for " + format_duration(s.window_s) +
                   (s.at_rest_up_to
                        ? " (at or below " + with_unit(*s.at_rest_up_to, unit) + ": at rest)"
                        : std::string());
          },
          [](const engine::OutOfRangeCheckSpec& s) {
            return "out of range, when " + s.of + " leaves its range" +
                   (s.margin_percent > 0
                        ? " by more than " + format_number(s.margin_percent) + " % of span"
                        : std::string());
          },
          [](const engine::Ne43CheckSpec& s) {
            return "NE 43 failure signal on " + s.of + " (at or below 3.6 mA, at or above 21 mA)";
          },
      },
      c.kind);
  std::string out =
      "check " + c.name + ": " + body + ", priority " + std::string(priority_name(c.priority));
  if (c.latching) out += ", latching";
  if (c.suppressed_when) {
    const auto& w = *c.suppressed_when;
    out += ", suppressed while " + w.of +
           (w.when == engine::LimitDirection::low ? " below " : " above ") +
           with_unit(w.threshold, unit_of(asset, w.of));
  }
  return out + ": \"" + c.message + "\"";
}

std::string describe_record(const engine::AssetSpec& asset, const engine::RecordSpec& r) {
  const auto period = kRecordPeriodNames[static_cast<std::size_t>(r.period)].first;
  std::string out = "record " + r.name + ": " + std::string(period) + ", the day starting " +
                    format_duration(r.day_start_s) + " after local midnight;";
  for (const auto& f : r.fields) {
    const auto stat = kRecordStatNames[static_cast<std::size_t>(f.stat)].first;
    out += " " + f.name + " = " + std::string(stat) + " of " + f.of;
    if (f.stat == engine::RecordStat::total) out += " [" + f.unit + "]";
    if (f.above) out += " above " + with_unit(*f.above, unit_of(asset, f.of));
    out += ",";
  }
  return out + " " + engine::kCoveredHoursField;
}

void describe_asset(std::ostringstream& out, const engine::AssetSpec& asset) {
  out << "\nasset " << asset.name << " (template " << asset.template_name << ")";
  if (!asset.description.empty()) out << ": " << asset.description;
  out << "\n  tags:\n";
  for (const auto& input : asset.inputs) {
    if (input.tag.empty()) {
      out << "    (" << input.role << " [" << input.unit << "] not bound, optional)\n";
    } else {
      out << "    " << input.tag << " -> " << input.role << " [" << input.unit << "]\n";
    }
  }
  out << "  evaluation order:\n";
  for (const auto& node : engine::analyse_asset(asset).order) {
    const bool is_signal = node.kind == engine::GraphNode::Kind::signal;
    out << "    "
        << (is_signal ? describe_signal(asset.signals[node.index])
                      : describe_estimator(asset.estimators[node.index]))
        << "\n";
  }
  out << "  checks:\n";
  for (const auto& check : asset.checks) out << "    " << describe_check(asset, check) << "\n";
  if (asset.records.empty()) return;
  out << "  records:\n";
  for (const auto& record : asset.records) out << "    " << describe_record(asset, record) << "\n";
}

}  // namespace

std::string describe_site(const engine::SiteSpec& site) {
  std::ostringstream out;
  out << "site " << site.name << " (time zone " << site.time_zone << "), " << site.assets.size()
      << (site.assets.size() == 1 ? " asset" : " assets");
  if (!site.file.empty()) out << ", from " << site.file;
  out << "\n";
  for (const auto& asset : site.assets) describe_asset(out, asset);
  return out.str();
}

}  // namespace bw::config
