// Replays constructed disposal-well histories through the shipped disposal_well template.
//
// The well model (REFERENCES.md "Wells": steady-state radial flow in field units, Darcy constant
// 0.00708; the Hall plot relation G = W / II for steady flow, Hall 1963, citation from memory):
//   II(s) = 0.00708 k h / (mu B (ln(re/rw) + s))          bbl/d/psi
//   p_tubing = p_ref + q / II(s) + noise                   psi
// with p_ref the reservoir pressure less the hydrostatic head of the water column (surface
// equivalent) and tubing friction neglected (a simplification: friction adds a term in q^2 that
// the template does not model). Rate: q = 3000 + 200 sin(2 pi t / 1 d) + noise bbl/d, the daily
// swing of truck deliveries (invented). Annulus, healthy: 120 + 10 sin(2 pi t / 1 d + 1) + noise
// psi, a thermal swing unrelated to tubing pressure; with a tubing or packer leak from t_leak it
// relaxes toward tubing pressure, a = a_h + (p - a_h)(1 - exp(-(t - t_leak) / 12 h)) (a
// first-order fill through a small leak path; common practice to model it so).
#include <gtest/gtest.h>

#include <cmath>
#include <cstdio>
#include <numbers>
#include <optional>
#include <random>
#include <string>

#include "wide_history_replay.h"

namespace {

using bw::testing::AlertEvent;
using bw::testing::first_raised;
using bw::testing::raised_list;
using bw::testing::WideHistory;

constexpr double kDay = 86400.0;
constexpr double kStep = 300.0;          // s, one sample of each tag every 5 minutes
constexpr double kReferencePsi = 400.0;  // p_ref, also the template parameter
constexpr double kMasipPsi = 3000.0;     // example permit value for the invented well

// k 50 md, h 40 ft, mu = B = 1, re 745 ft, rw 0.25 ft (an invented, ordinary sandstone).
double injectivity_index(double skin) {
  return 0.00708 * 50.0 * 40.0 / (std::log(745.0 / 0.25) + skin);
}

struct Scenario {
  double days = 16;
  double skin_from_day = -1;  // skin grows from this day (negative: never)
  double skin_per_day = 0;
  double leak_from_day = -1;  // annulus leak from this day (negative: never)
};

struct Built {
  WideHistory history{{"DC9.W1.TUBING", "DC9.W1.RATE", "DC9.W1.ANNULUS"}};
  std::optional<double> masip_reached_h;  // first time the noise-free tubing pressure reaches MASIP
};

Built build(const Scenario& sc) {
  Built out;
  std::mt19937 random(7);
  std::normal_distribution<double> rate_noise(0.0, 20.0);
  std::normal_distribution<double> pressure_noise(0.0, 5.0);
  std::normal_distribution<double> annulus_noise(0.0, 2.0);
  for (double t = 0; t <= sc.days * kDay; t += kStep) {
    const double day = t / kDay;
    const double skin = sc.skin_from_day >= 0 && day > sc.skin_from_day
                            ? sc.skin_per_day * (day - sc.skin_from_day)
                            : 0.0;
    const double q_true = 3000.0 + 200.0 * std::sin(2 * std::numbers::pi * day);
    const double p_true = kReferencePsi + q_true / injectivity_index(skin);
    if (!out.masip_reached_h && p_true >= kMasipPsi) out.masip_reached_h = t / 3600.0;
    double annulus = 120.0 + 10.0 * std::sin(2 * std::numbers::pi * day + 1.0);
    if (sc.leak_from_day >= 0 && day > sc.leak_from_day) {
      annulus += (p_true - annulus) * (1.0 - std::exp(-(day - sc.leak_from_day) * 2.0));
    }
    out.history.add_row(t, {p_true + pressure_noise(random), q_true + rate_noise(random),
                            annulus + annulus_noise(random)});
  }
  return out;
}

std::string site() {
  return bw::testing::one_asset_site(
      "well_1", "disposal_well",
      "{tubing_pressure: DC9.W1.TUBING, rate: DC9.W1.RATE, annulus_pressure: DC9.W1.ANNULUS}",
      "{reference_pressure: 400, masip: 3000}");
}

std::vector<AlertEvent> replay(const std::string& name, const Built& built) {
  return bw::testing::replay_history(name, site(), built.history, "well_1");
}

TEST(DisposalWellTemplate, HealthyWellAtConstantSkinStaysQuietForTwentyDays) {
  const auto events = replay("healthy", build({.days = 20}));
  EXPECT_TRUE(raised_list(events).empty()) << ::testing::PrintToString(raised_list(events));
}

// Skin grows by 0.5 a day from day 5: II falls, tubing pressure climbs toward MASIP at constant
// rate. Each check must raise after the skin starts to grow and well before MASIP is reached.
TEST(DisposalWellTemplate, SkinGrowthRaisesInjectivityHallAndMasipChecksWithLeadTime) {
  const Built built = build({.days = 16, .skin_from_day = 5, .skin_per_day = 0.5});
  ASSERT_TRUE(built.masip_reached_h.has_value());
  const double masip_h = *built.masip_reached_h;
  const auto events = replay("skin", built);
  const double onset_h = 5 * 24.0;
  for (const char* check : {"injectivity_falling", "hall_slope_rising", "masip_ahead"}) {
    const auto raised = first_raised(events, check);
    ASSERT_TRUE(raised.has_value())
        << check << ": " << ::testing::PrintToString(raised_list(events));
    std::printf("[ figures ] %s raised %.1f h after the skin began to grow, %.1f h before MASIP\n",
                check, *raised - onset_h, masip_h - *raised);
    EXPECT_GT(*raised, onset_h) << check;
    // Lead time before MASIP: at least 2 days for every check (the forecast looks 7 days ahead).
    EXPECT_GE(masip_h - *raised, 48.0) << check;
  }
  // The injectivity CUSUM sees a 3 % fall (skin 0.25, several sigma of the scatter) within a day.
  EXPECT_LT(*first_raised(events, "injectivity_falling") - onset_h, 24.0);
  EXPECT_FALSE(first_raised(events, "hall_slope_falling").has_value());
  EXPECT_FALSE(first_raised(events, "annulus_following_tubing").has_value());
}

// A leak from day 6: the annulus follows tubing pressure with a 12 h time constant, so it is 50
// psi above its healthy value after about 50 / 1900 x 12 h = 19 min; the check then waits its
// 30 min on-delay.
TEST(DisposalWellTemplate, AnnulusLeakRaisesWithinTheHour) {
  const auto events = replay("leak", build({.days = 8, .leak_from_day = 6}));
  const auto raised = first_raised(events, "annulus_following_tubing");
  ASSERT_TRUE(raised.has_value()) << ::testing::PrintToString(raised_list(events));
  const double delay_h = *raised - 6 * 24.0;
  std::printf("[ figures ] annulus_following_tubing raised %.2f h after the leak began\n", delay_h);
  EXPECT_GT(delay_h, 0.5);  // not before the on-delay could have run
  EXPECT_LT(delay_h, 1.5);
  EXPECT_FALSE(first_raised(events, "injectivity_falling").has_value());
  EXPECT_FALSE(first_raised(events, "hall_slope_rising").has_value());
}

}  // namespace
