#include "engine/notification_policy.h"

#include <gtest/gtest.h>

#include <string>
#include <vector>

namespace bw::engine {
namespace {

using Action = Decision::Action;
using Kind = PolicyNotice::Kind;

core::SensorTime at(double s) { return core::sensor_time_from_seconds(1.7e9 + s); }

constexpr std::string_view kSite = "Dry Creek SWD 4";

struct Names {  // AlertTransition holds views: keep the strings alive
  std::string asset;
  std::string check;
};

AlertTransition transition(const Names& n, AlertEvent event, double t_s,
                           Priority priority = Priority::medium) {
  AlertTransition t;
  t.time = at(t_s);
  t.site = kSite;
  t.asset = n.asset;
  t.check = n.check;
  t.event = event;
  t.priority = priority;
  return t;
}

const Names kLevel{"water_tank_9", "level_high"};

// Distinct alerts, so a flood test never trips chattering.
std::vector<Names> many_alerts(int n) {
  std::vector<Names> names;
  for (int i = 0; i < n; ++i) names.push_back({"tank_" + std::to_string(i), "level_high"});
  return names;
}

// Chattering, common practice: 3 or more raises of one alert within 60 s.
TEST(NotificationPolicy, ThreeRaisesWithin59SecondsChatter) {
  NotificationPolicy policy(std::string(kSite), {});
  EXPECT_EQ(policy.on_transition(transition(kLevel, AlertEvent::raised, 0)).action, Action::notify);
  EXPECT_EQ(policy.on_transition(transition(kLevel, AlertEvent::cleared, 10)).action,
            Action::notify);
  EXPECT_EQ(policy.on_transition(transition(kLevel, AlertEvent::raised, 30)).action,
            Action::notify);
  EXPECT_EQ(policy.on_transition(transition(kLevel, AlertEvent::cleared, 40)).action,
            Action::notify);
  const Decision third = policy.on_transition(transition(kLevel, AlertEvent::raised, 59));
  EXPECT_EQ(third.action, Action::held_chattering);
  ASSERT_EQ(third.notices.size(), 1u);
  EXPECT_EQ(third.notices[0].kind, Kind::chattering_started);
  EXPECT_EQ(third.notices[0].time, at(59));
  EXPECT_EQ(third.notices[0].asset, "water_tank_9");
  EXPECT_EQ(third.notices[0].check, "level_high");
  EXPECT_EQ(third.notices[0].count, 3);
  EXPECT_EQ(third.notices[0].text,
            "water_tank_9/level_high is chattering (3 raises within 60 s); its notifications are "
            "held until it settles");
  EXPECT_TRUE(policy.chattering("water_tank_9", "level_high"));
  // Its clear is held too; a person's command on it is not.
  EXPECT_EQ(policy.on_transition(transition(kLevel, AlertEvent::cleared, 65)).action,
            Action::held_chattering);
  EXPECT_EQ(policy.on_transition(transition(kLevel, AlertEvent::shelved, 70)).action,
            Action::notify);
}

TEST(NotificationPolicy, ThreeRaisesOver61SecondsDoNotChatter) {
  NotificationPolicy policy(std::string(kSite), {});
  for (double t : {0.0, 30.0, 61.0}) {
    const Decision d = policy.on_transition(transition(kLevel, AlertEvent::raised, t));
    EXPECT_EQ(d.action, Action::notify) << "raise at " << t;
    EXPECT_TRUE(d.notices.empty());
  }
  EXPECT_FALSE(policy.chattering("water_tank_9", "level_high"));
}

TEST(NotificationPolicy, RaiseExactlyOneWindowLaterNoLongerSeesTheFirst) {
  NotificationPolicy policy(std::string(kSite), {});
  for (double t : {0.0, 30.0, 60.0}) {
    EXPECT_EQ(policy.on_transition(transition(kLevel, AlertEvent::raised, t)).action,
              Action::notify);
  }
}

TEST(NotificationPolicy, ChatteringEndsOneFullWindowAfterTheLastRaise) {
  NotificationPolicy policy(std::string(kSite), {});
  for (double t : {0.0, 20.0, 40.0, 50.0}) {
    (void)policy.on_transition(transition(kLevel, AlertEvent::raised, t));
    (void)policy.on_transition(transition(kLevel, AlertEvent::cleared, t + 5));
  }
  EXPECT_TRUE(policy.advance(at(109)).empty());
  EXPECT_TRUE(policy.chattering("water_tank_9", "level_high"));
  const std::vector<PolicyNotice> notices = policy.advance(at(500));  // noticed late
  ASSERT_EQ(notices.size(), 1u);
  EXPECT_EQ(notices[0].kind, Kind::chattering_ended);
  EXPECT_EQ(notices[0].time, at(110));  // when it happened, not when it was noticed
  EXPECT_EQ(notices[0].count, 2);       // raises at 40 and 50 s were held
  EXPECT_EQ(notices[0].held, 4);        // those two and the clears at 45 and 55 s
  EXPECT_FALSE(policy.chattering("water_tank_9", "level_high"));
  EXPECT_EQ(policy.on_transition(transition(kLevel, AlertEvent::raised, 600)).action,
            Action::notify);
}

// Flood: more than 10 new alerts in 10 minutes at one site (ISA-18.2 flood figure; EEMUA 191
// benchmark of at most 10 alarms in 10 minutes; see REFERENCES.md "Alarm management").
TEST(NotificationPolicy, ElevenNewAlertsInTenMinutesAreAFlood) {
  NotificationPolicy policy(std::string(kSite), {});
  const std::vector<Names> names = many_alerts(11);
  for (int i = 0; i < 10; ++i) {
    const Decision d = policy.on_transition(
        transition(names[static_cast<std::size_t>(i)], AlertEvent::raised, 50.0 * i));
    EXPECT_EQ(d.action, Action::notify) << "alert " << i;
    EXPECT_TRUE(d.notices.empty());
  }
  EXPECT_FALSE(policy.in_flood());
  const Decision eleventh =
      policy.on_transition(transition(names[10], AlertEvent::raised, 500, Priority::urgent));
  EXPECT_EQ(eleventh.action, Action::held_flood);
  ASSERT_EQ(eleventh.notices.size(), 1u);
  const PolicyNotice& start = eleventh.notices[0];
  EXPECT_EQ(start.kind, Kind::flood_started);
  EXPECT_EQ(start.time, at(500));
  EXPECT_EQ(start.count, 11);
  EXPECT_EQ(start.text,
            "Alert flood at Dry Creek SWD 4: 11 new alerts within 10 min; single notifications "
            "are held until it eases. Highest priority: urgent tank_10/level_high, medium "
            "tank_0/level_high, medium tank_1/level_high");
  EXPECT_TRUE(policy.in_flood());
}

TEST(NotificationPolicy, TenNewAlertsInTenMinutesAreNotAFlood) {
  NotificationPolicy policy(std::string(kSite), {});
  const std::vector<Names> names = many_alerts(10);
  for (int i = 0; i < 10; ++i) {
    EXPECT_EQ(policy
                  .on_transition(
                      transition(names[static_cast<std::size_t>(i)], AlertEvent::raised, 59.0 * i))
                  .action,
              Action::notify);
  }
  EXPECT_FALSE(policy.in_flood());
}

TEST(NotificationPolicy, ElevenNewAlertsSpreadOverMoreThanTenMinutesAreNotAFlood) {
  NotificationPolicy policy(std::string(kSite), {});
  const std::vector<Names> names = many_alerts(11);
  for (int i = 0; i < 11; ++i) {
    (void)policy.on_transition(
        transition(names[static_cast<std::size_t>(i)], AlertEvent::raised, 61.0 * i));
  }
  EXPECT_FALSE(policy.in_flood());
}

TEST(NotificationPolicy, FloodHoldsEverythingAndEndsWithOneSummary) {
  NotificationPolicy policy(std::string(kSite), {});
  const std::vector<Names> names = many_alerts(13);
  for (int i = 0; i < 11; ++i) {
    (void)policy.on_transition(
        transition(names[static_cast<std::size_t>(i)], AlertEvent::raised, 50.0 * i));
  }
  ASSERT_TRUE(policy.in_flood());
  // During the flood: a clear, an acknowledgement and two more new alerts, all held.
  EXPECT_EQ(policy.on_transition(transition(names[0], AlertEvent::cleared, 520)).action,
            Action::held_flood);
  EXPECT_EQ(policy.on_transition(transition(names[1], AlertEvent::acknowledged, 530)).action,
            Action::held_flood);
  EXPECT_EQ(policy.on_transition(transition(names[11], AlertEvent::raised, 540)).action,
            Action::held_flood);
  EXPECT_EQ(policy.on_transition(transition(names[12], AlertEvent::raised, 550)).action,
            Action::held_flood);
  // 13 raises at 0, 50, ..., 500, 540, 550 s: the count falls to 10 when the raise at 100 s
  // leaves the window, at 700 s.
  EXPECT_TRUE(policy.advance(at(699)).empty());
  const std::vector<PolicyNotice> end = policy.advance(at(1000));
  ASSERT_EQ(end.size(), 1u);
  EXPECT_EQ(end[0].kind, Kind::flood_ended);
  EXPECT_EQ(end[0].time, at(700));
  EXPECT_EQ(end[0].held, 5);   // the 11th raise and the four above
  EXPECT_EQ(end[0].count, 3);  // new alerts while it lasted
  EXPECT_EQ(end[0].text,
            "Alert flood at Dry Creek SWD 4 is over after 3.333 min: 5 notifications were held "
            "(3 new alerts); the journal has every one");
  EXPECT_FALSE(policy.in_flood());
  EXPECT_EQ(policy.on_transition(transition(names[0], AlertEvent::raised, 1010)).action,
            Action::notify);
}

TEST(NotificationPolicy, FloodEndNoticeComesBeforeTheNextTransition) {
  NotificationPolicy policy(std::string(kSite), {});
  const std::vector<Names> names = many_alerts(12);
  for (int i = 0; i < 11; ++i) {
    (void)policy.on_transition(
        transition(names[static_cast<std::size_t>(i)], AlertEvent::raised, 10.0 * i));
  }
  ASSERT_TRUE(policy.in_flood());
  const Decision d = policy.on_transition(transition(names[11], AlertEvent::raised, 900));
  EXPECT_EQ(d.action, Action::notify);
  ASSERT_EQ(d.notices.size(), 1u);
  EXPECT_EQ(d.notices[0].kind, Kind::flood_ended);
  EXPECT_EQ(d.notices[0].time, at(600));
}

TEST(NotificationPolicy, RaisesHeldForChatteringAreNotNewAlertsForTheFlood) {
  NotificationPolicy policy(std::string(kSite), {});
  for (int i = 0; i < 20; ++i) {
    (void)policy.on_transition(transition(kLevel, AlertEvent::raised, 10.0 * i));
  }
  EXPECT_TRUE(policy.chattering("water_tank_9", "level_high"));
  EXPECT_FALSE(policy.in_flood());  // only the first two raises were new alerts
}

TEST(NotificationPolicy, ParametersAreHonoured) {
  NotificationParams params;
  params.chatter_count = 2;
  params.chatter_window_s = 10;
  NotificationPolicy policy(std::string(kSite), params);
  EXPECT_EQ(policy.on_transition(transition(kLevel, AlertEvent::raised, 0)).action, Action::notify);
  EXPECT_EQ(policy.on_transition(transition(kLevel, AlertEvent::raised, 9)).action,
            Action::held_chattering);
}

std::string bytes_of(const NotificationPolicy& p) {
  StateWriter w;
  p.save(w);
  return w.take();
}

TEST(NotificationPolicy, SaveLoadRoundTripIsByteExactAndContinuesTheSame) {
  NotificationPolicy original(std::string(kSite), {});
  const std::vector<Names> names = many_alerts(12);
  for (int i = 0; i < 11; ++i) {
    (void)original.on_transition(transition(names[static_cast<std::size_t>(i)], AlertEvent::raised,
                                            20.0 * i, Priority::high));
  }
  for (double t : {230.0, 240.0, 250.0}) {
    (void)original.on_transition(transition(kLevel, AlertEvent::raised, t));
  }
  ASSERT_TRUE(original.in_flood());
  ASSERT_TRUE(original.chattering("water_tank_9", "level_high"));
  const std::string bytes = bytes_of(original);

  NotificationPolicy restored(std::string(kSite), {});
  StateReader reader(bytes);
  ASSERT_TRUE(restored.load(reader));
  EXPECT_TRUE(reader.finished());
  EXPECT_EQ(bytes_of(restored), bytes);

  // The same continuation gives the same decisions and notices.
  const AlertTransition next = transition(names[11], AlertEvent::raised, 700);
  const Decision a = original.on_transition(next);
  const Decision b = restored.on_transition(next);
  EXPECT_EQ(a.action, b.action);
  ASSERT_EQ(a.notices.size(), b.notices.size());
  ASSERT_FALSE(a.notices.empty());
  for (std::size_t i = 0; i < a.notices.size(); ++i) {
    EXPECT_EQ(a.notices[i].kind, b.notices[i].kind);
    EXPECT_EQ(a.notices[i].time, b.notices[i].time);
    EXPECT_EQ(a.notices[i].text, b.notices[i].text);
  }
}

TEST(NotificationPolicy, DamagedStateIsRejectedAndChangesNothing) {
  NotificationPolicy original(std::string(kSite), {});
  (void)original.on_transition(transition(kLevel, AlertEvent::raised, 0));
  const std::string bytes = bytes_of(original);

  NotificationPolicy target(std::string(kSite), {});
  const std::string fresh = bytes_of(target);
  std::string bad_priority = bytes;
  // Layout: version, now (1 + 8), no flood (1), one raise: count (8), time (8), priority.
  bad_priority[1 + 9 + 1 + 8 + 8] = 9;
  for (const std::string& bad : {bytes.substr(0, bytes.size() - 1), bad_priority}) {
    StateReader reader(bad);
    EXPECT_FALSE(target.load(reader));
    EXPECT_EQ(bytes_of(target), fresh);
  }
}

}  // namespace
}  // namespace bw::engine
