// Sparkplug B sessions, checked with payloads built by the protobuf library's own encoder from the
// schema (daemon/io/mqtt/sparkplug.h, sparkplug_b.proto).
#include "io/mqtt/sparkplug.h"

#include <gtest/gtest.h>

#include <chrono>
#include <cmath>
#include <cstdint>
#include <string>

#include "io/mqtt/sparkplug_b.pb.h"

namespace bw::io::mqtt {
namespace {

namespace pb = sparkplug;
using engine::Quality;

constexpr std::uint64_t kBirthMs = 1'772'344'800'000;  // 2026-03-01T06:00:00Z
const core::SensorTime kReceived{std::chrono::milliseconds(kBirthMs + 5000)};

core::SensorTime at_ms(std::uint64_t ms) {
  return core::SensorTime(std::chrono::milliseconds(static_cast<std::int64_t>(ms)));
}

pb::Payload::Metric* add_metric(pb::Payload& p, const char* name, std::uint64_t alias,
                                pb::DataType type) {
  auto* m = p.add_metrics();
  if (name != nullptr) m->set_name(name);
  m->set_alias(alias);
  m->set_datatype(type);
  return m;
}

pb::Payload::Metric* add_alias(pb::Payload& p, std::uint64_t alias) {
  auto* m = p.add_metrics();
  m->set_alias(alias);
  return m;
}

// NBIRTH of node SWD4 (Eclipse Sparkplug specification: seq 0, a bdSeq metric and
// "Node Control/Rebirth" false) with a tank level (alias 1) and a pump current (alias 2).
std::string node_birth(std::uint64_t bd_seq = 0) {
  pb::Payload p;
  p.set_timestamp(kBirthMs);
  p.set_seq(0);
  add_metric(p, "bdSeq", 100, pb::Int64)->set_long_value(bd_seq);
  add_metric(p, "Node Control/Rebirth", 101, pb::Boolean)->set_boolean_value(false);
  add_metric(p, "TK1/LEVEL", 1, pb::Double)->set_double_value(12.5);
  add_metric(p, "P1/AMPS", 2, pb::Float)->set_float_value(41.5F);
  add_metric(p, "Firmware", 3, pb::String)->set_string_value("2.4.1");
  return p.SerializeAsString();
}

// NDATA with the tank level by alias only.
std::string level_data(std::uint64_t seq, double level) {
  pb::Payload p;
  p.set_timestamp(kBirthMs + 1000);
  p.set_seq(seq);
  add_alias(p, 1)->set_double_value(level);
  return p.SerializeAsString();
}

std::string device_birth(std::uint64_t seq) {
  pb::Payload p;
  p.set_timestamp(kBirthMs);
  p.set_seq(seq);
  add_metric(p, "DISCHARGE_PSI", 10, pb::Double)->set_double_value(1450.0);
  add_metric(p, "RUNNING", 11, pb::Boolean)->set_boolean_value(true);
  return p.SerializeAsString();
}

std::string death(std::uint64_t bd_seq) {
  pb::Payload p;
  add_metric(p, "bdSeq", 100, pb::Int64)->set_long_value(bd_seq);
  return p.SerializeAsString();
}

constexpr const char* kNbirth = "spBv1.0/DryCreek/NBIRTH/SWD4";
constexpr const char* kNdata = "spBv1.0/DryCreek/NDATA/SWD4";
constexpr const char* kNdeath = "spBv1.0/DryCreek/NDEATH/SWD4";
constexpr const char* kDbirth = "spBv1.0/DryCreek/DBIRTH/SWD4/P1";
constexpr const char* kDdata = "spBv1.0/DryCreek/DDATA/SWD4/P1";
constexpr const char* kDdeath = "spBv1.0/DryCreek/DDEATH/SWD4/P1";
const SparkplugNodeId kSwd4{"DryCreek", "SWD4"};

TEST(SparkplugTopic, ParsesNodeDeviceAndStateTopics) {
  // Eclipse Sparkplug specification: spBv1.0/{group}/{type}/{node}[/{device}], STATE/{host}.
  EXPECT_EQ(parse_sparkplug_topic(kNbirth), (SparkplugTopic{"DryCreek", "NBIRTH", "SWD4", ""}));
  EXPECT_EQ(parse_sparkplug_topic(kDdata), (SparkplugTopic{"DryCreek", "DDATA", "SWD4", "P1"}));
  EXPECT_EQ(parse_sparkplug_topic("spBv1.0/STATE/host1"),
            (SparkplugTopic{"", "STATE", "host1", ""}));
  EXPECT_EQ(parse_sparkplug_topic("spBv1.0/DryCreek/NDATA/SWD4/P1"), std::nullopt);
  EXPECT_EQ(parse_sparkplug_topic("spBv1.0/DryCreek/DDATA/SWD4"), std::nullopt);
  EXPECT_EQ(parse_sparkplug_topic("spBv1.0/DryCreek/NDATA/+"), std::nullopt);
  EXPECT_EQ(parse_sparkplug_topic("spBv1.0/DryCreek/NDATA/#"), std::nullopt);
  EXPECT_EQ(parse_sparkplug_topic("spBv1.0//NDATA/SWD4"), std::nullopt);
  EXPECT_EQ(parse_sparkplug_topic("spBv1.0/DryCreek/NDATA/SWD4/"), std::nullopt);
  EXPECT_EQ(parse_sparkplug_topic("spBv1.0/DryCreek/NDATUM/SWD4"), std::nullopt);
  EXPECT_EQ(parse_sparkplug_topic("spAv1.0/DryCreek/NDATA/SWD4"), std::nullopt);
  EXPECT_EQ(parse_sparkplug_topic("spBv1.0/DryCreek/DDATA/SWD4/P1/extra"), std::nullopt);
  EXPECT_EQ(topic_for_rebirth("DryCreek", "SWD4"), "spBv1.0/DryCreek/NCMD/SWD4");
}

TEST(SparkplugSession, BirthValuesBecomeSamplesAndDataByAliasFollows) {
  SparkplugSession session;
  const auto birth = session.on_message(kNbirth, node_birth(), kReceived);
  // bdSeq and Node Control/* are housekeeping and the firmware text is not a number.
  ASSERT_EQ(birth.samples.size(), 2u);
  EXPECT_EQ(birth.samples[0].tag, "DryCreek/SWD4/TK1/LEVEL");
  EXPECT_DOUBLE_EQ(birth.samples[0].value, 12.5);
  EXPECT_EQ(birth.samples[0].time, at_ms(kBirthMs));
  EXPECT_EQ(birth.samples[1].tag, "DryCreek/SWD4/P1/AMPS");
  EXPECT_DOUBLE_EQ(birth.samples[1].value, 41.5);
  EXPECT_EQ(birth.rejected.total, 0u);
  EXPECT_TRUE(birth.rebirth_requests.empty());

  const auto data = session.on_message(kNdata, level_data(1, 12.75), kReceived);
  ASSERT_EQ(data.samples.size(), 1u);
  EXPECT_EQ(data.samples[0].tag, "DryCreek/SWD4/TK1/LEVEL");
  EXPECT_DOUBLE_EQ(data.samples[0].value, 12.75);
  EXPECT_EQ(data.samples[0].time, at_ms(kBirthMs + 1000));
  EXPECT_EQ(data.samples[0].quality, Quality::good);
  EXPECT_EQ(data.rejected.total, 0u);
}

TEST(SparkplugSession, DataByNameWorksToo) {
  SparkplugSession session;
  (void)session.on_message(kNbirth, node_birth(), kReceived);
  pb::Payload p;
  p.set_seq(1);
  p.add_metrics()->set_name("P1/AMPS");
  p.mutable_metrics(0)->set_float_value(43.0F);
  const auto data = session.on_message(kNdata, p.SerializeAsString(), kReceived);
  ASSERT_EQ(data.samples.size(), 1u);
  EXPECT_EQ(data.samples[0].tag, "DryCreek/SWD4/P1/AMPS");
  EXPECT_DOUBLE_EQ(data.samples[0].value, 43.0);
}

TEST(SparkplugSession, MetricTimeFallsBackToPayloadThenReceiveTime) {
  SparkplugSession session;
  (void)session.on_message(kNbirth, node_birth(), kReceived);
  pb::Payload p;
  p.set_seq(1);
  add_alias(p, 1)->set_double_value(1.0);
  const auto no_times = session.on_message(kNdata, p.SerializeAsString(), kReceived);
  ASSERT_EQ(no_times.samples.size(), 1u);
  EXPECT_EQ(no_times.samples[0].time, kReceived);
  p.set_seq(2);
  p.mutable_metrics(0)->set_timestamp(kBirthMs + 2500);
  p.set_timestamp(kBirthMs + 3000);
  const auto own_time = session.on_message(kNdata, p.SerializeAsString(), kReceived);
  ASSERT_EQ(own_time.samples.size(), 1u);
  EXPECT_EQ(own_time.samples[0].time, at_ms(kBirthMs + 2500));
}

TEST(SparkplugSession, NumericDatatypesDecodeFromTheirWireFields) {
  // Eclipse Sparkplug specification (from memory): signed integers travel as two's complement
  // in the unsigned int_value (Int8-Int32) and long_value (Int64) fields.
  pb::Payload p;
  p.set_timestamp(kBirthMs);
  p.set_seq(0);
  add_metric(p, "I8", 1, pb::Int8)->set_int_value(0xFFFFFFFFu);
  add_metric(p, "I16", 2, pb::Int16)->set_int_value(0xFFFEu);
  add_metric(p, "I32", 3, pb::Int32)->set_int_value(0xFFFFFFFDu);
  add_metric(p, "I64", 4, pb::Int64)->set_long_value(static_cast<std::uint64_t>(-4LL));
  add_metric(p, "U8", 5, pb::UInt8)->set_int_value(250);
  add_metric(p, "U32", 6, pb::UInt32)->set_int_value(4'000'000'000u);
  add_metric(p, "U64", 7, pb::UInt64)->set_long_value(1ULL << 40);
  add_metric(p, "B", 8, pb::Boolean)->set_boolean_value(true);
  SparkplugSession session("{metric}");
  const auto birth = session.on_message(kNbirth, p.SerializeAsString(), kReceived);
  ASSERT_EQ(birth.samples.size(), 8u);
  const double expected[] = {-1, -2, -3, -4, 250, 4e9, 1099511627776.0, 1};
  for (std::size_t i = 0; i < 8; ++i) {
    EXPECT_DOUBLE_EQ(birth.samples[i].value, expected[i]) << birth.samples[i].tag;
  }
}

TEST(SparkplugSession, NullAndTextAreSkippedButMissingAndNanValuesAreCounted) {
  SparkplugSession session;
  (void)session.on_message(kNbirth, node_birth(), kReceived);
  pb::Payload p;
  p.set_seq(1);
  add_alias(p, 1)->set_is_null(true);                                           // skipped
  add_alias(p, 3)->set_string_value("2.4.2");                                   // text: skipped
  add_alias(p, 2);                                                              // no value: counted
  add_alias(p, 1)->set_double_value(std::numeric_limits<double>::quiet_NaN());  // counted
  const auto data = session.on_message(kNdata, p.SerializeAsString(), kReceived);
  EXPECT_TRUE(data.samples.empty());
  EXPECT_EQ(data.rejected.count(Rejection::not_a_number), 1u);
  EXPECT_EQ(data.rejected.count(Rejection::not_finite), 1u);
  EXPECT_EQ(data.rejected.total, 2u);
  EXPECT_TRUE(data.rebirth_requests.empty());
}

TEST(SparkplugSession, SeqGapGivesOneRebirthRequestUntilTheNextBirth) {
  // Eclipse Sparkplug specification: each message after NBIRTH carries seq + 1; on a gap the
  // host asks the node to rebirth.
  SparkplugSession session;
  (void)session.on_message(kNbirth, node_birth(), kReceived);
  EXPECT_EQ(session.on_message(kNdata, level_data(1, 1.0), kReceived).samples.size(), 1u);
  const auto gap = session.on_message(kNdata, level_data(3, 3.0), kReceived);
  EXPECT_TRUE(gap.samples.empty());
  EXPECT_EQ(gap.rejected.count(Rejection::out_of_sequence), 1u);
  ASSERT_EQ(gap.rebirth_requests.size(), 1u);
  EXPECT_EQ(gap.rebirth_requests[0], kSwd4);
  const auto after = session.on_message(kNdata, level_data(4, 4.0), kReceived);
  EXPECT_TRUE(after.samples.empty());
  EXPECT_EQ(after.rejected.count(Rejection::out_of_sequence), 1u);
  EXPECT_TRUE(after.rebirth_requests.empty());  // once per gap, not per message

  EXPECT_EQ(session.on_message(kNbirth, node_birth(1), kReceived).samples.size(), 2u);
  const auto resumed = session.on_message(kNdata, level_data(1, 5.0), kReceived);
  ASSERT_EQ(resumed.samples.size(), 1u);
  EXPECT_DOUBLE_EQ(resumed.samples[0].value, 5.0);
}

TEST(SparkplugSession, SeqWrapFrom255To0IsNotAGap) {
  // Eclipse Sparkplug specification: seq counts 0-255 and wraps to 0.
  SparkplugSession session;
  (void)session.on_message(kNbirth, node_birth(), kReceived);
  std::size_t samples = 0;
  for (std::uint64_t n = 1; n <= 300; ++n) {
    const auto data = session.on_message(kNdata, level_data(n % 256, 1.0), kReceived);
    EXPECT_EQ(data.rejected.total, 0u) << "seq " << n % 256;
    EXPECT_TRUE(data.rebirth_requests.empty());
    samples += data.samples.size();
  }
  EXPECT_EQ(samples, 300u);
  EXPECT_EQ(session.on_message(kNdata, level_data(300 % 256, 1.0), kReceived)
                .rejected.count(Rejection::out_of_sequence),
            1u);  // a repeated seq is a gap too
}

TEST(SparkplugSession, DataBeforeAnyBirthAsksForRebirthOnce) {
  SparkplugSession session;
  const auto first = session.on_message(kNdata, level_data(1, 1.0), kReceived);
  EXPECT_TRUE(first.samples.empty());
  EXPECT_EQ(first.rejected.count(Rejection::not_born), 1u);
  ASSERT_EQ(first.rebirth_requests.size(), 1u);
  EXPECT_EQ(first.rebirth_requests[0], kSwd4);
  const auto second = session.on_message(kNdata, level_data(2, 1.0), kReceived);
  EXPECT_EQ(second.rejected.count(Rejection::not_born), 1u);
  EXPECT_TRUE(second.rebirth_requests.empty());
}

TEST(SparkplugSession, UnknownAliasAsksForRebirthAndKeepsKnownMetrics) {
  SparkplugSession session;
  (void)session.on_message(kNbirth, node_birth(), kReceived);
  pb::Payload p;
  p.set_seq(1);
  add_alias(p, 77)->set_double_value(9.0);
  add_alias(p, 1)->set_double_value(13.0);
  const auto data = session.on_message(kNdata, p.SerializeAsString(), kReceived);
  ASSERT_EQ(data.samples.size(), 1u);
  EXPECT_DOUBLE_EQ(data.samples[0].value, 13.0);
  EXPECT_EQ(data.rejected.count(Rejection::unknown_metric), 1u);
  EXPECT_EQ(data.rebirth_requests.size(), 1u);
}

TEST(SparkplugSession, NodeDeathMarksEveryTagOfNodeAndDevicesBad) {
  SparkplugSession session;
  (void)session.on_message(kNbirth, node_birth(5), kReceived);
  ASSERT_EQ(session.on_message(kDbirth, device_birth(1), kReceived).samples.size(), 2u);
  const core::SensorTime death_received = kReceived + std::chrono::seconds(30);
  const auto dead = session.on_message(kNdeath, death(5), death_received);
  ASSERT_EQ(dead.samples.size(), 4u);
  EXPECT_EQ(dead.samples[0].tag, "DryCreek/SWD4/TK1/LEVEL");
  EXPECT_EQ(dead.samples[1].tag, "DryCreek/SWD4/P1/AMPS");
  EXPECT_EQ(dead.samples[2].tag, "DryCreek/SWD4/P1/DISCHARGE_PSI");
  EXPECT_EQ(dead.samples[3].tag, "DryCreek/SWD4/P1/RUNNING");
  for (const auto& s : dead.samples) {
    EXPECT_EQ(s.quality, Quality::bad);
    EXPECT_TRUE(std::isnan(s.value));
    EXPECT_EQ(s.time, death_received);
  }
  // Dead until born again: data asks for a rebirth.
  const auto late = session.on_message(kNdata, level_data(2, 1.0), death_received);
  EXPECT_EQ(late.rejected.count(Rejection::not_born), 1u);
  EXPECT_EQ(late.rebirth_requests.size(), 1u);
}

TEST(SparkplugSession, DeathWithAnotherBdSeqIsALateWillAndIgnored) {
  // Eclipse Sparkplug specification: an NDEATH applies only to the session whose NBIRTH carried
  // the same bdSeq.
  SparkplugSession session;
  (void)session.on_message(kNbirth, node_birth(6), kReceived);
  const auto stale = session.on_message(kNdeath, death(5), kReceived);
  EXPECT_TRUE(stale.samples.empty());
  EXPECT_EQ(session.on_message(kNdata, level_data(1, 2.0), kReceived).samples.size(), 1u);
}

TEST(SparkplugSession, DeviceBirthDataAndDeath) {
  SparkplugSession session;
  (void)session.on_message(kNbirth, node_birth(), kReceived);
  const auto birth = session.on_message(kDbirth, device_birth(1), kReceived);
  ASSERT_EQ(birth.samples.size(), 2u);
  EXPECT_EQ(birth.samples[0].tag, "DryCreek/SWD4/P1/DISCHARGE_PSI");
  EXPECT_DOUBLE_EQ(birth.samples[1].value, 1.0);

  pb::Payload data;
  data.set_seq(2);
  add_alias(data, 10)->set_double_value(1462.5);
  const auto ddata = session.on_message(kDdata, data.SerializeAsString(), kReceived);
  ASSERT_EQ(ddata.samples.size(), 1u);
  EXPECT_EQ(ddata.samples[0].tag, "DryCreek/SWD4/P1/DISCHARGE_PSI");
  EXPECT_DOUBLE_EQ(ddata.samples[0].value, 1462.5);

  pb::Payload ddeath;
  ddeath.set_seq(3);
  ddeath.set_timestamp(kBirthMs + 4000);
  const auto dead = session.on_message(kDdeath, ddeath.SerializeAsString(), kReceived);
  ASSERT_EQ(dead.samples.size(), 2u);
  EXPECT_EQ(dead.samples[0].tag, "DryCreek/SWD4/P1/DISCHARGE_PSI");
  EXPECT_EQ(dead.samples[1].tag, "DryCreek/SWD4/P1/RUNNING");
  EXPECT_EQ(dead.samples[0].quality, Quality::bad);
  EXPECT_EQ(dead.samples[0].time, at_ms(kBirthMs + 4000));

  data.set_seq(4);
  const auto orphan = session.on_message(kDdata, data.SerializeAsString(), kReceived);
  EXPECT_TRUE(orphan.samples.empty());
  EXPECT_EQ(orphan.rejected.count(Rejection::not_born), 1u);
  EXPECT_EQ(orphan.rebirth_requests.size(), 1u);
  // The node itself is still in sequence and alive.
  EXPECT_EQ(session.on_message(kNdata, level_data(5, 2.0), kReceived).samples.size(), 1u);
}

TEST(SparkplugSession, DeviceAliasMeansNothingAtNodeLevel) {
  SparkplugSession session;
  (void)session.on_message(kNbirth, node_birth(), kReceived);
  (void)session.on_message(kDbirth, device_birth(1), kReceived);
  pb::Payload node_data;
  node_data.set_seq(2);
  add_alias(node_data, 10)->set_double_value(1.0);
  const auto data = session.on_message(kNdata, node_data.SerializeAsString(), kReceived);
  EXPECT_TRUE(data.samples.empty());
  EXPECT_EQ(data.rejected.count(Rejection::unknown_metric), 1u);
}

TEST(SparkplugSession, TemplateWithoutDeviceSeparatorsAndOtherGroups) {
  SparkplugSession session("{node}.{device}.{metric}");
  EXPECT_EQ(session.on_message(kNbirth, node_birth(), kReceived).samples.at(0).tag,
            "SWD4.TK1/LEVEL");
  EXPECT_EQ(session.on_message(kDbirth, device_birth(1), kReceived).samples.at(0).tag,
            "SWD4.P1.DISCHARGE_PSI");
  // Another group's node of the same name has a session of its own.
  EXPECT_EQ(session.on_message("spBv1.0/Other/NDATA/SWD4", level_data(2, 1.0), kReceived)
                .rejected.count(Rejection::not_born),
            1u);
}

TEST(SparkplugSession, GarbageCommandsAndForeignTopics) {
  SparkplugSession session;
  EXPECT_EQ(
      session.on_message(kNbirth, "\xff\xff\xff", kReceived).rejected.count(Rejection::unparsable),
      1u);
  EXPECT_EQ(session.on_message("tumbleweed/drycreek4/TK1", node_birth(), kReceived)
                .rejected.count(Rejection::unparsable),
            1u);
  const auto command = session.on_message("spBv1.0/DryCreek/NCMD/SWD4",
                                          encode_rebirth_request(kReceived), kReceived);
  EXPECT_TRUE(command.samples.empty());
  EXPECT_EQ(command.rejected.total, 0u);
  SparkplugSession small("{metric}", DecodeLimits{.max_payload_bytes = 8});
  EXPECT_EQ(small.on_message(kNbirth, node_birth(), kReceived).rejected.count(Rejection::too_large),
            1u);
}

TEST(SparkplugSession, TimesOutsideTheWindowAreCounted) {
  SparkplugSession session;
  (void)session.on_message(kNbirth, node_birth(), kReceived);
  pb::Payload p;
  p.set_seq(1);
  add_alias(p, 1)->set_double_value(1.0);
  p.mutable_metrics(0)->set_timestamp(kBirthMs + 3'600'000);  // an hour ahead
  add_alias(p, 2)->set_float_value(1.0F);
  p.mutable_metrics(1)->set_timestamp(~0ULL);  // no calendar holds it
  const auto data = session.on_message(kNdata, p.SerializeAsString(), kReceived);
  EXPECT_TRUE(data.samples.empty());
  EXPECT_EQ(data.rejected.count(Rejection::too_far_in_future), 1u);
  EXPECT_EQ(data.rejected.count(Rejection::bad_time), 1u);
}

TEST(SparkplugRebirth, RequestDecodesToNodeControlRebirthTrue) {
  // Eclipse Sparkplug specification: a rebirth request is an NCMD with the Boolean metric
  // "Node Control/Rebirth" = true. Decoded here by the protobuf library itself.
  const core::SensorTime now = at_ms(kBirthMs + 123);
  pb::Payload p;
  ASSERT_TRUE(p.ParseFromString(encode_rebirth_request(now)));
  EXPECT_EQ(p.timestamp(), kBirthMs + 123);
  ASSERT_EQ(p.metrics_size(), 1);
  EXPECT_EQ(p.metrics(0).name(), "Node Control/Rebirth");
  EXPECT_EQ(p.metrics(0).datatype(), 11u);
  EXPECT_EQ(p.metrics(0).value_case(), pb::Payload::Metric::kBooleanValue);
  EXPECT_TRUE(p.metrics(0).boolean_value());
  EXPECT_EQ(p.metrics(0).timestamp(), kBirthMs + 123);
}

TEST(SparkplugTemplateCheck, NeedsMetricAndKnownNames) {
  EXPECT_TRUE(check_sparkplug_tag_template("{group}/{node}/{device}/{metric}").ok());
  EXPECT_FALSE(check_sparkplug_tag_template("{group}/{node}").ok());
  EXPECT_FALSE(check_sparkplug_tag_template("{site}/{metric}").ok());
  EXPECT_FALSE(check_sparkplug_tag_template("{metric").ok());
}

}  // namespace
}  // namespace bw::io::mqtt
