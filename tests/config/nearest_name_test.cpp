#include "config/nearest_name.h"

#include <gtest/gtest.h>

namespace bw::config {
namespace {

// Distances below are worked by hand from the definition of the optimal string alignment
// distance (Levenshtein distance with adjacent transpositions), common practice.
TEST(EditDistance, CountsInsertionsDeletionsAndSubstitutions) {
  EXPECT_EQ(edit_distance("kitten", "sitting"), 3u);  // classic example: k->s, e->i, +g
  EXPECT_EQ(edit_distance("", "abc"), 3u);
  EXPECT_EQ(edit_distance("abc", ""), 3u);
  EXPECT_EQ(edit_distance("same", "same"), 0u);
}

TEST(EditDistance, CountsAnAdjacentTranspositionAsOneEdit) {
  EXPECT_EQ(edit_distance("tiem_constant", "time_constant"), 1u);
  EXPECT_EQ(edit_distance("ab", "ba"), 1u);
  // Restricted form: "ca" -> "abc" needs 3 edits (no substring edited twice), not 2.
  EXPECT_EQ(edit_distance("ca", "abc"), 3u);
}

TEST(NearestName, SuggestsTheClosestCandidate) {
  const std::vector<std::string_view> keys{"of", "time_constant", "kind"};
  EXPECT_EQ(nearest_name("time_constnt", keys), "time_constant");
  EXPECT_EQ(did_you_mean("time_constnt", keys), "; did you mean 'time_constant'?");
}

TEST(NearestName, SuggestsNothingWhenNothingIsClose) {
  const std::vector<std::string_view> keys{"of", "time_constant", "kind"};
  EXPECT_FALSE(nearest_name("gain", keys).has_value());
  EXPECT_EQ(did_you_mean("deadband", keys), "");
}

TEST(NearestName, IgnoresLetterCase) {
  const std::vector<std::string_view> zones{"America/Chicago", "America/Denver"};
  EXPECT_EQ(nearest_name("america/chicago", zones), "America/Chicago");
}

TEST(NearestName, ShortWordsAllowOnlyOneEdit) {
  const std::vector<std::string_view> keys{"max"};
  EXPECT_EQ(nearest_name("mx", keys), "max");
  EXPECT_FALSE(nearest_name("m", keys).has_value());  // 2 edits from a 1-letter word
}

}  // namespace
}  // namespace bw::config
