// The `live:` section of a site file: how `brinewatch run` reaches the site's MQTT broker, which
// topics carry tag values, where alerts go, who may send commands and where state is kept.
//
// Plain values only (texts, seconds, whole numbers, enums), independent of the MQTT client and
// the payload decoders; the daemon converts them to its own settings. A LiveSpec comes out of
// read_live_section() (live_section.h) fully validated; its defaults are those written below.
//
// Schema (our own; every duration is seconds or a number with s, min, h or d):
//   live:
//     broker:                          required
//       uri: tcp://127.0.0.1:1883      required; tcp://host[:port] or ssl://host[:port]
//       client_id: dc4-brinewatch      default "brinewatch-" + the site name in lower case with
//                                      every run of other characters than letters and digits
//                                      written as one '-' ("brinewatch-dry-creek-swd-4")
//       mqtt_version: 4                4 (MQTT 3.1.1) or 5
//       keep_alive: 30s                whole seconds, 1 to 65535
//       credentials_file: <path>       optional; user name line, password line (mode 600 is
//                                      checked when the daemon starts); must exist
//       tls: {ca_file, cert_file, key_file}   required for ssl://, refused for tcp://; ca_file
//                                      required; cert_file and key_file together or neither;
//                                      each must be a readable file
//       reconnect: {min: 0.5s, max: 30s}      backoff between attempts, min <= max
//     inputs:                          required non-empty list; each item is either
//       - topic: tumbleweed/drycreek4/+/+     an MQTT filter ('+' a whole level, '#' the last)
//         tag: "{2}.{3}"               tag template; default "{topic}"
//         format: json                 json (default) or sparkplug
//         qos: 1                       0 or 1
//       - sparkplug_group: DryCreek    shorthand for topic spBv1.0/DryCreek/#, format sparkplug;
//                                      tag default "{group}/{node}/{device}/{metric}"
//     limits: {max_payload: 262144, max_future: 5min, max_past: 7d}   bytes, durations
//     outputs:
//       topic_prefix: brinewatch/dry-creek-swd4   default "brinewatch/" + the site name's form
//                                      above; no wildcard. Alerts go to <prefix>/alerts (QoS 1),
//                                      asset summaries to <prefix>/summary/<asset> (retained),
//                                      the site health roll-up to <prefix>/site_health
//                                      (retained), daemon status to <prefix>/status (retained,
//                                      last will)
//     commands:                        optional
//       topic: brinewatch/dry-creek-swd4/commands/+   '+' last and no other wildcard: the last
//                                      level is the id of the client that sent the command
//       authorised: [ops-tablet-1]     required, non-empty: client ids whose commands count
//     state:                           required
//       dir: /var/lib/brinewatch       required; created at start when missing
//       checkpoint_every: 5min
//     tick: 1s                         wall-clock tick: stale tags, delays, shelves, summaries
//
// Tag templates: literal text with placeholders in braces and no escape. For json inputs "{N}"
// is level N of the message's topic (0-based; N must be a level of the filter unless the filter
// ends in '#') and "{topic}" the whole topic; a tag named in the payload itself wins. For
// sparkplug inputs the placeholders are "{group}", "{node}", "{device}" and "{metric}".
// Relative file and folder names are resolved against the site file's folder.
#pragma once

#include <cstdint>
#include <optional>
#include <string>
#include <vector>

namespace bw::config {

// Do not renumber: names in files are kPayloadFormatNames (schema.h).
enum class PayloadFormat : std::uint8_t { json = 0, sparkplug = 1 };

struct TlsSpec {
  std::string ca_file;    // verifies the broker's certificate
  std::string cert_file;  // with key_file: identifies brinewatch to the broker; both or neither
  std::string key_file;
};

struct BrokerSpec {
  std::string uri;        // "tcp://host[:port]" or "ssl://host[:port]"
  std::string client_id;  // never empty after loading
  int mqtt_version = 4;   // 4 = MQTT 3.1.1, 5 = MQTT 5
  int keep_alive_s = 30;
  std::string credentials_file;  // empty: connect without user name and password
  std::optional<TlsSpec> tls;    // set exactly when the uri is ssl://
  double reconnect_min_s = 0.5;
  double reconnect_max_s = 30;
};

// One subscription and how its messages become samples.
struct InputRule {
  std::string topic;         // MQTT subscription filter
  std::string tag_template;  // never empty after loading
  PayloadFormat format = PayloadFormat::json;
  int qos = 1;
  std::string sparkplug_group;  // set when written as the sparkplug_group shorthand
};

struct DecodeLimitsSpec {
  int max_payload_bytes = 256 * 1024;  // larger messages are dropped and counted
  double max_future_s = 300;           // sample times further ahead of arrival are dropped
  double max_past_s = 7 * 86400;       // sample times further behind arrival are dropped
};

struct OutputSpec {
  std::string topic_prefix;  // never empty after loading; no wildcard, no trailing '/'
};

struct CommandSpec {
  std::string topic;                    // filter whose last level, '+', is the sender's id
  std::vector<std::string> authorised;  // non-empty; client ids
};

struct StateSpec {
  std::string dir;
  double checkpoint_every_s = 300;
};

struct LiveSpec {
  BrokerSpec broker;
  std::vector<InputRule> inputs;  // non-empty, no filter twice
  DecodeLimitsSpec limits;
  OutputSpec outputs;
  std::optional<CommandSpec> commands;
  StateSpec state;
  double tick_s = 1;
};

}  // namespace bw::config
