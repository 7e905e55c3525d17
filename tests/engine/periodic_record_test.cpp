// Daily records through the engine, on days of UTC (local days and clock changes are tested
// with the site calendar in tests/io/zone_calendar_test.cpp, the total against numpy in
// tests/reference/daily_total_reference_test.cpp).
//
// Expected figures follow from the definition of the statistics: a constant rate of q bbl/d held
// for h hours injects q * h / 24 bbl (volume is rate times time: common practice).
#include <gtest/gtest.h>

#include <cmath>
#include <random>

#include "engine/engine.h"
#include "record_sites.h"
#include "test_sites.h"

namespace bw::engine {
namespace {

using testing::kHour;
using testing::kMonday;
using testing::RecordKeeper;
using testing::utc;
using testing::well_with_daily_record;

constexpr double kDayStart = kMonday + 7 * kHour;  // Monday 07:00Z
constexpr double kStep = 300;                      // a sample of each tag every 5 minutes

// Both tags every 5 minutes over [from, to), values given by the callbacks; quality good unless
// `bad_rate` says otherwise.
template <class Rate, class Pressure, class BadRate>
void feed(Engine& engine, AlertSink& sink, double from, double to, Rate rate, Pressure pressure,
          BadRate bad_rate) {
  for (double t = from; t < to; t += kStep) {
    engine.process({"W.RATE", utc(t), rate(t), bad_rate(t) ? Quality::bad : Quality::good}, sink);
    engine.process({"W.TP", utc(t), pressure(t), Quality::good}, sink);
  }
}

auto constant(double v) {
  return [v](double) { return v; };
}
auto never = [](double) { return false; };

TEST(PeriodicRecord, AFullDayOfConstantInjectionGivesRateTimesADay) {
  Engine engine(testing::site_with(well_with_daily_record()));
  RecordKeeper sink;
  feed(engine, sink, kDayStart, kDayStart + 24 * kHour + 1, constant(2400), constant(1500), never);
  ASSERT_EQ(sink.records.size(), 1u);
  const auto& r = sink.records[0];
  EXPECT_EQ(r.site, "Test Site");
  EXPECT_EQ(r.asset, "well");
  EXPECT_EQ(r.source, "daily_injection");
  EXPECT_EQ(r.kind, "daily_injection");
  EXPECT_EQ(r.period_start, utc(kDayStart));
  EXPECT_EQ(r.time, utc(kDayStart + 24 * kHour));
  EXPECT_NEAR(r.field("injected_volume"), 2400, 1e-9);
  EXPECT_EQ(r.unit("injected_volume"), "bbl");
  EXPECT_DOUBLE_EQ(r.field("max_tubing_pressure"), 1500);
  EXPECT_EQ(r.unit("max_tubing_pressure"), "psi");
  EXPECT_NEAR(r.field("average_tubing_pressure"), 1500, 1e-9);
  EXPECT_NEAR(r.field("injecting_hours"), 24, 1e-9);
  EXPECT_EQ(r.unit("injecting_hours"), "h");
  EXPECT_NEAR(r.field("covered_h"), 24, 1e-9);
  EXPECT_EQ(engine.counters().records, 1u);
}

TEST(PeriodicRecord, TheFirstDayStartsAtTheDayStartAndCoversOnlyTimeWithData) {
  Engine engine(testing::site_with(well_with_daily_record()));
  RecordKeeper sink;
  feed(engine, sink, kDayStart + 3 * kHour, kDayStart + 24 * kHour + 1, constant(2400),
       constant(1500), never);
  ASSERT_EQ(sink.records.size(), 1u);
  EXPECT_EQ(sink.records[0].period_start, utc(kDayStart));
  EXPECT_NEAR(sink.records[0].field("covered_h"), 21, 1e-9);
  EXPECT_NEAR(sink.records[0].field("injected_volume"), 2100, 1e-9);
}

// The inputs expect a sample every 5 minutes and fall silent after 3 intervals (15 min): the
// values are held until then, and the rest of the gap is not integrated.
TEST(PeriodicRecord, ASilentGapIsNotIntegratedBeyondTheSilenceTime) {
  Engine engine(testing::site_with(well_with_daily_record()));
  RecordKeeper sink;
  const double gap_from = kDayStart + 5 * kHour;
  const double gap_to = kDayStart + 7 * kHour;
  feed(engine, sink, kDayStart, gap_from, constant(2400), constant(1500), never);
  feed(engine, sink, gap_to, kDayStart + 24 * kHour + 1, constant(2400), constant(1500), never);
  ASSERT_EQ(sink.records.size(), 1u);
  // The last samples before the gap came at gap_from - 5 min; held for 15 min after them.
  const double covered_h = 24 - 2 + 0.25 - 5.0 / 60;
  EXPECT_NEAR(sink.records[0].field("covered_h"), covered_h, 1e-9);
  EXPECT_NEAR(sink.records[0].field("injected_volume"), 2400 * covered_h / 24, 1e-9);
  EXPECT_NEAR(sink.records[0].field("injecting_hours"), covered_h, 1e-9);
}

TEST(PeriodicRecord, BadQualityStopsTheFieldsOfThatInputOnly) {
  Engine engine(testing::site_with(well_with_daily_record()));
  RecordKeeper sink;
  auto bad_hour = [](double t) { return t >= kDayStart + 3 * kHour && t < kDayStart + 4 * kHour; };
  feed(engine, sink, kDayStart, kDayStart + 24 * kHour + 1, constant(2400), constant(1500),
       bad_hour);
  ASSERT_EQ(sink.records.size(), 1u);
  const auto& r = sink.records[0];
  EXPECT_NEAR(r.field("injected_volume"), 2300, 1e-9);
  EXPECT_NEAR(r.field("injecting_hours"), 23, 1e-9);
  EXPECT_NEAR(r.field("average_tubing_pressure"), 1500, 1e-9);  // pressure was good throughout
  EXPECT_NEAR(r.field("covered_h"), 23, 1e-9);                  // every field usable
}

TEST(PeriodicRecord, StatisticsFollowSampleAndHold) {
  Engine engine(testing::site_with(well_with_daily_record()));
  RecordKeeper sink;
  // Shut in (rate 0) for the first 6 hours; pressure 1000 then 2000 from hour 12; one spike.
  auto rate = [](double t) { return t < kDayStart + 6 * kHour ? 0.0 : 3000.0; };
  auto pressure = [](double t) {
    if (t == kDayStart + 20 * kHour) return 2600.0;
    return t < kDayStart + 12 * kHour ? 1000.0 : 2000.0;
  };
  feed(engine, sink, kDayStart, kDayStart + 24 * kHour + 1, rate, pressure, never);
  ASSERT_EQ(sink.records.size(), 1u);
  const auto& r = sink.records[0];
  EXPECT_NEAR(r.field("injected_volume"), 3000 * 18.0 / 24, 1e-9);
  EXPECT_NEAR(r.field("injecting_hours"), 18, 1e-9);
  EXPECT_DOUBLE_EQ(r.field("max_tubing_pressure"), 2600);
  // 12 h at 1000, 12 h at 2000 less 5 min, 5 min at 2600.
  const double average = (12 * 1000 + (12 - 1.0 / 12) * 2000 + 2600.0 / 12) / 24;
  EXPECT_NEAR(r.field("average_tubing_pressure"), average, 1e-9);
}

TEST(PeriodicRecord, ADayWithNoDataReportsNullFiguresAndNoCoverage) {
  Engine engine(testing::site_with(well_with_daily_record()));
  RecordKeeper sink;
  feed(engine, sink, kDayStart, kDayStart + kHour, constant(2400), constant(1500), never);
  engine.advance(utc(kDayStart + 49 * kHour), sink);  // the live tick goes on; no samples
  ASSERT_EQ(sink.records.size(), 2u);
  const auto& quiet = sink.records[1];
  EXPECT_EQ(quiet.period_start, utc(kDayStart + 24 * kHour));
  EXPECT_TRUE(std::isnan(quiet.field("injected_volume")));
  EXPECT_TRUE(std::isnan(quiet.field("max_tubing_pressure")));
  EXPECT_DOUBLE_EQ(quiet.field("covered_h"), 0);
}

TEST(PeriodicRecord, TheDayClosesOnTimeWithoutASample) {
  RecordKeeper sink;
  // Samples every 5 min would make the inputs silent after 15 min; declare none to hold them.
  SiteSpec site = testing::site_with(well_with_daily_record());
  for (auto& input : site.assets[0].inputs) input.expected_interval_s = 0;
  Engine quiet_tags(std::move(site));
  feed(quiet_tags, sink, kDayStart + 23 * kHour, kDayStart + 23.5 * kHour, constant(2400),
       constant(1500), never);
  quiet_tags.advance(utc(kDayStart + 24 * kHour - 1), sink);
  EXPECT_TRUE(sink.records.empty());
  quiet_tags.advance(utc(kDayStart + 24 * kHour + 30), sink);
  ASSERT_EQ(sink.records.size(), 1u);
  EXPECT_EQ(sink.records[0].time, utc(kDayStart + 24 * kHour));
  EXPECT_NEAR(sink.records[0].field("covered_h"), 1, 1e-9);  // held from 23:00 to 24:00
  EXPECT_NEAR(sink.records[0].field("injected_volume"), 100, 1e-9);
}

// A day closes in event-time order: a step of time that both raises an alert and closes the day
// hands over the transition first; a sample after the day's end comes after the record.
TEST(PeriodicRecord, ARecordComesAfterTheTransitionsOfItsStep) {
  AssetSpec asset = well_with_daily_record();
  asset.checks.push_back({.name = "pressure_high",
                          .kind = LimitCheckSpec{.of = "tubing_pressure",
                                                 .limit = 2000,
                                                 .deadband = 10,
                                                 .on_delay_s = 300,
                                                 .off_delay_s = 0},
                          .message = "Tubing pressure high"});
  Engine engine(testing::site_with(asset));
  RecordKeeper sink;
  const double day_end = kDayStart + 24 * kHour;
  feed(engine, sink, kDayStart, day_end - kStep, constant(2400), constant(1500), never);
  // High from 5 min before the day's end: the on-delay runs out exactly when the day closes.
  engine.process({"W.TP", utc(day_end - kStep), 2500, Quality::good}, sink);
  EXPECT_EQ(sink.events, "");
  engine.process({"W.TP", utc(day_end + 10), 2500, Quality::good}, sink);
  EXPECT_EQ(sink.events, "TR");
  ASSERT_EQ(sink.records.size(), 1u);
  EXPECT_DOUBLE_EQ(sink.records[0].field("max_tubing_pressure"), 2500);
}

// A restart mid-day from a checkpoint gives the record of an uninterrupted run, bit for bit.
TEST(PeriodicRecord, CheckpointAndRestoreMidDayGiveTheSameRecord) {
  std::mt19937_64 random(11);
  std::uniform_real_distribution<double> rate(0, 4000);
  std::uniform_real_distribution<double> pressure(800, 2200);
  std::uniform_real_distribution<double> spacing(20, 400);
  struct Row {
    const char* tag;
    double t;
    double value;
    Quality quality;
  };
  std::vector<Row> rows;
  for (double t = kDayStart - 2 * kHour; t < kDayStart + 50 * kHour; t += spacing(random)) {
    const bool bad = t > kDayStart + 30 * kHour && t < kDayStart + 31 * kHour;
    rows.push_back({"W.RATE", t, rate(random), bad ? Quality::bad : Quality::good});
    rows.push_back({"W.TP", t + 1, pressure(random), Quality::good});
  }
  const SiteSpec site = testing::site_with(well_with_daily_record());

  Engine whole(site);
  RecordKeeper whole_sink;
  for (const auto& row : rows)
    whole.process({row.tag, utc(row.t), row.value, row.quality}, whole_sink);

  RecordKeeper split_sink;
  std::vector<EngineCheckpoint> saved;
  const std::size_t cut = rows.size() * 2 / 5;  // in the second day, mid-afternoon
  {
    Engine first(site);
    for (std::size_t i = 0; i < cut; ++i) {
      first.process({rows[i].tag, utc(rows[i].t), rows[i].value, rows[i].quality}, split_sink);
    }
    saved = first.checkpoint();
  }
  Engine second(site);
  const auto report = second.restore(saved);
  EXPECT_TRUE(report.reset.empty());
  for (std::size_t i = cut; i < rows.size(); ++i) {
    second.process({rows[i].tag, utc(rows[i].t), rows[i].value, rows[i].quality}, split_sink);
  }

  ASSERT_EQ(whole_sink.records.size(), 3u);
  ASSERT_EQ(split_sink.records.size(), whole_sink.records.size());
  for (std::size_t r = 0; r < whole_sink.records.size(); ++r) {
    const auto& a = whole_sink.records[r];
    const auto& b = split_sink.records[r];
    EXPECT_EQ(a.time, b.time);
    ASSERT_EQ(a.fields.size(), b.fields.size());
    for (std::size_t f = 0; f < a.fields.size(); ++f) {
      EXPECT_EQ(a.fields[f].value, b.fields[f].value) << a.fields[f].name;  // bit for bit
    }
  }
}

TEST(PeriodicRecord, AChangedRecordDefinitionChangesTheAssetFingerprint) {
  SiteSpec site = testing::site_with(well_with_daily_record());
  Engine before(site);
  site.assets[0].records[0].fields[0].rate_per_s = 3600;
  Engine after(site);
  EXPECT_NE(before.checkpoint()[0].definition, after.checkpoint()[0].definition);
}

}  // namespace
}  // namespace bw::engine
