#include "engine/alert_book.h"

#include <gtest/gtest.h>

#include <string>
#include <vector>

namespace bw::engine {
namespace {

core::SensorTime at(double s) { return core::sensor_time_from_seconds(1.7e9 + s); }

constexpr std::string_view kSite = "Dry Creek SWD 4";

// Every field of a transition, copied (the views are valid during the call only).
struct Recorded {
  core::SensorTime time;
  std::string site, asset, check, tag, unit, message, who, reason, source;
  AlertEvent event;
  Priority priority;
  AlertState from, to;
  TransitionCause cause;
  double value;
  std::optional<Forecast> forecast;
};

class Recorder final : public AlertSink {
 public:
  void on_transition(const AlertTransition& t) override {
    seen.push_back({t.time, std::string(t.site), std::string(t.asset), std::string(t.check),
                    std::string(t.tag), std::string(t.unit), t.message, std::string(t.who),
                    std::string(t.reason), std::string(t.source), t.event, t.priority, t.from, t.to,
                    t.cause, t.value, t.forecast});
  }
  std::vector<Recorded> seen;
};

ConditionChange condition(std::string_view check, bool active, double t_s, double value = 21.3) {
  ConditionChange c;
  c.kind = ConditionChange::Kind::condition;
  c.active = active;
  c.time = at(t_s);
  c.check = check;
  c.priority = Priority::high;
  c.message = "Tank level high";
  c.value = value;
  c.unit = "ft";
  c.tag = "DC4.TK9.LEVEL";
  c.detail = "21.3 ft over 20 ft";
  return c;
}

ConditionChange suppression(std::string_view check, bool active, double t_s) {
  ConditionChange c = condition(check, active, t_s);
  c.kind = ConditionChange::Kind::suppression;
  c.message = "";
  c.detail = active ? "tank under maintenance" : "maintenance over";
  return c;
}

AlertCommand command(AlertCommand::Kind kind, std::string check, double t_s,
                     std::string asset = "water_tank_9") {
  AlertCommand c;
  c.kind = kind;
  c.asset = std::move(asset);
  c.check = std::move(check);
  c.who = "Dana Ortiz";
  c.reason = "checked on site";
  c.source = "sms:+15550100";
  c.issued = at(t_s);
  return c;
}

AlertCommand shelve(std::string check, double t_s, double duration_s) {
  AlertCommand c = command(AlertCommand::Kind::shelve, std::move(check), t_s);
  c.duration_s = duration_s;
  return c;
}

class AlertBookTest : public ::testing::Test {
 protected:
  AlertBookTest() : book(std::string(kSite), policy()) { define_all(book); }

  static CommandPolicy policy() {
    CommandPolicy p;
    p.authorised_sources = {"sms:+15550100", "mqtt:client-7", "replay"};
    return p;
  }
  static void define_all(AlertBook& b) {
    b.define("water_tank_9", "level_high", Priority::high, false);
    b.define("water_tank_9", "level_high_high", Priority::urgent, true);
    b.define("filter_2", "dp_high", Priority::medium, false);
  }
  std::string state_bytes() const {
    StateWriter w;
    book.save(w);
    return w.take();
  }
  AlertState state_of(std::string_view asset, std::string_view check) const {
    const AlertLifecycle* l = book.find(asset, check);
    EXPECT_NE(l, nullptr);
    return l == nullptr ? AlertState::normal : l->state();
  }
  // A refused command: one command_refused transition whose message is the reply's, no state
  // change.
  void expect_refused(const AlertCommand& c, const std::string& message) {
    const std::string before = state_bytes();
    Recorder r;
    const CommandReply reply = book.execute(c, r);
    EXPECT_FALSE(reply.accepted);
    EXPECT_EQ(reply.message, message);
    ASSERT_EQ(r.seen.size(), 1u);
    EXPECT_EQ(r.seen[0].event, AlertEvent::command_refused);
    EXPECT_EQ(r.seen[0].cause, TransitionCause::command);
    EXPECT_EQ(r.seen[0].message, message);
    EXPECT_EQ(r.seen[0].who, c.who);
    EXPECT_EQ(r.seen[0].source, c.source);
    EXPECT_EQ(r.seen[0].time, c.issued);
    EXPECT_EQ(state_bytes(), before) << "a refused command changed state";
  }

  AlertBook book;
  Recorder out;
};

TEST_F(AlertBookTest, ConditionChangeEmitsRaisedWithEverythingTheJournalNeeds) {
  ConditionChange c = condition("level_high", true, 10);
  c.forecast = Forecast{at(100), at(90), std::nullopt, 20.0};
  book.on_change("water_tank_9", c, out);
  ASSERT_EQ(out.seen.size(), 1u);
  const Recorded& t = out.seen[0];
  EXPECT_EQ(t.time, at(10));
  EXPECT_EQ(t.site, kSite);
  EXPECT_EQ(t.asset, "water_tank_9");
  EXPECT_EQ(t.check, "level_high");
  EXPECT_EQ(t.tag, "DC4.TK9.LEVEL");
  EXPECT_EQ(t.event, AlertEvent::raised);
  EXPECT_EQ(t.priority, Priority::high);
  EXPECT_EQ(t.from, AlertState::normal);
  EXPECT_EQ(t.to, AlertState::unacknowledged);
  EXPECT_EQ(t.cause, TransitionCause::sample);
  EXPECT_EQ(t.value, 21.3);
  EXPECT_EQ(t.unit, "ft");
  EXPECT_EQ(t.message, "Tank level high: 21.3 ft over 20 ft");
  ASSERT_TRUE(t.forecast.has_value());
  EXPECT_EQ(t.forecast->crossing, at(100));
}

TEST_F(AlertBookTest, MessageIsTheDetailAloneWhenNoneIsConfigured) {
  ConditionChange c = condition("level_high", true, 10);
  c.message = "";
  book.on_change("water_tank_9", c, out);
  ASSERT_EQ(out.seen.size(), 1u);
  EXPECT_EQ(out.seen[0].message, "21.3 ft over 20 ft");
}

TEST_F(AlertBookTest, RepeatedConditionReportsNothing) {
  book.on_change("water_tank_9", condition("level_high", true, 10), out);
  book.on_change("water_tank_9", condition("level_high", true, 20), out);
  EXPECT_EQ(out.seen.size(), 1u);
}

TEST_F(AlertBookTest, AcknowledgeIsJournaledWithWhoWhyAndWhere) {
  book.on_change("water_tank_9", condition("level_high", true, 10), out);
  const CommandReply reply =
      book.execute(command(AlertCommand::Kind::acknowledge, "level_high", 30), out);
  EXPECT_TRUE(reply.accepted);
  EXPECT_EQ(reply.message,
            "water_tank_9/level_high acknowledged by Dana Ortiz (sms:+15550100): checked on site");
  ASSERT_EQ(out.seen.size(), 2u);
  const Recorded& t = out.seen[1];
  EXPECT_EQ(t.event, AlertEvent::acknowledged);
  EXPECT_EQ(t.cause, TransitionCause::command);
  EXPECT_EQ(t.time, at(30));
  EXPECT_EQ(t.from, AlertState::unacknowledged);
  EXPECT_EQ(t.to, AlertState::acknowledged);
  EXPECT_EQ(t.who, "Dana Ortiz");
  EXPECT_EQ(t.reason, "checked on site");
  EXPECT_EQ(t.source, "sms:+15550100");
  EXPECT_EQ(t.message, "acknowledged by Dana Ortiz (sms:+15550100): checked on site");
  EXPECT_EQ(state_of("water_tank_9", "level_high"), AlertState::acknowledged);
}

TEST_F(AlertBookTest, RefusesAnUnknownAlert) {
  book.advance(at(100), out);
  expect_refused(command(AlertCommand::Kind::acknowledge, "level_low", 100),
                 "refused: no alert 'water_tank_9/level_low' at Dry Creek SWD 4");
}

TEST_F(AlertBookTest, RefusesAnUnknownAssetForAnAssetWideCommand) {
  book.advance(at(100), out);
  expect_refused(command(AlertCommand::Kind::remove_from_service, "", 100, "water_tank_12"),
                 "refused: no alerts for asset 'water_tank_12' at Dry Creek SWD 4");
}

TEST_F(AlertBookTest, RefusesAnUnauthorisedSource) {
  book.on_change("water_tank_9", condition("level_high", true, 10), out);
  AlertCommand c = command(AlertCommand::Kind::acknowledge, "level_high", 10);
  c.source = "mqtt:unknown";
  expect_refused(c, "refused: source 'mqtt:unknown' is not authorised to send commands");
  EXPECT_EQ(state_of("water_tank_9", "level_high"), AlertState::unacknowledged);
}

TEST_F(AlertBookTest, RefusesANegativeShelveDuration) {
  book.advance(at(100), out);
  expect_refused(shelve("level_high", 100, -3600),
                 "refused: shelve duration must be positive (got -3600 s)");
}

TEST_F(AlertBookTest, RefusesAShelveOverThePolicyMaximum) {
  book.advance(at(100), out);
  expect_refused(shelve("level_high", 100, 8 * 86400.0),
                 "refused: shelve duration 691200 s is over the maximum of 604800 s");
}

TEST_F(AlertBookTest, RefusesAShelveThatHasAlreadyRunOut) {
  // Issued 1 h late (a delayed text message) for 30 min: it would have ended at 1800 s.
  book.advance(at(3600), out);
  expect_refused(shelve("level_high", 0, 1800),
                 "refused: shelve until 2023-11-14T22:43:20Z would already have run out "
                 "(now 2023-11-14T23:13:20Z)");
}

TEST_F(AlertBookTest, RefusesACommandThatDoesNotSayWho) {
  book.advance(at(100), out);
  AlertCommand c = command(AlertCommand::Kind::acknowledge, "level_high", 100);
  c.who = "";
  expect_refused(c, "refused: the command does not say who sent it");
}

TEST_F(AlertBookTest, RefusesAShelveOrRemovalWithoutAReason) {
  book.advance(at(100), out);
  AlertCommand s = shelve("level_high", 100, 3600);
  s.reason = "";
  expect_refused(s, "refused: shelve needs a reason");
  AlertCommand r = command(AlertCommand::Kind::remove_from_service, "level_high", 100);
  r.reason = "";
  expect_refused(r, "refused: remove_from_service needs a reason");
}

TEST_F(AlertBookTest, RefusesWhatTheLifecycleRefuses) {
  book.advance(at(100), out);
  expect_refused(command(AlertCommand::Kind::acknowledge, "level_high", 100),
                 "refused: water_tank_9/level_high: nothing to acknowledge: the alert is normal");
  expect_refused(command(AlertCommand::Kind::unshelve, "level_high", 100),
                 "refused: water_tank_9/level_high: the alert is not shelved (it is normal)");
  expect_refused(command(AlertCommand::Kind::return_to_service, "level_high", 100),
                 "refused: water_tank_9/level_high: the alert is already in service");
}

TEST_F(AlertBookTest, RefusalOfAKnownAlertCarriesItsStateAndPriority) {
  book.on_change("water_tank_9", condition("level_high_high", true, 10), out);
  ASSERT_TRUE(
      book.execute(command(AlertCommand::Kind::acknowledge, "level_high_high", 20), out).accepted);
  out.seen.clear();
  EXPECT_FALSE(
      book.execute(command(AlertCommand::Kind::acknowledge, "level_high_high", 30), out).accepted);
  ASSERT_EQ(out.seen.size(), 1u);
  EXPECT_EQ(out.seen[0].priority, Priority::urgent);
  EXPECT_EQ(out.seen[0].from, AlertState::acknowledged);
  EXPECT_EQ(out.seen[0].to, AlertState::acknowledged);
}

TEST_F(AlertBookTest, AssetWideCommandsChangeEveryAlertOfTheAsset) {
  book.on_change("water_tank_9", condition("level_high", true, 10), out);
  book.on_change("water_tank_9", condition("level_high_high", true, 11), out);
  book.on_change("filter_2", condition("dp_high", true, 12), out);
  out.seen.clear();

  const CommandReply ack = book.execute(command(AlertCommand::Kind::acknowledge, "", 20), out);
  EXPECT_TRUE(ack.accepted);
  EXPECT_EQ(ack.message,
            "2 of 2 alerts of water_tank_9 acknowledged by Dana Ortiz (sms:+15550100): checked "
            "on site");
  ASSERT_EQ(out.seen.size(), 2u);
  EXPECT_EQ(out.seen[0].check, "level_high");
  EXPECT_EQ(out.seen[1].check, "level_high_high");
  EXPECT_EQ(state_of("filter_2", "dp_high"), AlertState::unacknowledged);

  out.seen.clear();
  AlertCommand maintenance = command(AlertCommand::Kind::remove_from_service, "", 30);
  maintenance.reason = "tank cleaning";
  EXPECT_TRUE(book.execute(maintenance, out).accepted);
  ASSERT_EQ(out.seen.size(), 2u);
  for (const Recorded& t : out.seen) {
    EXPECT_EQ(t.event, AlertEvent::removed_from_service);
    EXPECT_EQ(t.to, AlertState::out_of_service);
  }
  // Both conditions clear during the work: nothing is reported.
  out.seen.clear();
  book.on_change("water_tank_9", condition("level_high", false, 40), out);
  book.on_change("water_tank_9", condition("level_high_high", false, 41), out);
  EXPECT_TRUE(out.seen.empty());

  EXPECT_TRUE(book.execute(command(AlertCommand::Kind::return_to_service, "", 50), out).accepted);
  ASSERT_EQ(out.seen.size(), 2u);
  EXPECT_EQ(out.seen[0].to, AlertState::normal);
  EXPECT_EQ(out.seen[1].to, AlertState::normal);
}

TEST_F(AlertBookTest, AssetWideCommandSkipsAlertsThatRefuseIt) {
  book.on_change("water_tank_9", condition("level_high", true, 10), out);
  out.seen.clear();
  const CommandReply reply = book.execute(command(AlertCommand::Kind::acknowledge, "", 20), out);
  EXPECT_TRUE(reply.accepted);
  EXPECT_EQ(reply.message.rfind("1 of 2 alerts of water_tank_9 acknowledged", 0), 0u)
      << reply.message;
  ASSERT_EQ(out.seen.size(), 1u);
  EXPECT_EQ(out.seen[0].check, "level_high");
}

TEST_F(AlertBookTest, AssetWideCommandThatNoAlertAcceptsIsOneRefusal) {
  book.advance(at(100), out);
  expect_refused(command(AlertCommand::Kind::unshelve, "", 100),
                 "refused: water_tank_9/level_high: the alert is not shelved (it is normal); "
                 "water_tank_9/level_high_high: the alert is not shelved (it is normal)");
}

TEST_F(AlertBookTest, ShelveRunsOutOnAdvanceAtItsOwnEndTime) {
  book.on_change("water_tank_9", condition("level_high", true, 10), out);
  const CommandReply reply = book.execute(shelve("level_high", 100, 3600), out);
  EXPECT_TRUE(reply.accepted);
  EXPECT_EQ(reply.message,
            "water_tank_9/level_high shelved until 2023-11-14T23:15:00Z by Dana Ortiz "
            "(sms:+15550100): checked on site");
  out.seen.clear();

  book.advance(at(3699), out);
  EXPECT_TRUE(out.seen.empty());
  EXPECT_EQ(state_of("water_tank_9", "level_high"), AlertState::shelved);

  book.advance(at(5000), out);
  ASSERT_EQ(out.seen.size(), 1u);
  const Recorded& t = out.seen[0];
  EXPECT_EQ(t.event, AlertEvent::shelve_expired);
  EXPECT_EQ(t.cause, TransitionCause::shelve_expiry);
  EXPECT_EQ(t.time, at(3700));
  EXPECT_EQ(t.from, AlertState::shelved);
  EXPECT_EQ(t.to, AlertState::unacknowledged);  // still active: seen again as new
  EXPECT_EQ(t.who, "Dana Ortiz");
  EXPECT_EQ(t.source, "sms:+15550100");
  EXPECT_EQ(t.reason, "checked on site");
  EXPECT_EQ(t.message,
            "shelve ran out (shelved until 2023-11-14T23:15:00Z by Dana Ortiz (sms:+15550100): "
            "checked on site)");
}

TEST_F(AlertBookTest, ExpiredShelveIsJournaledBeforeALaterChange) {
  ASSERT_TRUE(book.execute(shelve("level_high", 0, 600), out).accepted);
  out.seen.clear();
  book.on_change("water_tank_9", condition("level_high", true, 900), out);
  ASSERT_EQ(out.seen.size(), 2u);
  EXPECT_EQ(out.seen[0].event, AlertEvent::shelve_expired);
  EXPECT_EQ(out.seen[0].time, at(600));
  EXPECT_EQ(out.seen[1].event, AlertEvent::raised);
  EXPECT_EQ(out.seen[1].time, at(900));
}

TEST_F(AlertBookTest, ShelvesRunOutInTimeOrderNotDefinitionOrder) {
  ASSERT_TRUE(book.execute(shelve("level_high", 0, 900), out).accepted);
  ASSERT_TRUE(book.execute(shelve("level_high_high", 0, 300), out).accepted);
  out.seen.clear();
  book.advance(at(1000), out);
  ASSERT_EQ(out.seen.size(), 2u);
  EXPECT_EQ(out.seen[0].check, "level_high_high");
  EXPECT_EQ(out.seen[0].time, at(300));
  EXPECT_EQ(out.seen[1].check, "level_high");
  EXPECT_EQ(out.seen[1].time, at(900));
}

TEST_F(AlertBookTest, SuppressionHidesTheConditionAndShowsItWhenItEnds) {
  book.on_change("water_tank_9", suppression("level_high", true, 10), out);
  book.on_change("water_tank_9", condition("level_high", true, 20), out);
  book.on_change("water_tank_9", suppression("level_high", false, 30), out);
  ASSERT_EQ(out.seen.size(), 2u);
  EXPECT_EQ(out.seen[0].event, AlertEvent::suppressed);
  EXPECT_EQ(out.seen[0].to, AlertState::suppressed_by_design);
  EXPECT_EQ(out.seen[0].message, "tank under maintenance");
  EXPECT_EQ(out.seen[1].event, AlertEvent::unsuppressed);
  EXPECT_EQ(out.seen[1].to, AlertState::unacknowledged);
}

TEST_F(AlertBookTest, LatchedAlertWaitsForTheOperator) {
  book.on_change("water_tank_9", condition("level_high_high", true, 10), out);
  book.on_change("water_tank_9", condition("level_high_high", false, 20), out);
  EXPECT_EQ(state_of("water_tank_9", "level_high_high"), AlertState::latched);
  EXPECT_TRUE(
      book.execute(command(AlertCommand::Kind::acknowledge, "level_high_high", 30), out).accepted);
  EXPECT_EQ(state_of("water_tank_9", "level_high_high"), AlertState::normal);
}

TEST_F(AlertBookTest, NotNormalListsInDefinitionOrderWithSince) {
  book.on_change("filter_2", condition("dp_high", true, 5), out);
  book.on_change("water_tank_9", condition("level_high", true, 10), out);
  ASSERT_TRUE(
      book.execute(command(AlertCommand::Kind::acknowledge, "level_high", 15), out).accepted);
  const std::vector<AlertView> views = book.not_normal();
  ASSERT_EQ(views.size(), 2u);
  EXPECT_EQ(views[0].asset, "water_tank_9");
  EXPECT_EQ(views[0].check, "level_high");
  EXPECT_EQ(views[0].state, AlertState::acknowledged);
  EXPECT_EQ(views[0].priority, Priority::high);
  EXPECT_EQ(views[0].since, at(15));
  EXPECT_EQ(views[1].asset, "filter_2");
  EXPECT_EQ(views[1].since, at(5));
}

TEST_F(AlertBookTest, ChangeForAnUndefinedAlertDefinesIt) {
  ConditionChange c = condition("level_quality", true, 10);
  c.priority = Priority::low;
  book.on_change("water_tank_9", c, out);
  ASSERT_EQ(out.seen.size(), 1u);
  EXPECT_EQ(out.seen[0].priority, Priority::low);
  EXPECT_EQ(state_of("water_tank_9", "level_quality"), AlertState::unacknowledged);
}

TEST_F(AlertBookTest, SaveLoadRoundTripIsByteExactAndRestoresStates) {
  book.on_change("water_tank_9", condition("level_high", true, 10), out);
  ASSERT_TRUE(
      book.execute(command(AlertCommand::Kind::acknowledge, "level_high", 20), out).accepted);
  ASSERT_TRUE(book.execute(shelve("level_high_high", 30, 7200), out).accepted);
  AlertCommand maintenance = command(AlertCommand::Kind::remove_from_service, "", 40, "filter_2");
  maintenance.reason = "change-out";
  ASSERT_TRUE(book.execute(maintenance, out).accepted);
  const std::string bytes = state_bytes();

  AlertBook restored(std::string(kSite), policy());
  define_all(restored);
  StateReader reader(bytes);
  ASSERT_TRUE(restored.load(reader));
  EXPECT_TRUE(reader.finished());
  StateWriter again;
  restored.save(again);
  EXPECT_EQ(again.bytes(), bytes);

  // An acknowledged alert does not come back unacknowledged after a restart.
  EXPECT_EQ(restored.find("water_tank_9", "level_high")->state(), AlertState::acknowledged);
  // The restored shelve still runs out at its own time.
  Recorder r;
  restored.advance(at(8000), r);
  ASSERT_EQ(r.seen.size(), 1u);
  EXPECT_EQ(r.seen[0].event, AlertEvent::shelve_expired);
  EXPECT_EQ(r.seen[0].time, at(7230));
}

TEST_F(AlertBookTest, LoadDropsNamesNoLongerDefinedAndKeepsNewOnesNormal) {
  book.on_change("water_tank_9", condition("level_high", true, 10), out);
  book.on_change("filter_2", condition("dp_high", true, 10), out);
  const std::string bytes = state_bytes();

  AlertBook changed(std::string(kSite), policy());
  changed.define("water_tank_9", "level_high", Priority::high, false);
  changed.define("water_tank_9", "level_low", Priority::medium, false);
  StateReader reader(bytes);
  ASSERT_TRUE(changed.load(reader));
  EXPECT_EQ(changed.find("water_tank_9", "level_high")->state(), AlertState::unacknowledged);
  EXPECT_EQ(changed.find("water_tank_9", "level_low")->state(), AlertState::normal);
  EXPECT_EQ(changed.find("filter_2", "dp_high"), nullptr);
}

TEST_F(AlertBookTest, DamagedStateIsRejectedAndChangesNothing) {
  book.on_change("water_tank_9", condition("level_high", true, 10), out);
  const std::string bytes = state_bytes();

  AlertBook other(std::string(kSite), policy());
  define_all(other);
  StateWriter fresh;
  other.save(fresh);
  for (std::size_t cut : {std::size_t{1}, bytes.size() / 2, bytes.size() - 1}) {
    StateReader reader(std::string_view(bytes).substr(0, cut));
    EXPECT_FALSE(other.load(reader)) << "cut at " << cut;
    StateWriter after;
    other.save(after);
    EXPECT_EQ(after.bytes(), fresh.bytes());
  }
}

TEST(AlertCommandKind, NamesRoundTrip) {
  for (auto kind :
       {AlertCommand::Kind::acknowledge, AlertCommand::Kind::shelve, AlertCommand::Kind::unshelve,
        AlertCommand::Kind::remove_from_service, AlertCommand::Kind::return_to_service}) {
    const auto back = command_kind_from_string(to_string(kind));
    ASSERT_TRUE(back.has_value());
    EXPECT_EQ(*back, kind);
  }
  EXPECT_EQ(to_string(AlertCommand::Kind::remove_from_service), "remove_from_service");
  EXPECT_FALSE(command_kind_from_string("Acknowledge").has_value());
  EXPECT_FALSE(command_kind_from_string("").has_value());
}

}  // namespace
}  // namespace bw::engine
