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

// Fills, in place, the connect options of every attempt and (with TLS) their TLS options.
// paho-mqtt-cpp 1.2 copies and moves its option objects without pointing their C structs at the
// new object's own parts (the MQTT 5 properties), so a moved or returned options object points
// into a destroyed one. Hence both objects are filled where they live for the whole connection
// and never moved afterwards: the copy that each connect() takes then points into them. For the
// same reason no TLS error callback is installed: its context would point into the copy that
// connect() destroys before the handshake fails, so a failed handshake is reported from the
// token, with what to check, not with OpenSSL's own words.
void configure_connect_options(mqtt::connect_options& options, mqtt::ssl_options& tls,
                               const MqttSettings& settings,
                               const std::optional<MqttCredentials>& credentials);

// "cannot connect to <uri>: <reason>" for a failed connect token.
std::string connect_failure_text(const MqttSettings& settings, const mqtt::token& token);

// A short reason for any other failed token (subscribe, publish).
std::string token_failure_text(const mqtt::token& token);

}  // namespace bw::io::mqtt_detail
