// Replays constructed histories of one pressure transmitter through the shipped signal_watch
// template with its defaults (learn 9 min, 1 s samples, CUSUM k = 1.5 and h = 15 sigma, EWMA
// chart lambda 0.05 and L = 10, flatline after 10 min of identical values, stale after 3 s).
//
// Signal: the injection header pressure at the invented site Dry Creek SWD 4, 850 psi with
// 2 psi of spread, once a second. A second transmitter (the suction header, bound to its own
// signal_watch) reports every second throughout, so event time moves on while the watched one is
// silent. The samples of the learning window (0 to 540 s, both included) are rescaled so that
// their mean and sample standard deviation are exactly 850 and 2 psi: the learned normal is then
// the true one and the published average run lengths apply unchanged.
#include <gtest/gtest.h>

#include <algorithm>
#include <cmath>
#include <cstdio>
#include <numeric>
#include <random>
#include <string>
#include <vector>

#include "../reference/reference_tools.h"
#include "wide_history_replay.h"

namespace {

using bw::testing::AlertEvent;
using bw::testing::first_raised;
using bw::testing::raised_list;
using bw::testing::WideHistory;

constexpr double kMean = 850.0;   // psi
constexpr double kSigma = 2.0;    // psi
constexpr double kLearnS = 540;   // learn_time 9 min
constexpr double kCusumK = 1.5;   // sigma
constexpr double kCusumH = 15.0;  // sigma
constexpr double kChartLambda = 0.05;
constexpr double kChartWidth = 10.0;
constexpr double kFlatlineWindowS = 600;
constexpr double kStaleFactor = 3;  // x the 1 s sample interval

struct Plan {
  double seconds = 3600;
  double correlation = 0;      // AR(1) coefficient between neighbouring samples
  double shift_sigma = 0;      // size of each shift episode, sigma
  double shift_from_s = -1;    // first episode; then one every shift_every_s
  double shift_every_s = 300;  // episodes last shift_length_s, alternating up and down
  double shift_length_s = 60;
  double freeze_from_s = -1;  // the transmitter repeats kFrozenValue from here on
  double silent_from_s = -1;  // no sample of the watched tag for silent_length_s
  double silent_length_s = 60;
};

constexpr double kFrozenValue = 850.37;  // psi, 0.19 sigma above normal

// The watched value at each whole second, before freezing and silence.
std::vector<double> watched_values(const Plan& plan) {
  std::mt19937_64 random(2026);
  std::normal_distribution<double> normal(0.0, 1.0);
  const auto n = static_cast<std::size_t>(plan.seconds) + 1;
  std::vector<double> noise(n);
  double previous = normal(random);
  const double innovation = std::sqrt(1 - plan.correlation * plan.correlation);
  for (auto& v : noise) {
    v = previous;
    previous = plan.correlation * previous + innovation * normal(random);
  }
  const auto learn_end = noise.begin() + static_cast<std::ptrdiff_t>(kLearnS) + 1;
  const double count = static_cast<double>(learn_end - noise.begin());
  const double mean = std::accumulate(noise.begin(), learn_end, 0.0) / count;
  double squares = 0;
  for (auto it = noise.begin(); it != learn_end; ++it) squares += (*it - mean) * (*it - mean);
  const double sd = std::sqrt(squares / (count - 1));
  for (auto it = noise.begin(); it != learn_end; ++it) *it = (*it - mean) / sd;

  std::vector<double> values(n);
  for (std::size_t s = 0; s < n; ++s) {
    double shift = 0;
    const double t = static_cast<double>(s);
    if (plan.shift_from_s >= 0 && t >= plan.shift_from_s) {
      const double since = t - plan.shift_from_s;
      const auto episode = static_cast<long>(since / plan.shift_every_s);
      if (std::fmod(since, plan.shift_every_s) < plan.shift_length_s) {
        shift = (episode % 2 == 0 ? 1 : -1) * plan.shift_sigma;
      }
    }
    values[s] = kMean + kSigma * (noise[s] + shift);
  }
  return values;
}

WideHistory build(const Plan& plan) {
  WideHistory history({"DC4.INJ.HEADER_P", "DC4.INJ.SUCTION_P"});
  const std::vector<double> watched = watched_values(plan);
  std::mt19937 random(99);
  std::normal_distribution<double> suction(60.0, 0.5);
  for (std::size_t s = 0; s < watched.size(); ++s) {
    const double t = static_cast<double>(s);
    double value = watched[s];
    if (plan.freeze_from_s >= 0 && t >= plan.freeze_from_s) value = kFrozenValue;
    if (plan.silent_from_s >= 0 && t >= plan.silent_from_s &&
        t < plan.silent_from_s + plan.silent_length_s) {
      value = NAN;  // an empty cell: no sample
    }
    history.add_row(t, {value, suction(random)});
  }
  return history;
}

std::string site() {
  return std::string("site: {name: Dry Creek SWD 4, time_zone: America/Chicago}\n") + "rules: [" +
         BRINEWATCH_SOURCE_DIR + "/rules]\n" +
         "assets:\n"
         "  injection_header:\n"
         "    template: signal_watch\n"
         "    tags: {value: DC4.INJ.HEADER_P}\n"
         "  suction_header:\n"
         "    template: signal_watch\n"
         "    tags: {value: DC4.INJ.SUCTION_P}\n";
}

double seconds_of(const AlertEvent& e) { return std::round(e.hours * 3600.0); }

// Run lengths in samples (the first shifted sample counts 1) of `check` in each shift episode.
std::vector<double> run_lengths(const std::vector<AlertEvent>& events, const std::string& check,
                                const Plan& plan) {
  std::vector<double> out;
  for (double start = plan.shift_from_s; start + plan.shift_every_s <= plan.seconds;
       start += plan.shift_every_s) {
    for (const AlertEvent& e : events) {
      const double t = seconds_of(e);
      if (e.check == check && e.event == "raised" && t >= start && t < start + plan.shift_every_s) {
        out.push_back(t - start + 1);
        break;
      }
    }
  }
  return out;
}

struct MeanAndError {
  double mean = 0;
  double standard_error = 0;
};

MeanAndError summarise(const std::vector<double>& v) {
  const double n = static_cast<double>(v.size());
  const double mean = std::accumulate(v.begin(), v.end(), 0.0) / n;
  double squares = 0;
  for (double x : v) squares += (x - mean) * (x - mean);
  return {mean, std::sqrt(squares / (n - 1) / n)};
}

// Siegmund's approximation of the one-sided CUSUM ARL (REFERENCES.md: Siegmund, Sequential
// Analysis, 1985, as given in Montgomery; from memory): [exp(-2 D b) + 2 D b - 1] / (2 D^2),
// b = h + 1.166, D = delta - k; two-sided 1/ARL = 1/ARL+ + 1/ARL-.
double siegmund_two_sided_arl(double k, double h, double shift) {
  const double b = h + 1.166;
  const auto one_sided = [&](double d) {
    if (d == 0) return b * b;
    return (std::exp(-2 * d * b) + 2 * d * b - 1) / (2 * d * d);
  };
  return 1.0 / (1.0 / one_sided(shift - k) + 1.0 / one_sided(-shift - k));
}

TEST(SignalWatchTemplate, CorrelatedHealthyNoiseStaysQuietForThreeDays) {
  // Neighbouring samples correlated 0.5, as a real process signal read every second is.
  const Plan plan{.seconds = 3 * 86400, .correlation = 0.5};
  const auto events =
      bw::testing::replay_history("signal-healthy", site(), build(plan), "injection_header");
  EXPECT_TRUE(raised_list(events).empty()) << ::testing::PrintToString(raised_list(events));
}

// 60 episodes of a 3 sigma shift, 60 s each, every 5 min (the sums fall back to 0 within 20 s
// once a shift ends, so each episode starts afresh), on independent noise.
const Plan kShiftPlan{.seconds = 900 + 60 * 300,
                      .shift_sigma = 3,
                      .shift_from_s = 900,
                      .shift_every_s = 300,
                      .shift_length_s = 60};

const std::vector<AlertEvent>& shift_events() {
  static const std::vector<AlertEvent> events =
      bw::testing::replay_history("signal-shift", site(), build(kShiftPlan), "injection_header");
  return events;
}

TEST(SignalWatchTemplate, ThreeSigmaShiftsRaiseTheCusumAtThePublishedRunLength) {
  const auto lengths = run_lengths(shift_events(), "shift_cusum", kShiftPlan);
  ASSERT_EQ(lengths.size(), 60u) << "every episode must raise shift_cusum";
  const MeanAndError measured = summarise(lengths);
  const double siegmund = siegmund_two_sided_arl(kCusumK, kCusumH, 3);
  std::printf(
      "[ figures ] shift_cusum on a 3 sigma shift: mean delay %.2f +/- %.2f samples over "
      "60 episodes (Siegmund's approximation %.2f)\n",
      measured.mean, measured.standard_error, siegmund);
  // 4 standard errors of the mean, plus 2 % for the approximation itself.
  EXPECT_NEAR(measured.mean, siegmund, 4 * measured.standard_error + 0.02 * siegmund);
}

TEST(SignalWatchTemplate, ThreeSigmaShiftsMatchTheCusumRunLengthOfSpc) {
  BW_REQUIRE_REFERENCE_TOOL(bw::test::rscript_with_spc_available(), "Rscript with r-cran-spc");
  const auto lengths = run_lengths(shift_events(), "shift_cusum", kShiftPlan);
  ASSERT_EQ(lengths.size(), 60u);
  const MeanAndError measured = summarise(lengths);
  // r-cran-spc xcusum.arl(1.5, 15, 3, sided = "two") at test time.
  const auto output =
      bw::test::run_command("Rscript " + bw::test::tool_path("spc_arl.R") + " cusum,1.5,15,3");
  ASSERT_TRUE(output.has_value());
  const auto values = bw::test::parse_numbers(*output);
  ASSERT_TRUE(values && values->size() == 1) << *output;
  std::printf("[ figures ] shift_cusum mean delay %.2f samples, r-cran-spc ARL %.2f\n",
              measured.mean, values->front());
  EXPECT_NEAR(measured.mean, values->front(), 4 * measured.standard_error);
}

// Starting from the normal, the EWMA of a shift delta after n samples is delta (1 - (1 -
// lambda)^n); the chart limit is L sigma sqrt(lambda / (2 - lambda)) (REFERENCES.md, EWMA
// limits). Noise-free it signals at the first n with delta (1 - 0.95^n) above 1.601: n = 15 for
// 3 sigma. The noise of the EWMA (0.16 sigma) moves a crossing rising at 0.07 sigma per sample by
// a few samples either way; over 60 episodes the mean stays within 2 samples.
TEST(SignalWatchTemplate, ThreeSigmaShiftsRaiseTheEwmaChartWhenItsMeanCrossesTheLimit) {
  const auto lengths = run_lengths(shift_events(), "shift_ewma", kShiftPlan);
  ASSERT_EQ(lengths.size(), 60u) << "every episode must raise shift_ewma";
  const double limit = kChartWidth * std::sqrt(kChartLambda / (2 - kChartLambda));
  const double noise_free = std::ceil(std::log(1 - limit / 3) / std::log(1 - kChartLambda));
  const MeanAndError measured = summarise(lengths);
  std::printf(
      "[ figures ] shift_ewma on a 3 sigma shift: mean delay %.2f +/- %.2f samples "
      "(noise-free crossing at %.0f)\n",
      measured.mean, measured.standard_error, noise_free);
  EXPECT_NEAR(measured.mean, noise_free, 2.0);
}

// The transmitter freezes at a value close to normal: the shift checks have nothing to see, and
// value_flatline raises once the last real sample and the frozen ones span the 10 min window.
TEST(SignalWatchTemplate, FrozenValueRaisesFlatlineAfterItsWindow) {
  const double freeze_s = 1800;
  const Plan plan{.seconds = 3000, .freeze_from_s = freeze_s};
  const auto events =
      bw::testing::replay_history("signal-frozen", site(), build(plan), "injection_header");
  const auto raised = first_raised(events, "value_flatline");
  ASSERT_TRUE(raised.has_value()) << ::testing::PrintToString(raised_list(events));
  const double delay_s = *raised * 3600 - freeze_s;
  std::printf("[ figures ] value_flatline raised %.0f s after the value froze (window %.0f s)\n",
              delay_s, kFlatlineWindowS);
  EXPECT_GE(delay_s, kFlatlineWindowS - 1);
  EXPECT_LE(delay_s, kFlatlineWindowS + 1);
  EXPECT_FALSE(first_raised(events, "shift_cusum").has_value());
  EXPECT_FALSE(first_raised(events, "shift_ewma").has_value());
}

// The transmitter goes silent for a minute: value_stale raises once no sample has come for
// 3 x 1 s, and clears with the next sample; nothing else speaks.
TEST(SignalWatchTemplate, SilentTransmitterRaisesStaleWithinFourSeconds) {
  const double silent_s = 1800;
  const Plan plan{.seconds = 2400, .silent_from_s = silent_s, .silent_length_s = 60};
  const auto events =
      bw::testing::replay_history("signal-silent", site(), build(plan), "injection_header");
  const auto raised = first_raised(events, "value_stale");
  ASSERT_TRUE(raised.has_value()) << ::testing::PrintToString(raised_list(events));
  const double last_sample_s = silent_s - 1;
  const double delay_s = *raised * 3600 - last_sample_s;
  std::printf("[ figures ] value_stale raised %.0f s after the last sample (stale time %.0f s)\n",
              delay_s, kStaleFactor);
  EXPECT_GE(delay_s, kStaleFactor);
  EXPECT_LE(delay_s, kStaleFactor + 1);  // event time moves in whole seconds here
  const auto cleared = std::find_if(events.begin(), events.end(), [](const AlertEvent& e) {
    return e.check == "value_stale" && e.event == "cleared";
  });
  ASSERT_NE(cleared, events.end());
  EXPECT_NEAR(seconds_of(*cleared), silent_s + plan.silent_length_s, 0.5);
  EXPECT_EQ(raised_list(events).size(), 1u) << ::testing::PrintToString(raised_list(events));
}

}  // namespace
