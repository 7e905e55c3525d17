// Decoding the JSON payload of one MQTT message into samples.
//
// Accepted forms (one message):
//   (a) a bare value:  12.3                      tag from the topic, time = receive time, good
//   (b) one object:    {"value": 12.3, "time": ..., "quality": ...}
//                      tag from its "tag" member if it has one, else from the topic
//   (c) a batch, as an array of objects each with a "tag" member
//                      [{"tag": "DC4.TK1.LEVEL", "value": 12.3, "time": ..., "quality": ...}]
//       or as a map from tag to a value or an object like (b)
//                      {"DC4.TK1.LEVEL": 12.3, "DC4.TK2.LEVEL": {"value": 4.1, "time": ...}}
// An object with a "value" member is form (b), never a map, so no tag can be called "value" in
// the map form. Other members ("unit", ...) are ignored. An empty array or map gives nothing.
//
// Fields:
//   value    a JSON number; true/false as 1/0; or a string holding a decimal number (as the
//            history reader reads it, io/sample_fields.h). Text spelling NaN or infinity
//            ("nan", "-inf") is not_finite; JSON itself has no such numbers, and a number beyond
//            the range of double (1e999) makes the whole payload unparsable. null, objects,
//            arrays and other text are not_a_number.
//   time     absent -> the receive time; an ISO 8601 string with Z or an offset (a time without
//            one is bad_time: live data must say which clock it is on); epoch seconds as a
//            number (1772344800.25) or a string of digits. Resolution 1 us. More than 1e11
//            seconds (e.g. epoch milliseconds sent by mistake) is bad_time.
//   quality  absent -> good; "good" / "uncertain" / "bad" (any case) or an integer 0-65535
//            judged as in io/sample_fields.h (192 good).
// Each entry is checked in this order and counted under its first problem: tag, value, time
// (format, then the window of DecodeLimits around the receive time), quality. A payload larger
// than max_payload_bytes is one too_large; one that is not JSON is one unparsable.
//
// Thread safety: pure function; never throws (allocation failure aside).
#pragma once

#include <string_view>

#include "core/sensor_time.h"
#include "io/mqtt/decoded_sample.h"

namespace bw::io::mqtt {

// `topic_tag` is the tag the topic rule gave (tag_topics.h), or empty when none applies.
DecodedBatch decode_json_samples(std::string_view topic_tag, std::string_view payload,
                                 core::SensorTime received, const DecodeLimits& limits = {});

}  // namespace bw::io::mqtt
