#include "io/mqtt/json_samples.h"

#include <charconv>
#include <cmath>
#include <cstdint>
#include <nlohmann/json.hpp>
#include <optional>

#include "io/sample_fields.h"
#include "io/time_parse.h"

namespace bw::io::mqtt {
namespace {

using nlohmann::json;

// Epoch seconds beyond this (about the year 5138) cannot be a sensor time; it also keeps the
// conversion to microseconds far from overflow.
constexpr double kMaxEpochSeconds = 1e11;
constexpr double kMaxQualityWord = 65535;

// Nesting deeper than any accepted form needs is refused before parsing: the parser and the
// tree it builds would otherwise grow with every '[' of a hostile payload.
constexpr int kMaxNesting = 8;

class EntryDecoder {
 public:
  EntryDecoder(core::SensorTime received, const DecodeLimits& limits, DecodedBatch& out)
      : received_(received), limits_(limits), out_(out) {}

  // One entry whose fields are already located; nullptr means the field is absent.
  void decode(std::string_view tag, const json* value, const json* time, const json* quality) {
    if (tag.empty()) return reject(Rejection::no_tag);
    DecodedSample sample;
    if (auto problem = read_value(value, sample.value)) return reject(*problem);
    if (auto problem = read_time(time, sample.time)) return reject(*problem);
    if (auto problem = read_quality(quality, sample.quality)) return reject(*problem);
    sample.tag = tag;
    out_.samples.push_back(std::move(sample));
  }

  // An object of form (b); `fallback_tag` applies when it has no "tag" member.
  void decode_object(const json& object, std::string_view fallback_tag) {
    std::string_view tag = fallback_tag;
    if (const auto it = object.find("tag"); it != object.end()) {
      tag = it->is_string() ? std::string_view(it->get_ref<const std::string&>()) : "";
    }
    decode_fields(tag, object);
  }

  // An object's value, time and quality members under a tag found elsewhere.
  void decode_fields(std::string_view tag, const json& object) {
    decode(tag, member(object, "value"), member(object, "time"), member(object, "quality"));
  }

  void reject(Rejection reason) { out_.rejected.add(reason); }

 private:
  static const json* member(const json& object, const char* name) {
    const auto it = object.find(name);
    return it == object.end() ? nullptr : &*it;
  }

  static std::optional<Rejection> read_value(const json* field, double& out) {
    if (field == nullptr) return Rejection::not_a_number;
    if (field->is_boolean()) {
      out = field->get<bool>() ? 1.0 : 0.0;
      return std::nullopt;
    }
    if (field->is_number()) {
      const double value = field->get<double>();
      if (!std::isfinite(value)) return Rejection::not_finite;
      out = value;
      return std::nullopt;
    }
    if (field->is_string()) {
      const auto problem = parse_sample_value(field->get_ref<const std::string&>(), out);
      if (!problem) return std::nullopt;
      return *problem == RowProblemKind::not_finite ? Rejection::not_finite
                                                    : Rejection::not_a_number;
    }
    return Rejection::not_a_number;
  }

  std::optional<Rejection> read_time(const json* field, core::SensorTime& out) const {
    if (field == nullptr) {
      out = received_;
      return std::nullopt;
    }
    std::optional<core::SensorTime> time;
    if (field->is_number()) {
      const double seconds = field->get<double>();
      if (std::isfinite(seconds) && std::fabs(seconds) <= kMaxEpochSeconds) {
        time = core::SensorTime(core::Micros(std::llround(seconds * 1e6)));
      }
    } else if (field->is_string()) {
      const std::string_view text = field->get_ref<const std::string&>();
      if (looks_like_epoch_seconds(text)) {
        time = parse_epoch_seconds(text);
      } else if (const auto iso = parse_iso8601(text); iso && iso->offset_minutes) {
        time = to_sensor_time(*iso);
      }
    }
    if (!time) return Rejection::bad_time;
    if (auto outside = check_time_window(*time, received_, limits_)) return outside;
    out = *time;
    return std::nullopt;
  }

  static std::optional<Rejection> read_quality(const json* field, engine::Quality& out) {
    if (field == nullptr) {
      out = engine::Quality::good;
      return std::nullopt;
    }
    std::optional<RowProblemKind> problem = RowProblemKind::bad_quality;
    if (field->is_string()) {
      problem = parse_sample_quality(field->get_ref<const std::string&>(), out);
    } else if (field->is_number()) {
      // Numbers go through the same reader as quality text so that both agree on every word.
      const double word = field->get<double>();
      if (word >= 0 && word <= kMaxQualityWord && word == std::floor(word)) {
        char text[8];
        const auto result = std::to_chars(text, text + sizeof text, static_cast<unsigned>(word));
        problem = parse_sample_quality(std::string_view(text, result.ptr), out);
      }
    }
    return problem ? std::optional(Rejection::bad_quality) : std::nullopt;
  }

  core::SensorTime received_;
  const DecodeLimits& limits_;
  DecodedBatch& out_;
};

// Outside strings, counts how deep '[' and '{' nest; stops counting past the limit.
bool nesting_within(std::string_view text, int limit) {
  int depth = 0;
  bool in_string = false;
  bool escaped = false;
  for (const char c : text) {
    if (in_string) {
      if (escaped) {
        escaped = false;
      } else if (c == '\\') {
        escaped = true;
      } else if (c == '"') {
        in_string = false;
      }
    } else if (c == '"') {
      in_string = true;
    } else if (c == '[' || c == '{') {
      if (++depth > limit) return false;
    } else if (c == ']' || c == '}') {
      --depth;
    }
  }
  return true;
}

}  // namespace

DecodedBatch decode_json_samples(std::string_view topic_tag, std::string_view payload,
                                 core::SensorTime received, const DecodeLimits& limits) {
  DecodedBatch out;
  EntryDecoder decoder(received, limits, out);
  if (payload.size() > limits.max_payload_bytes) {
    decoder.reject(Rejection::too_large);
    return out;
  }
  if (!nesting_within(payload, kMaxNesting)) {
    decoder.reject(Rejection::unparsable);
    return out;
  }
  const json doc = json::parse(payload.begin(), payload.end(), nullptr, /*allow_exceptions=*/false);
  if (doc.is_discarded()) {
    decoder.reject(Rejection::unparsable);
  } else if (doc.is_array()) {
    out.samples.reserve(doc.size());
    for (const json& entry : doc) {
      if (entry.is_object()) {
        decoder.decode_object(entry, "");
      } else {
        decoder.reject(Rejection::unparsable);
      }
    }
  } else if (doc.is_object() && !doc.contains("value")) {
    out.samples.reserve(doc.size());
    for (auto it = doc.begin(); it != doc.end(); ++it) {
      if (it->is_object()) {
        decoder.decode_fields(it.key(), *it);
      } else {
        decoder.decode(it.key(), &*it, nullptr, nullptr);
      }
    }
  } else if (doc.is_object()) {
    decoder.decode_object(doc, topic_tag);
  } else {
    decoder.decode(topic_tag, &doc, nullptr, nullptr);
  }
  return out;
}

}  // namespace bw::io::mqtt
