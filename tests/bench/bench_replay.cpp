// Replay throughput: samples per second for parse alone and for parse plus evaluate, beside the
// time `wc -l` takes to read the same file. Prints figures; asserts nothing.
//
// The file is the demo site's shape (three tank levels, one-minute rows, local times) scaled up:
// eight years of rows of the wide form, three samples each, written once to a temporary folder.
#include <sys/wait.h>

#include <algorithm>
#include <chrono>
#include <cstdio>
#include <cstdlib>
#include <filesystem>
#include <fstream>
#include <string>
#include <vector>

#include "app/demo_history.h"
#include "config/site_loader.h"
#include "engine/engine.h"
#include "io/history_csv.h"

namespace {

namespace fs = std::filesystem;
using Clock = std::chrono::steady_clock;

constexpr int kRepeats = 5;
constexpr int kYears = 8;  // about 10 million samples

double median(std::vector<double> v) {
  std::sort(v.begin(), v.end());
  return v[v.size() / 2];
}

class CountOnly final : public bw::io::SampleVisitor {
 public:
  void on_sample(const bw::engine::Sample&) override { ++count; }
  std::size_t count = 0;
};

class NullSink final : public bw::engine::AlertSink {
 public:
  void on_transition(const bw::engine::AlertTransition&) override { ++count; }
  std::size_t count = 0;
};

class Evaluate final : public bw::io::SampleVisitor {
 public:
  Evaluate(bw::engine::Engine& engine, NullSink& sink) : engine_(engine), sink_(sink) {}
  void on_sample(const bw::engine::Sample& s) override { engine_.process(s, sink_); }

 private:
  bw::engine::Engine& engine_;
  NullSink& sink_;
};

double seconds_since(Clock::time_point start) {
  return std::chrono::duration<double>(Clock::now() - start).count();
}

}  // namespace

int main() {
  std::printf("bench_replay: build type %s, median wall time of %d runs\n", BRINEWATCH_BUILD_TYPE,
              kRepeats);
#ifndef __OPTIMIZE__
  std::printf("WARNING: built without optimisation; these figures mean nothing for production\n");
#endif
  const fs::path dir = fs::temp_directory_path() / "brinewatch-bench-replay";
  fs::create_directories(dir);
  const fs::path file = dir / "history.csv";
  {
    // The demo history repeated with its days shifted, so times keep increasing per tag.
    const std::string day_block = bw::app::make_demo_history();
    const std::string header = day_block.substr(0, day_block.find('\n') + 1);
    const std::string body = day_block.substr(header.size());
    std::ofstream out(file, std::ios::binary);
    out << header;
    for (int year = 2027; year < 2027 + kYears; ++year) {
    for (int month = 1; month <= 12; ++month) {
      for (int block = 0; block < 6; ++block) {
        std::string shifted = body;
        char prefix[16];
        // Rewrite "2026-03-DD" to the block's month and day range (4 days per block).
        for (std::size_t pos = 0; (pos = shifted.find("2026-03-", pos)) != std::string::npos;) {
          const int day = std::stoi(shifted.substr(pos + 8, 2)) - 2 + 2 + 4 * block;
          std::snprintf(prefix, sizeof prefix, "%04d-%02d-%02d", year, month, day);
          shifted.replace(pos, 10, prefix);
          pos += 10;
        }
        out << shifted;
      }
    }
    }
  }
  const auto bytes = fs::file_size(file);

  std::vector<double> wc_times;
  std::vector<double> parse_times;
  std::vector<double> replay_times;
  std::size_t samples = 0;
  std::size_t transitions = 0;
  const std::string wc = "wc -l " + file.string() + " > /dev/null";
  auto site = bw::config::load_site(std::string(BRINEWATCH_SOURCE_DIR) +
                                    "/config-examples/dry-creek-swd4.yaml");
  if (!site.ok()) {
    std::fprintf(stderr, "bench_replay: the example site does not load\n");
    return 1;
  }
  bw::io::HistoryOptions options;
  options.time_zone = site.site->time_zone;
  for (int r = 0; r < kRepeats; ++r) {
    auto start = Clock::now();
    if (std::system(wc.c_str()) != 0) return 1;
    wc_times.push_back(seconds_since(start));

    CountOnly counter;
    start = Clock::now();
    auto stats = bw::io::read_history(file, options, counter);
    parse_times.push_back(seconds_since(start));
    if (!stats) return 1;
    samples = counter.count;

    bw::engine::Engine engine(*site.site);
    NullSink sink;
    Evaluate evaluate(engine, sink);
    start = Clock::now();
    stats = bw::io::read_history(file, options, evaluate);
    replay_times.push_back(seconds_since(start));
    transitions = sink.count;
  }
  const double wc_s = median(wc_times);
  const double parse_s = median(parse_times);
  const double replay_s = median(replay_times);
  std::printf("file: %.1f MB, %zu samples (wide form, local times)\n",
              static_cast<double>(bytes) / 1e6, samples);
  std::printf("wc -l:              %8.3f s\n", wc_s);
  std::printf("parse only:         %8.3f s  %6.2f M samples/s  (%.1fx wc -l)\n", parse_s,
              static_cast<double>(samples) / parse_s / 1e6, parse_s / wc_s);
  std::printf("parse + evaluate:   %8.3f s  %6.2f M samples/s  (%.1fx wc -l), %zu transitions\n",
              replay_s, static_cast<double>(samples) / replay_s / 1e6, replay_s / wc_s, transitions);
  fs::remove_all(dir);
  return 0;
}
