#include "io/mqtt_connect_options.h"

#include <fcntl.h>
#include <mqtt/exception.h>
#include <mqtt/properties.h>
#include <mqtt/will_options.h>
#include <unistd.h>

#include <cerrno>
#include <cmath>
#include <cstring>
#include <string_view>

namespace bw::io::mqtt_detail {

namespace {

constexpr std::string_view kTcpScheme = "tcp://";
constexpr std::string_view kSslScheme = "ssl://";
constexpr int kMaxKeepAliveS = 65535;        // the CONNECT packet's 16-bit field
constexpr std::size_t kMaxInflight = 65535;  // packet identifiers are 16 bits

Error setting_error(std::string_view key, const std::string& reason) {
  return Error{"mqtt setting '" + std::string(key) + "': " + reason};
}

bool valid_qos(int qos) { return qos >= 0 && qos <= 2; }

// MQTT 5 reason codes from 0x80 up are failures; paho marks "no reason code" (3.1.1) as 255.
bool failure_reason(int reason) {
  return reason >= mqtt::ReasonCode::UNSPECIFIED_ERROR && reason != mqtt::MQTTPP_V3_CODE;
}

Status check_readable(std::string_view key, const std::string& path) {
  if (path.empty()) return setting_error(key, "is empty");
  const int fd = ::open(path.c_str(), O_RDONLY | O_CLOEXEC);
  if (fd < 0) {
    return setting_error(key, "cannot read '" + path + "': " + std::strerror(errno));
  }
  ::close(fd);
  return Ok{};
}

Status check_tls(const MqttSettings& settings) {
  const bool ssl_uri = settings.server_uri.starts_with(kSslScheme);
  if (ssl_uri && !settings.tls) {
    return setting_error("tls", "server_uri '" + settings.server_uri +
                                    "' is ssl:// but no tls settings (ca_file) are given");
  }
  if (!ssl_uri && settings.tls) {
    return setting_error(
        "tls", "tls settings are given but server_uri '" + settings.server_uri + "' is not ssl://");
  }
  if (!settings.tls) return Ok{};
  const MqttTls& tls = *settings.tls;
  if (Status ca = check_readable("tls.ca_file", tls.ca_file); !ca) return ca;
  if (tls.cert_file.empty() != tls.key_file.empty()) {
    return setting_error("tls", "cert_file and key_file go together; give both or neither");
  }
  if (tls.cert_file.empty()) return Ok{};
  if (Status cert = check_readable("tls.cert_file", tls.cert_file); !cert) return cert;
  return check_readable("tls.key_file", tls.key_file);
}

// Return codes of a refused CONNACK, MQTT 3.1.1 section 3.2.2.3.
std::string connack_text(int code) {
  switch (code) {
    case 1:
      return "unacceptable protocol version";
    case 2:
      return "client identifier rejected";
    case 3:
      return "server unavailable";
    case 4:
      return "bad user name or password";
    case 5:
      return "not authorized";
    default:
      return "";
  }
}

}  // namespace

Status validate_settings(const MqttSettings& s) {
  if (!s.server_uri.starts_with(kTcpScheme) && !s.server_uri.starts_with(kSslScheme)) {
    return setting_error("server_uri", "'" + s.server_uri +
                                           "' must start with tcp:// or ssl://, e.g. "
                                           "tcp://127.0.0.1:1883");
  }
  if (s.client_id.empty()) {
    return setting_error("client_id", "is empty; a persistent session needs a fixed id");
  }
  if (s.mqtt_version != 4 && s.mqtt_version != 5) {
    return setting_error("mqtt_version", std::to_string(s.mqtt_version) +
                                             " is not supported; use 4 (MQTT 3.1.1) or 5");
  }
  if (s.keep_alive_s < 1 || s.keep_alive_s > kMaxKeepAliveS) {
    return setting_error("keep_alive_s", "must be 1..65535 seconds");
  }
  if (s.connect_timeout_s < 1) return setting_error("connect_timeout_s", "must be >= 1 second");
  if (!std::isfinite(s.reconnect_min_s) || !std::isfinite(s.reconnect_max_s) ||
      s.reconnect_min_s <= 0 || s.reconnect_max_s < s.reconnect_min_s) {
    return setting_error("reconnect_min_s/reconnect_max_s",
                         "need 0 < reconnect_min_s <= reconnect_max_s (seconds)");
  }
  if (s.max_inflight < 1 || s.max_inflight > kMaxInflight) {
    return setting_error("max_inflight", "must be 1..65535");
  }
  for (const auto& [filter, qos] : s.subscriptions) {
    if (filter.empty()) return setting_error("subscriptions", "a topic filter is empty");
    if (!valid_qos(qos)) {
      return setting_error("subscriptions", "'" + filter + "': QoS must be 0, 1 or 2");
    }
  }
  if (s.will) {
    if (s.will->topic.empty() || s.will->topic.find_first_of("+#") != std::string::npos) {
      return setting_error("will.topic", "must be a topic name without wildcards");
    }
    if (!valid_qos(s.will->qos)) return setting_error("will.qos", "must be 0, 1 or 2");
  }
  return check_tls(s);
}

mqtt::create_options make_create_options(const MqttSettings& settings) {
  return mqtt::create_options(settings.mqtt_version);
}

void configure_connect_options(mqtt::connect_options& options, mqtt::ssl_options& tls,
                               const MqttSettings& settings,
                               const std::optional<MqttCredentials>& credentials) {
  options.set_mqtt_version(settings.mqtt_version);
  // paho refuses cleansession != 0 under MQTT 5 and cleanstart != 0 under 3.1.1, so the flag of
  // the other version is always cleared.
  if (settings.mqtt_version == 5) {
    options.set_clean_session(false);
    options.set_clean_start(!settings.persistent_session);
    if (settings.persistent_session) {
      options.set_properties(
          mqtt::properties{mqtt::property(mqtt::property::SESSION_EXPIRY_INTERVAL,
                                          static_cast<int32_t>(settings.session_expiry_s))});
    }
  } else {
    options.set_clean_start(false);
    options.set_clean_session(!settings.persistent_session);
  }
  options.set_keep_alive_interval(settings.keep_alive_s);
  options.set_connect_timeout(settings.connect_timeout_s);
  options.set_max_inflight(static_cast<int>(settings.max_inflight));
  options.set_automatic_reconnect(false);  // MqttClient runs its own jittered schedule
  if (credentials) {
    options.set_user_name(credentials->username);
    options.set_password(credentials->password);
  }
  if (settings.will) {
    options.set_will(mqtt::will_options(settings.will->topic, settings.will->payload,
                                        settings.will->qos, settings.will->retained));
  }
  if (settings.tls) {
    tls.set_trust_store(settings.tls->ca_file);
    if (!settings.tls->cert_file.empty()) {
      tls.set_key_store(settings.tls->cert_file);
      tls.set_private_key(settings.tls->key_file);
    }
    tls.set_enable_server_cert_auth(true);
    tls.set_verify(true);  // the certificate must name the host of server_uri
    options.set_ssl(tls);
  }
}

std::string connect_failure_text(const MqttSettings& settings, const mqtt::token& token) {
  std::string text = "cannot connect to " + settings.server_uri + ": ";
  // Under MQTT 5 paho reports the CONNACK reason code as the return code.
  const int rc = token.get_return_code();
  const int reason = failure_reason(rc) ? rc : token.get_reason_code();
  if (settings.mqtt_version == 5 && failure_reason(reason)) {
    return text + "broker refused the connection: " + mqtt::exception::reason_code_str(reason);
  }
  if (const std::string refused = connack_text(rc); !refused.empty()) {
    return text + "broker refused the connection: " + refused;
  }
  if (rc == MQTTASYNC_FAILURE) {
    text += "no connection (refused, closed or timed out before CONNACK)";
    if (settings.tls) {
      text += "; over TLS, check that ca_file '" + settings.tls->ca_file +
              "' is the CA that signed the broker's certificate, that the certificate names the "
              "host in server_uri, and that the broker accepts this client's certificate";
    }
    return text;
  }
  return text + token_failure_text(token);
}

std::string token_failure_text(const mqtt::token& token) {
  const int rc = token.get_return_code();
  std::string text = mqtt::exception::error_str(rc);
  if (text.empty()) text = "error " + std::to_string(rc);
  const int reason = token.get_reason_code();
  if (failure_reason(reason)) {
    text += " (" + mqtt::exception::reason_code_str(reason) + ")";
  }
  return text;
}

}  // namespace bw::io::mqtt_detail
