// Reads the broker user name and password from a file of their own, kept out of the site config.
//
// Format: the first line is the user name, the second the password; a trailing "\r" on either
// line is dropped and nothing may follow the second line except one final newline. Both must be
// non-empty.
//
// The file is refused when its group or others hold any permission bit (mode & 077 != 0): a
// password that other accounts on the box can read is a leak the operator should hear about
// at start-up, with the command that fixes it (chmod 600). The mode is taken from the opened
// descriptor, so the check and the read concern the same file.
//
// Thread safety: a free function with no shared state.
#pragma once

#include <string>

#include "core/result.h"

namespace bw::io {

struct MqttCredentials {
  std::string username;
  std::string password;
};

Result<MqttCredentials> read_mqtt_credentials(const std::string& path);

}  // namespace bw::io
