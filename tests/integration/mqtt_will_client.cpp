// A helper process for the last-will test: connects with a will through MqttClient, prints
// "connected" on standard output once the session is up, and waits to be killed. Killing it
// closes its socket without a DISCONNECT, which is what makes the broker publish the will.
//
//   mqtt_will_client URI CLIENT_ID WILL_TOPIC WILL_PAYLOAD
#include <boost/asio/io_context.hpp>
#include <boost/asio/strand.hpp>
#include <iostream>

#include "io/mqtt_client.h"

namespace {

class AnnounceConnected final : public bw::io::MqttEvents {
 public:
  void on_connected(bool /*session_present*/) override { std::cout << "connected" << std::endl; }
  void on_connection_lost(const std::string& why) override { std::cerr << why << std::endl; }
  void on_message(bw::io::MqttMessage /*message*/) override {}
  void on_delivered(std::uint64_t /*publish_id*/) override {}
  void on_publish_failed(std::uint64_t /*publish_id*/, const std::string& /*why*/) override {}
};

}  // namespace

int main(int argc, char** argv) {
  if (argc != 5) {
    std::cerr << "usage: mqtt_will_client URI CLIENT_ID WILL_TOPIC WILL_PAYLOAD\n";
    return 2;
  }
  boost::asio::io_context io;
  auto strand = boost::asio::make_strand(io);
  AnnounceConnected events;
  bw::io::MqttSettings settings;
  settings.server_uri = argv[1];
  settings.client_id = argv[2];
  settings.will = bw::io::MqttWill{argv[3], argv[4], 1, false};
  auto client = bw::io::MqttClient::create(settings, strand, events);
  if (!client) {
    std::cerr << client.error().message << "\n";
    return 1;
  }
  client.value()->start();
  auto guard = boost::asio::make_work_guard(io);
  io.run();
  return 0;
}
