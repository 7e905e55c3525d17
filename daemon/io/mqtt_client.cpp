#include "io/mqtt_client.h"

#include <mqtt/async_client.h>

#include <atomic>
#include <boost/asio/post.hpp>
#include <boost/asio/steady_timer.hpp>
#include <chrono>
#include <functional>
#include <future>

#include "io/backoff.h"
#include "io/mqtt_connect_options.h"
#include "io/mqtt_credentials.h"

namespace bw::io {

namespace {

// paho holds its listeners by reference and calls them on its own threads; this one forwards to
// functions so each kind of request (connect, subscribe, publish) needs one object, not a class.
class TokenListener final : public mqtt::iaction_listener {
 public:
  using Handler = std::function<void(const mqtt::token&)>;

  void set(Handler on_success, Handler on_failure) {
    success_ = std::move(on_success);
    failure_ = std::move(on_failure);
  }

 private:
  void on_success(const mqtt::token& token) override { success_(token); }
  void on_failure(const mqtt::token& token) override { failure_(token); }

  Handler success_;
  Handler failure_;
};

// The publish id travels in paho's per-token user context, so no table of pending publishes is
// needed (and no lock on the publish path).
static_assert(sizeof(std::uintptr_t) >= sizeof(std::uint64_t));
void* publish_context(std::uint64_t publish_id) {
  return reinterpret_cast<void*>(static_cast<std::uintptr_t>(publish_id));
}
std::uint64_t publish_id_of(const mqtt::token& token) {
  return reinterpret_cast<std::uintptr_t>(token.get_user_context());
}

// The first refused filter of a SUBACK, or "" when every filter was granted.
std::string subscription_refusal(const MqttSettings& settings, const mqtt::token& token) {
  const std::vector<mqtt::ReasonCode> codes = token.get_subscribe_response().get_reason_codes();
  for (std::size_t i = 0; i < codes.size() && i < settings.subscriptions.size(); ++i) {
    if (codes[i] >= mqtt::ReasonCode::UNSPECIFIED_ERROR) {
      return "broker refused the subscription to '" + settings.subscriptions[i].first +
             "' (reason code " + std::to_string(static_cast<int>(codes[i])) + ")";
    }
  }
  return "";
}

}  // namespace

class MqttClient::Connection : public std::enable_shared_from_this<Connection> {
 public:
  Connection(MqttSettings settings, Strand strand, MqttEvents& events)
      : settings_(std::move(settings)),
        strand_(std::move(strand)),
        events_(events),
        backoff_(settings_.reconnect_min_s, settings_.reconnect_max_s,
                 backoff_seed(settings_.client_id)),
        retry_timer_(strand_) {}

  // The second step of construction: the callbacks need weak_from_this().
  Status init(const std::optional<MqttCredentials>& credentials);

  void start();
  void stop();
  bool connected() const { return connected_.load(std::memory_order_acquire); }
  bool publish(std::uint64_t publish_id, const std::string& topic, std::string payload, int qos,
               bool retained);

 private:
  // Where the connection stands; read and written on the strand only.
  enum class State { kIdle, kConnecting, kSubscribing, kConnected, kWaiting };

  // Runs handler(*this) on the strand, unless the Connection is gone or stopped by then.
  template <class Handler>
  void post(Handler handler);

  // Runs `work` on the strand and returns when it has run (see stop() for the cases where no
  // one runs the strand).
  void run_on_strand(const std::function<void()>& work);


  // On the strand:
  void begin_attempt();
  void handle_connack(bool session_present);
  void handle_suback(const std::string& refusal);
  void handle_failure(const std::string& why);
  void mark_connected();

  const MqttSettings settings_;
  Strand strand_;
  MqttEvents& events_;
  ReconnectBackoff backoff_;
  boost::asio::steady_timer retry_timer_;
  State state_ = State::kIdle;
  bool session_present_ = false;
  mqtt::token_ptr pending_connect_;
  std::atomic<bool> active_{false};
  std::atomic<bool> connected_{false};
  mqtt::ssl_options tls_options_;  // filled in place, never moved (mqtt_connect_options.h)
  mqtt::connect_options connect_options_;
  TokenListener connect_listener_;
  TokenListener subscribe_listener_;
  TokenListener publish_listener_;
  // Declared last, destroyed first: no paho callback outlives the members it uses.
  std::unique_ptr<mqtt::async_client> client_;
};

template <class Handler>
void MqttClient::Connection::post(Handler handler) {
  boost::asio::post(strand_, [weak = weak_from_this(), handler = std::move(handler)]() mutable {
    const std::shared_ptr<Connection> self = weak.lock();
    if (self && self->active_.load(std::memory_order_acquire)) handler(*self);
  });
}

Status MqttClient::Connection::init(const std::optional<MqttCredentials>& credentials) {
  try {
    client_ = std::make_unique<mqtt::async_client>(settings_.server_uri, settings_.client_id,
                                                   mqtt_detail::make_create_options(settings_));
  } catch (const mqtt::exception& e) {
    return Error{"mqtt setting 'server_uri': '" + settings_.server_uri +
                 "' is not usable: " + e.what()};
  }
  mqtt_detail::configure_connect_options(connect_options_, tls_options_, settings_, credentials);

  connect_listener_.set(
      [this](const mqtt::token& token) {
        bool session_present = false;
        try {
          session_present = token.get_connect_response().is_session_present();
        } catch (const mqtt::exception&) {
          // No CONNACK details: treat the session as new, which only costs a resubscription.
        }
        post([session_present](Connection& c) { c.handle_connack(session_present); });
      },
      [this](const mqtt::token& token) {
        std::string why = mqtt_detail::connect_failure_text(settings_, token);
        post([why = std::move(why)](Connection& c) { c.handle_failure(why); });
      });
  subscribe_listener_.set(
      [this](const mqtt::token& token) {
        std::string refusal = subscription_refusal(settings_, token);
        post([refusal = std::move(refusal)](Connection& c) { c.handle_suback(refusal); });
      },
      [this](const mqtt::token& token) {
        std::string why = "subscribing failed: " + mqtt_detail::token_failure_text(token);
        post([why = std::move(why)](Connection& c) { c.handle_failure(why); });
      });
  publish_listener_.set(
      [this](const mqtt::token& token) {
        post([id = publish_id_of(token)](Connection& c) { c.events_.on_delivered(id); });
      },
      [this](const mqtt::token& token) {
        post([id = publish_id_of(token), why = mqtt_detail::token_failure_text(token)](
                 Connection& c) { c.events_.on_publish_failed(id, why); });
      });

  client_->set_message_callback([this](mqtt::const_message_ptr message) {
    MqttMessage copy{message->get_topic(), message->get_payload_str(), message->get_qos(),
                     message->is_retained()};
    post(
        [copy = std::move(copy)](Connection& c) mutable { c.events_.on_message(std::move(copy)); });
  });
  client_->set_connection_lost_handler([this](const std::string& cause) {
    std::string why = "connection to " + settings_.server_uri + " lost";
    if (!cause.empty()) why += ": " + cause;
    post([why = std::move(why)](Connection& c) { c.handle_failure(why); });
  });
  return Ok{};
}

void MqttClient::Connection::start() {
  if (active_.exchange(true)) return;
  post([](Connection& c) { c.begin_attempt(); });
}

void MqttClient::Connection::run_on_strand(const std::function<void()>& work) {
  if (strand_.running_in_this_thread() || strand_.get_inner_executor().context().stopped()) {
    work();
    return;
  }
  std::packaged_task<void()> task(work);
  std::future<void> done = task.get_future();
  boost::asio::post(strand_, std::move(task));
  // Nobody may be running the io_context (a daemon shutting down); then nothing else touches
  // the strand's state either and doing the work here is safe.
  if (done.wait_for(std::chrono::seconds(settings_.connect_timeout_s)) !=
      std::future_status::ready) {
    work();
  }
}

void MqttClient::Connection::stop() {
  if (!active_.exchange(false)) return;
  mqtt::token_ptr pending;
  run_on_strand([this, &pending] {
    retry_timer_.cancel();
    state_ = State::kIdle;
    pending = std::exchange(pending_connect_, nullptr);
  });
  connected_.store(false, std::memory_order_release);
  const auto timeout = std::chrono::seconds(settings_.connect_timeout_s);
  try {
    // An attempt under way could otherwise complete after stop() and leave a session open.
    if (pending) pending->wait_for(timeout);
  } catch (const mqtt::exception&) {
    // A failed attempt leaves nothing to close.
  }
  try {
    if (client_->is_connected()) client_->disconnect()->wait_for(timeout);
  } catch (const mqtt::exception&) {
    // The connection is gone either way.
  }
}

bool MqttClient::Connection::publish(std::uint64_t publish_id, const std::string& topic,
                                     std::string payload, int qos, bool retained) {
  if (!connected()) return false;
  try {
    client_->publish(mqtt::make_message(topic, mqtt::binary_ref(std::move(payload)), qos, retained),
                     publish_context(publish_id), publish_listener_);
  } catch (const mqtt::exception&) {
    return false;
  }
  return true;
}

void MqttClient::Connection::begin_attempt() {
  if (state_ != State::kIdle && state_ != State::kWaiting) return;
  state_ = State::kConnecting;
  try {
    pending_connect_ = client_->connect(connect_options_, nullptr, connect_listener_);
  } catch (const mqtt::exception& e) {
    handle_failure("cannot connect to " + settings_.server_uri + ": " + e.what());
  }
}

void MqttClient::Connection::handle_connack(bool session_present) {
  if (state_ != State::kConnecting) return;
  pending_connect_.reset();
  session_present_ = session_present;
  if (settings_.subscriptions.empty()) {
    mark_connected();
    return;
  }
  state_ = State::kSubscribing;
  auto filters = std::make_shared<mqtt::string_collection>();
  mqtt::iasync_client::qos_collection qos;
  for (const auto& [filter, filter_qos] : settings_.subscriptions) {
    filters->push_back(filter);
    qos.push_back(filter_qos);
  }
  try {
    client_->subscribe(filters, qos, nullptr, subscribe_listener_);
  } catch (const mqtt::exception& e) {
    handle_failure(std::string("subscribing failed: ") + e.what());
  }
}

void MqttClient::Connection::handle_suback(const std::string& refusal) {
  if (state_ != State::kSubscribing) return;
  if (!refusal.empty()) {
    handle_failure(refusal);
    return;
  }
  mark_connected();
}

void MqttClient::Connection::mark_connected() {
  state_ = State::kConnected;
  backoff_.reset();
  connected_.store(true, std::memory_order_release);
  events_.on_connected(session_present_);
}

void MqttClient::Connection::handle_failure(const std::string& why) {
  // A loss can be reported twice (e.g. connection lost and the subscribe failing with it).
  if (state_ == State::kIdle || state_ == State::kWaiting) return;
  state_ = State::kWaiting;
  pending_connect_.reset();
  connected_.store(false, std::memory_order_release);
  try {
    // A refused subscription leaves the network connection up; drop it before retrying.
    if (client_->is_connected()) client_->disconnect();
  } catch (const mqtt::exception&) {
    // Already closed.
  }
  events_.on_connection_lost(why);
  const double delay_s = backoff_.next_delay_s();
  retry_timer_.expires_after(std::chrono::duration_cast<std::chrono::steady_clock::duration>(
      std::chrono::duration<double>(delay_s)));
  retry_timer_.async_wait([weak = weak_from_this()](const boost::system::error_code& error) {
    if (error) return;
    const std::shared_ptr<Connection> self = weak.lock();
    if (self && self->active_.load(std::memory_order_acquire)) self->begin_attempt();
  });
}

// MqttClient: a thin owner, so paho's callbacks can hold weak references to the Connection.

Result<std::unique_ptr<MqttClient>> MqttClient::create(MqttSettings settings, Strand strand,
                                                       MqttEvents& events) {
  if (Status valid = mqtt_detail::validate_settings(settings); !valid) return valid.error();
  std::optional<MqttCredentials> credentials;
  if (!settings.credentials_file.empty()) {
    Result<MqttCredentials> read = read_mqtt_credentials(settings.credentials_file);
    if (!read) return read.error();
    credentials = std::move(read).value();
  }
  auto connection = std::make_shared<Connection>(std::move(settings), std::move(strand), events);
  if (Status ready = connection->init(credentials); !ready) return ready.error();
  return std::unique_ptr<MqttClient>(new MqttClient(std::move(connection)));
}

MqttClient::MqttClient(std::shared_ptr<Connection> connection)
    : connection_(std::move(connection)) {}

MqttClient::~MqttClient() { connection_->stop(); }

void MqttClient::start() { connection_->start(); }
void MqttClient::stop() { connection_->stop(); }
bool MqttClient::connected() const { return connection_->connected(); }
bool MqttClient::publish(std::uint64_t publish_id, const std::string& topic, std::string payload,
                         int qos, bool retained) {
  return connection_->publish(publish_id, topic, std::move(payload), qos, retained);
}

}  // namespace bw::io
