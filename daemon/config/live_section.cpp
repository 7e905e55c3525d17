#include "config/live_section.h"

#include <algorithm>
#include <cctype>
#include <cerrno>
#include <charconv>
#include <cstdio>
#include <cstring>
#include <map>
#include <system_error>
#include <vector>

#include "config/nearest_name.h"
#include "config/schema.h"

namespace bw::config {
namespace {

namespace fs = std::filesystem;

constexpr std::string_view kSparkplugNamespace = "spBv1.0";
constexpr std::string_view kJsonDefaultTag = "{topic}";
constexpr std::string_view kSparkplugDefaultTag = "{group}/{node}/{device}/{metric}";
const std::vector<std::string_view> kSparkplugPlaceholders{"group", "node", "device", "metric"};
// MQTT strings carry a 16-bit length (MQTT 3.1.1 section 1.5.3).
constexpr std::size_t kMaxTopicBytes = 65535;

std::vector<std::string_view> split_levels(std::string_view topic) {
  std::vector<std::string_view> levels;
  std::size_t start = 0;
  for (;;) {
    const std::size_t slash = topic.find('/', start);
    levels.push_back(topic.substr(start, slash - start));
    if (slash == std::string_view::npos) return levels;
    start = slash + 1;
  }
}

// MQTT 3.1.1 section 4.7: '+' and '#' fill a whole level, '#' only the last one.
std::optional<std::string> filter_problem(std::string_view filter) {
  if (filter.size() > kMaxTopicBytes) return "is longer than 65535 bytes";
  if (filter.find('\0') != std::string_view::npos) return "must not contain a NUL character";
  const auto levels = split_levels(filter);
  for (std::size_t i = 0; i < levels.size(); ++i) {
    const std::string_view level = levels[i];
    const bool wildcard = level.find_first_of("+#") != std::string_view::npos;
    if (wildcard && level.size() != 1) {
      return "level '" + std::string(level) + "': a wildcard '+' or '#' must be a whole level";
    }
    if (level == "#" && i + 1 != levels.size()) return "'#' must be the last level";
  }
  return std::nullopt;
}

// A topic we publish under: no wildcard, not a broker topic, no empty last level.
std::optional<std::string> topic_name_problem(std::string_view topic) {
  if (topic.size() > kMaxTopicBytes) return "is longer than 65535 bytes";
  if (topic.find_first_of(std::string_view("+#\0", 3)) != std::string_view::npos) {
    return "must not contain '+', '#' or a NUL character";
  }
  if (topic.front() == '$') return "must not start with '$' (topics of the broker itself)";
  if (topic.back() == '/') return "must not end with '/'";
  return std::nullopt;
}

std::optional<std::string> placeholder_problem(std::string_view name, PayloadFormat format,
                                               const std::vector<std::string_view>& levels) {
  const std::string braced = "'{" + std::string(name) + "}'";
  if (format == PayloadFormat::sparkplug) {
    if (std::find(kSparkplugPlaceholders.begin(), kSparkplugPlaceholders.end(), name) !=
        kSparkplugPlaceholders.end()) {
      return std::nullopt;
    }
    return braced + " is no placeholder of a sparkplug input; use {group}, {node}, {device} " +
           "or {metric}" + did_you_mean(name, kSparkplugPlaceholders);
  }
  if (name == "topic") return std::nullopt;
  std::size_t level = 0;
  const auto [end, ec] = std::from_chars(name.data(), name.data() + name.size(), level);
  if (ec != std::errc() || end != name.data() + name.size()) {
    return braced + ": a placeholder is a topic level number such as {2}, or {topic}" +
           did_you_mean(name, {"topic"});
  }
  if (level < levels.size() || levels.back() == "#") return std::nullopt;
  return braced + " names level " + std::to_string(level) + ", but the filter has " +
         std::to_string(levels.size()) + " levels (0 to " + std::to_string(levels.size() - 1) + ")";
}

// Placeholders run from '{' to the next '}' with no escape (the decoders expand them so).
std::optional<std::string> template_problem(std::string_view text, PayloadFormat format,
                                            std::string_view filter) {
  const auto levels = split_levels(filter);
  std::size_t i = 0;
  while (i < text.size()) {
    if (text[i] == '}') return std::string("a '}' without its '{'");
    if (text[i] != '{') {
      ++i;
      continue;
    }
    const std::size_t close = text.find('}', i + 1);
    if (close == std::string_view::npos) return std::string("a '{' without its '}'");
    const std::string_view name = text.substr(i + 1, close - i - 1);
    if (name.empty()) return std::string("an empty placeholder '{}'");
    if (name.find('{') != std::string_view::npos) return std::string("a '{' inside a placeholder");
    if (auto problem = placeholder_problem(name, format, levels)) return problem;
    i = close + 1;
  }
  return std::nullopt;
}

// "tcp://host[:port]" or "ssl://host[:port]"; host may be a bracketed IPv6 address.
std::optional<std::string> uri_problem(std::string_view uri) {
  const std::string expected =
      "expected tcp://host[:port] or ssl://host[:port], got '" + std::string(uri) + "'";
  const std::size_t separator = uri.find("://");
  if (separator == std::string_view::npos) return expected;
  const std::string_view scheme = uri.substr(0, separator);
  if (scheme != "tcp" && scheme != "ssl") {
    return "scheme '" + std::string(scheme) + "' is not supported; use tcp:// or ssl://" +
           did_you_mean(scheme, {"tcp", "ssl"});
  }
  std::string_view rest = uri.substr(separator + 3);
  if (rest.find('/') != std::string_view::npos) return expected + " (no path after the host)";
  std::size_t host_end = rest.find(':');
  if (!rest.empty() && rest.front() == '[') {
    const std::size_t bracket = rest.find(']');
    if (bracket == std::string_view::npos) return expected;
    host_end = bracket + 1 == rest.size() ? std::string_view::npos : bracket + 1;
    if (host_end != std::string_view::npos && rest[host_end] != ':') return expected;
  }
  if (rest.substr(0, host_end).empty()) return expected + " (no host)";
  if (host_end == std::string_view::npos) return std::nullopt;
  const std::string_view port = rest.substr(host_end + 1);
  unsigned value = 0;
  const auto [end, ec] = std::from_chars(port.data(), port.data() + port.size(), value);
  if (port.empty() || ec != std::errc() || end != port.data() + port.size() || value < 1 ||
      value > 65535) {
    return "port '" + std::string(port) + "' is not a number from 1 to 65535";
  }
  return std::nullopt;
}

// A client id becomes a topic level in the command topic, so it cannot hold level syntax.
bool is_client_id(std::string_view id) {
  return !id.empty() && id.find_first_of("/+#") == std::string_view::npos;
}

class LiveReader {
 public:
  LiveReader(FieldReader& reader, std::string_view site_name, const fs::path& base_folder)
      : reader_(reader), slug_(site_slug(site_name)), base_folder_(base_folder) {}

  std::optional<LiveSpec> read(const ConfigNode& live) {
    const std::size_t errors_before = reader_.error_count();
    if (!reader_.expect_map(live, "live")) return std::nullopt;
    reader_.check_keys(
        live,
        allowed_keys(kLiveKeys, {"broker", "inputs", "limits", "outputs", "commands", "state"}),
        "live");
    LiveSpec spec;
    read_keys(reader_, live, kLiveKeys, spec, "live");
    if (const ConfigNode* broker = reader_.require(live, "broker", "live")) {
      read_broker(*broker, spec.broker);
    }
    if (const ConfigNode* inputs = reader_.require(live, "inputs", "live")) {
      read_inputs(*inputs, spec.inputs);
    }
    if (const ConfigNode* limits = live.find("limits")) {
      read_section(*limits, kDecodeLimitsKeys, spec.limits, "live.limits");
    }
    read_outputs(live.find("outputs"), spec.outputs);
    if (const ConfigNode* commands = live.find("commands")) {
      read_commands(*commands, spec.commands.emplace());
    }
    if (const ConfigNode* state = reader_.require(live, "state", "live")) {
      read_state(*state, spec.state);
    }
    if (reader_.error_count() != errors_before) return std::nullopt;
    return spec;
  }

 private:
  // Reads a mapping that has only the keys of `keys`; false when any problem was reported.
  template <class Spec, std::size_t N>
  bool read_section(const ConfigNode& map, const std::array<Key<Spec>, N>& keys, Spec& out,
                    std::string_view what, std::initializer_list<std::string_view> extra = {}) {
    if (!reader_.expect_map(map, what)) return false;
    const std::size_t errors_before = reader_.error_count();
    reader_.check_keys(map, allowed_keys(keys, extra), what);
    read_keys(reader_, map, keys, out, what);
    return reader_.error_count() == errors_before;
  }

  std::string resolve(const std::string& name) const {
    return (base_folder_ / name).lexically_normal().string();
  }

  // Resolves the file named at `node` in place and reports why it cannot be used, if it cannot.
  void check_file(const ConfigNode& node, std::string& name, std::string_view what,
                  bool must_read) {
    name = resolve(name);
    const std::string label = std::string(what) + ": '" + name + "'";
    std::error_code ec;
    const fs::file_status status = fs::status(name, ec);
    if (ec) {
      reader_.error(node, label + ": " + ec.message());
    } else if (fs::is_directory(status)) {
      reader_.error(node, label + " is a folder, not a file");
    } else if (must_read) {
      std::FILE* file = std::fopen(name.c_str(), "rb");
      if (file == nullptr) {
        reader_.error(node, label + " cannot be read: " + std::strerror(errno));
      } else {
        std::fclose(file);
      }
    }
  }

  void read_broker(const ConfigNode& map, BrokerSpec& broker) {
    if (!reader_.expect_map(map, "live.broker")) return;
    read_section(map, kBrokerKeys, broker, "live.broker", {"tls", "reconnect"});
    const ConfigNode* uri = map.find("uri");
    bool uri_ok = uri != nullptr && !broker.uri.empty();
    if (uri_ok) {
      if (auto problem = uri_problem(broker.uri)) {
        reader_.error(*uri, "live.broker: key 'uri': " + *problem);
        uri_ok = false;
      }
    }
    if (broker.client_id.empty()) {
      broker.client_id = slug_.empty() ? "brinewatch" : "brinewatch-" + slug_;
    }
    if (const ConfigNode* file = map.find("credentials_file");
        file && !broker.credentials_file.empty()) {
      check_file(*file, broker.credentials_file, "live.broker: key 'credentials_file'", false);
    }
    if (const ConfigNode* reconnect = map.find("reconnect")) {
      if (read_section(*reconnect, kReconnectKeys, broker, "live.broker.reconnect") &&
          broker.reconnect_min_s > broker.reconnect_max_s) {
        reader_.error(*reconnect, "live.broker.reconnect: 'min' must not exceed 'max'");
      }
    }
    if (!uri_ok) return;  // whether tls belongs depends on the scheme
    const bool ssl = broker.uri.starts_with("ssl://");
    const ConfigNode* tls = map.find("tls");
    if (ssl && tls == nullptr) {
      reader_.error(*uri,
                    "live.broker: key 'uri': an ssl:// broker needs 'tls: {ca_file: ...}' to "
                    "verify its certificate");
    } else if (!ssl && tls != nullptr) {
      reader_.error(*tls,
                    "live.broker: key 'tls' is given but the uri is tcp://; use ssl:// "
                    "or remove 'tls'");
    } else if (tls != nullptr) {
      read_tls(*tls, broker.tls.emplace());
    }
  }

  void read_tls(const ConfigNode& map, TlsSpec& tls) {
    constexpr std::string_view kWhat = "live.broker.tls";
    if (!read_section(map, kTlsKeys, tls, kWhat)) return;
    if (tls.cert_file.empty() != tls.key_file.empty()) {
      reader_.error(map, std::string(kWhat) +
                             ": give 'cert_file' and 'key_file' together, or "
                             "neither");
      return;
    }
    for (const auto& [key, name] :
         {std::pair<std::string_view, std::string*>{"ca_file", &tls.ca_file},
          {"cert_file", &tls.cert_file},
          {"key_file", &tls.key_file}}) {
      if (const ConfigNode* node = map.find(key)) {
        check_file(*node, *name, std::string(kWhat) + ": key '" + std::string(key) + "'", true);
      }
    }
  }

  void read_inputs(const ConfigNode& list, std::vector<InputRule>& inputs) {
    if (!list.is_sequence() || list.items.empty()) {
      reader_.error(list,
                    "live: key 'inputs': expected a non-empty list of inputs (each with "
                    "'topic' or 'sparkplug_group'), got " +
                        FieldReader::describe(list));
      return;
    }
    std::map<std::string, std::size_t, std::less<>> first_item_of_filter;
    for (std::size_t i = 0; i < list.items.size(); ++i) {
      const ConfigNode& item = list.items[i];
      const std::string what = "live.inputs item " + std::to_string(i + 1);
      auto rule = read_input(item, what);
      if (!rule) continue;
      auto [it, inserted] = first_item_of_filter.emplace(rule->topic, i + 1);
      if (!inserted) {
        const ConfigNode* at =
            item.find(rule->sparkplug_group.empty() ? "topic" : "sparkplug_group");
        reader_.error(*at, what + ": topic filter '" + rule->topic +
                               "' is already subscribed by item " + std::to_string(it->second));
        continue;
      }
      inputs.push_back(std::move(*rule));
    }
  }

  std::optional<InputRule> read_input(const ConfigNode& item, const std::string& what) {
    InputRule rule;
    if (!read_section(item, kInputRuleKeys, rule, what)) return std::nullopt;
    const ConfigNode* topic = item.find("topic");
    const ConfigNode* group = item.find("sparkplug_group");
    if ((topic == nullptr) == (group == nullptr)) {
      reader_.error(item, what + ": give either 'topic' (an MQTT filter) or 'sparkplug_group'" +
                              (topic == nullptr ? "" : ", not both"));
      return std::nullopt;
    }
    if (group != nullptr) {
      if (rule.sparkplug_group.find_first_of("/+#") != std::string::npos) {
        reader_.error(*group, what +
                                  ": key 'sparkplug_group': a Sparkplug group id must not "
                                  "contain '/', '+' or '#'");
        return std::nullopt;
      }
      const ConfigNode* format = item.find("format");
      if (format != nullptr && rule.format != PayloadFormat::sparkplug) {
        reader_.error(*format, what +
                                   ": key 'format': 'sparkplug_group' reads Sparkplug B "
                                   "messages; write format: sparkplug or leave it out");
        return std::nullopt;
      }
      rule.topic = std::string(kSparkplugNamespace) + "/" + rule.sparkplug_group + "/#";
      rule.format = PayloadFormat::sparkplug;
    } else if (auto problem = filter_problem(rule.topic)) {
      reader_.error(*topic, what + ": key 'topic': filter '" + rule.topic + "': " + *problem);
      return std::nullopt;
    } else if (rule.format == PayloadFormat::sparkplug) {
      const std::string_view first = split_levels(rule.topic).front();
      if (first != kSparkplugNamespace && first != "+" && first != "#") {
        reader_.error(*topic, what + ": key 'topic': a sparkplug input's filter starts with '" +
                                  std::string(kSparkplugNamespace) + "/', got '" + rule.topic +
                                  "'");
        return std::nullopt;
      }
    }
    if (rule.tag_template.empty()) {
      rule.tag_template =
          rule.format == PayloadFormat::json ? kJsonDefaultTag : kSparkplugDefaultTag;
    } else if (auto problem = template_problem(rule.tag_template, rule.format, rule.topic)) {
      reader_.error(*item.find("tag"),
                    what + ": key 'tag': template '" + rule.tag_template + "': " + *problem);
      return std::nullopt;
    }
    return rule;
  }

  void read_outputs(const ConfigNode* map, OutputSpec& outputs) {
    if (map != nullptr && read_section(*map, kOutputKeys, outputs, "live.outputs") &&
        !outputs.topic_prefix.empty()) {
      if (auto problem = topic_name_problem(outputs.topic_prefix)) {
        reader_.error(*map->find("topic_prefix"), "live.outputs: key 'topic_prefix': '" +
                                                      outputs.topic_prefix + "' " + *problem);
      }
    }
    if (outputs.topic_prefix.empty()) {
      outputs.topic_prefix = slug_.empty() ? "brinewatch" : "brinewatch/" + slug_;
    }
  }

  void read_commands(const ConfigNode& map, CommandSpec& commands) {
    constexpr std::string_view kWhat = "live.commands";
    if (!reader_.expect_map(map, kWhat)) return;
    read_section(map, kCommandKeys, commands, kWhat, {"authorised"});
    if (!commands.topic.empty()) {
      const bool only_last_is_wildcard =
          !filter_problem(commands.topic) && split_levels(commands.topic).back() == "+" &&
          commands.topic.find_first_of("+#") == commands.topic.size() - 1;
      if (!only_last_is_wildcard) {
        reader_.error(*map.find("topic"),
                      std::string(kWhat) +
                          ": key 'topic': must end in the level '+' (the id of the sending "
                          "client) and have no other wildcard, got '" +
                          commands.topic + "'");
      }
    }
    const ConfigNode* authorised = reader_.require(map, "authorised", kWhat);
    if (authorised == nullptr) return;
    const std::string what = std::string(kWhat) + ": key 'authorised'";
    if (!authorised->is_sequence() || authorised->items.empty()) {
      reader_.error(*authorised,
                    what +
                        ": name at least one client id whose commands are "
                        "accepted, as a list such as [ops-tablet-1], got " +
                        (authorised->is_sequence() ? std::string("an empty list")
                                                   : FieldReader::describe(*authorised)));
      return;
    }
    for (const ConfigNode& item : authorised->items) {
      auto id = reader_.text(item, what);
      if (id && !is_client_id(*id)) {
        reader_.error(item, what + ": client id '" + *id + "' must not contain '/', '+' or '#'");
      } else if (id) {
        commands.authorised.push_back(std::move(*id));
      }
    }
  }

  void read_state(const ConfigNode& map, StateSpec& state) {
    if (!read_section(map, kStateKeys, state, "live.state")) return;
    state.dir = resolve(state.dir);
    std::error_code ec;
    if (fs::exists(state.dir, ec) && !fs::is_directory(state.dir, ec)) {
      reader_.error(*map.find("dir"),
                    "live.state: key 'dir': '" + state.dir + "' exists but is not a folder");
    }
  }

  FieldReader& reader_;
  std::string slug_;
  fs::path base_folder_;
};

}  // namespace

std::string site_slug(std::string_view site_name) {
  std::string slug;
  bool gap = false;
  for (char c : site_name) {
    const auto u = static_cast<unsigned char>(c);
    if (u < 0x80 && std::isalnum(u)) {
      if (gap && !slug.empty()) slug.push_back('-');
      slug.push_back(static_cast<char>(std::tolower(u)));
      gap = false;
    } else {
      gap = true;
    }
  }
  return slug;
}

std::optional<LiveSpec> read_live_section(FieldReader& reader, const ConfigNode& live,
                                          std::string_view site_name, const fs::path& base_folder) {
  return LiveReader(reader, site_name, base_folder).read(live);
}

}  // namespace bw::config
