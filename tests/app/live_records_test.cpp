// Live records without a broker: a record closed by a sample goes into the outbox on
// <prefix>/records in the commit that journals the sample's transitions, and that commit saves
// the asset too, so a restart does not close the same day a second time.
#include <gtest/gtest.h>

#include <filesystem>

#include "../engine/record_sites.h"
#include "../engine/test_sites.h"
#include "app/live_publisher.h"
#include "app/state_keeper.h"

namespace bw::app {
namespace {

namespace fs = std::filesystem;
using engine::testing::kHour;
using engine::testing::kMonday;
using engine::testing::utc;

constexpr double kDayStart = kMonday + 7 * kHour;

struct Live {
  engine::Engine engine{engine::testing::site_with(engine::testing::well_with_daily_record())};
  engine::NotificationPolicy policy{engine.site().name, {}};
  LivePublisher publisher{"brinewatch/dc4", engine, policy};
  std::unique_ptr<StateKeeper> keeper;
  engine::RestoreReport restore;

  explicit Live(const fs::path& dir) {
    auto opened = StateKeeper::open(dir, engine, &policy, publisher);
    EXPECT_TRUE(opened.ok());
    keeper = std::move(opened.value().keeper);
    restore = opened.value().restore;
    keeper->set_outbox_source([this] { return publisher.take(utc(kDayStart)); });
  }
  void sample(double t) {
    engine.process({"W.RATE", utc(t), 2400, engine::Quality::good}, *keeper);
    engine.process({"W.TP", utc(t), 1500, engine::Quality::good}, *keeper);
  }
};

TEST(LiveRecords, ARecordIsPublishedOnTheRecordsTopicAndNotRepeatedAfterARestart) {
  const fs::path dir =
      fs::temp_directory_path() / ("brinewatch_live_records_" + std::to_string(::getpid()));
  fs::remove_all(dir);
  {
    Live live(dir);
    for (double t = kDayStart; t < kDayStart + 24 * kHour; t += 300) live.sample(t);
    ASSERT_TRUE(
        live.keeper->commit(utc(kDayStart + 24 * kHour - 300), StateKeeper::Depth::full).ok());
    live.sample(kDayStart + 24 * kHour);  // closes the day
    EXPECT_GT(live.keeper->pending(), 0u);
    ASSERT_TRUE(
        live.keeper->commit(utc(kDayStart + 24 * kHour), StateKeeper::Depth::journal_only).ok());
    auto outbox = live.keeper->read_outbox(0, 1000);
    ASSERT_TRUE(outbox.ok());
    int records = 0;
    for (const auto& m : outbox.value()) {
      if (m.topic != "brinewatch/dc4/records") continue;
      ++records;
      EXPECT_EQ(m.qos, 1);
      EXPECT_FALSE(m.retained);
      EXPECT_NE(m.payload.find("\"kind\":\"daily_injection\""), std::string::npos) << m.payload;
      EXPECT_NE(m.payload.find("\"injected_volume\":{\"value\":2400,\"unit\":\"bbl\"}"),
                std::string::npos)
          << m.payload;
    }
    EXPECT_EQ(records, 1);
  }
  {
    Live again(dir);
    EXPECT_TRUE(again.restore.reset.empty());
    again.sample(kDayStart + 24 * kHour + 300);
    ASSERT_TRUE(
        again.keeper->commit(utc(kDayStart + 24 * kHour + 300), StateKeeper::Depth::journal_only)
            .ok());
    auto outbox = again.keeper->read_outbox(0, 1000);
    ASSERT_TRUE(outbox.ok());
    int records = 0;
    for (const auto& m : outbox.value()) records += m.topic == "brinewatch/dc4/records";
    EXPECT_EQ(records, 1);  // the one from before the restart, still undelivered; no second
  }
  fs::remove_all(dir);
}

}  // namespace
}  // namespace bw::app
