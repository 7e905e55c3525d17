// The site health roll-up: which states count how, the status word, the oldest unacknowledged
// time, per-asset rows, the daemon's own alert, and the visit order of several sites.
//
// The states are the ISA-18.2 / IEC 62682 alarm states (the same lifecycle EEMUA 191 describes).
// The facts of the trade the rules rest on (from memory, ISA-18.2): shelved, suppressed-by-design
// and out-of-service alarms are not annunciated to the operator, and an acknowledged alarm whose
// condition is still active stays in alarm until the condition returns to normal.
#include "engine/site_health.h"

#include <gtest/gtest.h>

#include <algorithm>
#include <string>
#include <vector>

#include "engine/engine.h"
#include "test_sites.h"

namespace bw::engine {
namespace {

using testing::at_seconds;

AlertView view(std::string_view asset, AlertState state, Priority priority, double since_s = 0) {
  return {asset, "some_check", state, priority, at_seconds(since_s)};
}

SiteHealth one_alert(AlertState state, Priority priority) {
  const std::vector<std::string> names = {"pump_1"};
  const std::vector<AlertView> alerts = {view("pump_1", state, priority)};
  return roll_up_site("Dry Creek SWD 4", names, alerts);
}

TEST(SiteHealth, AQuietSiteIsNormalWithOneRowPerAssetInSiteOrder) {
  const std::vector<std::string> names = {"water_tank_1", "injection_pump", "disposal_well"};
  const SiteHealth health = roll_up_site("Dry Creek SWD 4", names, {});
  EXPECT_EQ(health.site, "Dry Creek SWD 4");
  EXPECT_EQ(health.figures.status(), SiteStatus::normal);
  EXPECT_FALSE(health.figures.worst_active());
  EXPECT_FALSE(health.figures.oldest_unacknowledged);
  ASSERT_EQ(health.assets.size(), 3u);
  for (std::size_t i = 0; i < names.size(); ++i) {
    EXPECT_EQ(health.assets[i].asset, names[i]);
    EXPECT_EQ(health.assets[i].figures, HealthFigures{});
  }
}

// Each ISA-18.2 state lands in exactly one count, as the table in site_health.h says.
TEST(SiteHealth, EachAlertStateCountsWhereTheTableSays) {
  struct Case {
    AlertState state;
    std::uint32_t unacknowledged, acknowledged, to_review, shelved, suppressed, out_of_service;
    bool waits_for_acknowledgement;
  };
  const Case cases[] = {
      {AlertState::normal, 0, 0, 0, 0, 0, 0, false},
      {AlertState::unacknowledged, 1, 0, 0, 0, 0, 0, true},
      {AlertState::acknowledged, 0, 1, 0, 0, 0, 0, false},
      {AlertState::returned_unacknowledged, 0, 0, 1, 0, 0, 0, true},
      {AlertState::latched, 0, 0, 1, 0, 0, 0, true},
      {AlertState::shelved, 0, 0, 0, 1, 0, 0, false},
      {AlertState::suppressed_by_design, 0, 0, 0, 0, 1, 0, false},
      {AlertState::out_of_service, 0, 0, 0, 0, 0, 1, false},
  };
  for (const Case& c : cases) {
    SCOPED_TRACE(std::string(to_string(c.state)));
    const HealthFigures f = one_alert(c.state, Priority::medium).figures;
    EXPECT_EQ(f.unacknowledged[Priority::medium], c.unacknowledged);
    EXPECT_EQ(f.acknowledged[Priority::medium], c.acknowledged);
    EXPECT_EQ(f.to_review[Priority::medium], c.to_review);
    EXPECT_EQ(f.unacknowledged.total() + f.acknowledged.total() + f.to_review.total(),
              c.unacknowledged + c.acknowledged + c.to_review)
        << "counted under its own priority only";
    EXPECT_EQ(f.shelved, c.shelved);
    EXPECT_EQ(f.suppressed, c.suppressed);
    EXPECT_EQ(f.out_of_service, c.out_of_service);
    EXPECT_EQ(f.oldest_unacknowledged.has_value(), c.waits_for_acknowledgement);
  }
}

TEST(SiteHealth, TheStatusWordFollowsTheWorstActivePriority) {
  for (const AlertState active : {AlertState::unacknowledged, AlertState::acknowledged}) {
    SCOPED_TRACE(std::string(to_string(active)));
    EXPECT_EQ(one_alert(active, Priority::urgent).figures.status(), SiteStatus::visit_now);
    EXPECT_EQ(one_alert(active, Priority::high).figures.status(), SiteStatus::visit_soon);
    EXPECT_EQ(one_alert(active, Priority::medium).figures.status(), SiteStatus::attention);
    EXPECT_EQ(one_alert(active, Priority::low).figures.status(), SiteStatus::attention);
    EXPECT_EQ(one_alert(active, Priority::high).figures.worst_active(), Priority::high);
  }
}

TEST(SiteHealth, AnAlertToReviewAsksForAttentionOnlyWhateverItsPriority) {
  for (const AlertState state : {AlertState::returned_unacknowledged, AlertState::latched}) {
    const HealthFigures f = one_alert(state, Priority::urgent).figures;
    EXPECT_EQ(f.status(), SiteStatus::attention) << to_string(state);
    EXPECT_FALSE(f.worst_active()) << "the condition has cleared";
  }
}

TEST(SiteHealth, ShelvedSuppressedAndOutOfServiceAlertsNeverRaiseTheStatus) {
  for (const AlertState state :
       {AlertState::shelved, AlertState::suppressed_by_design, AlertState::out_of_service}) {
    const HealthFigures f = one_alert(state, Priority::urgent).figures;
    EXPECT_EQ(f.status(), SiteStatus::normal) << to_string(state);
    EXPECT_FALSE(f.worst_active());
    EXPECT_FALSE(f.oldest_unacknowledged);
  }
}

TEST(SiteHealth, TheOldestUnacknowledgedTimeIgnoresAcknowledgedAndSetAsideAlerts) {
  const std::vector<std::string> names = {"tank", "pump"};
  const std::vector<AlertView> alerts = {
      view("tank", AlertState::acknowledged, Priority::high, 100),
      view("tank", AlertState::shelved, Priority::high, 200),
      view("tank", AlertState::returned_unacknowledged, Priority::low, 700),
      view("pump", AlertState::unacknowledged, Priority::medium, 500),
      view("pump", AlertState::latched, Priority::medium, 900),
      view("pump", AlertState::out_of_service, Priority::medium, 300),
  };
  const SiteHealth health = roll_up_site("Dry Creek SWD 4", names, alerts);
  ASSERT_EQ(health.assets.size(), 2u);
  EXPECT_EQ(health.assets[0].figures.oldest_unacknowledged, at_seconds(700));
  EXPECT_EQ(health.assets[1].figures.oldest_unacknowledged, at_seconds(500));
  EXPECT_EQ(health.figures.oldest_unacknowledged, at_seconds(500));
}

TEST(SiteHealth, TheSiteSumsItsAssetsAndTakesTheWorstWord) {
  const std::vector<std::string> names = {"water_tank_1", "injection_pump", "disposal_well"};
  const std::vector<AlertView> alerts = {
      view("water_tank_1", AlertState::unacknowledged, Priority::medium),
      view("water_tank_1", AlertState::acknowledged, Priority::low),
      view("injection_pump", AlertState::acknowledged, Priority::high),
      view("injection_pump", AlertState::unacknowledged, Priority::high),
      view("injection_pump", AlertState::shelved, Priority::urgent),
      view("injection_pump", AlertState::normal, Priority::urgent),
  };
  const SiteHealth health = roll_up_site("Dry Creek SWD 4", names, alerts);
  ASSERT_EQ(health.assets.size(), 3u);
  EXPECT_EQ(health.assets[0].figures.status(), SiteStatus::attention);
  EXPECT_EQ(health.assets[1].figures.status(), SiteStatus::visit_soon);
  EXPECT_EQ(health.assets[2].figures.status(), SiteStatus::normal);
  EXPECT_EQ(health.figures.status(), SiteStatus::visit_soon);
  EXPECT_EQ(health.figures.active(Priority::high), 2u);
  EXPECT_EQ(health.figures.unacknowledged.total(), 2u);
  EXPECT_EQ(health.figures.acknowledged.total(), 2u);
  EXPECT_EQ(health.figures.shelved, 1u);
  EXPECT_EQ(health.figures.active(Priority::urgent), 0u) << "the shelved urgent alert is set aside";
}

TEST(SiteHealth, AnAlertOnAnAssetOutsideTheSiteListGetsItsOwnRowAfterTheSite) {
  const std::vector<std::string> names = {"tank"};
  const std::vector<AlertView> alerts = {
      view(Engine::kDaemonAsset, AlertState::returned_unacknowledged, Priority::high)};
  const SiteHealth health = roll_up_site("Dry Creek SWD 4", names, alerts);
  ASSERT_EQ(health.assets.size(), 2u);
  EXPECT_EQ(health.assets[0].asset, "tank");
  EXPECT_EQ(health.assets[1].asset, Engine::kDaemonAsset);
}

// The daemon's own alert, raised and cleared at once by the engine, waits returned
// unacknowledged: the site asks for attention (someone should look at the edge box's state),
// not for a visit, and is normal again once acknowledged.
TEST(SiteHealth, TheDaemonsOwnAlertAsksForAttentionUntilAcknowledged) {
  Engine engine(testing::site_with(testing::level_asset()),
                CommandPolicy{.authorised_sources = {"test"}});
  testing::RecordingSink sink;
  engine.report_daemon_event(Engine::kDaemonChecks[0], "moved aside", at_seconds(10), sink);
  SiteHealth health = roll_up_site(engine.alerts(), engine.site());
  ASSERT_EQ(health.assets.size(), 2u);
  EXPECT_EQ(health.assets[0].asset, "tank");
  EXPECT_EQ(health.assets[0].figures.status(), SiteStatus::normal);
  EXPECT_EQ(health.assets[1].asset, Engine::kDaemonAsset);
  EXPECT_EQ(health.assets[1].figures.to_review[Priority::high], 1u);
  EXPECT_EQ(health.figures.status(), SiteStatus::attention);
  EXPECT_EQ(health.figures.oldest_unacknowledged, at_seconds(10));

  AlertCommand ack{.kind = AlertCommand::Kind::acknowledge,
                   .asset = std::string(Engine::kDaemonAsset),
                   .check = std::string(Engine::kDaemonChecks[0]),
                   .who = "Dana Ortiz",
                   .reason = "",
                   .source = "test",
                   .issued = at_seconds(20)};
  ASSERT_TRUE(engine.execute(ack, sink).accepted);
  health = roll_up_site(engine.alerts(), engine.site());
  EXPECT_EQ(health.figures.status(), SiteStatus::normal);
  ASSERT_EQ(health.assets.size(), 1u) << "an asset outside the site shows only while not normal";
}

// From a real book: raise, acknowledge, shelve, each seen in the roll-up.
TEST(SiteHealth, FollowsTheBookThroughRaiseAcknowledgeAndShelve) {
  AlertBook book("Dry Creek SWD 4", CommandPolicy{.authorised_sources = {"test"}});
  book.define("water_tank_1", "level_high", Priority::high, false);
  book.define("water_tank_1", "level_high_high", Priority::urgent, false);
  SiteSpec spec;
  spec.name = "Dry Creek SWD 4";
  spec.assets.push_back({.name = "water_tank_1"});
  testing::RecordingSink sink;
  ConditionChange raise{.kind = ConditionChange::Kind::condition,
                        .active = true,
                        .time = at_seconds(60),
                        .check = "level_high",
                        .priority = Priority::high};
  book.on_change("water_tank_1", raise, sink);
  SiteHealth health = roll_up_site(book, spec);
  EXPECT_EQ(health.figures.unacknowledged[Priority::high], 1u);
  EXPECT_EQ(health.figures.status(), SiteStatus::visit_soon);
  EXPECT_EQ(health.figures.oldest_unacknowledged, at_seconds(60));

  raise.check = "level_high_high";
  raise.priority = Priority::urgent;
  raise.time = at_seconds(120);
  book.on_change("water_tank_1", raise, sink);
  AlertCommand command{.kind = AlertCommand::Kind::acknowledge,
                       .asset = "water_tank_1",
                       .check = "",
                       .who = "Dana Ortiz",
                       .reason = "driving out",
                       .source = "test",
                       .issued = at_seconds(180)};
  ASSERT_TRUE(book.execute(command, sink).accepted);
  health = roll_up_site(book, spec);
  EXPECT_EQ(health.figures.acknowledged.total(), 2u);
  EXPECT_EQ(health.figures.unacknowledged.total(), 0u);
  EXPECT_FALSE(health.figures.oldest_unacknowledged);
  EXPECT_EQ(health.figures.status(), SiteStatus::visit_now) << "acknowledged is not resolved";

  command.kind = AlertCommand::Kind::shelve;
  command.check = "level_high_high";
  command.reason = "transmitter being replaced";
  command.duration_s = 3600;
  command.issued = at_seconds(240);
  ASSERT_TRUE(book.execute(command, sink).accepted);
  health = roll_up_site(book, spec);
  EXPECT_EQ(health.figures.shelved, 1u);
  EXPECT_EQ(health.figures.status(), SiteStatus::visit_soon);
}

SiteHealth site(std::string name, std::vector<AlertView> alerts) {
  return roll_up_site(name, {}, alerts);
}

// Each key of the visit order decides when the ones before it are equal.
TEST(SiteHealth, VisitOrderComparesStatusThenActiveByPriorityThenWaitingThenAgeThenName) {
  const SiteHealth urgent = site("Z", {view("a", AlertState::acknowledged, Priority::urgent)});
  const SiteHealth high = site("A", {view("a", AlertState::unacknowledged, Priority::high)});
  EXPECT_TRUE(visit_before(urgent, high)) << "1. status";

  const SiteHealth two_high = site("Z", {view("a", AlertState::acknowledged, Priority::high),
                                         view("b", AlertState::acknowledged, Priority::high)});
  const SiteHealth high_and_medium =
      site("A", {view("a", AlertState::unacknowledged, Priority::high),
                 view("b", AlertState::unacknowledged, Priority::medium),
                 view("c", AlertState::unacknowledged, Priority::medium)});
  EXPECT_TRUE(visit_before(two_high, high_and_medium)) << "2. more high alerts";

  const SiteHealth unseen = site("Z", {view("a", AlertState::unacknowledged, Priority::low, 500)});
  const SiteHealth seen = site("A", {view("a", AlertState::acknowledged, Priority::low, 100)});
  EXPECT_TRUE(visit_before(unseen, seen)) << "3. waiting for an acknowledgement";

  const SiteHealth older =
      site("Z", {view("a", AlertState::returned_unacknowledged, Priority::low, 100)});
  const SiteHealth newer =
      site("A", {view("a", AlertState::returned_unacknowledged, Priority::low, 200)});
  EXPECT_TRUE(visit_before(older, newer)) << "4. older first";

  const SiteHealth dry_creek = site("Dry Creek SWD 4", {});
  const SiteHealth mesquite = site("Mesquite Flats SWD 2", {});
  EXPECT_TRUE(visit_before(dry_creek, mesquite)) << "5. name";

  for (const auto* pair : {&urgent, &two_high, &unseen, &older, &dry_creek}) {
    EXPECT_FALSE(visit_before(*pair, *pair)) << "irreflexive";
  }
  EXPECT_FALSE(visit_before(high, urgent));
  EXPECT_FALSE(visit_before(high_and_medium, two_high));
  EXPECT_FALSE(visit_before(seen, unseen));
  EXPECT_FALSE(visit_before(newer, older));
  EXPECT_FALSE(visit_before(mesquite, dry_creek));
}

TEST(SiteHealth, ASortedListOfSitesIsInVisitOrder) {
  std::vector<SiteHealth> sites = {
      site("Quiet SWD 1", {}),
      site("Shelved SWD 2", {view("a", AlertState::shelved, Priority::urgent)}),
      site("Review SWD 3", {view("a", AlertState::latched, Priority::urgent, 50)}),
      site("Low SWD 4", {view("a", AlertState::acknowledged, Priority::low)}),
      site("Urgent SWD 5", {view("a", AlertState::unacknowledged, Priority::urgent, 900)}),
      site("High SWD 6", {view("a", AlertState::unacknowledged, Priority::high, 10)}),
  };
  std::stable_sort(sites.begin(), sites.end(), visit_before);
  std::vector<std::string> order;
  for (const auto& s : sites) order.push_back(s.site);
  // Low SWD 4 (active low) comes before Review SWD 3 (only to review) by key 2.
  EXPECT_EQ(order, (std::vector<std::string>{"Urgent SWD 5", "High SWD 6", "Low SWD 4",
                                             "Review SWD 3", "Quiet SWD 1", "Shelved SWD 2"}));
}

}  // namespace
}  // namespace bw::engine
