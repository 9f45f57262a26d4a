#include "sim/clock_domain.h"

#include <gtest/gtest.h>

#include <cstdint>

namespace {

constexpr sim::time_ps second = sim::ps_per_second;

TEST(clock_domain_test, edge_one_billion_of_48mhz_is_exact) {
    // 10^9 edges of 48 MHz: 10^9 / 48e6 s = 20.833333333333... s, rounded to the picosecond.
    const sim::clock_domain d(sim::frequency::hz(48'000'000));
    EXPECT_EQ(d.time_of(1'000'000'000), 20'833'333'333'333ULL);
}

TEST(clock_domain_test, one_hour_at_48mhz_has_exact_tick_count_and_last_edge) {
    const sim::clock_domain d(sim::frequency::hz(48'000'000));
    const sim::time_ps hour = 3600 * second;
    // 48e6 * 3600 edges lie in [0, 1 h): the edge at exactly 1 h is the next one.
    EXPECT_EQ(d.tick_at(hour), 172'800'000'000ULL);
    EXPECT_EQ(d.time_of(172'800'000'000ULL), hour);
    // Last edge before the hour: one period (20833.33 ps) earlier, rounded to the nearest ps.
    EXPECT_EQ(d.time_of(172'800'000'000ULL - 1), hour - 20'833);
}

TEST(clock_domain_test, accumulating_a_rounded_period_would_drift) {
    // The reason for the design: adding the rounded period (20833 ps) 10^9 times is 333333333 ps
    // short of the exact time (333 us, 16 ppm); the domain has no such error.
    const sim::clock_domain d(sim::frequency::hz(48'000'000));
    const std::uint64_t accumulated = 20'833ULL * 1'000'000'000ULL;
    EXPECT_EQ(d.time_of(1'000'000'000) - accumulated, 333'333'333u);
}

TEST(clock_domain_test, watch_crystal_gives_32768_edges_per_second) {
    // A 32.768 kHz watch crystal is 2^15 Hz (common practice, no source).
    const sim::clock_domain d(sim::frequency::hz(1u << 15));
    for (std::uint64_t s = 1; s <= 10; ++s) {
        EXPECT_EQ(d.tick_at(s * second) - d.tick_at((s - 1) * second), 32'768u);
        EXPECT_EQ(d.time_of(s * 32'768), s * second);
    }
}

TEST(clock_domain_test, pll_derived_fraction_keeps_every_edge_within_half_a_picosecond) {
    // A PLL taking 48 MHz x 7 / 9 gives 37.333... MHz, whose period 187500/7 ps never terminates.
    const sim::frequency f = sim::frequency::hz(48'000'000).scaled(7, 9);
    const sim::clock_domain d(f);
    for (std::uint64_t k : {1ULL, 7ULL, 1'000'003ULL, 123'456'789'012ULL}) {
        const sim::u128 exact_x7 = static_cast<sim::u128>(k) * 187'500;
        const std::uint64_t expect = static_cast<std::uint64_t>((exact_x7 * 2 + 7) / 14);
        EXPECT_EQ(d.time_of(k), expect) << "edge " << k;
    }
}

TEST(clock_domain_test, tick_at_inverts_time_of) {
    const sim::clock_domain d(sim::frequency::hz(48'000'000).scaled(7, 9));
    for (std::uint64_t k = 0; k < 2000; ++k) {
        const sim::time_ps t = d.time_of(k);
        EXPECT_EQ(d.tick_at(t), k);
        EXPECT_EQ(d.tick_at(t + 1), k + 1);
        if (t > 0) {
            EXPECT_EQ(d.tick_at(t - 1), k);
        }
    }
}

TEST(clock_domain_test, mid_run_frequency_change_starts_new_origin_at_first_edge_after) {
    sim::clock_domain d(sim::frequency::hz(1'000'000));  // 1 us period
    // Change at 10.5 us: the edge at 11 us (tick 11) is the first edge of the 2 MHz stretch.
    const sim::clock_edge origin = d.change_frequency(10'500'000, sim::frequency::hz(2'000'000));
    EXPECT_EQ(origin.tick, 11u);
    EXPECT_EQ(origin.at, 11'000'000u);
    EXPECT_EQ(d.time_of(10), 10'000'000u);
    EXPECT_EQ(d.time_of(11), 11'000'000u);
    EXPECT_EQ(d.time_of(12), 11'500'000u);
    EXPECT_EQ(d.time_of(11 + 2'000'000), 1'000'011'000'000u);
    EXPECT_EQ(d.tick_at(11'250'000), 12u);
    EXPECT_EQ(d.freq_at(10'999'999), sim::frequency::hz(1'000'000));
    EXPECT_EQ(d.freq_at(11'000'000), sim::frequency::hz(2'000'000));
}

TEST(clock_domain_test, stop_and_restart_keep_the_tick_count) {
    sim::clock_domain d(sim::frequency::hz(1'000'000));
    d.stop(5'500'000);  // edges 0..5 happened
    EXPECT_FALSE(d.edge_at_or_after(5'500'000).has_value());
    EXPECT_THROW(d.time_of(6), std::out_of_range);
    // A restart requested at 20 us comes after everything at 20 us: the first edge is 1 ps later.
    d.change_frequency(20'000'000, sim::frequency::hz(1'000'000));
    EXPECT_EQ(d.time_of(6), 20'000'001u);
    EXPECT_EQ(d.tick_at(20'000'002), 7u);
    const auto e = d.edge_at_or_after(6'000'000);
    ASSERT_TRUE(e.has_value());
    EXPECT_EQ(e->tick, 6u);
    EXPECT_EQ(e->at, 20'000'001u);
}

TEST(clock_domain_test, time_limit_is_an_error_before_the_wrap) {
    // IEEE 1666-2011 5.11: sc_time is a 64-bit count of the resolution; at 1 ps that ends at
    // 2^64 - 1 ps, about 213.5 days.
    const sim::clock_domain d(sim::frequency::hz(1));
    EXPECT_EQ(d.time_of(18'446'744), 18'446'744 * second);
    EXPECT_THROW(d.time_of(18'446'745), sim::time_limit_error);
    const sim::clock_domain fast(sim::frequency::hz(1'000'000'000));
    EXPECT_THROW(fast.time_of(~0ULL), sim::time_limit_error);
    EXPECT_NO_THROW(fast.time_of(18'446'744'073'709'551ULL));
}

TEST(clock_domain_test, jitter_is_seeded_bounded_and_keeps_edges_in_order) {
    const sim::frequency f = sim::frequency::hz(8'000'000);  // 125000 ps period
    const sim::clock_segment a = sim::clock_segment::running(0, 0, f, 500, 42);
    const sim::clock_segment b = sim::clock_segment::running(0, 0, f, 500, 42);
    const sim::clock_segment c = sim::clock_segment::running(0, 0, f, 500, 43);
    int differ = 0;
    sim::time_ps prev = 0;
    for (std::uint64_t k = 0; k < 10'000; ++k) {
        const sim::time_ps t = a.time_of(k);
        EXPECT_EQ(t, b.time_of(k));
        EXPECT_GE(t, k * 125'000);
        EXPECT_LE(t, k * 125'000 + 500);
        if (k) {
            EXPECT_GT(t, prev);
        }
        prev = t;
        EXPECT_EQ(a.tick_at(t), k);
        EXPECT_EQ(a.tick_at(t + 1), k + 1);
        differ += t != c.time_of(k);
    }
    EXPECT_GT(differ, 9'000);  // another seed, other draws
    EXPECT_THROW(sim::clock_segment::running(0, 0, f, 62'500, 1), std::invalid_argument);
}

TEST(clock_domain_test, derived_segment_lands_exactly_on_parent_edges) {
    // A divide-by-3 of 48 MHz * 7 / 9: every output edge is exactly a parent edge.
    const sim::clock_segment p =
        sim::clock_segment::running(0, 0, sim::frequency::hz(48'000'000).scaled(7, 9));
    const sim::clock_segment d = sim::clock_segment::derived(p, 5, 0, 3);
    for (std::uint64_t k = 0; k < 1000; ++k) EXPECT_EQ(d.time_of(k), p.time_of(5 + 3 * k));
    EXPECT_EQ(d.freq(), sim::frequency::hz(48'000'000).scaled(7, 27));
}

TEST(clock_domain_test, formats_times_exactly) {
    EXPECT_EQ(sim::format_time(0), "0 ps");
    EXPECT_EQ(sim::format_time(1'500), "1.5 ns");
    EXPECT_EQ(sim::format_time(20'833'333'333'333ULL), "20.833333333333 s");
    EXPECT_EQ(sim::format_time(40'000'000), "40 us");
}

}  // namespace
