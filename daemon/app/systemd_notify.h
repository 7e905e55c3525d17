// Tells systemd how the service is doing (sd_notify protocol: a datagram to $NOTIFY_SOCKET),
// without linking libsystemd. Does nothing when not started by systemd.
#pragma once

#include <string_view>

namespace bw::app {

void notify_systemd(std::string_view state);

}  // namespace bw::app
