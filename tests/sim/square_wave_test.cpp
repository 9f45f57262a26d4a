#include "sim/stimulus/square_wave.h"

#include "tests/support/edge_list.h"

#include <gtest/gtest.h>

namespace {

using sim::stimulus::edge;
using sim::stimulus::square_settings;
using sim::stimulus::square_wave;
using tickbench_test::edges_until;

constexpr sim::time_ps us = 1'000'000;

square_settings khz(std::uint64_t hz = 1000) {
    square_settings s;
    s.freq = sim::frequency::hz(hz);
    return s;
}

TEST(square_wave_test, starts_high_at_its_start_and_toggles_every_half_period) {
    square_settings s = khz();
    s.duty_ppb = 250'000'000;  // 25 %: high 250 us of every 1 ms
    square_wave w(s);
    EXPECT_FALSE(w.initial_level());
    const std::vector<edge> want = {
        {0, true}, {250 * us, false}, {1000 * us, true}, {1250 * us, false}, {2000 * us, true}};
    EXPECT_EQ(edges_until(w, 2000 * us), want);
}

TEST(square_wave_test, a_fractional_period_is_rounded_per_edge_never_accumulated) {
    // 3 Hz: a period of 10^12 / 3 ps. Hand-worked: rising edge 1 at 333333333333.33 ps rounds down,
    // rising edge 2 at 666666666666.67 ps up; falling edge 0 at 166666666666.67 ps up.
    square_wave w(khz(3));
    const auto e = edges_until(w, 700'000'000'000);
    ASSERT_EQ(e.size(), 5u);
    EXPECT_EQ(e[1], (edge{166'666'666'667, false}));
    EXPECT_EQ(e[2], (edge{333'333'333'333, true}));
    EXPECT_EQ(e[4], (edge{666'666'666'667, true}));
    // Rising edge 3 million is exactly 10^18 ps: no drift after a million periods.
    const auto far = w.next_edge(1'000'000'000'000'000'000 - 1);
    ASSERT_TRUE(far);
    EXPECT_EQ(far->at, 1'000'000'000'000'000'000u);
}

TEST(square_wave_test, an_angle_phase_delays_the_rising_edges) {
    square_settings s = khz();
    s.phase_udeg = 90'000'000;  // a quarter period: rising at 250 us, falling at 750 us
    square_wave quarter(s);
    const std::vector<edge> want = {{250 * us, true}, {750 * us, false}, {1250 * us, true}};
    EXPECT_EQ(edges_until(quarter, 1250 * us), want);
    // At 270 deg the wave is high at its start (it rose at -250 us): an edge at the start.
    s.phase_udeg = 270'000'000;
    square_wave late(s);
    const std::vector<edge> want_late = {{0, true}, {250 * us, false}, {750 * us, true}};
    EXPECT_EQ(edges_until(late, 750 * us), want_late);
}

TEST(square_wave_test, a_time_phase_and_a_start_shift_the_wave) {
    square_settings s = khz();
    s.start = 100 * us;
    s.phase_ps = 50 * us;
    square_wave w(s);
    const std::vector<edge> want = {{150 * us, true}, {650 * us, false}, {1150 * us, true}};
    EXPECT_EQ(edges_until(w, 1150 * us), want);
}

TEST(square_wave_test, a_ppm_offset_changes_the_period_exactly) {
    // 1 kHz + 1000 ppm = 1001 Hz: rising edge 1 at 10^12 / 1001 = 999000999.0009 ps.
    square_settings s = khz();
    s.offset_ppb = 1'000'000;
    square_wave w(s);
    EXPECT_EQ(w.next_edge(1)->at, 499'500'500u);  // 499500499.5005 rounds up
    EXPECT_EQ(w.next_edge(499'500'501)->at, 999'000'999u);
}

TEST(square_wave_test, stops_at_its_idle_level) {
    square_settings s = khz();
    s.stop = 1200 * us;
    square_wave w(s);
    const std::vector<edge> want = {
        {0, true}, {500 * us, false}, {1000 * us, true}, {1200 * us, false}};
    EXPECT_EQ(edges_until(w, 10'000 * us), want);
    // Stopping while low needs no edge; an idle-high wave falls at its start and rises at its
    // stop.
    s.stop = 1700 * us;
    square_wave low_at_stop(s);
    EXPECT_EQ(edges_until(low_at_stop, 10'000 * us).back(), (edge{1500 * us, false}));
    s.idle_level = true;
    s.start = 200 * us;
    s.phase_udeg = 180'000'000;
    square_wave idle_high(s);
    EXPECT_TRUE(idle_high.initial_level());
    const std::vector<edge> want_high = {
        {200 * us, false}, {700 * us, true}, {1200 * us, false}, {1700 * us, true}};
    EXPECT_EQ(edges_until(idle_high, 10'000 * us), want_high);
}

TEST(square_wave_test, jitter_is_bounded_and_reproducible_from_the_seed) {
    square_settings s = khz();
    s.jitter = 1000;
    s.seed = 42;
    square_wave a(s), b(s);
    // Edge i is nominally at i x 500 us (edge 0 at the start, then displaced like the others).
    const sim::time_ps until = 20'000 * us + 1000;
    const auto ea = edges_until(a, until);
    EXPECT_EQ(ea, edges_until(b, until));
    ASSERT_EQ(ea.size(), 41u);
    bool moved = false;
    for (std::size_t i = 0; i < ea.size(); ++i) {
        const sim::time_ps nominal = i * 500 * us;
        EXPECT_GE(ea[i].at, nominal);
        EXPECT_LE(ea[i].at, nominal + 1000);
        moved = moved || ea[i].at != nominal;
    }
    EXPECT_TRUE(moved);
    s.seed = 43;
    square_wave c(s);
    EXPECT_NE(edges_until(c, until), ea);
}

TEST(square_wave_test, refuses_settings_it_cannot_honour) {
    square_settings s = khz();
    s.duty_ppb = 0;
    EXPECT_THROW(square_wave{s}, std::invalid_argument);
    s = khz();
    s.stop = 0;
    EXPECT_THROW(square_wave{s}, std::invalid_argument);
    s = khz();
    s.jitter = 500 * us;  // as long as the high time
    EXPECT_THROW(square_wave{s}, std::invalid_argument);
    EXPECT_FALSE(sim::stimulus::square_problems(khz()).size());
}

}  // namespace
