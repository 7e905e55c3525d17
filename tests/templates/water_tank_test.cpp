// Replays constructed histories of a gun-barrel tank through the shipped water_tank template.
//
// Tank model (REFERENCES.md "Tanks and volumes": vertical cylinder, bbl per foot = (pi D^2 / 4)
// / 5.614583 = 33.607 for D = 15.5 ft): the water outlet leg holds the water column at 15 ft, so
// the total level is 15 ft + pad thickness and the interface sits at 15 ft; pad thickness =
// oil pad volume / 33.607. Oil arrives with the water at 0.6 bbl/h (about 0.2 % of 7,200 bbl/d,
// an invented but ordinary carry-over); the operator skims the pad every 8 h at 120 bbl/h back
// to 10 bbl (common practice: periodic skimming to a sales or recovered-oil tank). A slug is
// extra oil at 30 bbl/h for one hour. Both transmitters read with 0.005 ft noise, once a minute.
#include <gtest/gtest.h>

#include <algorithm>
#include <cmath>
#include <cstdio>
#include <random>
#include <string>

#include "wide_history_replay.h"

namespace {

using bw::testing::AlertEvent;
using bw::testing::first_raised;
using bw::testing::raised_list;
using bw::testing::WideHistory;

constexpr double kBblPerFoot = 33.607;  // (pi * 15.5^2 / 4) / 5.614583
constexpr double kStep = 60.0;          // s
constexpr double kSlugRateBph = 30.0;

WideHistory build(double hours, double slug_from_h) {
  WideHistory history({"DC9.GB.LEVEL", "DC9.GB.INTERFACE"});
  std::mt19937 random(11);
  std::normal_distribution<double> noise(0.0, 0.005);
  double pad_bbl = 10.0;
  bool skimming = false;
  for (double t = 0; t <= hours * 3600.0; t += kStep) {
    const double h = t / 3600.0;
    double inflow_bph = 0.6;
    if (slug_from_h >= 0 && h >= slug_from_h && h < slug_from_h + 1.0) inflow_bph += kSlugRateBph;
    if (std::fmod(h, 8.0) < kStep / 3600.0 && h > 0) skimming = true;
    if (skimming) inflow_bph -= 120.0;
    pad_bbl = std::max(0.0, pad_bbl + inflow_bph * kStep / 3600.0);
    if (skimming && pad_bbl <= 10.0) skimming = false;
    const double pad_ft = pad_bbl / kBblPerFoot;
    history.add_row(t, {15.0 + pad_ft + noise(random), 15.0 + noise(random)});
  }
  return history;
}

std::string site() {
  return bw::testing::one_asset_site("gun_barrel", "water_tank",
                                     "{level: DC9.GB.LEVEL, interface_level: DC9.GB.INTERFACE}",
                                     "{diameter: 15.5}");
}

TEST(WaterTankTemplate, NormalCarryOverAndSkimmingStayQuietForTwoDays) {
  const auto events =
      bw::testing::replay_history("tank-normal", site(), build(48, -1), "gun_barrel");
  EXPECT_TRUE(raised_list(events).empty()) << ::testing::PrintToString(raised_list(events));
}

// The pad's growth rate, smoothed with a 10 min time constant, passes 8 bbl/h about
// -10 ln(1 - 8.6 / 30.6) = 3.3 min into the slug; the check then waits its 5 min on-delay.
TEST(WaterTankTemplate, OilSlugRaisesWithinFifteenMinutes) {
  const double slug_h = 30.5;
  const auto events =
      bw::testing::replay_history("tank-slug", site(), build(36, slug_h), "gun_barrel");
  const auto raised = first_raised(events, "oil_slug");
  ASSERT_TRUE(raised.has_value()) << ::testing::PrintToString(raised_list(events));
  const double delay_min = (*raised - slug_h) * 60.0;
  std::printf("[ figures ] oil_slug raised %.1f min after a %.0f bbl/h slug began\n", delay_min,
              kSlugRateBph);
  EXPECT_GE(delay_min, 5.0);  // the on-delay alone
  EXPECT_LE(delay_min, 15.0);
  EXPECT_FALSE(first_raised(events, "overflow_ahead").has_value());
  // The slug brings 30 bbl/h; the episode counts from a few minutes after the onset, so the
  // 20 bbl slug volume limit is passed about 20 / 30.6 h = 39 min plus those minutes in.
  const auto large = first_raised(events, "slug_volume_large");
  ASSERT_TRUE(large.has_value()) << ::testing::PrintToString(raised_list(events));
  const double large_min = (*large - slug_h) * 60.0;
  std::printf("[ figures ] slug_volume_large (20 bbl) raised %.1f min after the slug began\n",
              large_min);
  EXPECT_GE(large_min, 39.0);
  EXPECT_LE(large_min, 50.0);
  // The slug's record: 30 bbl of slug plus the normal 0.6 bbl/h over the episode, less what the
  // smoothed growth misses before it crosses slug_end_rate (a few minutes' worth). Skimming
  // starts at 32 h, after the slug's peak, and is not counted against it.
  const auto records = bw::testing::records_of("tank-slug", "gun_barrel");
  ASSERT_EQ(records.size(), 1u);
  EXPECT_EQ(records[0].source, "slug");
  const double hours = records[0].field("hours").value_or(-1);
  const double change = records[0].field("change").value_or(-1);
  std::printf("[ figures ] slug record: %.1f bbl over %.2f h (30 bbl slug)\n", change, hours);
  EXPECT_NEAR(change, 30.0 + 0.6 * hours, 2.0);
}

}  // namespace
