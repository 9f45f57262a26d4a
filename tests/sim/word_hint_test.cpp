// The "did you mean" hints every reader of user input gives: the distance counts a swapped pair
// of letters as one slip, and short words allow fewer slips than long ones.

#include "sim/word_hint.h"

#include <gtest/gtest.h>

namespace {

TEST(word_hint_test, counts_inserts_deletes_replacements_and_swaps_as_one_slip_each) {
    EXPECT_EQ(sim::edit_distance("run", "run"), 0u);
    EXPECT_EQ(sim::edit_distance("rnu", "run"), 1u);  // n and u swapped
    EXPECT_EQ(sim::edit_distance("duraton", "duration"), 1u);
    EXPECT_EQ(sim::edit_distance("frequency", "frequnecy"), 1u);
    EXPECT_EQ(sim::edit_distance("", "plan"), 4u);
    EXPECT_EQ(sim::edit_distance("pll", "pin"), 2u);
    EXPECT_EQ(sim::edit_distance("kitten", "sitting"), 3u);
}

TEST(word_hint_test, names_the_closest_candidate_within_the_slips_a_word_of_its_length_allows) {
    const std::vector<std::string> commands = {"run", "sweep", "merge", "check", "clocks", "plan"};
    EXPECT_EQ(sim::hint("rnu", commands), " (did you mean \"run\"?)");
    EXPECT_EQ(sim::hint("clock", commands), " (did you mean \"clocks\"?)");
    EXPECT_EQ(sim::hint("swep", commands), " (did you mean \"sweep\"?)");
    EXPECT_EQ(sim::hint("simulate", commands), "");
    EXPECT_EQ(sim::hint("pll", {"pin"}), "");  // two slips on a short word is another word
    EXPECT_EQ(sim::join({"a", "b", "c"}), "a, b, c");
}

}  // namespace
