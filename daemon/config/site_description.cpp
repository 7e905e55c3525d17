#include "config/site_description.h"

#include <sstream>

#include "config/quantity.h"
#include "config/schema.h"
#include "core/overloaded.h"
#include "engine/asset_graph.h"

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
    const auto inputs = engine::estimator_inputs(e.kind);
    const std::string base = inputs.empty() ? "" : unit_of(asset, inputs.front());
    if (output == "per_hour" || output == "slope_per_hour") return base + "/h";
    if (output == "residual_percent") return "%";
    if (output == "upper" || output == "lower") return "sigma";
    return base;
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
      },
      e.kind);
  return head + "; " + details;
}

std::string describe_check(const engine::AssetSpec& asset, const engine::CheckSpec& c) {
  const std::string body = std::visit(
      Overloaded{
          [&](const engine::LimitCheckSpec& s) {
            const std::string unit = unit_of(asset, s.of);
            return "limit on " + s.of + ", " + std::string(direction_name(s.direction)) + " " +
                   with_unit(s.limit, unit) + " (deadband " + with_unit(s.deadband, unit) + ")";
          },
          [](const engine::StatisticalCheckSpec& s) {
            return "statistical, when estimator " + s.estimator + " signals";
          },
          [&](const engine::TimeToLimitCheckSpec& s) {
            return "time to limit, when trend " + s.estimator +
                   (s.direction == engine::LimitDirection::low ? " will fall to " : " will reach ") +
                   with_unit(s.limit, unit_of(asset, s.estimator + ".level")) + " within " +
                   format_duration(s.lead_time_s);
          },
      },
      c.kind);
  return "check " + c.name + ": " + body + ", priority " + std::string(priority_name(c.priority)) +
         ": \"" + c.message + "\"";
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
