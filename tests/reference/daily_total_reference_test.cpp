// The daily record's figures against numpy, computed at test time from the same samples by
// tests/tools/held_summary.py: the left-held sum (each value holds until the next sample; the
// engine's rule, not numpy.trapz), time above a threshold, the maximum and the time average,
// over one reporting day, with bad-quality stretches left out.
#include <gtest/gtest.h>

#include <cstdio>
#include <filesystem>
#include <fstream>
#include <random>

#include "../engine/record_sites.h"
#include "../engine/test_sites.h"
#include "engine/engine.h"
#include "reference_tools.h"

namespace bw::engine {
namespace {

using testing::kHour;
using testing::kMonday;
using testing::utc;

TEST(DailyTotalReference, HeldSumsOfIrregularSamplesMatchNumpy) {
  const auto python = bw::test::find_python_with_numpy();
  BW_REQUIRE_REFERENCE_TOOL(python, "python3 with numpy");

  SiteSpec site = testing::site_with(testing::well_with_daily_record());
  for (auto& input : site.assets[0].inputs) input.expected_interval_s = 0;  // hold across gaps
  Engine engine(std::move(site));
  testing::RecordKeeper sink;

  // Irregular samples from 05:00 Monday to 09:00 Tuesday; the rate is often near the
  // injecting threshold of 1 bbl/d and bad for a stretch; pressure has its own times.
  const double day_start = kMonday + 7 * kHour;
  const double day_end = day_start + 24 * kHour;
  std::mt19937_64 random(2026);
  std::uniform_real_distribution<double> spacing(5, 900);
  std::uniform_real_distribution<double> rate(0, 5000);
  std::uniform_real_distribution<double> pressure(600, 2400);
  std::uniform_int_distribution<int> coin(0, 3);
  const auto csv = std::filesystem::temp_directory_path() / "brinewatch_daily_total.csv";
  {
    std::ofstream out(csv);
    out.precision(17);
    double tr = kMonday + 5 * kHour;
    double tp = tr + 17.5;
    while (tr < day_end + 2 * kHour || tp < day_end + 2 * kHour) {
      if (tr <= tp) {
        const double v = coin(random) == 0 ? 0.5 : rate(random);
        const bool bad = tr > day_start + 10 * kHour && tr < day_start + 11.5 * kHour;
        engine.process({"W.RATE", utc(tr), v, bad ? Quality::bad : Quality::good}, sink);
        out << 0 << ',' << tr << ',' << v << ',' << (bad ? 0 : 1) << '\n';
        tr += spacing(random);
      } else {
        const double v = pressure(random);
        engine.process({"W.TP", utc(tp), v, Quality::good}, sink);
        out << 1 << ',' << tp << ',' << v << ",1\n";
        tp += spacing(random);
      }
    }
  }
  const auto day = std::find_if(sink.records.begin(), sink.records.end(),
                                [&](const auto& r) { return r.time == utc(day_end); });
  ASSERT_NE(day, sink.records.end());

  char args[160];
  std::snprintf(args, sizeof args, " %.17g %.17g 86400 1", day_start, day_end);
  const auto text = bw::test::run_command(*python + " " + bw::test::tool_path("held_summary.py") +
                                          " " + csv.string() + args);
  std::filesystem::remove(csv);
  ASSERT_TRUE(text.has_value());
  const auto numbers = bw::test::parse_numbers(*text);
  ASSERT_TRUE(numbers.has_value());
  ASSERT_EQ(numbers->size(), 10u);  // rate, then pressure: total, usable h, above h, max, average
  const auto& n = *numbers;
  EXPECT_NEAR(day->field("injected_volume"), n[0], 1e-9 * n[0]);
  EXPECT_NEAR(day->field("injecting_hours"), n[2], 1e-9);
  EXPECT_DOUBLE_EQ(day->field("max_tubing_pressure"), n[8]);
  EXPECT_NEAR(day->field("average_tubing_pressure"), n[9], 1e-9 * n[9]);
  // The bad stretch took time out of the rate's usable hours (and so out of the cover).
  EXPECT_LT(n[1], 23.0);
  EXPECT_NEAR(day->field("covered_h"), n[1], 1e-9);
}

}  // namespace
}  // namespace bw::engine
