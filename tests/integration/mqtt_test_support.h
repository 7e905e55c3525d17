// What the MQTT client tests share: an io_context running on its own thread with the strand the
// client posts to, and an MqttEvents that records every call so a test can wait for one.
//
// RecordingEvents is called on the strand and read from the test thread, hence its mutex (the
// client itself takes none on the message path). It also counts calls that did not arrive on
// the strand, which the client promises never to make.
#pragma once

#include <boost/asio/executor_work_guard.hpp>
#include <boost/asio/io_context.hpp>
#include <boost/asio/strand.hpp>
#include <chrono>
#include <condition_variable>
#include <cstdint>
#include <functional>
#include <map>
#include <mutex>
#include <string>
#include <thread>
#include <vector>

#include "io/mqtt_client.h"
#include "mosquitto_harness.h"

namespace bw::testing {

using Clock = std::chrono::steady_clock;

class AsioLoop {
 public:
  AsioLoop() : thread_([this] { io_.run(); }) {}
  ~AsioLoop() {
    guard_.reset();
    io_.stop();
    thread_.join();
  }
  io::MqttClient::Strand strand() const { return strand_; }

 private:
  boost::asio::io_context io_;
  io::MqttClient::Strand strand_{boost::asio::make_strand(io_)};
  boost::asio::executor_work_guard<boost::asio::io_context::executor_type> guard_{
      io_.get_executor()};
  std::thread thread_;
};

struct ReceivedMessage {
  io::MqttMessage message;
  Clock::time_point at;
};

class RecordingEvents final : public io::MqttEvents {
 public:
  explicit RecordingEvents(io::MqttClient::Strand strand) : strand_(std::move(strand)) {}

  void on_connected(bool session_present) override {
    record([&] { connects_.push_back({session_present, Clock::now()}); });
  }
  void on_connection_lost(const std::string& why) override {
    record([&] { losses_.push_back({why, Clock::now()}); });
  }
  void on_message(io::MqttMessage message) override {
    record([&] { messages_.push_back({std::move(message), Clock::now()}); });
  }
  void on_delivered(std::uint64_t publish_id) override {
    record([&] { ++delivered_[publish_id]; });
  }
  void on_publish_failed(std::uint64_t publish_id, const std::string& why) override {
    record([&] { failed_[publish_id] = why; });
  }

  // Waits until `done()` holds or `timeout` passes. `done` runs without the lock, so it may
  // call the accessors below; it is checked again after every recorded call.
  bool wait_until(const std::function<bool()>& done,
                  std::chrono::milliseconds timeout = std::chrono::seconds(10)) {
    const Clock::time_point deadline = Clock::now() + timeout;
    std::unique_lock<std::mutex> lock(mutex_);
    while (true) {
      const std::uint64_t seen = changes_;
      lock.unlock();
      if (done()) return true;
      lock.lock();
      if (!changed_.wait_until(lock, deadline, [&] { return changes_ != seen; })) {
        lock.unlock();
        return done();
      }
    }
  }
  bool wait_connects(std::size_t n, std::chrono::milliseconds timeout = std::chrono::seconds(10)) {
    return wait_until([&] { return connects().size() >= n; }, timeout);
  }
  bool wait_losses(std::size_t n, std::chrono::milliseconds timeout = std::chrono::seconds(10)) {
    return wait_until([&] { return losses().size() >= n; }, timeout);
  }
  bool wait_messages(std::size_t n, std::chrono::milliseconds timeout = std::chrono::seconds(10)) {
    return wait_until([&] { return message_count() >= n; }, timeout);
  }

  struct Connect {
    bool session_present;
    Clock::time_point at;
  };
  struct Loss {
    std::string why;
    Clock::time_point at;
  };
  // Copies taken under the lock; the lists themselves are only touched by record().
  std::vector<Connect> connects() const { return locked_copy(connects_); }
  std::vector<Loss> losses() const { return locked_copy(losses_); }
  std::vector<ReceivedMessage> messages() const { return locked_copy(messages_); }
  std::map<std::uint64_t, int> delivered() const { return locked_copy(delivered_); }
  std::map<std::uint64_t, std::string> failed() const { return locked_copy(failed_); }
  std::size_t message_count() const {
    const std::lock_guard<std::mutex> lock(mutex_);
    return messages_.size();
  }
  ReceivedMessage last_message() const {
    const std::lock_guard<std::mutex> lock(mutex_);
    return messages_.back();
  }
  int off_strand_calls() const { return locked_copy(off_strand_calls_); }

 private:
  template <class Change>
  void record(Change change) {
    const bool on_strand = strand_.running_in_this_thread();
    {
      const std::lock_guard<std::mutex> lock(mutex_);
      if (!on_strand) ++off_strand_calls_;
      change();
      ++changes_;
    }
    changed_.notify_all();
  }
  template <class T>
  T locked_copy(const T& value) const {
    const std::lock_guard<std::mutex> lock(mutex_);
    return value;
  }

  io::MqttClient::Strand strand_;
  mutable std::mutex mutex_;
  std::condition_variable changed_;
  std::vector<Connect> connects_;
  std::vector<Loss> losses_;
  std::vector<ReceivedMessage> messages_;
  std::map<std::uint64_t, int> delivered_;
  std::map<std::uint64_t, std::string> failed_;
  int off_strand_calls_ = 0;
  std::uint64_t changes_ = 0;
};

// Settings for a test client of `broker`: short backoff and timeouts so tests stay quick.
inline io::MqttSettings test_settings(const MosquittoHarness& broker, std::string client_id) {
  io::MqttSettings settings;
  settings.server_uri = broker.uri();
  settings.client_id = std::move(client_id);
  settings.keep_alive_s = 5;
  settings.connect_timeout_s = 5;
  settings.reconnect_min_s = 0.1;
  settings.reconnect_max_s = 1.0;
  return settings;
}

inline double milliseconds_between(Clock::time_point from, Clock::time_point to) {
  return std::chrono::duration<double, std::milli>(to - from).count();
}

}  // namespace bw::testing

// Skips the test without the broker tools, or fails it when BRINEWATCH_REQUIRE_REFERENCE_TOOLS=1.
#define BW_NEED_MOSQUITTO()                                                                      \
  do {                                                                                           \
    if (!::bw::testing::broker_tools_available()) {                                              \
      const char* required = std::getenv("BRINEWATCH_REQUIRE_REFERENCE_TOOLS");                  \
      if (required != nullptr && std::string(required) == "1") {                                 \
        FAIL() << "mosquitto, mosquitto_pub, mosquitto_passwd and openssl are required "         \
                  "(BRINEWATCH_REQUIRE_REFERENCE_TOOLS=1); install mosquitto mosquitto-clients " \
                  "openssl";                                                                     \
      }                                                                                          \
      GTEST_SKIP() << "mosquitto, mosquitto-clients or openssl not installed";                   \
    }                                                                                            \
  } while (false)
