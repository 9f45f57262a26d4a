#include "sim/stimulus/pulse_list.h"
#include "sim/stimulus/glitch_overlay.h"

#include "tests/support/edge_list.h"

#include <gtest/gtest.h>

namespace {

using sim::stimulus::edge;
using sim::stimulus::edges_from_points;
using sim::stimulus::glitch_overlay;
using sim::stimulus::glitch_settings;
using sim::stimulus::pulse_list;
using tickbench_test::edges_until;

constexpr sim::time_ps us = 1'000'000;

TEST(pulse_list_test, times_toggle_and_levels_set) {
    const auto toggles = edges_from_points({{10 * us, {}}, {12 * us, {}}, {30 * us, {}}}, false);
    const std::vector<edge> want = {{10 * us, true}, {12 * us, false}, {30 * us, true}};
    EXPECT_EQ(toggles, want);
    // A point that repeats the level is no edge.
    const auto set = edges_from_points({{5 * us, true}, {6 * us, true}, {8 * us, false}}, true);
    const std::vector<edge> want_set = {{8 * us, false}};
    EXPECT_EQ(set, want_set);
    EXPECT_THROW(edges_from_points({{5 * us, {}}, {5 * us, {}}}, false), std::invalid_argument);
}

TEST(pulse_list_test, answers_from_any_later_time) {
    pulse_list p(edges_from_points({{10 * us, {}}, {12 * us, {}}, {30 * us, {}}}, false), false);
    EXPECT_EQ(p.next_edge(0), (edge{10 * us, true}));
    EXPECT_EQ(p.next_edge(10 * us), (edge{10 * us, true}));
    EXPECT_EQ(p.next_edge(11 * us), (edge{12 * us, false}));
    EXPECT_EQ(p.next_edge(31 * us), std::nullopt);
}

std::unique_ptr<pulse_list> low_then_high_at(sim::time_ps t) {
    return std::make_unique<pulse_list>(std::vector<edge>{{t, true}}, false);
}

TEST(glitch_overlay_test, a_glitch_inverts_the_level_for_its_width) {
    glitch_settings g;
    g.width = 100'000;  // 100 ns
    g.at = {1000 * us, 3000 * us};
    glitch_overlay o(low_then_high_at(2000 * us), g);
    // On the low line a short high pulse, on the high line a short low one.
    const std::vector<edge> want = {{1000 * us, true},
                                    {1000 * us + 100'000, false},
                                    {2000 * us, true},
                                    {3000 * us, false},
                                    {3000 * us + 100'000, true}};
    EXPECT_EQ(edges_until(o, 10'000 * us), want);
}

TEST(glitch_overlay_test,
     a_base_edge_inside_a_glitch_shows_at_its_end_and_coinciding_edges_cancel) {
    glitch_settings g;
    g.width = 100'000;
    g.at = {1000 * us};
    glitch_overlay inside(low_then_high_at(1000 * us + 50'000), g);
    const std::vector<edge> want = {
        {1000 * us, true}, {1000 * us + 50'000, false}, {1000 * us + 100'000, true}};
    EXPECT_EQ(edges_until(inside, 10'000 * us), want);
    // The base rises exactly where the glitch begins: the two cancel, the line stays low for the
    // glitch and rises at its end.
    glitch_overlay same(low_then_high_at(1000 * us), g);
    const std::vector<edge> want_same = {{1000 * us + 100'000, true}};
    EXPECT_EQ(edges_until(same, 10'000 * us), want_same);
}

TEST(glitch_overlay_test, random_glitches_repeat_with_their_seed_and_keep_their_mean_rate) {
    glitch_settings g;
    g.width = 50'000;
    g.rate = sim::frequency::hz(10'000);  // one every 100 us on average
    g.seed = 5;
    g.stop = 100'000 * us;  // 100 ms: about 1000 glitches
    const auto run = [&g](std::uint64_t seed) {
        glitch_settings s = g;
        s.seed = seed;
        glitch_overlay o(std::make_unique<pulse_list>(std::vector<edge>{}, false), s);
        return edges_until(o, 200'000 * us);
    };
    const auto a = run(5);
    EXPECT_EQ(a, run(5));
    EXPECT_NE(a, run(6));
    ASSERT_EQ(a.size() % 2, 0u);
    for (std::size_t i = 0; i < a.size(); i += 2) {
        EXPECT_TRUE(a[i].level);
        EXPECT_EQ(a[i + 1].at - a[i].at, 50'000u);
        if (i > 0) {
            EXPECT_GT(a[i].at - a[i - 2].at, 50'000u);
        }
    }
    // Uniform gaps with a mean of 100 us: 1000 +- a few percent glitches in 100 ms (the spread of
    // a sum of 1000 uniform gaps is under 2 % of it; common practice, no source).
    EXPECT_NEAR(static_cast<double>(a.size() / 2), 1000.0, 60.0);
    EXPECT_LT(a.back().at, 100'000 * us + 50'000);
}

TEST(glitch_overlay_test, refuses_overlapping_or_missing_glitches) {
    glitch_settings g;
    g.width = 100;
    g.at = {1000, 1050};
    EXPECT_FALSE(sim::stimulus::glitch_problems(g).empty());
    g.at.clear();
    EXPECT_FALSE(sim::stimulus::glitch_problems(g).empty());
    g.rate = sim::frequency::hz(20'000'000'000);  // a mean gap of 50 ps, under the width
    EXPECT_FALSE(sim::stimulus::glitch_problems(g).empty());
}

}  // namespace
