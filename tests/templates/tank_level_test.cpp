// Replays constructed histories of a produced-water tank through the shipped tank_level template.
//
// Tank model: an upright tank of 15.5 ft inside diameter at the invented site Dry Creek SWD 4,
// bbl per foot = (pi D^2 / 4) / 5.614583 = 33.607 (1 bbl = 5.614583 ft^3, the barrel's
// definition; REFERENCES.md "Tanks and volumes"). A gathering line brings 20 bbl/h day and night;
// from 06:00 to 18:00 (hours of the history modulo 24) a truck unloads every 1.5 h, 120 bbl at
// 240 bbl/h; the transfer pump draws 180 bbl/h under level control, starting at 10 ft and stopping
// at 6 ft (invented, ordinary figures for a small disposal site). The level transmitter reads once
// a minute with 0.01 ft of gauge noise.
//
// How the two estimators answer (derived by hand, used for the expected times below): both are
// the straight line fitted with weights exp(-age / tau). With the exponential density
// p(s) = e^(-s/tau) / tau over the age s, the fitted slope is Cov(s, y) / Var(s); integrating the
// covariance by parts gives
//   slope = integral of y'(s) s e^(-s/tau) / tau^2 ds  (past local slopes, gamma(2) weights > 0),
//   level at now = integral of y(s) p(s) ds + tau x slope.
// So a step of the slope from r0 to r, x = T / tau after it, reads r0 + (r - r0) G(x) with
// G(x) = 1 - (1 + x) e^-x, and any slope between the two bounds of the local slopes.
#include <gtest/gtest.h>

#include <algorithm>
#include <cmath>
#include <cstdio>
#include <numbers>
#include <random>
#include <string>
#include <vector>

#include "wide_history_replay.h"

namespace {

using bw::testing::first_raised;
using bw::testing::raised_list;
using bw::testing::WideHistory;

constexpr double kDiameterFt = 15.5;
constexpr double kCubicFeetPerBbl = 5.614583;  // 42 US gal of 231 in^3 (definition)
constexpr double kBblPerFoot =
    std::numbers::pi * kDiameterFt * kDiameterFt / 4.0 / kCubicFeetPerBbl;
constexpr double kStep = 60.0;  // s
constexpr double kPipelineBph = 20.0;
constexpr double kTruckBph = 240.0;
constexpr double kTruckBbl = 120.0;
constexpr double kPumpBph = 180.0;
constexpr double kPumpStartFt = 10.0;
constexpr double kPumpStopFt = 6.0;
constexpr double kStartLevelFt = 7.0;

// Template defaults (rules/tank_level.yaml).
constexpr double kHighFt = 18.0;
constexpr double kHighHighFt = 19.5;
constexpr double kForecastMemoryH = 2.0;
constexpr double kLeadTimeH = 6.0;
constexpr double kFillRateMemoryH = 0.25;
constexpr double kFillRateHighBph = 400.0;
constexpr double kLevelOnDelayH = 60.0 / 3600.0;  // level measurement (rules/README.md)

// Response of the exponentially weighted slope to a step of slope, x = T / tau (see above).
double gamma2_cdf(double x) { return 1.0 - (1.0 + x) * std::exp(-x); }

// The x at which the slope, stepping from r0 to r, reaches `target` (bisection; G is monotone).
double x_reaching(double r0, double r, double target) {
  double lo = 0, hi = 50;
  for (int i = 0; i < 100; ++i) {
    const double mid = (lo + hi) / 2;
    (r0 + (r - r0) * gamma2_cdf(mid) >= target ? hi : lo) = mid;
  }
  return hi;
}

struct Plan {
  double hours = 48;
  double pump_lost_at_h = -1;  // from here the pump never runs and no truck is unloaded
  double fast_fill_at_h = -1;  // three trucks unload at once, 160 bbl each at 300 bbl/h
};

// The tank as the plan makes it: the noise-free level every minute, and the history with noise.
struct Tank {
  WideHistory history{{"DC4.TK2.LEVEL"}};
  std::vector<double> level_ft;  // noise-free, one per row
};

Tank build(const Plan& plan) {
  Tank tank;
  std::mt19937 random(7);
  std::normal_distribution<double> noise(0.0, 0.01);
  double level = kStartLevelFt;
  bool pump_on = false;
  double truck_left_bbl = 0;
  double fast_left_bbl = 0;
  for (double t = 0; t <= plan.hours * 3600.0; t += kStep) {
    const double h = t / 3600.0;
    tank.level_ft.push_back(level);
    tank.history.add_row(t, {level + noise(random)});
    const bool pump_lost = plan.pump_lost_at_h >= 0 && h >= plan.pump_lost_at_h;
    const double day_h = std::fmod(h, 24.0);
    if (!pump_lost && day_h >= 6.0 && day_h < 18.0 && std::fmod(day_h - 6.0, 1.5) < 1e-9) {
      truck_left_bbl += kTruckBbl;
    }
    if (plan.fast_fill_at_h >= 0 && std::abs(h - plan.fast_fill_at_h) < 1e-9) {
      fast_left_bbl = 3 * 160.0;
    }
    if (level >= kPumpStartFt) pump_on = true;
    if (level <= kPumpStopFt) pump_on = false;
    if (pump_lost) pump_on = false;
    const double dt_h = kStep / 3600.0;
    const double truck_bbl = std::min(truck_left_bbl, kTruckBph * dt_h);
    const double fast_bbl = std::min(fast_left_bbl, 3 * 300.0 * dt_h);
    truck_left_bbl -= truck_bbl;
    fast_left_bbl -= fast_bbl;
    const double net_bbl =
        kPipelineBph * dt_h + truck_bbl + fast_bbl - (pump_on ? kPumpBph * dt_h : 0.0);
    level += net_bbl / kBblPerFoot;
  }
  return tank;
}

std::string site(const std::string& parameters) {
  return bw::testing::one_asset_site("water_tank_2", "tank_level", "{level: DC4.TK2.LEVEL}",
                                     "{" + parameters + "}");
}

TEST(TankLevelTemplate, GeometryGivesThePublishedBarrelsPerFoot) {
  // REFERENCES.md "Tanks and volumes": 15.5 ft -> 33.607 bbl/ft.
  EXPECT_NEAR(kBblPerFoot, 33.607, 0.0005);
}

TEST(TankLevelTemplate, TwoDaysOfFillAndDrawCyclesStayQuiet) {
  const Tank tank = build({.hours = 48});
  // The construction really cycles: the pump draws the tank down and trucks lift it.
  const auto [low, high] = std::minmax_element(tank.level_ft.begin(), tank.level_ft.end());
  EXPECT_LT(*low, 6.2);
  EXPECT_GT(*high, 10.0);
  const auto events = bw::testing::replay_history("tank-level-normal", site("diameter: 15.5"),
                                                  tank.history, "water_tank_2");
  EXPECT_TRUE(raised_list(events).empty()) << ::testing::PrintToString(raised_list(events));
}

// The pump is lost at 18:00 of the second day (42 h), after the day's trucks, so that 7 forecast
// time constants of history precede it and the integrals over all past ages (above) hold; the
// gathering line alone fills the tank at
// 20 bbl/h = 0.5951 ft/h. The level reaches 18 ft and 19.5 ft at times the geometry fixes; the
// limit checks follow after their 60 s on-delay. The forecast raises when the fitted line (the
// integrals above over the constructed level) reaches 18 ft within 6 h.
TEST(TankLevelTemplate, LostPumpRaisesOverflowAheadThenTheLevelLimits) {
  const double lost_h = 42.0;
  const Tank tank = build({.hours = 68, .pump_lost_at_h = lost_h});
  const auto events = bw::testing::replay_history("tank-level-pump-lost", site("diameter: 15.5"),
                                                  tank.history, "water_tank_2");

  const auto row = [](double h) { return static_cast<std::size_t>(std::lround(h * 60)); };
  const double start_ft = tank.level_ft[row(lost_h)];
  const double rise_fph = kPipelineBph / kBblPerFoot;
  const double high_at_h = lost_h + (kHighFt - start_ft) / rise_fph;
  const double high_high_at_h = lost_h + (kHighHighFt - start_ft) / rise_fph;

  // Forecast of the fitted line `since_h` after the loss, from the integrals above taken over the
  // noise-free level of the history (one-minute steps).
  const auto forecast_h = [&](double since_h) {
    const std::size_t now = row(lost_h + since_h);
    const double step_h = kStep / 3600.0;
    double mean = 0, weight = 0, slope = 0;
    for (std::size_t i = 0; i <= now; ++i) {
      const double age_h = static_cast<double>(now - i) * step_h;
      const double decay = std::exp(-age_h / kForecastMemoryH);
      mean += tank.level_ft[i] * decay;
      weight += decay;
      if (i > 0) {
        const double local_slope = (tank.level_ft[i] - tank.level_ft[i - 1]) / step_h;
        const double mid_age_h = age_h + step_h / 2;
        slope += local_slope * mid_age_h * std::exp(-mid_age_h / kForecastMemoryH) * step_h /
                 (kForecastMemoryH * kForecastMemoryH);
      }
    }
    const double level = mean / weight + kForecastMemoryH * slope;
    return slope > 0 ? (kHighFt - level) / slope : HUGE_VAL;
  };
  double lo = 0.5, hi = high_at_h - lost_h;  // forecast_h falls through the lead time here
  for (int i = 0; i < 30; ++i) {
    const double mid = (lo + hi) / 2;
    (forecast_h(mid) <= kLeadTimeH ? hi : lo) = mid;
  }
  const double predicted_ahead_h = lost_h + hi;

  const auto ahead = first_raised(events, "overflow_ahead");
  const auto high = first_raised(events, "level_high");
  const auto high_high = first_raised(events, "level_high_high");
  ASSERT_TRUE(ahead && high && high_high) << ::testing::PrintToString(raised_list(events));
  std::printf(
      "[ figures ] pump lost at %.1f h at %.2f ft; 18 ft due at %.2f h, 19.5 ft at %.2f h "
      "(geometry, 20 bbl/h)\n",
      lost_h, start_ft, high_at_h, high_high_at_h);
  std::printf(
      "[ figures ] overflow_ahead raised %.2f h after the loss, %.2f h before 18 ft "
      "(derived fit: %.2f h after)\n",
      *ahead - lost_h, high_at_h - *ahead, predicted_ahead_h - lost_h);
  std::printf(
      "[ figures ] level_high raised %.1f min after 18 ft, level_high_high %.1f min after "
      "19.5 ft\n",
      (*high - high_at_h) * 60, (*high_high - high_high_at_h) * 60);

  // The fitted line lags a ramp, so the warning comes later than a perfect 6 h forecast would.
  // Tolerance: the integrals above are continuous and over all ages; the estimator sums
  // one-minute samples since the start of the history.
  EXPECT_NEAR(*ahead, predicted_ahead_h, 0.1);
  EXPECT_GT(high_at_h - *ahead, 1.0);
  EXPECT_LE(high_at_h - *ahead, kLeadTimeH);
  // On-delay 60 s; 0.01 ft of noise at 0.595 ft/h moves a crossing by about a minute.
  EXPECT_NEAR(*high, high_at_h + kLevelOnDelayH, 3.0 / 60);
  EXPECT_NEAR(*high_high, high_high_at_h + kLevelOnDelayH, 3.0 / 60);
  EXPECT_FALSE(first_raised(events, "fill_rate_high").has_value());
}

// Three trucks at once at 2:00 (no other truck then): 900 bbl/h on top of the line's 20, with the
// pump off until the level reaches 10 ft (net 920 bbl/h) and on after that (net 740 bbl/h). The
// smoothed rate lies between the responses to steady steps from 20 to 920 and from 20 to 740
// bbl/h (positive weights, above), so fill_rate_high (400 bbl/h, no delay on a derived signal)
// raises between those two crossing times.
TEST(TankLevelTemplate, SeveralTrucksAtOnceRaiseFillRateHigh) {
  const double fill_h = 2.0;
  const Tank tank = build({.hours = 4, .fast_fill_at_h = fill_h});
  const auto events = bw::testing::replay_history("tank-level-fast-fill", site("diameter: 15.5"),
                                                  tank.history, "water_tank_2");
  const double earliest_h =
      kFillRateMemoryH * x_reaching(kPipelineBph, kPipelineBph + 900, kFillRateHighBph);
  const double latest_h =
      kFillRateMemoryH * x_reaching(kPipelineBph, kPipelineBph + 900 - kPumpBph, kFillRateHighBph);
  const auto delay = bw::testing::expect_raised_within(events, "fill_rate_high", fill_h,
                                                       latest_h + 2.0 / 60, "three trucks at once");
  ASSERT_TRUE(delay.has_value());
  std::printf(
      "[ figures ] fill_rate_high: %.1f min after the trucks began (derived %.1f to %.1f "
      "min)\n",
      *delay * 60, earliest_h * 60, latest_h * 60);
  EXPECT_GE(*delay, earliest_h - 2.0 / 60);
}

// A cone-bottom tank: a cone 4 ft deep under the same 15.5 ft shell. Volume below the level L in
// the cone: pi (R L / hc)^2 L / 3 (cone volume pi r^2 h / 3); above it: the whole cone plus
// pi R^2 (L - hc). In ft^3, divided by 5.614583 for barrels. Table points every 0.25 ft in the
// cone, then the top of the shell.
constexpr double kConeFt = 4.0;

double cone_tank_bbl(double level_ft) {
  const double radius = kDiameterFt / 2;
  const double in_cone = std::min(level_ft, kConeFt);
  const double cone_radius = radius * in_cone / kConeFt;
  const double cone = std::numbers::pi * cone_radius * cone_radius * in_cone / 3.0;
  const double shell = std::numbers::pi * radius * radius * std::max(0.0, level_ft - kConeFt);
  return (cone + shell) / kCubicFeetPerBbl;
}

std::string cone_table() {
  std::string table = "[";
  char point[64];
  for (double level = 0; level <= kConeFt + 1e-9; level += 0.25) {
    std::snprintf(point, sizeof point, "[%.2f, %.4f], ", level, cone_tank_bbl(level));
    table += point;
  }
  std::snprintf(point, sizeof point, "[25, %.4f]]", cone_tank_bbl(25));
  return table + point;
}

// Level of the cone-bottom tank holding `bbl` (the inverse of cone_tank_bbl).
double cone_tank_level(double bbl) {
  const double cone_bbl = cone_tank_bbl(kConeFt);
  if (bbl >= cone_bbl) return kConeFt + (bbl - cone_bbl) / kBblPerFoot;
  return kConeFt * std::cbrt(bbl / cone_bbl);
}

constexpr double kConeInflowBph = 20.0;

// One hour still at `from_bbl`, then a steady 20 bbl/h for `fill_h`, then still for an hour.
WideHistory cone_fill(double from_bbl, double fill_h) {
  WideHistory history({"DC4.TK2.LEVEL"});
  std::mt19937 random(5);
  std::normal_distribution<double> noise(0.0, 0.01);
  for (double t = 0; t <= (fill_h + 2) * 3600.0; t += kStep) {
    const double filling_h = std::clamp(t / 3600.0 - 1.0, 0.0, fill_h);
    history.add_row(t, {cone_tank_level(from_bbl + kConeInflowBph * filling_h) + noise(random)});
  }
  return history;
}

// The fill rate must equal the 20 bbl/h put in, inside the cone (where the level rises ever
// slower and a plain cylinder would read up to many times more) and above it: with the limit at
// 23 bbl/h it stays quiet; at 17 bbl/h it raises when the smoothed rate has risen from 0 to 85 %
// of 20 bbl/h, 15 min x G^-1(0.85) after the fill starts, and not earlier.
TEST(TankLevelTemplate, ConeBottomStrappingTableGivesTheTrueFillRate) {
  const double cone_bbl = cone_tank_bbl(kConeFt);
  EXPECT_NEAR(cone_bbl, kBblPerFoot * kConeFt / 3.0, 1e-9);  // one third of the cylinder
  const double cone_fill_h = cone_bbl / kConeInflowBph;      // 2.24 h, the whole cone
  const double expected_delay_h = kFillRateMemoryH * x_reaching(0, kConeInflowBph, 17.0);
  struct Case {
    std::string name;
    double from_bbl;
    double fill_h;
  };
  const Case cases[] = {{"inside the cone", 0.0, cone_fill_h},
                        {"above the cone", cone_bbl + 1.0 * kBblPerFoot, 4.0}};
  for (const Case& c : cases) {
    const WideHistory history = cone_fill(c.from_bbl, c.fill_h);
    const auto quiet = bw::testing::replay_history(
        "tank-level-cone-quiet", site("strapping_table: " + cone_table() + ", fill_rate_high: 23"),
        history, "water_tank_2");
    EXPECT_FALSE(first_raised(quiet, "fill_rate_high").has_value())
        << c.name << ": the fill rate read above 23 bbl/h";
    const auto raising = bw::testing::replay_history(
        "tank-level-cone-raise", site("strapping_table: " + cone_table() + ", fill_rate_high: 17"),
        history, "water_tank_2");
    const auto delay = bw::testing::expect_raised_within(
        raising, "fill_rate_high", 1.0, expected_delay_h + 3.0 / 60,
        "cone-bottom tank, 20 bbl/h " + c.name + ", 17 bbl/h limit");
    if (!delay) continue;
    std::printf("[ figures ] cone-bottom tank %s: derived %.1f min\n", c.name.c_str(),
                expected_delay_h * 60);
    EXPECT_GE(*delay, expected_delay_h - 3.0 / 60) << c.name;
    EXPECT_LE(*delay, c.fill_h) << c.name << ": raised only after the fill ended";
  }
}

}  // namespace
