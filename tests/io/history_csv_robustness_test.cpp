// Randomly damaged history text (fixed seeds): the reader must never crash, and every line must
// be accounted for as a sample, a counted problem or a blank line.
#include <gtest/gtest.h>

#include <chrono>
#include <cmath>
#include <map>
#include <random>
#include <string>
#include <vector>

#include "io/history_csv.h"
#include "sample_collector.h"

namespace bw::io {
namespace {

using testing::SampleCollector;

constexpr int kLines = 5000;

class Damage {
 public:
  Damage(unsigned seed, char separator) : random_(seed), separator_(separator) {}

  int pick(int n) { return std::uniform_int_distribution<int>(0, n - 1)(random_); }

  // Times that mostly move forward, written in the four forms the reader accepts; the local
  // form (read in America/Chicago, UTC-6 in winter) crosses the 2026-03-08 spring-forward gap.
  std::string time_text() {
    clock_ += std::chrono::seconds(pick(3));
    switch (pick(4)) {
      case 0:
        return testing::civil_text(clock_) + "Z";
      case 1:
        return testing::civil_text(clock_ - std::chrono::hours(5)) + "." +
               std::to_string(100000 + pick(900000)) + "-05:00";
      case 2:
        return testing::civil_text(clock_ - std::chrono::hours(6));
      default:
        return std::to_string(clock_.time_since_epoch().count()) + "." + std::to_string(pick(10));
    }
  }

  std::string good_line() {
    static const char* const kQualities[] = {"good", "bad", "Uncertain", "192", "64", ""};
    return time_text() + ",DC4.TAG" + std::to_string(pick(5)) + "," +
           std::to_string(pick(20000) / 7.0 - 1000) + "," + kQualities[pick(6)];
  }

  std::string huge_number() {
    static const char* const kHuge[] = {"1e308",    "1e309", "-1e-400",   "1.7976931348623157e308",
                                        "4.9e-324", "NaN",   "-Infinity", "0x1p3",
                                        ".",        "-"};
    if (pick(2) == 0) return kHuge[pick(10)];
    return std::string(static_cast<std::size_t>(1 + pick(400)), static_cast<char>('1' + pick(9)));
  }

  // One of the ways a line can be damaged; leaves it intact now and then.
  std::string damage(std::string line) {
    static const char kGarbage[] = {'\0', '\r', '\n', ',', ';', '"', '\xff', '\x80', ' ',
                                    '\t', 'e',  '-',  '.', ':', 'Z', '+',    'T',    '9'};
    switch (pick(8)) {
      case 0:
        return line;
      case 1:
        return line.substr(0, static_cast<std::size_t>(pick(static_cast<int>(line.size()) + 1)));
      case 2:
        for (int i = pick(4); i >= 0; --i) {
          line[static_cast<std::size_t>(pick(static_cast<int>(line.size())))] =
              kGarbage[pick(sizeof kGarbage)];
        }
        return line;
      case 3: {
        // Replace the second-to-last field (the value in the long form).
        const auto last = line.rfind(separator_);
        const auto start = line.rfind(separator_, last - 1) + 1;
        return line.substr(0, start) + huge_number() + line.substr(last);
      }
      case 4:
        return pick(2) ? "" : " \t";
      case 5:
        return line + separator_ + line.substr(0, static_cast<std::size_t>(pick(10)));
      case 6: {
        std::string noise(static_cast<std::size_t>(pick(60)), ' ');
        for (char& c : noise) c = static_cast<char>(pick(256));
        return noise;
      }
      default:
        return line.substr(line.find(separator_) + 1);
    }
  }

 private:
  std::mt19937 random_;
  char separator_;
  std::chrono::sys_seconds clock_ =
      std::chrono::sys_days(std::chrono::March / 8 / 2026) + std::chrono::minutes(7 * 60 + 30);
};

// Lines as a text editor counts them: every '\n' ends one, and a last one may lack it.
std::size_t count_lines(const std::string& text) {
  std::size_t lines = 0;
  for (const char c : text) lines += c == '\n' ? 1 : 0;
  return lines + (!text.empty() && text.back() != '\n' ? 1 : 0);
}

std::string damaged_long_form(unsigned seed) {
  Damage damage(seed, ',');
  std::string text = "time,tag,value,quality\n";
  for (int i = 0; i < kLines; ++i) {
    text += damage.damage(damage.good_line());
    if (i + 1 < kLines || damage.pick(2)) text += damage.pick(3) ? "\n" : "\r\n";
  }
  return text;
}

void expect_sane_samples(const std::vector<testing::CollectedSample>& samples) {
  std::map<std::string, core::SensorTime> last;
  for (const auto& s : samples) {
    ASSERT_TRUE(std::isfinite(s.value));
    ASSERT_FALSE(s.tag.empty());
    const auto found = last.find(s.tag);
    if (found != last.end()) {
      ASSERT_GE(s.time, found->second) << s.tag;
    }
    last[s.tag] = s.time;
  }
}

TEST(HistoryCsvRobustness, EveryDamagedLongFormLineIsASampleOrACountedProblem) {
  for (const unsigned seed : {7u, 11u, 2026u}) {
    SCOPED_TRACE("seed " + std::to_string(seed));
    const std::string text = damaged_long_form(seed);
    SampleCollector out;
    HistoryOptions options;
    options.time_zone = "America/Chicago";
    const auto stats = read_history_text(text, "damaged.csv", options, out);
    ASSERT_TRUE(stats.ok()) << stats.error().message;
    const std::size_t lines = count_lines(text);
    EXPECT_EQ(stats->lines, lines);
    EXPECT_EQ(stats->samples + stats->rejected + stats->blank_lines, lines - 1);
    EXPECT_EQ(out.samples.size(), stats->samples);
    std::size_t by_reason = 0;
    for (const auto& [reason, n] : stats->rejected_by_reason) by_reason += n;
    EXPECT_EQ(by_reason, stats->rejected);
    // Both outcomes occur hundreds of times (about 1 line in 6 survives the damage).
    EXPECT_GT(stats->samples, 500u) << describe(stats.value(), "damaged.csv");
    EXPECT_GT(stats->rejected, 500u);
    expect_sane_samples(out.samples);
  }
}

TEST(HistoryCsvRobustness, StrictModeOnDamagedTextStopsAtOneProblem) {
  const std::string text = damaged_long_form(7);
  SampleCollector out;
  HistoryOptions options;
  options.strict = true;
  options.time_zone = "America/Chicago";
  const auto stats = read_history_text(text, "damaged.csv", options, out);
  ASSERT_TRUE(stats.ok());
  EXPECT_TRUE(stats->stopped_early);
  EXPECT_EQ(stats->rejected, 1u);
  EXPECT_EQ(stats->samples + stats->rejected + stats->blank_lines, stats->lines - 1);
}

TEST(HistoryCsvRobustness, DamagedWideFormNeverYieldsBadSamples) {
  Damage damage(13, ';');
  std::string text = "time;A;B;C\r\n";
  for (int i = 0; i < kLines; ++i) {
    std::string line = damage.time_text();
    for (int c = 0; c < 3; ++c) line += ";" + (damage.pick(4) ? damage.huge_number() : "");
    text += damage.damage(line) + "\r\n";
  }
  SampleCollector out;
  HistoryOptions options;
  options.time_zone = "America/Chicago";
  const auto stats = read_history_text(text, "damaged_wide.csv", options, out);
  ASSERT_TRUE(stats.ok());
  EXPECT_EQ(stats->lines, count_lines(text));
  EXPECT_LE(stats->samples, 3 * (stats->lines - 1));
  EXPECT_GT(stats->rejected, 0u);
  expect_sane_samples(out.samples);
}

}  // namespace
}  // namespace bw::io
