// FilterLife: run life, throughput and step drops of a filter element.
//
// The loading histories follow Ruth's constant-rate cake filtration equation (Ruth, 1935; in
// McCabe, Smith and Harriott, Unit Operations of Chemical Engineering, "constant-rate
// filtration"): dP = Q (Km + Kc V), with Q the flow, V the volume filtered since the element was
// clean, Km the clean element's resistance and Kc the cake's. Referred to a reference flow with
// exponent 1, dP x (Qref / Q) = Qref (Km + Kc V) depends on the volume filtered only.
// Throughput figures are arithmetic (flow x time, bbl/d x d).
#include "core/filter_life.h"

#include <gtest/gtest.h>

#include <optional>

#include "test_random.h"

namespace bw::core {
namespace {

using test::at;

constexpr double kMinute = 60;
constexpr double kHour = 3600;
constexpr double kQref = 10000;       // bbl/d
constexpr double kKm = 4.0 / kQref;   // 4 psi clean at the reference flow
constexpr double kKc = 3.5e-8;        // psi per (bbl/d) per bbl: 25 psi after 60,000 bbl

// The referred dP of a Ruth element that has filtered `volume_bbl`.
double referred_dp(double volume_bbl) { return kQref * (kKm + kKc * volume_bbl); }

FilterLife::Options options() {
  return FilterLife::Options{.memory_s = 2 * kHour,
                             .drop_fraction = 0.4,
                             .confirm_s = 15 * kMinute,
                             .stop_gap_s = 10 * kMinute,
                             .flow_time_unit_s = 86400,
                             .stop_required = true};
}

// Feeds a constant flow from `from_s` to `to_s` (inclusive) every minute; returns the first
// change-out closed, if any. `volume` tracks the element's filtered volume for Ruth's dP.
std::optional<FilterLife::ChangeOut> run(FilterLife& life, double from_s, double to_s,
                                         double flow_bpd, double& volume,
                                         std::optional<double> fixed_dp = std::nullopt) {
  std::optional<FilterLife::ChangeOut> closed;
  for (double t = from_s; t <= to_s; t += kMinute) {
    const double dp = fixed_dp ? *fixed_dp : referred_dp(volume);
    if (auto c = life.update(dp, flow_bpd, at(t)); c && !closed) closed = c;
    volume += flow_bpd * kMinute / 86400.0;
  }
  return closed;
}

TEST(FilterLife, ThroughputIsFlowTimesOnLineTime) {
  FilterLife life(options());
  double volume = 0;
  EXPECT_FALSE(run(life, 0, 48 * kHour, 9000, volume));
  // 9,000 bbl/d held over 48 on-line hours = 18,000 bbl (arithmetic).
  EXPECT_NEAR(life.throughput(), 18000.0, 1e-6);
  EXPECT_NEAR(life.online_hours(), 48.0, 1e-9);
  EXPECT_EQ(life.change_outs(), 0);
  // The reference level follows the loading: Ruth's referred dP after 18,000 bbl is 10.3 psi,
  // rising 10,000 x Kc x 9,000 / 24 = 0.13125 psi/h; an exponential mean of a ramp lags it by
  // slope x time constant once settled (a property of the first-order filter): 0.2625 psi.
  EXPECT_NEAR(life.reference_level(), referred_dp(18000.0) - 0.13125 * 2, 0.005);
}

TEST(FilterLife, StopThenStepDropIsAChangeOutWithTheOldElementsLife) {
  FilterLife life(options());
  double volume = 0;
  ASSERT_FALSE(run(life, 0, 48 * kHour, 9000, volume));
  const double before = life.reference_level();
  // One hour off line while the socks are changed, then a clean element.
  double clean = 0;
  const auto closed = run(life, 49 * kHour, 50 * kHour, 9000, clean);
  ASSERT_TRUE(closed.has_value());
  EXPECT_EQ(closed->time, at(49 * kHour));
  EXPECT_EQ(closed->life_start, at(0));
  EXPECT_EQ(closed->life_end, at(48 * kHour));
  EXPECT_FALSE(closed->life_complete);  // the first life seen began with the first sample
  EXPECT_NEAR(closed->online_s, 48 * kHour, 1e-6);
  EXPECT_NEAR(closed->throughput, 18000.0, 1e-6);
  EXPECT_DOUBLE_EQ(closed->level_before, before);
  // The mean over the 15 min confirm window: the clean element after 7.5 min of flow on average.
  EXPECT_NEAR(closed->level_after, referred_dp(9000.0 * 7.5 / 1440), 1e-3);
  EXPECT_EQ(life.change_outs(), 1);
  EXPECT_FALSE(life.unexplained_drop());
  // The new element's life started at the first clean value: 1 h on line at 9,000 bbl/d.
  EXPECT_NEAR(life.online_hours(), 1.0, 1e-9);
  EXPECT_NEAR(life.throughput(), 9000.0 / 24.0, 1e-6);
  // The reference restarted at that mean and follows the clean element, lagging it.
  EXPECT_GT(life.reference_level(), closed->level_after);
  EXPECT_LT(life.reference_level(), referred_dp(clean));
}

TEST(FilterLife, ChangeOutIsConfirmedOnlyAfterTheConfirmTime) {
  FilterLife life(options());
  double volume = 0;
  ASSERT_FALSE(run(life, 0, 24 * kHour, 9000, volume));
  double clean = 0;
  EXPECT_FALSE(run(life, 25 * kHour, 25 * kHour + 14 * kMinute, 9000, clean));
  EXPECT_TRUE(run(life, 25 * kHour + 15 * kMinute, 25 * kHour + 15 * kMinute, 9000, clean));
}

TEST(FilterLife, SecondChangeOutReportsACompleteLife) {
  FilterLife life(options());
  double volume = 0;
  ASSERT_FALSE(run(life, 0, 24 * kHour, 9000, volume));
  double second = 0;
  ASSERT_TRUE(run(life, 25 * kHour, 72 * kHour, 9000, second));
  double third = 0;
  const auto closed = run(life, 73 * kHour, 74 * kHour, 9000, third);
  ASSERT_TRUE(closed.has_value());
  EXPECT_TRUE(closed->life_complete);
  EXPECT_EQ(closed->life_start, at(25 * kHour));
  EXPECT_NEAR(closed->online_s, 47 * kHour, 1e-6);
  EXPECT_NEAR(closed->throughput, 9000.0 * 47 / 24, 1e-6);
}

TEST(FilterLife, DropUnderFlowIsNotAChangeOut) {
  FilterLife life(options());
  double volume = 0;
  ASSERT_FALSE(run(life, 0, 48 * kHour, 9000, volume));
  // A sock tears: the dP falls to a third without any stop.
  double torn = 0;
  EXPECT_FALSE(run(life, 48 * kHour + kMinute, 50 * kHour, 9000, torn, 3.5));
  EXPECT_TRUE(life.unexplained_drop());
  EXPECT_EQ(life.change_outs(), 0);
  // Same element: its life and throughput carry on (50 h at 9,000 bbl/d).
  EXPECT_NEAR(life.online_hours(), 50.0, 1e-9);
  EXPECT_NEAR(life.throughput(), 9000.0 * 50 / 24, 1e-6);
  // A real change-out afterwards clears it.
  double clean = 0;
  ASSERT_TRUE(run(life, 51 * kHour, 52 * kHour, 9000, clean, 2.0));
  EXPECT_FALSE(life.unexplained_drop());
}

TEST(FilterLife, WithoutStopRequiredAnyConfirmedDropIsAChangeOut) {
  auto opts = options();
  opts.stop_required = false;
  FilterLife life(opts);
  double volume = 0;
  ASSERT_FALSE(run(life, 0, 48 * kHour, 9000, volume));
  double clean = 0;
  EXPECT_TRUE(run(life, 48 * kHour + kMinute, 49 * kHour, 9000, clean));
  EXPECT_FALSE(life.unexplained_drop());
}

TEST(FilterLife, ABriefLowReadingIsNoDrop) {
  FilterLife life(options());
  double volume = 0;
  ASSERT_FALSE(run(life, 0, 24 * kHour, 9000, volume));
  const double level = life.reference_level();
  life.update(0.2 * level, 9000, at(24 * kHour + kMinute));  // one bad reading
  EXPECT_FALSE(run(life, 24 * kHour + 2 * kMinute, 26 * kHour, 9000, volume));
  EXPECT_FALSE(life.unexplained_drop());
  EXPECT_EQ(life.change_outs(), 0);
  EXPECT_NEAR(life.online_hours(), 26.0, 1e-9);
}

TEST(FilterLife, StopsAreNotOnLineTime) {
  FilterLife life(options());
  double volume = 0;
  ASSERT_FALSE(run(life, 0, 10 * kHour, 8000, volume));
  ASSERT_FALSE(run(life, 14 * kHour, 20 * kHour, 8000, volume));  // off line 10 h to 14 h
  EXPECT_NEAR(life.online_hours(), 16.0, 1e-9);
  EXPECT_NEAR(life.throughput(), 8000.0 * 16 / 24, 1e-6);
  EXPECT_NEAR(life.days_in_service(at(20 * kHour)), 20.0 / 24, 1e-12);
}

TEST(FilterLife, OutOfOrderAndNonFiniteSamplesAreRefused) {
  FilterLife life(options());
  double volume = 0;
  ASSERT_FALSE(run(life, 0, kHour, 9000, volume));
  const auto before = life.state();
  life.update(1.0, 9000, at(0.5 * kHour));
  life.update(std::numeric_limits<double>::quiet_NaN(), 9000, at(2 * kHour));
  EXPECT_EQ(life.gate().out_of_order(), 1);
  EXPECT_EQ(life.gate().non_finite(), 1);
  auto after = life.state();
  after.gate = before.gate;
  EXPECT_EQ(after, before);
}

TEST(FilterLife, RestoreContinuesBitForBit) {
  FilterLife a(options());
  double volume = 0;
  ASSERT_FALSE(run(a, 0, 24 * kHour, 9000, volume));
  double clean = 0;
  run(a, 25 * kHour, 25 * kHour + 5 * kMinute, 9000, clean);  // a candidate is open
  FilterLife b(options());
  b.restore(a.state());
  EXPECT_EQ(b.state(), a.state());
  double clean_a = clean;
  double clean_b = clean;
  const auto ca = run(a, 25 * kHour + 6 * kMinute, 26 * kHour, 9000, clean_a);
  const auto cb = run(b, 25 * kHour + 6 * kMinute, 26 * kHour, 9000, clean_b);
  ASSERT_TRUE(ca && cb);
  EXPECT_EQ(ca->throughput, cb->throughput);
  EXPECT_EQ(b.state(), a.state());
}

}  // namespace
}  // namespace bw::core
