#include "engine/alert_lifecycle.h"

#include <gtest/gtest.h>

#include <cmath>
#include <limits>
#include <string>
#include <vector>

#include "engine/alert.h"

namespace bw::engine {
namespace {

core::SensorTime at(double s) { return core::sensor_time_from_seconds(1.7e9 + s); }

constexpr double kMaxShelve = 7 * 86400.0;  // common practice: shelving is always time-limited

ShelveRequest request(double duration_s, double issued_s = 0) {
  return {at(issued_s), duration_s, "Dana Ortiz", "transmitter being recalibrated",
          "sms:+15550100"};
}

// How a row's alert is put in its start state before the happening under test.
struct Start {
  AlertState state;
  bool active = false;  // the condition, where the state does not imply it
  bool latching = false;
};

AlertLifecycle make(const Start& start) {
  AlertLifecycle a(start.latching);
  auto must = [](auto&& change) { ASSERT_TRUE(bool(change)); };
  switch (start.state) {
    case AlertState::normal:
      break;
    case AlertState::unacknowledged:
      must(a.set_condition(true));
      break;
    case AlertState::acknowledged:
      must(a.set_condition(true));
      must(a.acknowledge());
      break;
    case AlertState::returned_unacknowledged:
    case AlertState::latched:
      must(a.set_condition(true));
      must(a.set_condition(false));
      break;
    case AlertState::shelved:
      if (start.active) must(a.set_condition(true));
      must(a.shelve(request(3600), at(0), kMaxShelve));
      break;
    case AlertState::suppressed_by_design:
      if (start.active) must(a.set_condition(true));
      must(a.set_suppressed(true));
      break;
    case AlertState::out_of_service:
      if (start.active) must(a.set_condition(true));
      must(a.remove_from_service());
      break;
  }
  EXPECT_EQ(a.state(), start.state);
  return a;
}

enum class Happening {
  condition_active,
  condition_clear,
  acknowledge,
  shelve,
  shelve_negative,
  shelve_zero,
  shelve_nan,
  shelve_over_maximum,
  shelve_already_run_out,
  unshelve,
  shelve_runs_out,
  suppression_begins,
  suppression_ends,
  remove_from_service,
  return_to_service,
};

struct Outcome {
  bool changed = false;
  LifecycleChange change{AlertState::normal, AlertState::normal, AlertEvent::raised};
  std::string refusal;  // empty unless refused
};

template <class R>
Outcome outcome_of(R&& result) {
  Outcome o;
  if constexpr (std::is_same_v<std::decay_t<R>, Result<LifecycleChange>>) {
    if (!result) {
      o.refusal = result.error().message;
      return o;
    }
    o.changed = true;
    o.change = result.value();
  } else {
    o.changed = result.has_value();
    if (result) o.change = *result;
  }
  return o;
}

Outcome happen(AlertLifecycle& a, Happening h) {
  switch (h) {
    case Happening::condition_active:
      return outcome_of(a.set_condition(true));
    case Happening::condition_clear:
      return outcome_of(a.set_condition(false));
    case Happening::acknowledge:
      return outcome_of(a.acknowledge());
    case Happening::shelve:
      return outcome_of(a.shelve(request(7200, 10), at(10), kMaxShelve));
    case Happening::shelve_negative:
      return outcome_of(a.shelve(request(-3600, 10), at(10), kMaxShelve));
    case Happening::shelve_zero:
      return outcome_of(a.shelve(request(0, 10), at(10), kMaxShelve));
    case Happening::shelve_nan:
      return outcome_of(
          a.shelve(request(std::numeric_limits<double>::quiet_NaN(), 10), at(10), kMaxShelve));
    case Happening::shelve_over_maximum:
      return outcome_of(a.shelve(request(8 * 86400.0, 10), at(10), kMaxShelve));
    case Happening::shelve_already_run_out:  // issued at 10 s for 1800 s, but it is now 5000 s
      return outcome_of(a.shelve(request(1800, 10), at(5000), kMaxShelve));
    case Happening::unshelve:
      return outcome_of(a.unshelve());
    case Happening::shelve_runs_out:  // make() shelves at 0 s for 3600 s
      return outcome_of(a.expire_shelve(at(3600)));
    case Happening::suppression_begins:
      return outcome_of(a.set_suppressed(true));
    case Happening::suppression_ends:
      return outcome_of(a.set_suppressed(false));
    case Happening::remove_from_service:
      return outcome_of(a.remove_from_service());
    case Happening::return_to_service:
      return outcome_of(a.return_to_service());
  }
  return {};
}

struct Row {
  Start start;
  Happening happening;
  AlertState expected;              // the shown state afterwards
  std::optional<AlertEvent> event;  // the reported event; none: nothing reported
  std::string refusal = {};         // part of the refusal reason; empty: not refused
};

using S = AlertState;
using E = AlertEvent;
using H = Happening;

// The ISA-18.2 / IEC 62682 alarm state model, row by row as the table in alert_lifecycle.h
// writes it, then the hidden-condition, repeat and refusal rows.
const std::vector<Row> kTable = {
    // The annunciation states.
    {{S::normal}, H::condition_active, S::unacknowledged, E::raised},
    {{S::unacknowledged}, H::acknowledge, S::acknowledged, E::acknowledged},
    {{S::unacknowledged}, H::condition_clear, S::returned_unacknowledged, E::cleared},
    {{S::unacknowledged, true, true}, H::condition_clear, S::latched, E::cleared},
    {{S::acknowledged}, H::condition_clear, S::normal, E::cleared},
    {{S::returned_unacknowledged}, H::acknowledge, S::normal, E::acknowledged},
    {{S::returned_unacknowledged}, H::condition_active, S::unacknowledged, E::raised},
    {{S::latched, false, true}, H::acknowledge, S::normal, E::acknowledged},
    {{S::latched, false, true}, H::condition_active, S::unacknowledged, E::raised},
    // Shelve from every state; out_of_service and suppressed_by_design take precedence.
    {{S::normal}, H::shelve, S::shelved, E::shelved},
    {{S::unacknowledged}, H::shelve, S::shelved, E::shelved},
    {{S::acknowledged}, H::shelve, S::shelved, E::shelved},
    {{S::returned_unacknowledged}, H::shelve, S::shelved, E::shelved},
    {{S::latched, false, true}, H::shelve, S::shelved, E::shelved},
    {{S::shelved}, H::shelve, S::shelved, E::shelved},
    {{S::suppressed_by_design}, H::shelve, S::suppressed_by_design, E::shelved},
    {{S::out_of_service}, H::shelve, S::out_of_service, E::shelved},
    // The end of a shelve: a still-active condition shows as new.
    {{S::shelved, true}, H::unshelve, S::unacknowledged, E::unshelved},
    {{S::shelved, false}, H::unshelve, S::normal, E::unshelved},
    {{S::shelved, true}, H::shelve_runs_out, S::unacknowledged, E::shelve_expired},
    {{S::shelved, false}, H::shelve_runs_out, S::normal, E::shelve_expired},
    // Suppression by design.
    {{S::normal}, H::suppression_begins, S::suppressed_by_design, E::suppressed},
    {{S::acknowledged}, H::suppression_begins, S::suppressed_by_design, E::suppressed},
    {{S::shelved}, H::suppression_begins, S::suppressed_by_design, E::suppressed},
    {{S::suppressed_by_design, true}, H::suppression_ends, S::unacknowledged, E::unsuppressed},
    {{S::suppressed_by_design, false}, H::suppression_ends, S::normal, E::unsuppressed},
    // Out of service.
    {{S::normal}, H::remove_from_service, S::out_of_service, E::removed_from_service},
    {{S::unacknowledged}, H::remove_from_service, S::out_of_service, E::removed_from_service},
    {{S::shelved}, H::remove_from_service, S::out_of_service, E::removed_from_service},
    {{S::suppressed_by_design}, H::remove_from_service, S::out_of_service, E::removed_from_service},
    {{S::out_of_service, true}, H::return_to_service, S::unacknowledged, E::returned_to_service},
    {{S::out_of_service, false}, H::return_to_service, S::normal, E::returned_to_service},
    // Hidden states track the condition silently.
    {{S::shelved}, H::condition_active, S::shelved, std::nullopt},
    {{S::shelved, true}, H::condition_clear, S::shelved, std::nullopt},
    {{S::suppressed_by_design}, H::condition_active, S::suppressed_by_design, std::nullopt},
    {{S::out_of_service}, H::condition_active, S::out_of_service, std::nullopt},
    {{S::out_of_service}, H::suppression_begins, S::out_of_service, std::nullopt},
    // Repeats report nothing.
    {{S::unacknowledged}, H::condition_active, S::unacknowledged, std::nullopt},
    {{S::acknowledged}, H::condition_active, S::acknowledged, std::nullopt},
    {{S::normal}, H::condition_clear, S::normal, std::nullopt},
    {{S::normal}, H::suppression_ends, S::normal, std::nullopt},
    // Refusals: nothing changes.
    {{S::normal}, H::acknowledge, S::normal, std::nullopt, "nothing to acknowledge"},
    {{S::acknowledged}, H::acknowledge, S::acknowledged, std::nullopt, "nothing to acknowledge"},
    {{S::shelved, true}, H::acknowledge, S::shelved, std::nullopt, "the alert is shelved"},
    {{S::normal}, H::unshelve, S::normal, std::nullopt, "not shelved"},
    {{S::out_of_service}, H::unshelve, S::out_of_service, std::nullopt, "not shelved"},
    {{S::unacknowledged},
     H::return_to_service,
     S::unacknowledged,
     std::nullopt,
     "already in service"},
    {{S::out_of_service},
     H::remove_from_service,
     S::out_of_service,
     std::nullopt,
     "already out of service"},
    {{S::unacknowledged},
     H::shelve_negative,
     S::unacknowledged,
     std::nullopt,
     "shelve duration must be positive (got -3600 s)"},
    {{S::unacknowledged},
     H::shelve_zero,
     S::unacknowledged,
     std::nullopt,
     "shelve duration must be positive (got 0 s)"},
    {{S::unacknowledged},
     H::shelve_nan,
     S::unacknowledged,
     std::nullopt,
     "shelve duration must be positive (got nan s)"},
    {{S::unacknowledged},
     H::shelve_over_maximum,
     S::unacknowledged,
     std::nullopt,
     "shelve duration 691200 s is over the maximum of 604800 s"},
    {{S::unacknowledged},
     H::shelve_already_run_out,
     S::unacknowledged,
     std::nullopt,
     "would already have run out"},
};

std::string bytes_of(const AlertLifecycle& a) {
  StateWriter w;
  a.save(w);
  return w.take();
}

TEST(AlertLifecycle, EveryRowOfTheStateTable) {
  for (std::size_t i = 0; i < kTable.size(); ++i) {
    const Row& row = kTable[i];
    SCOPED_TRACE("row " + std::to_string(i) + " from " + std::string(to_string(row.start.state)));
    AlertLifecycle a = make(row.start);
    const std::string before = bytes_of(a);
    const Outcome o = happen(a, row.happening);
    EXPECT_EQ(a.state(), row.expected);
    if (!row.refusal.empty()) {
      EXPECT_FALSE(o.changed);
      EXPECT_NE(o.refusal.find(row.refusal), std::string::npos) << o.refusal;
      EXPECT_EQ(bytes_of(a), before) << "a refusal changed the state";
      continue;
    }
    EXPECT_TRUE(o.refusal.empty()) << o.refusal;
    ASSERT_EQ(o.changed, row.event.has_value());
    if (!o.changed) continue;
    EXPECT_EQ(o.change.event, *row.event);
    EXPECT_EQ(o.change.from, row.start.state);
    EXPECT_EQ(o.change.to, row.expected);
  }
}

// ISA-18.2 / IEC 62682: out_of_service > suppressed_by_design > shelved; each one's end shows
// the next that still holds.
TEST(AlertLifecycle, PrecedenceUnwindsOneLayerAtATime) {
  AlertLifecycle a;
  ASSERT_TRUE(a.set_condition(true));
  ASSERT_TRUE(a.shelve(request(3600), at(0), kMaxShelve));
  ASSERT_TRUE(a.set_suppressed(true));
  ASSERT_TRUE(a.remove_from_service());
  EXPECT_EQ(a.state(), S::out_of_service);

  const auto back = a.return_to_service();
  ASSERT_TRUE(back);
  EXPECT_EQ(back->to, S::suppressed_by_design);
  const auto unsuppressed = a.set_suppressed(false);
  ASSERT_TRUE(unsuppressed);
  EXPECT_EQ(unsuppressed->to, S::shelved);
  const auto unshelved = a.unshelve();
  ASSERT_TRUE(unshelved);
  EXPECT_EQ(unshelved->to, S::unacknowledged);
}

TEST(AlertLifecycle, ConditionThatClearedWhileShelvedReturnsToNormalNotReturnedUnacknowledged) {
  AlertLifecycle a;
  ASSERT_TRUE(a.set_condition(true));
  ASSERT_TRUE(a.shelve(request(3600), at(0), kMaxShelve));
  EXPECT_FALSE(a.set_condition(false));
  EXPECT_FALSE(a.condition_active());
  const auto change = a.expire_shelve(at(3600));
  ASSERT_TRUE(change);
  EXPECT_EQ(change->to, S::normal);
}

TEST(AlertLifecycle, AcknowledgedAlertIsSeenAgainAfterSuppressionEndsWhileActive) {
  AlertLifecycle a;
  ASSERT_TRUE(a.set_condition(true));
  ASSERT_TRUE(a.acknowledge());
  ASSERT_TRUE(a.set_suppressed(true));
  const auto change = a.set_suppressed(false);
  ASSERT_TRUE(change);
  EXPECT_EQ(change->to, S::unacknowledged);
}

TEST(AlertLifecycle, ShelveRunsOutAtItsEndAndNotBefore) {
  AlertLifecycle a;
  ASSERT_TRUE(a.shelve(request(3600, 100), at(100), kMaxShelve));
  EXPECT_FALSE(a.expire_shelve(at(3699.999999)));
  ASSERT_TRUE(a.shelve().has_value());
  EXPECT_EQ(a.shelve()->until, at(3700));
  EXPECT_EQ(a.shelve()->who, "Dana Ortiz");
  EXPECT_TRUE(a.expire_shelve(at(3700)));
  EXPECT_FALSE(a.shelve().has_value());
}

TEST(AlertLifecycle, ShelveAtTheMaximumIsAccepted) {
  AlertLifecycle a;
  EXPECT_TRUE(a.shelve(request(kMaxShelve), at(0), kMaxShelve));
}

TEST(AlertLifecycle, StateNamesAreTheWireNames) {
  EXPECT_EQ(to_string(S::normal), "normal");
  EXPECT_EQ(to_string(S::returned_unacknowledged), "returned_unacknowledged");
  EXPECT_EQ(to_string(S::suppressed_by_design), "suppressed_by_design");
  EXPECT_EQ(to_string(S::out_of_service), "out_of_service");
  EXPECT_EQ(static_cast<int>(S::out_of_service), 7);
}

TEST(AlertLifecycle, SaveLoadRoundTripIsByteExact) {
  std::vector<AlertLifecycle> cases;
  cases.push_back(make({S::normal}));
  cases.push_back(make({S::acknowledged}));
  cases.push_back(make({S::latched, false, true}));
  cases.push_back(make({S::shelved, true}));
  AlertLifecycle layered = make({S::out_of_service, true});
  EXPECT_FALSE(layered.set_suppressed(true));  // hidden behind out_of_service: tracked silently
  EXPECT_TRUE(layered.suppressed());
  ASSERT_TRUE(layered.shelve(request(600, 50), at(50), kMaxShelve));
  cases.push_back(layered);
  for (const AlertLifecycle& original : cases) {
    const std::string bytes = bytes_of(original);
    AlertLifecycle restored(original.latching());
    StateReader reader(bytes);
    ASSERT_TRUE(restored.load(reader));
    EXPECT_TRUE(reader.finished());
    EXPECT_EQ(bytes_of(restored), bytes);
    EXPECT_EQ(restored.state(), original.state());
  }
}

TEST(AlertLifecycle, LoadKeepsConfiguredLatching) {
  const std::string bytes = bytes_of(make({S::unacknowledged}));
  AlertLifecycle restored(true);
  StateReader reader(bytes);
  ASSERT_TRUE(restored.load(reader));
  const auto change = restored.set_condition(false);
  ASSERT_TRUE(change);
  EXPECT_EQ(change->to, S::latched);
}

TEST(AlertLifecycle, DamagedStateIsRejectedAndChangesNothing) {
  const AlertLifecycle acknowledged = make({S::acknowledged});
  const std::string good = bytes_of(make({S::shelved, true}));

  std::string wrong_version = good;
  wrong_version[0] = 99;
  std::string truncated = good.substr(0, good.size() - 3);
  std::string unknown_state = bytes_of(acknowledged);
  unknown_state[1] = 42;
  // Acknowledged but the condition clear, with nothing hiding it: cannot happen.
  std::string inconsistent = bytes_of(acknowledged);
  inconsistent[2] = 0;

  for (const std::string& bad : {wrong_version, truncated, unknown_state, inconsistent}) {
    AlertLifecycle target = acknowledged;
    StateReader reader(bad);
    EXPECT_FALSE(target.load(reader));
    EXPECT_FALSE(reader.ok());
    EXPECT_EQ(bytes_of(target), bytes_of(acknowledged));
  }
}

}  // namespace
}  // namespace bw::engine
