#include "io/mqtt/sparkplug.h"

#include <cassert>
#include <cmath>
#include <cstdint>
#include <limits>
#include <map>
#include <unordered_map>
#include <utility>

#include "io/mqtt/sparkplug_b.pb.h"
#include "io/mqtt/tag_template.h"

namespace bw::io::mqtt {
namespace {

namespace pb = sparkplug;
using PbMetric = pb::Payload::Metric;

constexpr std::uint64_t kSeqModulo = 256;
constexpr std::string_view kBdSeq = "bdSeq";
constexpr std::string_view kNodeControlPrefix = "Node Control/";
constexpr std::string_view kRebirthMetric = "Node Control/Rebirth";
// 9999-12-31T23:59:59.999Z: later millisecond stamps are garbage, and this bound keeps the
// conversion to microseconds from overflowing.
constexpr std::uint64_t kMaxEpochMillis = 253402300799999;

std::uint64_t to_epoch_millis(core::SensorTime t) {
  return static_cast<std::uint64_t>(
      std::chrono::duration_cast<std::chrono::milliseconds>(t.time_since_epoch()).count());
}

std::optional<core::SensorTime> from_epoch_millis(std::uint64_t ms) {
  if (ms > kMaxEpochMillis) return std::nullopt;
  return core::SensorTime(std::chrono::milliseconds(static_cast<std::int64_t>(ms)));
}

// The datatype a birth metric declares, or the one its value field implies.
std::uint32_t birth_datatype(const PbMetric& m) {
  if (m.has_datatype()) return m.datatype();
  switch (m.value_case()) {
    case PbMetric::kIntValue:
      return pb::UInt32;
    case PbMetric::kLongValue:
      return pb::UInt64;
    case PbMetric::kFloatValue:
      return pb::Float;
    case PbMetric::kDoubleValue:
      return pb::Double;
    case PbMetric::kBooleanValue:
      return pb::Boolean;
    default:
      return pb::Unknown;
  }
}

bool is_numeric(std::uint32_t datatype) { return datatype >= pb::Int8 && datatype <= pb::Boolean; }

enum class ValueRead { number, skipped, problem };

// Which value field carries each numeric datatype.
PbMetric::ValueCase value_field(std::uint32_t datatype) {
  switch (datatype) {
    case pb::Int8:
    case pb::Int16:
    case pb::Int32:
    case pb::UInt8:
    case pb::UInt16:
    case pb::UInt32:
      return PbMetric::kIntValue;
    case pb::Int64:
    case pb::UInt64:
      return PbMetric::kLongValue;
    case pb::Float:
      return PbMetric::kFloatValue;
    case pb::Double:
      return PbMetric::kDoubleValue;
    case pb::Boolean:
      return PbMetric::kBooleanValue;
    default:
      return PbMetric::VALUE_NOT_SET;
  }
}

// Reads a metric's value as its datatype says. On `problem`, `why` says which.
ValueRead read_number(const PbMetric& m, std::uint32_t datatype, double& out, Rejection& why) {
  if (m.is_null() || !is_numeric(datatype)) return ValueRead::skipped;
  if (m.value_case() != value_field(datatype)) {
    why = Rejection::not_a_number;
    return ValueRead::problem;
  }
  // Signed kinds travel as two's complement in the unsigned fields; the casts undo it.
  switch (datatype) {
    case pb::Int8:
      out = static_cast<std::int8_t>(m.int_value());
      break;
    case pb::Int16:
      out = static_cast<std::int16_t>(m.int_value());
      break;
    case pb::Int32:
      out = static_cast<std::int32_t>(m.int_value());
      break;
    case pb::Int64:
      out = static_cast<double>(static_cast<std::int64_t>(m.long_value()));
      break;
    case pb::UInt64:
      out = static_cast<double>(m.long_value());
      break;
    case pb::Float:
      out = m.float_value();
      break;
    case pb::Double:
      out = m.double_value();
      break;
    case pb::Boolean:
      out = m.boolean_value() ? 1.0 : 0.0;
      break;
    default:
      out = m.int_value();
      break;  // UInt8, UInt16, UInt32
  }
  if (!std::isfinite(out)) {
    why = Rejection::not_finite;
    return ValueRead::problem;
  }
  return ValueRead::number;
}

struct MetricInfo {
  std::string tag;
  std::uint32_t datatype = pb::Unknown;
  bool emits = false;  // numeric and not housekeeping: has a tag the engine knows
};

// The metrics one birth declared, in birth order, found by alias or by name.
struct MetricTable {
  std::vector<MetricInfo> metrics;
  std::unordered_map<std::uint64_t, std::size_t> by_alias;
  std::unordered_map<std::string, std::size_t> by_name;

  const MetricInfo* find(const PbMetric& m) const {
    if (m.has_alias()) {
      const auto it = by_alias.find(m.alias());
      return it == by_alias.end() ? nullptr : &metrics[it->second];
    }
    if (m.has_name()) {
      const auto it = by_name.find(m.name());
      return it == by_name.end() ? nullptr : &metrics[it->second];
    }
    return nullptr;
  }
};

struct NodeState {
  bool born = false;
  bool stale = false;  // a seq gap since the birth: data dropped until the next NBIRTH
  bool rebirth_requested = false;
  std::uint64_t seq = 0;
  std::optional<std::uint64_t> bd_seq;
  MetricTable metrics;
  std::map<std::string, MetricTable, std::less<>> devices;
};

}  // namespace

struct SparkplugSession::State {
  std::string tag_template;
  DecodeLimits limits;
  std::map<std::pair<std::string, std::string>, NodeState> nodes;  // by (group, node)
};

namespace {

// The work of one on_message call: the message, its node, and where results go.
class MessageHandler {
 public:
  MessageHandler(std::string_view tag_template, const DecodeLimits& limits,
                 const SparkplugTopic& topic, const pb::Payload& payload, core::SensorTime received,
                 NodeState& node, SparkplugSession::Result& result)
      : tag_template_(tag_template),
        limits_(limits),
        topic_(topic),
        payload_(payload),
        received_(received),
        node_(node),
        result_(result) {}

  void handle() {
    const std::string& type = topic_.type;
    if (type == "NBIRTH") return node_birth();
    if (type == "NDEATH") return node_death();
    if (!node_.born) {
      // A DDEATH of an unknown node needs no rebirth: there is nothing of it to keep.
      result_.rejected.add(Rejection::not_born);
      if (type != "DDEATH") request_rebirth();
      return;
    }
    if (node_.stale) return result_.rejected.add(Rejection::out_of_sequence);
    if (!continues_sequence()) {
      node_.stale = true;
      request_rebirth();
      return result_.rejected.add(Rejection::out_of_sequence);
    }
    if (type == "DBIRTH") return device_birth();
    if (type == "NDATA") return data(node_.metrics);
    const auto device = node_.devices.find(topic_.device);
    if (device == node_.devices.end()) {
      result_.rejected.add(Rejection::not_born);
      if (type == "DDATA") request_rebirth();
      return;
    }
    if (type == "DDATA") return data(device->second);
    assert(type == "DDEATH");
    mark_bad(device->second, payload_time());
    node_.devices.erase(device);
  }

 private:
  void node_birth() {
    node_ = NodeState{};
    node_.born = true;
    node_.seq = payload_.seq() % kSeqModulo;
    record_birth(node_.metrics);
    for (const auto& m : payload_.metrics()) {
      double value = 0;
      Rejection why{};
      if (m.name() == kBdSeq &&
          read_number(m, birth_datatype(m), value, why) == ValueRead::number) {
        node_.bd_seq = static_cast<std::uint64_t>(value);
      }
    }
  }

  void node_death() {
    if (!node_.born) return;
    for (const auto& m : payload_.metrics()) {
      double value = 0;
      Rejection why{};
      if (m.name() == kBdSeq && node_.bd_seq &&
          read_number(m, birth_datatype(m), value, why) == ValueRead::number &&
          static_cast<std::uint64_t>(value) != *node_.bd_seq) {
        return;  // the will of an earlier session
      }
    }
    mark_bad(node_.metrics, received_);
    for (const auto& [id, device] : node_.devices) mark_bad(device, received_);
    node_ = NodeState{};
  }

  void device_birth() {
    MetricTable& table = node_.devices[topic_.device];
    table = MetricTable{};
    record_birth(table);
  }

  void data(const MetricTable& table) {
    for (const auto& m : payload_.metrics()) {
      const MetricInfo* info = table.find(m);
      if (info == nullptr) {
        result_.rejected.add(Rejection::unknown_metric);
        request_rebirth();
        continue;
      }
      if (!info->emits) continue;
      emit(*info, m, m.has_datatype() ? m.datatype() : info->datatype);
    }
  }

  // Declares every named metric of a birth in `table` and emits the numeric ones.
  void record_birth(MetricTable& table) {
    for (const auto& m : payload_.metrics()) {
      if (!m.has_name() || m.name().empty()) {
        result_.rejected.add(Rejection::no_tag);
        continue;
      }
      MetricInfo info;
      info.datatype = birth_datatype(m);
      info.emits = is_numeric(info.datatype) && m.name() != kBdSeq &&
                   !std::string_view(m.name()).starts_with(kNodeControlPrefix);
      if (info.emits) info.tag = tag_for(m.name());
      const std::size_t index = table.metrics.size();
      table.by_name[m.name()] = index;
      if (m.has_alias()) table.by_alias[m.alias()] = index;
      table.metrics.push_back(std::move(info));
      if (table.metrics.back().emits) emit(table.metrics.back(), m, table.metrics.back().datatype);
    }
  }

  void emit(const MetricInfo& info, const PbMetric& m, std::uint32_t datatype) {
    DecodedSample sample;
    Rejection why{};
    switch (read_number(m, datatype, sample.value, why)) {
      case ValueRead::skipped:
        return;
      case ValueRead::problem:
        return result_.rejected.add(why);
      case ValueRead::number:
        break;
    }
    const auto time = m.has_timestamp()          ? from_epoch_millis(m.timestamp())
                      : payload_.has_timestamp() ? from_epoch_millis(payload_.timestamp())
                                                 : std::optional(received_);
    if (!time) return result_.rejected.add(Rejection::bad_time);
    if (auto outside = check_time_window(*time, received_, limits_)) {
      return result_.rejected.add(*outside);
    }
    sample.tag = info.tag;
    sample.time = *time;
    result_.samples.push_back(std::move(sample));
  }

  void mark_bad(const MetricTable& table, core::SensorTime time) {
    for (const auto& info : table.metrics) {
      if (!info.emits) continue;
      result_.samples.push_back(
          {info.tag, time, std::numeric_limits<double>::quiet_NaN(), engine::Quality::bad});
    }
  }

  // The payload's own time when it has a usable one, else the receive time.
  core::SensorTime payload_time() const {
    if (!payload_.has_timestamp()) return received_;
    const auto time = from_epoch_millis(payload_.timestamp());
    if (!time || check_time_window(*time, received_, limits_)) return received_;
    return *time;
  }

  bool continues_sequence() {
    if (!payload_.has_seq() || payload_.seq() != (node_.seq + 1) % kSeqModulo) return false;
    node_.seq = payload_.seq();
    return true;
  }

  void request_rebirth() {
    if (node_.rebirth_requested) return;
    node_.rebirth_requested = true;
    result_.rebirth_requests.push_back({topic_.group, topic_.node});
  }

  std::string tag_for(std::string_view metric) const {
    auto tag = expand_tag_template(tag_template_, [&](std::string_view name, std::string& out) {
      if (name == "group") out.append(topic_.group);
      if (name == "node") out.append(topic_.node);
      if (name == "device") out.append(topic_.device);
      if (name == "metric") out.append(metric);
      return true;
    });
    assert(tag.has_value());  // checked by the constructor
    return std::move(*tag);
  }

  std::string_view tag_template_;
  const DecodeLimits& limits_;
  const SparkplugTopic& topic_;
  const pb::Payload& payload_;
  core::SensorTime received_;
  NodeState& node_;
  SparkplugSession::Result& result_;
};

}  // namespace

SparkplugSession::SparkplugSession(std::string tag_template, DecodeLimits limits)
    : state_(std::make_unique<State>(State{std::move(tag_template), limits, {}})) {
  assert(check_sparkplug_tag_template(state_->tag_template).ok());
}

SparkplugSession::~SparkplugSession() = default;

SparkplugSession::Result SparkplugSession::on_message(std::string_view topic,
                                                      std::string_view payload,
                                                      core::SensorTime received) {
  Result result;
  const auto parsed = parse_sparkplug_topic(topic);
  if (!parsed) {
    result.rejected.add(Rejection::unparsable);
    return result;
  }
  if (parsed->type == "NCMD" || parsed->type == "DCMD" || parsed->type == "STATE") return result;
  if (payload.size() > state_->limits.max_payload_bytes) {
    result.rejected.add(Rejection::too_large);
    return result;
  }
  pb::Payload message;
  if (!message.ParseFromArray(payload.data(), static_cast<int>(payload.size()))) {
    result.rejected.add(Rejection::unparsable);
    return result;
  }
  NodeState& node = state_->nodes[{parsed->group, parsed->node}];
  MessageHandler(state_->tag_template, state_->limits, *parsed, message, received, node, result)
      .handle();
  return result;
}

std::string encode_rebirth_request(core::SensorTime now) {
  pb::Payload payload;
  const std::uint64_t ms = to_epoch_millis(now);
  payload.set_timestamp(ms);
  PbMetric* metric = payload.add_metrics();
  metric->set_name(std::string(kRebirthMetric));
  metric->set_timestamp(ms);
  metric->set_datatype(pb::Boolean);
  metric->set_boolean_value(true);
  return payload.SerializeAsString();
}

}  // namespace bw::io::mqtt
