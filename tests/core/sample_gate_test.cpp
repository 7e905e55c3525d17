#include "core/sample_gate.h"

#include <gtest/gtest.h>

#include "test_random.h"

namespace bw::core {
namespace {

using test::at;

TEST(SampleGate, FirstSampleHasNoInterval) {
  SampleGate gate;
  const auto in = gate.admit(true, at(5));
  EXPECT_TRUE(in.accepted);
  EXPECT_TRUE(in.first);
  EXPECT_EQ(in.dt_s, 0.0);
  EXPECT_EQ(gate.accepted(), 1);
}

TEST(SampleGate, IntervalIsMeasuredFromLastAdmittedSample) {
  SampleGate gate;
  gate.admit(true, at(5));
  gate.admit(false, at(6));  // refused: does not move the clock
  const auto in = gate.admit(true, at(7.5));
  EXPECT_TRUE(in.accepted);
  EXPECT_FALSE(in.first);
  EXPECT_DOUBLE_EQ(in.dt_s, 2.5);
}

TEST(SampleGate, NonFiniteIsRefusedAndCounted) {
  SampleGate gate;
  EXPECT_FALSE(gate.admit(false, at(1)).accepted);
  EXPECT_EQ(gate.non_finite(), 1);
  EXPECT_EQ(gate.accepted(), 0);
  // The refused sample did not count as a first sample.
  EXPECT_TRUE(gate.admit(true, at(2)).first);
}

TEST(SampleGate, TimeGoingBackwardsIsRefusedAndCounted) {
  SampleGate gate;
  gate.admit(true, at(10));
  EXPECT_FALSE(gate.admit(true, at(9.999999)).accepted);
  EXPECT_EQ(gate.out_of_order(), 1);
  EXPECT_EQ(gate.last_time(), at(10));
}

TEST(SampleGate, SameTimeIsAdmittedWithZeroInterval) {
  SampleGate gate;
  gate.admit(true, at(10));
  const auto in = gate.admit(true, at(10));
  EXPECT_TRUE(in.accepted);
  EXPECT_EQ(in.dt_s, 0.0);
}

TEST(SampleGate, ResetMakesTheNextSampleFirst) {
  SampleGate gate;
  gate.admit(true, at(10));
  gate.reset();
  EXPECT_EQ(gate.accepted(), 0);
  EXPECT_TRUE(gate.admit(true, at(3)).first);
}

}  // namespace
}  // namespace bw::core
