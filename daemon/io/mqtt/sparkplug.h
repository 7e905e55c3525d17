// Sparkplug B (Eclipse Sparkplug specification): topics, the host side of edge-node sessions,
// and the rebirth request a host sends.
//
// SparkplugSession turns the messages of edge nodes into samples. It follows each node's session
// the way the specification asks a host to:
// - NBIRTH starts (or restarts) a node's session: its metrics' names, aliases and datatypes are
//   recorded and their values come out as samples; its seq (normally 0) is the start of the
//   count; its bdSeq metric is remembered. Any devices of an earlier session are forgotten.
// - DBIRTH does the same for one device of a born node.
// - Every later message of the node (DBIRTH, NDATA, DDATA, DDEATH) must carry seq = previous + 1
//   modulo 256 (255 -> 0 is no gap). On a gap the message is dropped (out_of_sequence), the node
//   is asked to rebirth, and its data is dropped (out_of_sequence, one count per message) until
//   its next NBIRTH, because aliases may have been reassigned by a birth that was missed.
// - Data from a node with no current birth (not_born), DDATA of an unborn device (not_born) and a
//   metric whose alias or name the birth did not declare (unknown_metric, other metrics of the
//   message still decoded) also ask for a rebirth. A node is asked at most once between births.
// - NDEATH ends the session: every tag of the node and of its devices gets one sample of bad
//   quality, value NaN, at the receive time (a death is usually the MQTT will the node stored when
//   it connected, so its own timestamp tells when the session began, not when it ended). An
//   NDEATH whose bdSeq differs from the current birth's is a late will of an earlier session and
//   is ignored, as is the death of a node with no current birth. DDEATH does the same for one
//   device, at its payload timestamp (else the receive time); a DDEATH of a device or node with
//   no current birth is counted not_born and asks for nothing.
// - NCMD, DCMD and STATE messages are commands between hosts and nodes, not data: ignored.
// Metric values: Int8..Int64, UInt8..UInt64, Float, Double, and Boolean (as 0/1) become sample
// values; String, Text, UUID, DateTime, Bytes, DataSet and other kinds are recorded at birth (so
// their aliases are known) but produce no sample and no count: they are content brinewatch does
// not use, not bad data. The housekeeping metrics "bdSeq" and "Node Control/..." produce no
// sample. A metric marked is_null is skipped. A numeric metric without a value of its kind is
// not_a_number; NaN or infinite values are not_finite. A metric's time is its own timestamp (ms
// since the epoch), else the payload's, else the receive time, and must lie in the window of
// DecodeLimits. When a metric names no datatype, its birth's is used; a birth metric without one
// takes it from the value's field (int_value as UInt32, long_value as UInt64).
// A birth metric without a name is no_tag.
// A topic that is not a Sparkplug topic, or a payload that is not a Sparkplug protobuf, is one
// unparsable; a payload over max_payload_bytes is one too_large.
//
// Tag names come from a template over "{group}", "{node}", "{device}" (empty for node metrics,
// the separator after it is dropped, see tag_template.h) and "{metric}" (the metric's name).
//
// Thread safety: a SparkplugSession is not thread-safe; feed it from one thread (or strand).
// The free functions are pure.
#pragma once

#include <memory>
#include <optional>
#include <string>
#include <string_view>
#include <vector>

#include "core/result.h"
#include "core/sensor_time.h"
#include "io/mqtt/decoded_sample.h"

namespace bw::io::mqtt {

// spBv1.0/{group}/{type}/{node}[/{device}]; for STATE (spBv1.0/STATE/{host}) group and device are
// empty and node holds the host id.
struct SparkplugTopic {
  std::string group, type, node, device;
  friend bool operator==(const SparkplugTopic&, const SparkplugTopic&) = default;
};

// nullopt unless the namespace is spBv1.0, the type is one of NBIRTH NDEATH NDATA NCMD (4 levels)
// DBIRTH DDEATH DDATA DCMD (5 levels) or STATE (3 levels), and every id is non-empty and free of
// '+' and '#'.
std::optional<SparkplugTopic> parse_sparkplug_topic(std::string_view topic);

// Error unless the template is well formed, names only {group} {node} {device} {metric}, and
// names {metric} (without it every metric of a node would share one tag).
Status check_sparkplug_tag_template(std::string_view tag_template);

struct SparkplugNodeId {
  std::string group, node;
  friend bool operator==(const SparkplugNodeId&, const SparkplugNodeId&) = default;
};

class SparkplugSession {
 public:
  // REQUIRES: check_sparkplug_tag_template(tag_template) is ok.
  explicit SparkplugSession(std::string tag_template = "{group}/{node}/{device}/{metric}",
                            DecodeLimits limits = {});
  ~SparkplugSession();
  SparkplugSession(const SparkplugSession&) = delete;
  SparkplugSession& operator=(const SparkplugSession&) = delete;

  struct Result {
    std::vector<DecodedSample> samples;
    std::vector<SparkplugNodeId> rebirth_requests;  // publish encode_rebirth_request() to
                                                    // topic_for_rebirth(group, node) of each
    RejectionCounters rejected;
  };

  Result on_message(std::string_view topic, std::string_view payload, core::SensorTime received);

 private:
  struct State;
  std::unique_ptr<State> state_;
};

// NCMD payload asking an edge node to publish a new NBIRTH: metric "Node Control/Rebirth",
// Boolean (datatype 11) true, payload and metric timestamp = now (ms since the epoch).
std::string encode_rebirth_request(core::SensorTime now);

// spBv1.0/{group}/NCMD/{node}
std::string topic_for_rebirth(std::string_view group, std::string_view node);

}  // namespace bw::io::mqtt
