// The live path under load: `brinewatch run` against a real mosquitto on loopback. Prints
// figures; asserts nothing.
//
// Three measurements, each repeated kRepeats times with a fresh daemon (and fresh topics, so the
// session a finished daemon leaves at the broker queues nothing), medians printed at the end:
//   1. throughput: kSingleMessages messages of one sample each (then kBatchMessages messages of
//      a JSON map of kTanks tags each) published by one io::MqttClient at QoS 1 with a window of
//      kWindow unacknowledged messages, as fast as it goes. The same stream goes once to a bare
//      `mosquitto_sub` (its rate: lines counted on its standard output until the last) and once
//      to the daemon (its rate: samples from its closing "stopped: ..." line over the time until
//      the alert of a marker sample published after the stream reaches a watcher). Both receive
//      at QoS 1, as the daemon's inputs do by default.
//   2. latency: a steady kSteadyRate samples per second, one per message; every kSpikeEvery one
//      tank reads below its transmitter's range, which raises its level_out_of_range alert at
//      once (no on-delay); its next sample clears it. Latency is publish call to the raise's
//      arrival on <prefix>/alerts at the watcher, through broker, daemon, journal commit and
//      broker again.
//   3. the daemon's CPU (utime + stime from /proc/<pid>/stat over each measured interval) and its
//      memory (VmRSS at the end, VmHWM) from /proc/<pid>/status.
//
// The site: kTanks tanks of the shipped tank_level template on level tags fed with a gentle
// swing around 10 ft (no limit crossed), sample time = receive time. Every wait is bounded.
#include <fcntl.h>
#include <poll.h>
#include <signal.h>
#include <spawn.h>
#include <sys/wait.h>
#include <unistd.h>

#include <algorithm>
#include <atomic>
#include <cmath>
#include <cstdio>
#include <deque>
#include <filesystem>
#include <fstream>
#include <limits>
#include <map>
#include <optional>
#include <sstream>
#include <thread>

#include "../integration/mqtt_test_support.h"

extern char** environ;

namespace {

namespace fs = std::filesystem;
using bw::testing::Clock;
using namespace std::chrono_literals;

constexpr int kRepeats = 3;
constexpr int kTanks = 50;  // one batch message carries one sample of each tank
constexpr std::size_t kSingleMessages = 20'000;
constexpr std::size_t kBatchMessages = 4'000;
constexpr std::size_t kWindow = 256;    // QoS 1 publishes awaiting PUBACK
constexpr double kSteadyRate = 10'000;  // samples per second, one per message
constexpr auto kSteadyFor = 3s;
constexpr auto kSpikeEvery = 20ms;
constexpr auto kStepLimit = 30s;      // no single wait or stream runs longer than this
constexpr double kSpikeLevel = -5.0;  // ft; the transmitter's range starts at 0 ft

double seconds(Clock::duration d) { return std::chrono::duration<double>(d).count(); }

double median(std::vector<double> v) {
  if (v.empty()) return std::nan("");
  std::sort(v.begin(), v.end());
  return v[v.size() / 2];
}

// The value at rank q (0..1) of the sorted figures, nearest rank.
double percentile(std::vector<double> v, double q) {
  if (v.empty()) return std::nan("");
  std::sort(v.begin(), v.end());
  const auto rank = static_cast<std::size_t>(std::ceil(q * static_cast<double>(v.size())));
  return v[std::clamp<std::size_t>(rank, 1, v.size()) - 1];
}

std::string tank_name(int i) {
  char name[8];
  std::snprintf(name, sizeof name, "TK%02d", i + 1);
  return name;
}

// A swing of 0.02 ft over a minute: the estimators work, no limit or rate check trips.
std::string level_text(Clock::time_point now) {
  const double phase = 2 * M_PI * seconds(now.time_since_epoch()) / 60.0;
  char text[16];
  std::snprintf(text, sizeof text, "%.4f", 10.0 + 0.02 * std::sin(phase));
  return text;
}

std::string text_field(const std::string& json, const std::string& name) {
  const std::string key = "\"" + name + "\":\"";
  const auto at = json.find(key);
  if (at == std::string::npos) return {};
  const auto end = json.find('"', at + key.size());
  return json.substr(at + key.size(), end - at - key.size());
}

// What a bench client hears: PUBACKs counted, alert raises of level_out_of_range and the
// daemon's status kept with their arrival times. Called on the client's strand.
class Watch final : public bw::io::MqttEvents {
 public:
  struct Raise {
    std::string asset;
    Clock::time_point at;
  };
  void on_connected(bool) override {
    signal([&] { connected_ = true; });
  }
  void on_connection_lost(const std::string& why) override {
    std::fprintf(stderr, "bench_live: connection lost: %s\n", why.c_str());
  }
  void on_message(bw::io::MqttMessage m) override {
    const auto at = Clock::now();
    signal([&] {
      if (m.topic.ends_with("/status")) {
        status_ = m.payload;
      } else if (text_field(m.payload, "check") == "level_out_of_range") {
        if (text_field(m.payload, "event") == "raised") {
          raises_.push_back({text_field(m.payload, "asset"), at});
        }
      } else {
        ++other_alerts_;
      }
    });
  }
  void on_delivered(std::uint64_t) override {
    signal([&] { ++delivered_; });
  }
  void on_publish_failed(std::uint64_t, const std::string& why) override {
    std::fprintf(stderr, "bench_live: publish failed: %s\n", why.c_str());
  }

  // Waits until `done()` (called under the lock) holds; false after `limit`.
  template <class Done>
  bool wait(Done done, Clock::duration limit = kStepLimit) {
    std::unique_lock<std::mutex> lock(mutex_);
    return changed_.wait_for(lock, limit, [&] { return done(); });
  }
  // Waits for the next change or `limit`.
  void wait_change(Clock::duration limit) {
    std::unique_lock<std::mutex> lock(mutex_);
    changed_.wait_for(lock, limit);
  }
  bool connected() {
    return wait([&] { return connected_; }, 10s);
  }
  bool status_is(const std::string& s) {
    return wait([&] { return status_ == s; }, 10s);
  }
  bool wait_raises(std::size_t n, Clock::duration limit) {
    return wait([&] { return raises_.size() >= n; }, limit);
  }
  std::uint64_t delivered() {
    const std::lock_guard<std::mutex> lock(mutex_);
    return delivered_;
  }
  std::vector<Raise> raises() {
    const std::lock_guard<std::mutex> lock(mutex_);
    return raises_;
  }
  std::size_t other_alerts() {
    const std::lock_guard<std::mutex> lock(mutex_);
    return other_alerts_;
  }

 private:
  template <class Change>
  void signal(Change change) {
    {
      const std::lock_guard<std::mutex> lock(mutex_);
      change();
    }
    changed_.notify_all();
  }

  std::mutex mutex_;
  std::condition_variable changed_;
  bool connected_ = false;
  std::string status_;
  std::uint64_t delivered_ = 0;
  std::vector<Raise> raises_;
  std::size_t other_alerts_ = 0;
};

// One bench client on its own io_context thread.
class BenchClient {
 public:
  BenchClient(const bw::testing::MosquittoHarness& broker, const std::string& id,
              std::vector<std::pair<std::string, int>> subscriptions) {
    auto settings = bw::testing::test_settings(broker, id);
    settings.persistent_session = false;
    settings.max_inflight = kWindow;
    settings.subscriptions = std::move(subscriptions);
    auto client = bw::io::MqttClient::create(std::move(settings), loop_.strand(), watch_);
    if (!client) {
      std::fprintf(stderr, "bench_live: %s\n", client.error().message.c_str());
      return;
    }
    client_ = std::move(client).value();
    client_->start();
    if (!watch_.connected()) client_.reset();
  }
  ~BenchClient() {
    if (client_) client_->stop();
  }
  bool ok() const { return client_ != nullptr; }
  Watch& watch() { return watch_; }

  // Publishes at QoS 1, waiting while the window is full; false after `deadline`.
  bool publish(const std::string& topic, const std::string& payload, Clock::time_point deadline) {
    while (!client_->publish(next_id_, topic, payload, 1, false)) {
      if (Clock::now() > deadline) return false;
      watch_.wait_change(1ms);
    }
    ++next_id_;
    return true;
  }
  // Waits for the PUBACK of everything published so far.
  bool all_acknowledged() {
    const auto deadline = Clock::now() + kStepLimit;
    while (watch_.delivered() < next_id_ - 1) {
      if (Clock::now() > deadline) return false;
      watch_.wait_change(5ms);
    }
    return true;
  }

 private:
  bw::testing::AsioLoop loop_;
  Watch watch_;
  std::unique_ptr<bw::io::MqttClient> client_;
  std::uint64_t next_id_ = 1;
};

// A child process, stopped (SIGTERM, then SIGKILL after 5 s) when the object goes.
class Child {
 public:
  // Standard output and error go to `log`; with `pipe_out`, standard output goes to a pipe.
  Child(const std::vector<std::string>& argv, const fs::path& log, bool pipe_out = false) {
    posix_spawn_file_actions_t actions;
    posix_spawn_file_actions_init(&actions);
    int fds[2] = {-1, -1};
    if (pipe_out && pipe2(fds, O_CLOEXEC) == 0) {
      posix_spawn_file_actions_adddup2(&actions, fds[1], STDOUT_FILENO);
      out_ = fds[0];
    } else {
      posix_spawn_file_actions_addopen(&actions, STDOUT_FILENO, log.c_str(),
                                       O_WRONLY | O_CREAT | O_TRUNC, 0600);
    }
    posix_spawn_file_actions_addopen(&actions, STDERR_FILENO, log.c_str(),
                                     O_WRONLY | O_CREAT | O_APPEND, 0600);
    std::vector<char*> args;
    for (const auto& a : argv) args.push_back(const_cast<char*>(a.c_str()));
    args.push_back(nullptr);
    if (posix_spawn(&pid_, args[0], &actions, nullptr, args.data(), environ) != 0) pid_ = -1;
    posix_spawn_file_actions_destroy(&actions);
    if (fds[1] >= 0) close(fds[1]);
  }
  ~Child() {
    stop();
    if (out_ >= 0) close(out_);
  }
  Child(const Child&) = delete;
  Child& operator=(const Child&) = delete;

  pid_t pid() const { return pid_; }
  int out() const { return out_; }
  void stop() {
    if (pid_ <= 0) return;
    ::kill(pid_, SIGTERM);
    const auto deadline = Clock::now() + 5s;
    while (waitpid(pid_, nullptr, WNOHANG) == 0) {
      if (Clock::now() > deadline) {
        ::kill(pid_, SIGKILL);
        waitpid(pid_, nullptr, 0);
        break;
      }
      std::this_thread::sleep_for(5ms);
    }
    pid_ = -1;
  }

 private:
  pid_t pid_ = -1;
  int out_ = -1;
};

// CPU seconds (user + system) a process has used so far.
double cpu_seconds(pid_t pid) {
  std::ifstream in("/proc/" + std::to_string(pid) + "/stat");
  const std::string stat{std::istreambuf_iterator<char>(in), {}};
  std::istringstream fields(stat.substr(stat.rfind(')') + 2));
  std::string skip;
  for (int i = 3; i < 14; ++i) fields >> skip;  // state .. cmajflt: fields 3 to 13
  double utime = 0;
  double stime = 0;
  fields >> utime >> stime;
  return (utime + stime) / static_cast<double>(sysconf(_SC_CLK_TCK));
}

// A "VmXXX:  1234 kB" figure of /proc/<pid>/status, in MB.
double memory_mb(pid_t pid, const std::string& key) {
  std::ifstream in("/proc/" + std::to_string(pid) + "/status");
  for (std::string line; std::getline(in, line);) {
    if (line.rfind(key + ":", 0) == 0) return std::stod(line.substr(key.size() + 1)) / 1024.0;
  }
  return std::nan("");
}

// One run's topics, site file and folder; the number keeps runs apart at the broker.
struct Run {
  int number;
  fs::path dir;
  std::string root() const { return "dc4run" + std::to_string(number); }
  std::string prefix() const { return "bench/r" + std::to_string(number); }
  std::string tank_topic(int i) const { return root() + "/" + tank_name(i) + "/LEVEL"; }
  std::string batch_topic() const { return root() + "/batch"; }
};

Run make_run(const fs::path& base, const bw::testing::MosquittoHarness& broker) {
  static int count = 0;
  ++count;
  Run run{count, base / ("run" + std::to_string(count))};
  fs::create_directories(run.dir);
  std::ofstream site(run.dir / "site.yaml");
  site << "site: {name: Dry Creek SWD 4, time_zone: UTC}\n"
       << "rules: [" << BRINEWATCH_SOURCE_DIR << "/rules]\nassets:\n";
  for (int i = 0; i < kTanks; ++i) {
    site << "  tank_" << i + 1 << ": {template: tank_level, tags: {level: DC4." << tank_name(i)
         << ".LEVEL}}\n";
  }
  site << "live:\n  broker: {uri: \"" << broker.uri() << "\", client_id: bench-daemon-"
       << run.number << "}\n  inputs:\n"
       << "    - {topic: \"" << run.root() << "/+/+\", tag: \"DC4.{1}.{2}\", qos: 1}\n"
       << "    - {topic: \"" << run.batch_topic() << "\", qos: 1}\n"
       << "  outputs: {topic_prefix: " << run.prefix() << "}\n"
       << "  state: {dir: " << (run.dir / "state").string() << "}\n";
  return run;
}

// The stream of part 1: `messages` single samples, or batches of one sample per tank.
struct Stream {
  bool batched;
  std::size_t messages;
  std::size_t samples() const { return batched ? messages * kTanks : messages; }
};

// Publishes the stream; returns the time it took the publisher (PUBACKs included).
std::optional<double> publish_stream(BenchClient& publisher, const Run& run, const Stream& s) {
  const auto start = Clock::now();
  const auto deadline = start + kStepLimit;
  for (std::size_t m = 0; m < s.messages; ++m) {
    const auto now = Clock::now();
    std::string payload;
    std::string topic;
    if (s.batched) {
      topic = run.batch_topic();
      payload = "{";
      const std::string level = level_text(now);
      for (int i = 0; i < kTanks; ++i) {
        payload += (i ? ",\"DC4." : "\"DC4.") + tank_name(i) + ".LEVEL\":" + level;
      }
      payload += "}";
    } else {
      topic = run.tank_topic(static_cast<int>(m % kTanks));
      payload = level_text(now);
    }
    if (!publisher.publish(topic, payload, deadline)) return std::nullopt;
  }
  if (!publisher.all_acknowledged()) return std::nullopt;
  return seconds(Clock::now() - start);
}

// Counts lines on a pipe, on its own thread, until finish().
class LineCounter {
 public:
  explicit LineCounter(int fd) : thread_([this, fd] { count(fd); }) {}
  ~LineCounter() { finish(); }
  LineCounter(const LineCounter&) = delete;
  LineCounter& operator=(const LineCounter&) = delete;

  std::size_t lines() const { return lines_.load(); }
  // When the latest line arrived.
  Clock::time_point last() const { return Clock::time_point(Clock::duration(last_.load())); }
  // Waits until `target` lines, or `quiet` without a line, or kStepLimit; then stops counting.
  void wait(std::size_t target, Clock::duration quiet) {
    const auto deadline = Clock::now() + kStepLimit;
    auto seen = lines();
    auto progress = Clock::now();
    while (lines() < target && Clock::now() < deadline && Clock::now() - progress < quiet) {
      std::this_thread::sleep_for(5ms);
      if (lines() != seen) {
        seen = lines();
        progress = Clock::now();
      }
    }
    finish();
  }
  void finish() {
    stop_ = true;
    if (thread_.joinable()) thread_.join();
  }

 private:
  void count(int fd) {
    char buffer[1 << 16];
    while (!stop_) {
      pollfd p{fd, POLLIN, 0};
      if (poll(&p, 1, 20) <= 0) continue;
      const ssize_t n = read(fd, buffer, sizeof buffer);
      if (n <= 0) return;
      lines_ += static_cast<std::size_t>(std::count(buffer, buffer + n, '\n'));
      last_ = Clock::now().time_since_epoch().count();
    }
  }

  std::atomic<bool> stop_{false};
  std::atomic<std::size_t> lines_{0};
  std::atomic<Clock::rep> last_{0};
  std::thread thread_;
};

// Samples per second a bare mosquitto_sub receives of the stream: the lines it printed over the
// time until the last, which counts what the broker dropped for a slow reader as not received.
std::optional<double> bare_rate(const bw::testing::MosquittoHarness& broker, BenchClient& publisher,
                                const Run& run, const Stream& s) {
  Child sub({bw::testing::find_program("mosquitto_sub"), "-h", "127.0.0.1", "-p",
             std::to_string(broker.port()), "-q", "1", "-t", run.root() + "/#"},
            run.dir / "mosquitto_sub.log", true);
  {
    // Ready once a probe comes back; probes still on their way are read and not counted.
    LineCounter probes(sub.out());
    const auto probe_deadline = Clock::now() + 10s;
    while (probes.lines() == 0 && Clock::now() < probe_deadline) {
      publisher.publish(run.root() + "/probe/x", "probe", probe_deadline);
      std::this_thread::sleep_for(20ms);
    }
    if (probes.lines() == 0) return std::nullopt;
    probes.wait(std::numeric_limits<std::size_t>::max(), 100ms);
  }
  LineCounter counter(sub.out());
  const auto start = Clock::now();
  if (!publish_stream(publisher, run, s)) return std::nullopt;
  counter.wait(s.messages, 1s);
  const std::size_t samples_per_line = s.batched ? kTanks : 1;
  return static_cast<double>(counter.lines() * samples_per_line) / seconds(counter.last() - start);
}

struct DaemonFigures {
  double samples_per_s = std::nan("");
  double publisher_s = std::nan("");
  double cpu_percent = std::nan("");
  double cpu_us_per_sample = std::nan("");
  double rss_mb = std::nan("");
  double hwm_mb = std::nan("");
  std::uint64_t processed = 0;
  std::size_t other_alerts = 0;
  std::vector<double> latencies_ms;
};

// Starts `brinewatch run` on a new run's site and waits for its "online" status.
class DaemonUnderTest {
 public:
  DaemonUnderTest(const fs::path& base, const bw::testing::MosquittoHarness& broker)
      : run_(make_run(base, broker)),
        watcher_(broker, "bench-watch-" + std::to_string(run_.number),
                 {{run_.prefix() + "/alerts", 1}, {run_.prefix() + "/status", 1}}),
        daemon_({BRINEWATCH_EXE, "run", "--config", (run_.dir / "site.yaml").string()},
                run_.dir / "daemon.log") {
    ready_ = watcher_.ok() && watcher_.watch().status_is("online");
    if (!ready_) std::fprintf(stderr, "bench_live: the daemon did not come up:\n%s", log().c_str());
  }
  bool ready() const { return ready_; }
  const Run& run() const { return run_; }
  pid_t pid() const { return daemon_.pid(); }
  Watch& watch() { return watcher_.watch(); }
  std::string log() const {
    std::ifstream in(run_.dir / "daemon.log");
    return {std::istreambuf_iterator<char>(in), {}};
  }
  // Stops the daemon; the samples its closing line counts (0 when it has none).
  std::uint64_t stop() {
    daemon_.stop();
    const std::string text = log();
    const auto at = text.find("stopped: ");
    unsigned long long messages = 0;
    unsigned long long samples = 0;
    if (at == std::string::npos ||
        std::sscanf(text.c_str() + at, "stopped: %llu messages, %llu samples", &messages,
                    &samples) != 2) {
      return 0;
    }
    return samples;
  }

 private:
  Run run_;
  BenchClient watcher_;
  Child daemon_;
  bool ready_ = false;
};

void note_process(DaemonFigures& f, pid_t pid, double cpu_s, double wall_s, std::size_t samples) {
  f.cpu_percent = 100 * cpu_s / wall_s;
  f.cpu_us_per_sample = 1e6 * cpu_s / static_cast<double>(samples);
  f.rss_mb = memory_mb(pid, "VmRSS");
  f.hwm_mb = memory_mb(pid, "VmHWM");
}

// Part 1 for the daemon: the stream, then a marker spike on the first tank, sent again every
// 100 ms in case the broker dropped it, until its raise arrives.
std::optional<DaemonFigures> daemon_rate(const fs::path& base,
                                         const bw::testing::MosquittoHarness& broker,
                                         BenchClient& publisher, const Stream& s) {
  DaemonUnderTest d(base, broker);
  if (!d.ready()) return std::nullopt;
  DaemonFigures f;
  const double cpu_before = cpu_seconds(d.pid());
  const auto start = Clock::now();
  const auto published = publish_stream(publisher, d.run(), s);
  if (!published) return std::nullopt;
  f.publisher_s = *published;
  const auto deadline = Clock::now() + kStepLimit;
  bool seen = false;
  while (!seen && Clock::now() < deadline) {
    publisher.publish(d.run().tank_topic(0), std::to_string(kSpikeLevel), deadline);
    seen = d.watch().wait_raises(1, 100ms);
  }
  if (!seen) return std::nullopt;
  const double wall = seconds(d.watch().raises().front().at - start);
  note_process(f, d.pid(), cpu_seconds(d.pid()) - cpu_before, wall, s.samples());
  f.other_alerts = d.watch().other_alerts();
  f.processed = d.stop();
  f.samples_per_s = static_cast<double>(std::min<std::uint64_t>(f.processed, s.samples())) / wall;
  return f;
}

// Part 2: the steady stream with spikes; latency of each raise.
std::optional<DaemonFigures> daemon_latency(const fs::path& base,
                                            const bw::testing::MosquittoHarness& broker,
                                            BenchClient& publisher) {
  DaemonUnderTest d(base, broker);
  if (!d.ready()) return std::nullopt;
  DaemonFigures f;
  std::map<std::string, std::deque<Clock::time_point>> spikes;  // by asset, in order
  const double cpu_before = cpu_seconds(d.pid());
  const auto start = Clock::now();
  const auto deadline = start + kStepLimit;
  std::size_t sent = 0;
  std::size_t spike_count = 0;
  auto next_spike = start + kSpikeEvery;
  while (Clock::now() - start < kSteadyFor) {
    const auto now = Clock::now();
    const auto due = static_cast<std::size_t>(kSteadyRate * seconds(now - start));
    for (; sent < due; ++sent) {
      const int tank = static_cast<int>(sent % kTanks);
      std::string payload = level_text(now);
      if (now >= next_spike) {
        next_spike += kSpikeEvery;
        payload = std::to_string(kSpikeLevel);
        spikes["tank_" + std::to_string(tank + 1)].push_back(Clock::now());
        ++spike_count;
      }
      if (!publisher.publish(d.run().tank_topic(tank), payload, deadline)) return std::nullopt;
    }
    std::this_thread::sleep_for(200us);
  }
  const double wall = seconds(Clock::now() - start);
  publisher.all_acknowledged();
  d.watch().wait_raises(spike_count, 5s);
  note_process(f, d.pid(), cpu_seconds(d.pid()) - cpu_before, wall, sent);
  for (const auto& raise : d.watch().raises()) {
    auto& queue = spikes[raise.asset];
    if (queue.empty()) continue;
    f.latencies_ms.push_back(1e3 * seconds(raise.at - queue.front()));
    queue.pop_front();
  }
  f.samples_per_s = static_cast<double>(sent) / wall;
  f.other_alerts = d.watch().other_alerts();
  f.processed = d.stop();
  if (f.latencies_ms.size() < spike_count) {
    std::printf("  (%zu of %zu raises arrived)\n", f.latencies_ms.size(), spike_count);
  }
  return f;
}

void print_throughput(const char* name, const Stream& s, const std::vector<double>& bare,
                      const std::vector<DaemonFigures>& runs) {
  std::vector<double> rate, ratio, publisher, cpu, cpu_per, rss, hwm;
  for (std::size_t i = 0; i < runs.size(); ++i) {
    rate.push_back(runs[i].samples_per_s);
    if (i < bare.size()) ratio.push_back(runs[i].samples_per_s / bare[i]);
    publisher.push_back(static_cast<double>(s.samples()) / runs[i].publisher_s);
    cpu.push_back(runs[i].cpu_percent);
    cpu_per.push_back(runs[i].cpu_us_per_sample);
    rss.push_back(runs[i].rss_mb);
    hwm.push_back(runs[i].hwm_mb);
    std::printf(
        "  %s run %zu: daemon %.0f samples/s (%llu of %zu processed, %zu other alerts), "
        "bare %.0f samples/s, publisher %.0f samples/s\n",
        name, i + 1, runs[i].samples_per_s, static_cast<unsigned long long>(runs[i].processed),
        s.samples(), runs[i].other_alerts, i < bare.size() ? bare[i] : std::nan(""),
        publisher.back());
  }
  std::printf("%s: %zu messages, %zu samples\n", name, s.messages, s.samples());
  std::printf("  daemon            %10.0f samples/s\n", median(rate));
  std::printf("  bare mosquitto_sub %9.0f samples/s\n", median(bare));
  std::printf("  ratio daemon/bare %10.2f\n", median(ratio));
  std::printf("  publisher offered %10.0f samples/s (PUBACKs received)\n", median(publisher));
  std::printf("  daemon CPU        %10.0f %% of one core, %.2f us per sample\n", median(cpu),
              median(cpu_per));
  std::printf("  daemon memory     %10.1f MB VmRSS, %.1f MB VmHWM\n", median(rss), median(hwm));
}

}  // namespace

int main() {
  std::printf("bench_live: build type %s, %d tanks (tank_level), %d repetitions, medians\n",
              BRINEWATCH_BUILD_TYPE, kTanks, kRepeats);
#ifndef __OPTIMIZE__
  std::printf("WARNING: built without optimisation; these figures mean nothing for production\n");
#endif
  if (!bw::testing::broker_tools_available()) {
    std::printf(
        "bench_live: mosquitto and mosquitto-clients are not installed; nothing measured\n");
    return 0;
  }
  const fs::path base =
      fs::temp_directory_path() / ("brinewatch-bench-live-" + std::to_string(getpid()));
  fs::create_directories(base);
  int status = 0;
  {
    bw::testing::MosquittoHarness broker;
    if (!broker.start().ok()) {
      std::fprintf(stderr, "bench_live: mosquitto did not start:\n%s", broker.log().c_str());
      return 1;
    }
    BenchClient publisher(broker, "bench-publisher", {});
    if (!publisher.ok()) return 1;
    for (const Stream& s : {Stream{false, kSingleMessages}, Stream{true, kBatchMessages}}) {
      const char* name = s.batched ? "batched (50 samples per message)" : "one sample per message";
      std::vector<double> bare;
      std::vector<DaemonFigures> runs;
      for (int r = 0; r < kRepeats; ++r) {
        const Run bare_run = make_run(base, broker);
        const auto b = bare_rate(broker, publisher, bare_run, s);
        const auto d = daemon_rate(base, broker, publisher, s);
        if (!b || !d) {
          std::printf("  %s run %d: timed out (%s)\n", name, r + 1, b ? "daemon" : "mosquitto_sub");
          status = 1;
          continue;
        }
        bare.push_back(*b);
        runs.push_back(*d);
      }
      print_throughput(name, s, bare, runs);
    }
    std::vector<double> p50, p99, cpu, rss, hwm, all;
    for (int r = 0; r < kRepeats; ++r) {
      const auto f = daemon_latency(base, broker, publisher);
      if (!f || f->latencies_ms.empty()) {
        std::printf("  latency run %d: no raise arrived\n", r + 1);
        status = 1;
        continue;
      }
      p50.push_back(percentile(f->latencies_ms, 0.5));
      p99.push_back(percentile(f->latencies_ms, 0.99));
      cpu.push_back(f->cpu_percent);
      rss.push_back(f->rss_mb);
      hwm.push_back(f->hwm_mb);
      all.insert(all.end(), f->latencies_ms.begin(), f->latencies_ms.end());
      std::printf(
          "  latency run %d: %.0f samples/s sent, %zu raises, p50 %.2f ms, p99 %.2f ms, "
          "max %.2f ms, %zu other alerts\n",
          r + 1, f->samples_per_s, f->latencies_ms.size(), p50.back(), p99.back(),
          percentile(f->latencies_ms, 1.0), f->other_alerts);
    }
    std::printf("publish-to-alert latency at %.0f samples/s, one per message:\n", kSteadyRate);
    std::printf(
        "  p50 %.2f ms, p99 %.2f ms (medians of runs); all %zu raises: p50 %.2f ms, "
        "p99 %.2f ms\n",
        median(p50), median(p99), all.size(), percentile(all, 0.5), percentile(all, 0.99));
    std::printf("  daemon CPU %.0f %% of one core, %.1f MB VmRSS, %.1f MB VmHWM\n", median(cpu),
                median(rss), median(hwm));
  }
  fs::remove_all(base);
  return status;
}
