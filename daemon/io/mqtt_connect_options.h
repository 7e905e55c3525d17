// Internal to mqtt_client.cpp: checks MqttSettings, turns them into paho's options, and turns
// paho's failure codes into sentences for an operator. Kept apart so the client file holds only
// the connection's life cycle.
//
// Thread safety: free functions without shared state.
#pragma once

#include <mqtt/connect_options.h>
#include <mqtt/create_options.h>
#include <mqtt/ssl_options.h>
#include <mqtt/token.h>

#include <optional>
#include <string>

#include "core/result.h"
#include "io/mqtt_client.h"
#include "io/mqtt_credentials.h"

namespace bw::io::mqtt_detail {

// Everything create() promises to check before any network activity, except the credentials
// file, which read_mqtt_credentials() checks. The Error names the setting and the fix.
Status validate_settings(const MqttSettings& settings);

mqtt::create_options make_create_options(const MqttSettings& settings);

// Connect options for every attempt. `on_tls_error` receives OpenSSL's error text during a
// failed handshake (on a paho thread).
mqtt::connect_options make_connect_options(const MqttSettings& settings,
                                           const std::optional<MqttCredentials>& credentials,
                                           mqtt::ssl_options::error_handler on_tls_error);

// "cannot connect to <uri>: <reason>" for a failed connect token; `tls_error` is the last text
// given to on_tls_error during this attempt (empty if none).
std::string connect_failure_text(const MqttSettings& settings, const mqtt::token& token,
                                 const std::string& tls_error);

// A short reason for any other failed token (subscribe, publish).
std::string token_failure_text(const mqtt::token& token);

}  // namespace bw::io::mqtt_detail
