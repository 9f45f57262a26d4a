#include "sim/stimulus/quadrature_encoder.h"

#include "tests/support/edge_list.h"

#include <gtest/gtest.h>

namespace {

using sim::stimulus::edge;
using sim::stimulus::encoder_output;
using sim::stimulus::encoder_settings;
using sim::stimulus::quadrature_encoder;
using tickbench_test::edges_until;

constexpr sim::time_ps ms = 1'000'000'000;
constexpr sim::time_ps s1 = 1'000'000'000'000;

encoder_settings encoder(std::vector<sim::stimulus::speed_point> speed, std::uint32_t lines = 100) {
    encoder_settings e;
    e.lines = lines;
    e.speed = std::move(speed);
    return e;
}

TEST(quadrature_encoder_test, a_leads_b_a_quarter_line_apart_when_turning_forward) {
    // 100 lines at 60 rpm: one turn a second, 400 quarter lines, one every 2.5 ms.
    const auto e = encoder({{0, 60}});
    quadrature_encoder a(e, encoder_output::a), b(e, encoder_output::b);
    EXPECT_FALSE(a.initial_level());
    EXPECT_FALSE(b.initial_level());
    const std::vector<edge> want_a = {
        {2'500'000'000, true}, {7'500'000'000, false}, {12'500'000'000, true}};
    const std::vector<edge> want_b = {{5'000'000'000, true}, {10 * ms, false}, {15 * ms, true}};
    EXPECT_EQ(edges_until(a, 15 * ms), want_a);
    EXPECT_EQ(edges_until(b, 15 * ms), want_b);
}

TEST(quadrature_encoder_test, counts_four_times_the_lines_per_turn) {
    const auto e = encoder({{0, 60}}, 1024);
    quadrature_encoder a(e, encoder_output::a), b(e, encoder_output::b);
    EXPECT_EQ(a.count_at(s1), 4096);
    EXPECT_EQ(edges_until(a, s1).size() + edges_until(b, s1).size(), 4096u);
    // Backward at 120 rpm: two turns back in a second.
    const quadrature_encoder back(encoder({{0, -120}}, 1024), encoder_output::a);
    EXPECT_EQ(back.count_at(s1), -8192);
}

TEST(quadrature_encoder_test, a_ramp_is_integrated_exactly) {
    // From 0 to 60 rpm over a second: the shaft has turned t^2 / 2 turns after t seconds, so 200
    // t^2 quarter lines with 100 lines. Quarter line 2 is crossed at exactly 0.1 s; quarter line 1
    // at sqrt(0.005) s = 70710678118.6547... ps, the edge at the next whole picosecond.
    const auto e = encoder({{0, 0}, {s1, 60}});
    quadrature_encoder a(e, encoder_output::a), b(e, encoder_output::b);
    EXPECT_EQ(a.next_edge(0), (edge{70'710'678'119, true}));
    EXPECT_EQ(b.next_edge(0), (edge{100 * ms, true}));
    EXPECT_EQ(a.count_at(500 * ms), 50);
    EXPECT_EQ(a.count_at(500 * ms - 1), 49);
    EXPECT_EQ(a.count_at(s1), 200);
}

TEST(quadrature_encoder_test, reverses_through_zero_speed) {
    // 60 rpm down to -60 rpm over 2 s: forward half a turn (200 quarter lines) until 1 s, then
    // back; at 1.5 s it has come back 50; at 2 s it is home, then runs backward at 60 rpm.
    const auto e = encoder({{0, 60}, {2 * s1, -60}});
    const quadrature_encoder a(e, encoder_output::a);
    EXPECT_EQ(a.count_at(s1), 200);
    EXPECT_EQ(a.count_at(1500 * ms), 150);
    EXPECT_EQ(a.count_at(2 * s1), 0);
    EXPECT_EQ(a.count_at(3 * s1), -400);
    // Edges on each side of the turn mirror each other: the last forward quarter line crossed at
    // 1 s - d is crossed back at 1 s + d (the profile is symmetric about 1 s).
    quadrature_encoder a2(e, encoder_output::a), b2(e, encoder_output::b);
    auto all = edges_until(a2, 2 * s1);
    const auto bs = edges_until(b2, 2 * s1);
    all.insert(all.end(), bs.begin(), bs.end());
    std::sort(all.begin(), all.end(), [](const edge& x, const edge& y) { return x.at < y.at; });
    ASSERT_EQ(all.size(), 400u);
    // The top (quarter line 200) is reached exactly at 1 s and left one picosecond later.
    EXPECT_EQ(all[199].at, s1);
    EXPECT_EQ(all[200].at, s1 + 1);
    for (std::size_t i = 0; i < 199; ++i) EXPECT_EQ(all[i].at + all[399 - i].at, 2 * s1 + 1) << i;
}

TEST(quadrature_encoder_test, holds_the_first_speed_before_the_first_point) {
    const quadrature_encoder a(encoder({{s1, 60}, {2 * s1, 0}}), encoder_output::a);
    EXPECT_EQ(a.count_at(s1), 400);
    EXPECT_EQ(a.count_at(2 * s1), 600);
    EXPECT_EQ(a.count_at(5 * s1), 600);
}

TEST(quadrature_encoder_test, refuses_bad_profiles) {
    EXPECT_THROW(quadrature_encoder(encoder({}), encoder_output::a), std::invalid_argument);
    EXPECT_THROW(quadrature_encoder(encoder({{0, 60}}, 0), encoder_output::a),
                 std::invalid_argument);
    EXPECT_THROW(quadrature_encoder(encoder({{ms, 60}, {ms, 0}}), encoder_output::a),
                 std::invalid_argument);
    EXPECT_THROW(quadrature_encoder(encoder({{0, 2'000'000}}), encoder_output::a),
                 std::invalid_argument);
}

}  // namespace
